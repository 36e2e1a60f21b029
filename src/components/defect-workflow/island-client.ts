/**
 * The query client for the defect islands. In the browser it is the shared module-level client (one cache for
 * every island of the page). NOTE: on the server a module-level client outlives the request, so a record put
 * into it as `initialData` during one render would be served to the next request — another moment's data, or
 * another person's. Server renders therefore get a fresh client each time.
 */
import { useState } from 'react';
import { QueryClient } from '@tanstack/react-query';
import { queryClient } from '@/lib/client/query-client';

/** The client an island root should provide. */
export function useIslandQueryClient(): QueryClient {
  const [client] = useState(() => (typeof window === 'undefined' ? new QueryClient({ defaultOptions: { queries: { staleTime: Infinity, retry: false } } }) : queryClient));
  return client;
}
