import { z } from 'zod';
import { handle, idParam, json, notFound, readJson, methodNotAllowed, invalid } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { ROLE_VALUES } from '@/lib/auth/permissions';
import { listUsers, updateUser } from '@/server/users';

const UserPatchSchema = z.object({
  name: z.string().trim().min(1).max(120).optional(),
  role: z.enum(ROLE_VALUES).optional(),
  depots: z.array(z.string().max(16)).optional(),
  allDepots: z.boolean().optional(),
  active: z.boolean().optional(),
  password: z.string().min(10, 'password must have at least 10 characters').max(200).optional(),
});

export const GET = handle((ctx) => {
  requirePermission(ctx, 'user:write');
  const id = idParam(ctx.params.id, 'Person');
  const u = listUsers().find((x) => x.id === id);
  if (!u) throw notFound('Person');
  return json(u);
});

export const PATCH = handle(async (ctx) => {
  const me = requirePermission(ctx, 'user:write');
  const id = idParam(ctx.params.id, 'Person');
  if (!listUsers().some((x) => x.id === id)) throw notFound('Person');
  const body = await readJson(ctx, UserPatchSchema);
  if (id === me.id && (body.active === false || (body.role && body.role !== 'admin'))) {
    throw invalid('You cannot deactivate yourself or remove your own admin role.');
  }
  await updateUser(id, body, actorOf(me));
  return json(listUsers().find((x) => x.id === id));
});

export const ALL = methodNotAllowed('GET, PATCH');
