// GET /api/overview: the Overview figures for the caller's depots (the landing page renders the same data).
import { handle, json, methodNotAllowed } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { getOverview } from '@/server/overview';

export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json(getOverview(user));
});

export const ALL = methodNotAllowed('GET');
