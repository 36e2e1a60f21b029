import { handle, json, readJson, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { UserCreateSchema } from '@/lib/contracts/users';
import { createUser, listUsers } from '@/server/users';

export const GET = handle((ctx) => {
  requirePermission(ctx, 'user:write');
  return json({ items: listUsers() });
});

export const POST = handle(async (ctx) => {
  const user = requirePermission(ctx, 'user:write');
  const body = await readJson(ctx, UserCreateSchema);
  const { id } = await createUser(body, actorOf(user));
  return json(listUsers().find((u) => u.id === id), 201);
});

export const ALL = methodNotAllowed('GET, POST');
