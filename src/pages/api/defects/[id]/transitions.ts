import { handle, idParam, json, readJson, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { TransitionRequestSchema } from '@/lib/contracts/defects';
import { listTransitions, transitionDefect } from '@/server/defects';

/** The defect's status changes, oldest first. */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json(listTransitions(user, idParam(ctx.params.id, 'Defect')));
});

/** Move the defect to `to` (lifecycle rules, roles, the release-verification gate; `version` required). */
export const POST = handle(async (ctx) => {
  const user = requirePermission(ctx, 'defect:write');
  const id = idParam(ctx.params.id, 'Defect');
  const req = await readJson(ctx, TransitionRequestSchema);
  return json(transitionDefect(user, id, req, actorOf(user)));
});

export const ALL = methodNotAllowed('GET, POST');
