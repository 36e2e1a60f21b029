/** The Overview's one query (GET /api/overview); the page passes the server-rendered figures as initial data. */
import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from '@/lib/client/api-client';
import type { OverviewResponse } from '@/lib/contracts/overview';

/** Query options of the Overview figures. */
export function overviewQueryOptions(initialData?: OverviewResponse) {
  return queryOptions({
    queryKey: ['overview'],
    queryFn: ({ signal }) => apiFetch<OverviewResponse>('/api/overview', { signal }),
    initialData,
    staleTime: 60_000,
  });
}

/** The Overview figures, refreshed when older than a minute. */
export function useOverview(initialData?: OverviewResponse) {
  return useQuery(overviewQueryOptions(initialData));
}
