/**
 * Fetchers and query hooks of the Patterns views: the report as of a day (each cohort with its record), the
 * records sync, one pattern record, its MCF curves, and the status change. Response shapes come from
 * src/lib/contracts/patterns.ts.
 */
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiFetch, toQuery } from '@/lib/client/api-client';
import type { McfResponse, PatternGroupDetail, PatternRecordDetail, PatternsReportResponse, PatternStatusChange, PatternSyncResponse } from '@/lib/contracts/patterns';

/** Query options of the patterns report (`asOf` empty = today on the server). */
export function patternsReportQueryOptions(asOf: string) {
  return queryOptions({
    queryKey: ['patterns', 'report', asOf],
    queryFn: ({ signal }) => apiFetch<PatternsReportResponse>(`/api/patterns${toQuery({ asOf })}`, { signal }),
    placeholderData: keepPreviousData,
    staleTime: 60_000,
  });
}

/** The report as of a day; waits while `enabled` is false (until the records are synced). */
export function usePatternsReport(asOf: string, enabled = true) {
  return useQuery({ ...patternsReportQueryOptions(asOf), enabled });
}

/** Bring the pattern records up to date with today's fleet-wide report (managers and admins). */
export function useSyncPatterns() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => apiFetch<PatternSyncResponse>('/api/patterns/sync', { method: 'POST', json: {} }),
    onSuccess: (r) => {
      if (!r.upToDate) void qc.invalidateQueries({ queryKey: ['patterns'] });
    },
  });
}

/** Query options of one pattern record. */
export function patternRecordQueryOptions(id: number) {
  return queryOptions({
    queryKey: ['patterns', 'record', id],
    queryFn: ({ signal }) => apiFetch<PatternRecordDetail>(`/api/patterns/${id}`, { signal }),
  });
}

/** One pattern record. */
export function usePatternRecord(id: number, enabled = true) {
  return useQuery({ ...patternRecordQueryOptions(id), enabled });
}

/**
 * MCF curves of a module type by exposure band over the caller's depots, with the group (band × build range) against
 * the rest of its band when `compare` is given.
 */
export function useMcf(moduleCode: string, asOf: string, compare?: { band: string; buildFrom: string; buildTo: string }) {
  return useQuery({
    queryKey: ['patterns', 'mcf', moduleCode, asOf, compare?.band ?? '', compare?.buildFrom ?? '', compare?.buildTo ?? ''],
    queryFn: ({ signal }) => apiFetch<McfResponse>(`/api/patterns/mcf${toQuery({ module: moduleCode, asOf, by: 'exposureBand', ...(compare ?? {}) })}`, { signal }),
    staleTime: 5 * 60_000,
    enabled: moduleCode !== '',
  });
}

/** One module type × band of the report as of a day (the read-only group page). */
export function usePatternGroup(moduleCode: string, band: string, asOf: string) {
  return useQuery({
    queryKey: ['patterns', 'group', moduleCode, band, asOf],
    queryFn: ({ signal }) => apiFetch<PatternGroupDetail>(`/api/patterns/group${toQuery({ module: moduleCode, band, asOf })}`, { signal }),
    staleTime: 60_000,
  });
}

/** Change a record's status; the answer is the updated record, which replaces the cached one. */
export function useChangeStatus(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: PatternStatusChange) => apiFetch<PatternRecordDetail>(`/api/patterns/${id}/status`, { method: 'POST', json: body }),
    onSuccess: (r) => {
      qc.setQueryData(['patterns', 'record', id], r);
      void qc.invalidateQueries({ queryKey: ['patterns', 'report'] });
    },
  });
}
