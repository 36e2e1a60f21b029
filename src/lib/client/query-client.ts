/** The module-level TanStack Query client every island shares (one cache per page). */
import { QueryClient } from '@tanstack/react-query';

export const queryClient = new QueryClient({
  defaultOptions: {
    queries: { staleTime: 30_000, refetchOnWindowFocus: false, retry: (n, e) => n < 1 && !(e as { status?: number }).status },
  },
});
