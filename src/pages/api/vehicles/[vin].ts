import { z } from 'zod';
import { handle, json, readJson, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { assertVinParam, deleteVehicle, getVehicle, updateVehicle } from '@/server/fleet';

export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json(getVehicle(user, assertVinParam(ctx.params.vin)));
});

export const PATCH = handle(async (ctx) => {
  const user = requirePermission(ctx, 'vehicle:write');
  const vin = assertVinParam(ctx.params.vin);
  const body = await readJson(ctx, z.record(z.string(), z.unknown()));
  const { vehicle, warnings } = updateVehicle(user, vin, body, actorOf(user));
  return json({ ...vehicle, warnings });
});

export const DELETE = handle((ctx) => {
  const user = requirePermission(ctx, 'vehicle:write');
  deleteVehicle(user, assertVinParam(ctx.params.vin), actorOf(user));
  return new Response(null, { status: 204 });
});

export const ALL = methodNotAllowed('GET, PATCH, DELETE');
