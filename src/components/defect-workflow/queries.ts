/**
 * The defect record shared by every island of the defect page (one query key, so a step taken in one island
 * shows at once in the others), and its writes: PATCH (version-checked edits), lifecycle steps, photo upload
 * and removal. A 409 puts the current record into the cache, so every form can rebase onto it.
 */
import { keepPreviousData, useMutation, useQuery, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { ApiError, apiFetch, toQuery } from '@/lib/client/api-client';
import type { DefectPhoto, DefectRecord, StaleWriteBody } from '@/lib/contracts/defects';
import type { ListResponse } from '@/lib/contracts/lists';
import type { DefectRow } from '@/components/defects/queries';

/** The query key of one defect. */
export const defectKey = (id: number) => ['defect', id] as const;

/** The defect record, seeded with what the page was rendered with. */
export function useDefect(initial: DefectRecord) {
  return useQuery({
    queryKey: defectKey(initial.id),
    queryFn: () => apiFetch<DefectRecord>(`/api/defects/${initial.id}`),
    initialData: initial,
    staleTime: Infinity,
  });
}

/** The current record carried by a 409, if this error is one. */
export function staleRecord(e: unknown): DefectRecord | null {
  if (e instanceof ApiError && e.status === 409) {
    const current = (e.body as StaleWriteBody | null)?.current;
    return current && typeof current === 'object' ? current : null;
  }
  return null;
}

function keepNewest(qc: QueryClient, r: DefectRecord) {
  const now = qc.getQueryData<DefectRecord>(defectKey(r.id));
  if (!now || now.version <= r.version) qc.setQueryData(defectKey(r.id), r);
}

/** Save changed fields with the version they were based on. */
export function useSaveDefect(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (patch: Record<string, unknown>) => apiFetch<DefectRecord>(`/api/defects/${id}`, { method: 'PATCH', json: patch }),
    onSuccess: (r) => keepNewest(qc, r),
  });
}

/** What a lifecycle step sends. */
export type StepInput = {
  to: string;
  version: number;
  reason?: string;
  verification?: { reinitialised: true; reversalVerified: true; at?: string; note?: string | null };
};

/** Take a lifecycle step; a 409 refreshes the record in the cache. */
export function useStep(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: StepInput) => apiFetch<DefectRecord>(`/api/defects/${id}/transitions`, { method: 'POST', json: input }),
    onSuccess: (r) => keepNewest(qc, r),
    onError: (e) => {
      const current = staleRecord(e);
      if (current) keepNewest(qc, current);
    },
  });
}

/** Upload one photo; the record is fetched again so that every island sees it. */
export function useUploadPhoto(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ file, caption }: { file: File; caption: string }) => {
      const form = new FormData();
      form.set('file', file, file.name);
      if (caption.trim()) form.set('caption', caption.trim());
      return apiFetch<DefectPhoto & { duplicate: boolean }>(`/api/defects/${id}/photos`, { method: 'POST', body: form });
    },
    onSettled: () => qc.invalidateQueries({ queryKey: defectKey(id) }),
  });
}

/** Remove a photo. */
export function useDeletePhoto(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (photoId: number) => apiFetch<void>(`/api/photos/${photoId}`, { method: 'DELETE' }),
    onSettled: () => qc.invalidateQueries({ queryKey: defectKey(id) }),
  });
}

/**
 * The defects of the defect's vehicle (door map, door history), fetched again whenever the defect's version
 * moves on (a step, an edit), so those cards never show the status of before. Seeded with the page's own list.
 */
export function useVehicleDefectRows(record: Pick<DefectRecord, 'vin' | 'version'>, initial: { version: number; items: DefectRow[] }) {
  return useQuery({
    queryKey: ['defects', 'vehicle', record.vin, 'at-version', record.version],
    queryFn: ({ signal }) => apiFetch<ListResponse<DefectRow>>(`/api/defects${toQuery({ vin: record.vin, pageSize: 200, sort: '-reportedAt' })}`, { signal }).then((r) => r.items),
    initialData: record.version === initial.version ? initial.items : undefined,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });
}
