import { handle, idParam, json, methodNotAllowed, readQuery } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { getTraceSamples } from '@/server/traces/store';
import { DEFAULT_PLOT_COLUMNS, TraceSamplesQuery } from '@/lib/contracts/traces';

/**
 * A window of a stored capture for the plot: `from`/`to` in seconds (default: the whole capture), `columns`
 * pixel columns (default 1000, at most 4000); min/max per column, or every sample when zoomed in far enough.
 */
export const GET = handle(async (ctx) => {
  const user = requirePermission(ctx, 'read');
  const id = idParam(ctx.params.id, 'Trace');
  const q = readQuery(ctx, TraceSamplesQuery);
  const body = await getTraceSamples(user, id, { fromS: q.from, toS: q.to, columns: q.columns ?? DEFAULT_PLOT_COLUMNS });
  return json(body);
});

export const ALL = methodNotAllowed('GET');
