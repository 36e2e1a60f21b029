import { z } from 'zod';
import { handle, json, readJson, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { deleteDepot, getDepot, updateDepot } from '@/server/fleet';

export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json(getDepot(user, ctx.params.code ?? ''));
});

export const PATCH = handle(async (ctx) => {
  const user = requirePermission(ctx, 'depot:write');
  const body = await readJson(ctx, z.record(z.string(), z.unknown()));
  return json(updateDepot(user, ctx.params.code ?? '', body, actorOf(user)));
});

export const DELETE = handle((ctx) => {
  const user = requirePermission(ctx, 'depot:write');
  deleteDepot(user, ctx.params.code ?? '', actorOf(user));
  return new Response(null, { status: 204 });
});

export const ALL = methodNotAllowed('GET, PATCH, DELETE');
