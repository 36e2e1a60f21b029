/**
 * Fetchers and query hooks of the Vehicles view: the paged vehicle list, the depot list for the filter,
 * and the off-road change. Row types mirror `vehicleJson` in src/server/fleet.ts (islands do not import it).
 */
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiFetch, toQuery } from '@/lib/client/api-client';
import type { ListResponse } from '@/lib/contracts/lists';

export type VehicleStatus = 'active' | 'retired' | 'off_road';

/** One vehicle as the API returns it. */
export type VehicleRow = {
  id: number;
  vin: string;
  fleetNumber: string | null;
  registration: string | null;
  make: string | null;
  model: string | null;
  body: string | null;
  buildDate: string;
  buildMonth: string;
  inServiceDate: string;
  retiredDate: string | null;
  depotCode: string;
  depotName: string;
  parking: 'indoor' | 'outdoor' | 'mixed';
  washesPerMonth: number;
  modelYear: number | null;
  status: VehicleStatus;
  offRoadSince: string | null;
  /** Why it is off road, as written when it was taken off (null when in service or not recorded). */
  offRoadReason: string | null;
  /** The open defects keeping an off-road vehicle off road (list rows of off-road vehicles only). */
  offRoadDefects?: OffRoadDefectRow[];
  depotTimeZone: string | null;
  openDefects: number;
  defects: number;
  version: number;
};

/** An open defect of a vehicle, as the off-road views show it (mirrors OffRoadDefect in src/server/fleet.ts). */
export type OffRoadDefectRow = {
  id: number;
  ref: string;
  status: string;
  position: string;
  moduleCode: string;
  moduleName: string;
  /** Still needs the release verification before the vehicle is released. */
  needsVerification: boolean;
};

/** A depot as the filter needs it. */
export type DepotOption = { id: number; code: string; name: string };

/** The list parameters the island keeps in the URL. */
export type VehicleListParams = {
  page?: string;
  pageSize?: string;
  sort?: string;
  q?: string;
  depot?: string;
  parking?: string;
  status?: string;
  make?: string;
};

export const VEHICLE_PARAM_KEYS = ['page', 'pageSize', 'sort', 'q', 'depot', 'parking', 'status', 'make'] as const;

/** Only the list parameters, in a fixed order (a stable query key). */
export function pickVehicleParams(state: Record<string, string>): VehicleListParams {
  const out: Record<string, string> = {};
  for (const k of VEHICLE_PARAM_KEYS) if (state[k]) out[k] = state[k];
  return out as VehicleListParams;
}

/** Query options of one page of vehicles. */
export function vehiclesQueryOptions(params: VehicleListParams) {
  return queryOptions({
    queryKey: ['vehicles', 'list', params],
    queryFn: ({ signal }) => apiFetch<ListResponse<VehicleRow>>(`/api/vehicles${toQuery(params)}`, { signal }),
    placeholderData: keepPreviousData,
  });
}

/** One page of vehicles; the previous page stays on screen while the next one loads. */
export function useVehicles(params: VehicleListParams) {
  return useQuery(vehiclesQueryOptions(params));
}

/** The depots the caller may see (for filter dropdowns). */
export function useDepotOptions() {
  return useQuery({
    queryKey: ['depots', 'options'],
    queryFn: ({ signal }) => apiFetch<ListResponse<DepotOption>>('/api/depots?pageSize=200&sort=code', { signal }),
    staleTime: 5 * 60_000,
    select: (r) => r.items.map((d) => ({ id: d.id, code: d.code, name: d.name })),
  });
}

/** Take a vehicle off the road or put it back; `version` guards against a stale page (409). */
export function useSetOffRoad(vin: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { offRoad: boolean; version: number; offRoadReason?: string | undefined; confirmUnverified?: boolean | undefined }) =>
      apiFetch<VehicleRow>(`/api/vehicles/${encodeURIComponent(vin)}`, { method: 'PATCH', json: body }),
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: ['vehicles'] });
    },
  });
}
