import { z } from 'zod';
import { handle, json, readJson, readQuery, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { DefectListQuery } from '@/lib/contracts/lists';
import { createDefect, listDefects } from '@/server/defects';

export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json(listDefects(user, readQuery(ctx, DefectListQuery)));
});

export const POST = handle(async (ctx) => {
  const user = requirePermission(ctx, 'defect:write');
  const body = await readJson(ctx, z.record(z.string(), z.unknown()));
  return json(createDefect(user, body, actorOf(user)), 201);
});

export const ALL = methodNotAllowed('GET, POST');
