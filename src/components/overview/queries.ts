/** The Overview's one query (GET /api/overview); the page passes the server-rendered figures as initial data. */
import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiFetch } from '@/lib/client/api-client';
import type { OverviewResponse } from '@/lib/contracts/overview';

/** Query options of the Overview figures. */
export function overviewQueryOptions() {
  return queryOptions({
    queryKey: ['overview'],
    queryFn: ({ signal }) => apiFetch<OverviewResponse>('/api/overview', { signal }),
    staleTime: 60_000,
  });
}

/**
 * The Overview figures: during the server render exactly the figures computed for this request; in the
 * browser the query, seeded with them and refreshed when older than a minute.
 *
 * NOTE: the shared query client is one module-level instance, so on the server it lives across requests
 * (and people). Seeding it there would let the next request render someone else's figures; the server render
 * therefore never touches the cache.
 */
export function useOverview(initial: OverviewResponse): OverviewResponse {
  const inBrowser = typeof window !== 'undefined';
  const q = useQuery({ ...overviewQueryOptions(), enabled: inBrowser, ...(inBrowser ? { initialData: initial, initialDataUpdatedAt: Date.parse(initial.asOf) } : {}) });
  return inBrowser ? (q.data ?? initial) : initial;
}
