import { z } from 'zod';
import { handle, json, readJson, readQuery, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { VehicleListQuery } from '@/lib/contracts/lists';
import { createVehicle, listVehicles } from '@/server/fleet';

export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json(listVehicles(user, readQuery(ctx, VehicleListQuery)));
});

export const POST = handle(async (ctx) => {
  const user = requirePermission(ctx, 'vehicle:write');
  const body = await readJson(ctx, z.record(z.string(), z.unknown()));
  const { vehicle, warnings } = createVehicle(user, body, actorOf(user));
  return json({ ...vehicle, warnings }, 201);
});

export const ALL = methodNotAllowed('GET, POST');
