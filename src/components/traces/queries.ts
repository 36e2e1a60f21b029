/**
 * Fetchers and query hooks of the trace views: the list of stored traces (all, or one defect's), and plot
 * windows of one capture. Types come from src/lib/contracts/traces.ts.
 */
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch, toQuery } from '@/lib/client/api-client';
import type { ListResponse } from '@/lib/contracts/lists';
import type { TraceRecord, TraceSamples } from '@/lib/contracts/traces';

/** The list parameters the Traces page keeps in the URL. */
export type TraceListParams = { page?: string; pageSize?: string; verdict?: string; depot?: string; defectId?: string; sort?: string };

export const TRACE_PARAM_KEYS = ['page', 'pageSize', 'verdict', 'depot', 'defectId', 'sort'] as const;

/** Default order of the trace list: newest first. */
export const DEFAULT_TRACE_SORT = '-createdAt';

/** Only the list parameters, in a fixed order (a stable query key). */
export function pickTraceParams(state: Record<string, string | undefined>): TraceListParams {
  const out: Record<string, string> = {};
  for (const k of TRACE_PARAM_KEYS) {
    const v = state[k];
    if (v) out[k] = v;
  }
  return out as TraceListParams;
}

/** Query options of one page of traces. */
export function tracesQueryOptions(params: TraceListParams) {
  return queryOptions({
    queryKey: ['traces', 'list', params],
    queryFn: ({ signal }) => apiFetch<ListResponse<TraceRecord>>(`/api/traces${toQuery(params)}`, { signal }),
    placeholderData: keepPreviousData,
  });
}

/** One page of traces; the previous page stays on screen while the next one loads. */
export function useTraces(params: TraceListParams) {
  return useQuery(tracesQueryOptions(params));
}

/** A window of a capture to plot: seconds (null = the whole capture) and pixel columns. */
export type SampleWindow = { fromS: number | null; toS: number | null; columns: number };

/** One plot window of a stored capture (kept on screen while the next window loads). */
export function useTraceSamples(traceId: string, w: SampleWindow) {
  return useQuery({
    queryKey: ['traces', traceId, 'samples', w.fromS, w.toS, w.columns],
    queryFn: ({ signal }) =>
      apiFetch<TraceSamples>(`/api/traces/${encodeURIComponent(traceId)}/samples${toQuery({ from: w.fromS, to: w.toS, columns: w.columns })}`, { signal }),
    placeholderData: keepPreviousData,
    staleTime: Infinity, // a stored capture never changes
    enabled: w.columns > 0,
  });
}
