import { z } from 'zod';
import { eq } from 'drizzle-orm';
import { handle, json, readJson, methodNotAllowed, invalid } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { createToken, listTokens } from '@/server/users';
import { getDb } from '@/db/client';
import { users } from '@/db/schema';

const TokenCreateSchema = z
  .object({
    email: z.email().optional(),
    userId: z.number().int().positive().optional(),
    label: z.string().trim().max(80).optional(),
  })
  .refine((b) => b.email || b.userId, 'Give the email (or userId) of the person the token acts as.');

export const GET = handle((ctx) => {
  requirePermission(ctx, 'token:write');
  return json({ items: listTokens() });
});

export const POST = handle(async (ctx) => {
  const me = requirePermission(ctx, 'token:write');
  const body = await readJson(ctx, TokenCreateSchema);
  const db = getDb();
  const target = body.userId
    ? db.select({ id: users.id }).from(users).where(eq(users.id, body.userId)).get()
    : db.select({ id: users.id }).from(users).where(eq(users.email, body.email!.toLowerCase())).get();
  if (!target) throw invalid('No person with that e-mail.', [{ path: 'email', message: 'Unknown person' }]);
  const t = createToken(target.id, body.label ?? 'API token', actorOf(me));
  return json({ id: t.id, token: t.token, prefix: t.prefix, label: body.label ?? 'API token', userId: target.id, note: 'Shown once: store it now.' }, 201);
});

export const ALL = methodNotAllowed('GET, POST');
