import { handle, invalid, json, methodNotAllowed } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { getMcf, parseAsOfParam, type McfCompareQuery } from '@/server/patterns';

const MONTH = /^\d{4}-(0[1-9]|1[0-2])$/;
const BANDS = ['low', 'medium', 'high'] as const;

/**
 * Mean cumulative function of a module type (CONTRACT.md "Mean cumulative function"). Optional `band`, `buildFrom`
 * and `buildTo` (all three) add `compare`: that band's vehicles built in the range against the rest of the band.
 */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'pattern:read');
  const sp = ctx.url.searchParams;
  const module = sp.get('module');
  if (!module || module.length > 32) throw invalid('module (a module type code) is required.', [{ path: 'module', message: 'Required' }]);
  const by = sp.get('by');
  if (by !== null && by !== 'exposureBand') throw invalid('by may only be exposureBand.', [{ path: 'by', message: `Unknown grouping ${by}` }]);
  const [band, buildFrom, buildTo] = [sp.get('band'), sp.get('buildFrom'), sp.get('buildTo')];
  let compare: McfCompareQuery | undefined;
  if (band !== null || buildFrom !== null || buildTo !== null) {
    const issues = [];
    if (!BANDS.includes(band as (typeof BANDS)[number])) issues.push({ path: 'band', message: 'low, medium or high' });
    if (!buildFrom || !MONTH.test(buildFrom)) issues.push({ path: 'buildFrom', message: 'A build month YYYY-MM' });
    if (!buildTo || !MONTH.test(buildTo)) issues.push({ path: 'buildTo', message: 'A build month YYYY-MM' });
    if (issues.length === 0 && buildTo! < buildFrom!) issues.push({ path: 'buildTo', message: 'Must not be before buildFrom' });
    if (issues.length) throw invalid('band, buildFrom and buildTo go together: a band and an inclusive range of build months.', issues);
    compare = { band: band as McfCompareQuery['band'], buildFrom: buildFrom!, buildTo: buildTo! };
  }
  return json(getMcf(user, module, parseAsOfParam(sp.get('asOf')), by === 'exposureBand', compare));
});

export const ALL = methodNotAllowed('GET');
