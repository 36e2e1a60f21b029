/** Module catalogue: list query, create/change/delete mutations (each invalidates every modules query). */
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiFetch, toQuery } from '@/lib/client/api-client';
import type { ListResponse } from '@/lib/contracts/lists';

export const MODULE_FUNCTIONS = ['window_lifter', 'lock_actuator', 'door_control', 'mirror', 'harness', 'switch', 'other'] as const;
export type ModuleFunction = (typeof MODULE_FUNCTIONS)[number];

export type ModuleType = {
  id: number;
  code: string;
  name: string;
  function: ModuleFunction;
  partNumber: string | null;
  supplier: string | null;
  defects: number;
  openDefects: number;
  /** Defects in every depot (sent to people who may delete module types). */
  usage?: { defects: number };
};

export type ModuleInput = { code: string; name: string; function: ModuleFunction; partNumber: string | null; supplier: string | null };

export type ModuleListParams = { page?: string; pageSize?: string; sort?: string; q?: string; function?: string };

export const MODULES_KEY = ['modules'] as const;

export function modulesQueryOptions(params: ModuleListParams) {
  return queryOptions({
    queryKey: [...MODULES_KEY, 'list', params],
    queryFn: () => apiFetch<ListResponse<ModuleType>>(`/api/modules${toQuery(params)}`),
    placeholderData: keepPreviousData,
  });
}

export function useModules(params: ModuleListParams) {
  return useQuery(modulesQueryOptions(params));
}

export function useSaveModule() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ code, body }: { code: string | null; body: ModuleInput }) =>
      code
        ? apiFetch<ModuleType>(`/api/modules/${encodeURIComponent(code)}`, { method: 'PATCH', json: body })
        : apiFetch<ModuleType>('/api/modules', { method: 'POST', json: body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: MODULES_KEY }),
  });
}

export function useDeleteModule() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (code: string) => apiFetch<void>(`/api/modules/${encodeURIComponent(code)}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: MODULES_KEY }),
  });
}
