/** Depots: list query, create/change/delete mutations (each invalidates every depots query). */
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiFetch, toQuery } from '@/lib/client/api-client';
import type { ListResponse } from '@/lib/contracts/lists';

export type Depot = {
  id: number;
  code: string;
  name: string;
  region: string | null;
  coastal: boolean;
  rainDaysPerYear: number;
  meanRhPct: number;
  washBay: boolean;
  inspectionSlotsPerDay: number | null;
  timezone: string | null;
  vehicles: number;
  openDefects: number;
  /** Everything attached to the depot (sent to people who may delete depots). */
  usage?: { vehicles: number; defects: number; people: number };
};

/** What the form sends (camelCase keys; the API also takes snake_case). */
export type DepotInput = {
  code: string;
  name: string;
  region: string | null;
  coastal: boolean;
  rainDaysPerYear: number;
  meanRhPct: number;
  washBay: boolean;
  inspectionSlotsPerDay: number | null;
  timezone: string | null;
};

export type DepotListParams = { page?: string; pageSize?: string; sort?: string; q?: string };

export const DEPOTS_KEY = ['depots'] as const;

export function depotsQueryOptions(params: DepotListParams) {
  return queryOptions({
    queryKey: [...DEPOTS_KEY, 'list', params],
    queryFn: () => apiFetch<ListResponse<Depot>>(`/api/depots${toQuery(params)}`),
    placeholderData: keepPreviousData,
  });
}

export function useDepots(params: DepotListParams) {
  return useQuery(depotsQueryOptions(params));
}

/** Every depot the caller may see (≤ 200), for pickers. */
export function useAllDepots() {
  return useQuery(depotsQueryOptions({ pageSize: '200', sort: 'code' }));
}

export function useSaveDepot() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ code, body }: { code: string | null; body: DepotInput }) =>
      code
        ? apiFetch<Depot>(`/api/depots/${encodeURIComponent(code)}`, { method: 'PATCH', json: body })
        : apiFetch<Depot>('/api/depots', { method: 'POST', json: body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: DEPOTS_KEY }),
  });
}

export function useDeleteDepot() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (code: string) => apiFetch<void>(`/api/depots/${encodeURIComponent(code)}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: DEPOTS_KEY }),
  });
}
