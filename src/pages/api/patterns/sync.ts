import { handle, json, methodNotAllowed } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { syncPatternRecords } from '@/server/patterns-records';

/** Bring the pattern records up to date with today's fleet-wide report (managers and admins). */
export const POST = handle((ctx) => {
  const user = requirePermission(ctx, 'pattern:write');
  return json(syncPatternRecords(user));
});

export const ALL = methodNotAllowed('POST');
