import { handle, idParam, json, methodNotAllowed } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { getTrace } from '@/server/traces/store';

/** One stored trace with its analysis. */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json(getTrace(user, idParam(ctx.params.id, 'Trace')));
});

export const ALL = methodNotAllowed('GET');
