/**
 * Fetchers and query hooks of the Defects view: the paged defect list and the module catalogue for the filter
 * (the CSV download is a plain link to /api/defects/export). Row types mirror `defectJson` in src/server/defects.ts
 * (islands and components do not import server code).
 */
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch, toQuery } from '@/lib/client/api-client';
import type { ListResponse } from '@/lib/contracts/lists';
import type { DefectListState } from './list-state';

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
  /** The depot's IANA time zone (dates are shown in it); absent from other defect JSON. */
  depotTimeZone?: string | null;
};

/** A module type as the filter needs it. */
export type ModuleOption = { code: string; name: string; function: string };

/** The list parameters sent to the API (the URL state of list-state.ts, unchanged). */
export type DefectListParams = DefectListState;

/** Query options of one page of defects. */
export function defectsQueryOptions(params: DefectListParams) {
  return queryOptions({
    queryKey: ['defects', 'list', params],
    queryFn: ({ signal }) => apiFetch<ListResponse<DefectRow>>(`/api/defects${toQuery(params)}`, { signal }),
    placeholderData: keepPreviousData,
  });
}

/** One page of defects; the previous page stays on screen while the next one loads (`enabled` false: no request). */
export function useDefects(params: DefectListParams, enabled = true) {
  return useQuery({ ...defectsQueryOptions(params), enabled });
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
