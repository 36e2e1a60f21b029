/**
 * The TanStack Query client of the islands. In the browser every island of a page shares one module-level
 * client (one cache per page). NOTE: on the server a module-level client outlives the request, so anything put
 * into it during one render (initialData, setQueryData) would be served to the next request — another moment's
 * data, or another person's. Server renders therefore get a fresh client each time; the module-level client is
 * deliberately not exported, so islands can only reach it through `useIslandQueryClient()`.
 */
import { useState } from 'react';
import { QueryClient } from '@tanstack/react-query';

const defaultOptions = {
  queries: { staleTime: 30_000, refetchOnWindowFocus: false, retry: (n: number, e: unknown) => n < 1 && !(e as { status?: number }).status },
};

let browserClient: QueryClient | undefined;

/** A new client with the shared defaults (one per server render, or the browser's single one). */
export function makeQueryClient(): QueryClient {
  return new QueryClient({ defaultOptions });
}

/** The browser's page-wide client, or a fresh one on the server (never shared across requests). */
export function getQueryClient(): QueryClient {
  if (typeof window === 'undefined') return makeQueryClient();
  browserClient ??= makeQueryClient();
  return browserClient;
}

/** The client an island root should provide (stable for the island's lifetime). */
export function useIslandQueryClient(): QueryClient {
  const [client] = useState(getQueryClient);
  return client;
}
