import { handle, json, methodNotAllowed, readQuery } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { PatternRecordsQuerySchema } from '@/lib/contracts/patterns';
import { listPatternRecords } from '@/server/patterns-records';

/** Pattern records the caller may see (supervisors: records with vehicles at their depots), filtered. */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'pattern:read');
  const q = readQuery(ctx, PatternRecordsQuerySchema);
  return json(listPatternRecords(user, q));
});

export const ALL = methodNotAllowed('GET');
