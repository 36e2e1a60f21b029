import { handle, json, methodNotAllowed } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { getPatternsReport, parseAsOfParam, patternsResponse } from '@/server/patterns';

/** The patterns report over the caller's depots (CONTRACT.md "Patterns"), each cohort with its pattern record. */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'pattern:read');
  const asOf = parseAsOfParam(ctx.url.searchParams.get('asOf'));
  return json(patternsResponse(getPatternsReport(user, asOf), user));
});

export const ALL = methodNotAllowed('GET');
