import { forbidden, handle, idParam, methodNotAllowed } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { can } from '@/lib/auth/permissions';
import { getPatternEvidenceCsv } from '@/server/patterns-records';

/** The warranty evidence CSV of a pattern: its vehicles and defects (columns in README "Patterns"). */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'pattern:read');
  // A claim to a supplier is made fleet-wide, by the people who decide campaigns (docs/decisions/011).
  if (!can(user.role, 'pattern:write')) throw forbidden('Warranty evidence packs are prepared by fleet managers and admins.');
  const { csv, fileName } = getPatternEvidenceCsv(user, idParam(ctx.params.id, 'Pattern'));
  return new Response(csv, {
    status: 200,
    headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${fileName}"`, 'cache-control': 'no-store' },
  });
});

export const ALL = methodNotAllowed('GET');
