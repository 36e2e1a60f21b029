/**
 * Sends a capture to POST /api/traces with XMLHttpRequest rather than apiFetch, because only XHR reports
 * upload progress (a full-size capture is about 48 MB). Answers are read the way apiFetch reads them:
 * 201 → the stored trace, anything else → ApiError with the server's message (which names the line of a
 * file the analysis cannot use).
 */
import { ApiError, type ApiIssue } from '@/lib/client/api-client';
import type { TraceRecord } from '@/lib/contracts/traces';

/** Largest capture the server accepts (src/server/traces/store.ts MAX_TRACE_UPLOAD_BYTES). */
export const MAX_CAPTURE_UPLOAD_BYTES = 96 * 1024 * 1024;

/** Where an upload is: sending bytes (with a percentage), then waiting for the measurement. */
export type TraceUploadPhase = { phase: 'uploading'; percent: number; loaded: number; total: number } | { phase: 'measuring' };

/** Optional fields sent with the capture. */
export type TraceUploadOptions = { defectId?: number; pulsesPerRev?: number; supplyV?: number };

type ErrorBody = { error?: { code?: string; message?: string; issues?: ApiIssue[] } };

/** Upload `file`; `onPhase` hears upload progress, then "measuring" once every byte is sent. */
export function uploadTrace(
  file: File,
  options: TraceUploadOptions,
  onPhase: (p: TraceUploadPhase) => void,
): { promise: Promise<TraceRecord>; abort: () => void } {
  const xhr = new XMLHttpRequest();
  const promise = new Promise<TraceRecord>((resolve, reject) => {
    xhr.open('POST', '/api/traces');
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.withCredentials = true;
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onPhase({ phase: 'uploading', percent: Math.min(100, Math.round((e.loaded / e.total) * 100)), loaded: e.loaded, total: e.total });
    };
    xhr.upload.onload = () => onPhase({ phase: 'measuring' });
    xhr.onerror = () => reject(new ApiError(0, 'NETWORK', 'The server could not be reached; check the connection and try again.'));
    xhr.onabort = () => reject(new ApiError(0, 'ABORTED', 'Upload cancelled.'));
    xhr.onload = () => {
      let body: unknown = null;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        body = null;
      }
      if (xhr.status === 201 && body) {
        resolve(body as TraceRecord);
        return;
      }
      if (xhr.status === 401) {
        window.location.href = `/signin?next=${encodeURIComponent(window.location.pathname + window.location.search)}`;
      }
      const err = (body as ErrorBody | null)?.error;
      reject(new ApiError(xhr.status, err?.code ?? 'INTERNAL', err?.message ?? `The upload failed (${xhr.status}).`, err?.issues ?? [], body));
    };
    const form = new FormData();
    form.append('file', file, file.name);
    if (options.defectId !== undefined) form.append('defectId', String(options.defectId));
    if (options.pulsesPerRev !== undefined) form.append('pulsesPerRev', String(options.pulsesPerRev));
    if (options.supplyV !== undefined) form.append('supplyV', String(options.supplyV));
    xhr.send(form);
  });
  return { promise, abort: () => xhr.abort() };
}
