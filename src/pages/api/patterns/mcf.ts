import { handle, invalid, json, methodNotAllowed } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { getMcf, parseAsOfParam } from '@/server/patterns';

/** Mean cumulative function of a module type (CONTRACT.md "Mean cumulative function"). */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'pattern:read');
  const sp = ctx.url.searchParams;
  const module = sp.get('module');
  if (!module || module.length > 32) throw invalid('module (a module type code) is required.', [{ path: 'module', message: 'Required' }]);
  const by = sp.get('by');
  if (by !== null && by !== 'exposureBand') throw invalid('by may only be exposureBand.', [{ path: 'by', message: `Unknown grouping ${by}` }]);
  return json(getMcf(user, module, parseAsOfParam(sp.get('asOf')), by === 'exposureBand'));
});

export const ALL = methodNotAllowed('GET');
