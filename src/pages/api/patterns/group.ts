import { handle, json, methodNotAllowed, readQuery } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { PatternGroupQuerySchema } from '@/lib/contracts/patterns';
import { parseAsOfParam } from '@/server/patterns';
import { getPatternGroup } from '@/server/patterns-records';

/** One module type × band of the report as of a day over the caller's depots, read only (significant or not). */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'pattern:read');
  const q = readQuery(ctx, PatternGroupQuerySchema);
  return json(getPatternGroup(user, { moduleCode: q.module, band: q.band, asOf: parseAsOfParam(q.asOf) }));
});

export const ALL = methodNotAllowed('GET');
