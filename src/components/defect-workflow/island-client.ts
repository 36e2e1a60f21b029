/** The defect islands use the shared island client (see src/lib/client/query-client.ts for why it is per render on the server). */
export { useIslandQueryClient } from '@/lib/client/query-client';
