import { z } from 'zod';
import { handle, json, readJson, readQuery, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { SimpleListQuery } from '@/lib/contracts/lists';
import { createDepot, listDepots } from '@/server/fleet';

export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json(listDepots(user, readQuery(ctx, SimpleListQuery)));
});

export const POST = handle(async (ctx) => {
  const user = requirePermission(ctx, 'depot:write');
  const body = await readJson(ctx, z.record(z.string(), z.unknown()));
  return json(createDepot(body, actorOf(user)), 201);
});

export const ALL = methodNotAllowed('GET, POST');
