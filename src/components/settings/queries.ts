/** Settings: the current values (GET /api/settings) and the change, with an optional dry run (PATCH). */
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiFetch } from '@/lib/client/api-client';
import type { Settings, SettingsChangeResult, SettingsPatch } from '@/lib/contracts/settings';

/** One audit row about settings. */
export type SettingsChange = { at: string; action: string; field: string | null; oldValue: string | null; newValue: string | null; who: string };

export const SETTINGS_KEY = ['settings'] as const;

/** The settings in force and (for admins) their recent changes. */
export function useSettings() {
  return useQuery({
    queryKey: SETTINGS_KEY,
    queryFn: ({ signal }) => apiFetch<Settings & { changes?: SettingsChange[] }>('/api/settings', { signal }),
  });
}

/** Change the settings (`dryRun` previews without writing); a real change refreshes every cached list and figure. */
export function useChangeSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ patch, dryRun }: { patch: SettingsPatch; dryRun: boolean }) =>
      apiFetch<SettingsChangeResult>(`/api/settings${dryRun ? '?dryRun=1' : ''}`, { method: 'PATCH', json: patch }),
    onSuccess: (r) => {
      if (!r.dryRun) void qc.invalidateQueries();
    },
  });
}
