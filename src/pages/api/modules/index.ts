import { z } from 'zod';
import { handle, json, readJson, readQuery, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { SimpleListQuery } from '@/lib/contracts/lists';
import { createModule, listModules } from '@/server/fleet';

const ModuleListQuery = SimpleListQuery.extend({
  function: z.enum(['window_lifter', 'lock_actuator', 'door_control', 'mirror', 'harness', 'switch', 'other']).optional(),
});

export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json(listModules(user, readQuery(ctx, ModuleListQuery)));
});

export const POST = handle(async (ctx) => {
  const user = requirePermission(ctx, 'module:write');
  const body = await readJson(ctx, z.record(z.string(), z.unknown()));
  return json(createModule(body, actorOf(user)), 201);
});

export const ALL = methodNotAllowed('GET, POST');
