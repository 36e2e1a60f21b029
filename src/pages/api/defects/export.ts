// GET /api/defects/export: the whole filtered Defects view (same query as GET /api/defects, every page) as a
// CSV file: the defects import columns (it re-imports), then the report columns (status, depot, findings, parts,
// labour, cost and currency). Edit together with listDefects when a list filter is added.
import { handle, readQuery, methodNotAllowed } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { DefectListQuery } from '@/lib/contracts/lists';
import { listDefectsForExport } from '@/server/defects';
import { buildDefectsCsv, defectsCsvFileName } from '@/lib/exports/defects-csv';
import { currencyCode } from '@/server/currency';

export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  const rows = listDefectsForExport(user, readQuery(ctx, DefectListQuery));
  return new Response(buildDefectsCsv(rows, currencyCode()), {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="${defectsCsvFileName(new Date())}"`,
      'cache-control': 'no-store',
      'x-total-count': String(rows.length),
    },
  });
});

export const ALL = methodNotAllowed('GET');
