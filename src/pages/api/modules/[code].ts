import { z } from 'zod';
import { handle, json, readJson, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { deleteModule, getModule, updateModule } from '@/server/fleet';

export const GET = handle((ctx) => {
  requirePermission(ctx, 'read');
  return json(getModule(ctx.params.code ?? ''));
});

export const PATCH = handle(async (ctx) => {
  const user = requirePermission(ctx, 'module:write');
  const body = await readJson(ctx, z.record(z.string(), z.unknown()));
  return json(updateModule(ctx.params.code ?? '', body, actorOf(user)));
});

export const DELETE = handle((ctx) => {
  const user = requirePermission(ctx, 'module:write');
  deleteModule(ctx.params.code ?? '', actorOf(user));
  return new Response(null, { status: 204 });
});

export const ALL = methodNotAllowed('GET, PATCH, DELETE');
