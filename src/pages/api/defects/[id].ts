import { handle, idParam, json, readJson, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { DefectPatchSchema } from '@/lib/contracts/defects';
import { deleteDefect, getDefect, updateDefect } from '@/server/defects';

export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json(getDefect(user, idParam(ctx.params.id, 'Defect')));
});

/** Change the fields given; `version` makes it conditional (409 with the current record when stale). */
export const PATCH = handle(async (ctx) => {
  const user = requirePermission(ctx, 'defect:write');
  const id = idParam(ctx.params.id, 'Defect');
  const patch = await readJson(ctx, DefectPatchSchema);
  return json(updateDefect(user, id, patch, actorOf(user)));
});

export const DELETE = handle((ctx) => {
  const user = requirePermission(ctx, 'import');
  deleteDefect(user, idParam(ctx.params.id, 'Defect'), actorOf(user));
  return new Response(null, { status: 204 });
});

export const ALL = methodNotAllowed('GET, PATCH, DELETE');
