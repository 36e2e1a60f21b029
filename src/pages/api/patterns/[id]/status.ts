import { handle, idParam, json, methodNotAllowed, readJson } from '@/server/http';
import { actorOf, requirePermission } from '@/server/auth';
import { PatternStatusChangeSchema } from '@/lib/contracts/patterns';
import { changePatternStatus } from '@/server/patterns-records';

/** Move a pattern to a new status (acknowledged, campaign planned with its campaign, resolved, dismissed with a reason). */
export const POST = handle(async (ctx) => {
  const user = requirePermission(ctx, 'pattern:write');
  const id = idParam(ctx.params.id, 'Pattern');
  const body = await readJson(ctx, PatternStatusChangeSchema);
  return json(changePatternStatus(user, id, body, actorOf(user)));
});

export const ALL = methodNotAllowed('POST');
