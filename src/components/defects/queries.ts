/**
 * Fetchers and query hooks of the Defects view: the paged defect list, the module catalogue for the filter,
 * and the "all pages" fetch behind the CSV download. Row types mirror `defectJson` in src/server/defects.ts
 * (islands and components do not import server code).
 */
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch, toQuery } from '@/lib/client/api-client';
import type { ListResponse } from '@/lib/contracts/lists';

/** One defect as the list API returns it. */
export type DefectRow = {
  id: number;
  ref: string;
  vin: string;
  vehicleId: number;
  fleetNumber: string | null;
  registration: string | null;
  make: string | null;
  model: string | null;
  depotCode: string;
  moduleCode: string;
  moduleName: string;
  moduleFunction: string;
  position: string;
  status: string;
  open: boolean;
  reportedAt: string;
  symptom: string | null;
  dtcs: string[];
  moisture: string | null;
  rootCause: string | null;
  action: string | null;
  odometerKm: number | null;
  labourMinutes: number | null;
  costMinor: number | null;
  closedAt: string | null;
  repeat: boolean;
  repeatOfId: number | null;
  repeatOfRef: string | null;
  version: number;
};

/** A module type as the filter needs it. */
export type ModuleOption = { code: string; name: string; function: string };

/** The list parameters the island keeps in the URL (and sends to the API unchanged). */
export const DEFECT_PARAM_KEYS = [
  'page',
  'pageSize',
  'sort',
  'q',
  'depot',
  'vin',
  'status',
  'module',
  'position',
  'moisture',
  'repeat',
  'open',
  'mine',
  'reportedFrom',
  'reportedTo',
] as const;
export type DefectListParams = Partial<Record<(typeof DEFECT_PARAM_KEYS)[number], string>>;

/** Only the list parameters, in a fixed order (a stable query key). */
export function pickDefectParams(state: Record<string, string | undefined>): DefectListParams {
  const out: DefectListParams = {};
  for (const k of DEFECT_PARAM_KEYS) {
    const v = state[k];
    if (v) out[k] = v;
  }
  return out;
}

/** Query options of one page of defects. */
export function defectsQueryOptions(params: DefectListParams) {
  return queryOptions({
    queryKey: ['defects', 'list', params],
    queryFn: ({ signal }) => apiFetch<ListResponse<DefectRow>>(`/api/defects${toQuery(params)}`, { signal }),
    placeholderData: keepPreviousData,
  });
}

/** One page of defects; the previous page stays on screen while the next one loads. */
export function useDefects(params: DefectListParams) {
  return useQuery(defectsQueryOptions(params));
}

/** The module catalogue (for the filter). */
export function useModuleOptions() {
  return useQuery({
    queryKey: ['modules', 'options'],
    queryFn: ({ signal }) => apiFetch<ListResponse<ModuleOption>>('/api/modules?pageSize=200&sort=code', { signal }),
    staleTime: 5 * 60_000,
    select: (r) => r.items.map((m) => ({ code: m.code, name: m.name, function: m.function })),
  });
}

/** Largest number of rows the CSV download collects. */
export const EXPORT_MAX_ROWS = 10_000;
const EXPORT_PAGE_SIZE = 200;

/**
 * Every defect of the current filtered view (same filters and sort), page by page, up to EXPORT_MAX_ROWS.
 * `onProgress` gets rows fetched so far and the total.
 */
export async function fetchAllDefects(
  params: DefectListParams,
  onProgress: (done: number, total: number) => void,
  signal?: AbortSignal,
): Promise<{ rows: DefectRow[]; total: number; truncated: boolean }> {
  const rows: DefectRow[] = [];
  let total = 0;
  for (let page = 1; ; page++) {
    const { page: _p, pageSize: _s, ...filters } = params;
    const r = await apiFetch<ListResponse<DefectRow>>(`/api/defects${toQuery({ ...filters, page, pageSize: EXPORT_PAGE_SIZE })}`, { signal });
    total = r.total;
    rows.push(...r.items.slice(0, EXPORT_MAX_ROWS - rows.length));
    onProgress(rows.length, Math.min(total, EXPORT_MAX_ROWS));
    if (r.items.length < EXPORT_PAGE_SIZE || rows.length >= total || rows.length >= EXPORT_MAX_ROWS) break;
  }
  return { rows, total, truncated: total > rows.length };
}
