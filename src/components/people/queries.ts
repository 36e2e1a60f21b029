/** People and API tokens (admin only): lists and mutations; every change invalidates both lists. */
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from '@/lib/client/api-client';
import type { Role } from '@/lib/auth/permissions';

export type Person = {
  id: number;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  /** True when the person sees every depot (admins, managers, and viewers given all depots). */
  allDepots: boolean;
  depots: string[];
  activeTokens: number;
  lastSignInAt: string | null;
};

export type ApiToken = {
  id: number;
  userId: number;
  email: string;
  name: string;
  label: string;
  prefix: string;
  createdAt: string | null;
  lastUsedAt: string | null;
  revokedAt: string | null;
};

export type PersonCreate = { email: string; name: string; role: Role; password: string; depots: string[]; allDepots?: boolean };
export type PersonChange = { name?: string; role?: Role; depots?: string[]; allDepots?: boolean; active?: boolean; password?: string };
export type NewToken = { id: number; token: string; prefix: string; label: string; userId: number };

export const PEOPLE_KEY = ['people'] as const;
export const TOKENS_KEY = ['tokens'] as const;

export const peopleQueryOptions = () =>
  queryOptions({ queryKey: [...PEOPLE_KEY, 'list'], queryFn: () => apiFetch<{ items: Person[] }>('/api/users').then((r) => r.items) });
export const tokensQueryOptions = () =>
  queryOptions({ queryKey: [...TOKENS_KEY, 'list'], queryFn: () => apiFetch<{ items: ApiToken[] }>('/api/tokens').then((r) => r.items) });

export const usePeople = () => useQuery(peopleQueryOptions());
export const useTokens = () => useQuery(tokensQueryOptions());

function useInvalidateAll() {
  const qc = useQueryClient();
  return () => Promise.all([qc.invalidateQueries({ queryKey: PEOPLE_KEY }), qc.invalidateQueries({ queryKey: TOKENS_KEY })]);
}

export function useCreatePerson() {
  const invalidate = useInvalidateAll();
  return useMutation({ mutationFn: (body: PersonCreate) => apiFetch<Person>('/api/users', { method: 'POST', json: body }), onSuccess: invalidate });
}

export function useUpdatePerson() {
  const invalidate = useInvalidateAll();
  return useMutation({
    mutationFn: ({ id, body }: { id: number; body: PersonChange }) => apiFetch<Person>(`/api/users/${id}`, { method: 'PATCH', json: body }),
    onSuccess: invalidate,
  });
}

export function useCreateToken() {
  const invalidate = useInvalidateAll();
  return useMutation({
    mutationFn: (body: { email: string; label: string }) => apiFetch<NewToken>('/api/tokens', { method: 'POST', json: body }),
    onSuccess: invalidate,
  });
}

export function useRevokeToken() {
  const invalidate = useInvalidateAll();
  return useMutation({ mutationFn: (id: number) => apiFetch<void>(`/api/tokens/${id}`, { method: 'DELETE' }), onSuccess: invalidate });
}
