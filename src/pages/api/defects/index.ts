import { handle, json, readJson, readQuery, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { DefectListQuery } from '@/lib/contracts/lists';
import { DefectCreateSchema } from '@/lib/contracts/defects';
import { createDefect, listDefects } from '@/server/defects';

export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json(listDefects(user, readQuery(ctx, DefectListQuery)));
});

/** Report a defect (depot scope from the vehicle, which must be in the caller's depots). */
export const POST = handle(async (ctx) => {
  const user = requirePermission(ctx, 'defect:write');
  const input = await readJson(ctx, DefectCreateSchema);
  return json(createDefect(user, input, actorOf(user)), 201);
});

export const ALL = methodNotAllowed('GET, POST');
