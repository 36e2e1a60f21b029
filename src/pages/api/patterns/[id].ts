import { handle, idParam, json, methodNotAllowed } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { getPatternRecord } from '@/server/patterns-records';

/** One pattern record with its cohort, the vehicles and defects behind it (caller's depots) and its history. */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'pattern:read');
  return json(getPatternRecord(user, idParam(ctx.params.id, 'Pattern')));
});

export const ALL = methodNotAllowed('GET');
