/**
 * Sends an import file with XMLHttpRequest rather than apiFetch, because only XHR reports upload progress.
 * Answers are read the way apiFetch reads them: 200 → result, 422 with row errors → result (nothing written),
 * anything else → ApiError.
 */
import { ApiError, type ApiIssue } from '@/lib/client/api-client';
import type { ImportKind } from './formats';

export type RowIssue = { row: number; column: string; message: string };

/** Where a row named by an issue sits in the sheet (spreadsheet line) and which record it is (code, VIN or ref). */
export type IssueRow = { row: number; line: number; record: string | null };

export type ImportResult = {
  kind?: string;
  dryRun?: boolean;
  rows: number;
  inserted: number;
  updated: number;
  unchanged: number;
  errors: RowIssue[];
  warnings: RowIssue[];
  issueRows: IssueRow[];
};

export type UploadPhase = { phase: 'uploading'; percent: number } | { phase: 'validating' };

type ErrorBody = { error?: { code?: string; message?: string; issues?: ApiIssue[] } } & Partial<ImportResult>;

/** Upload `file` to the import endpoint; `onPhase` hears upload percentages, then "validating". */
export function uploadImport(
  kind: ImportKind,
  file: File,
  dryRun: boolean,
  onPhase: (p: UploadPhase) => void,
): { promise: Promise<ImportResult>; abort: () => void } {
  const xhr = new XMLHttpRequest();
  const promise = new Promise<ImportResult>((resolve, reject) => {
    xhr.open('POST', `/api/import/${kind}${dryRun ? '?dryRun=1' : ''}`);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.withCredentials = true;
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onPhase({ phase: 'uploading', percent: Math.min(100, Math.round((e.loaded / e.total) * 100)) });
    };
    xhr.upload.onload = () => onPhase({ phase: 'validating' });
    xhr.onerror = () => reject(new ApiError(0, 'NETWORK', 'The server could not be reached; check the connection and try again.'));
    xhr.onabort = () => reject(new ApiError(0, 'ABORTED', 'Upload cancelled.'));
    xhr.onload = () => {
      let body: ErrorBody | null = null;
      try {
        body = xhr.responseText ? (JSON.parse(xhr.responseText) as ErrorBody) : null;
      } catch {
        body = null;
      }
      if (xhr.status === 200 && body) {
        resolve({ ...(body as ImportResult), errors: body.errors ?? [], warnings: body.warnings ?? [], issueRows: body.issueRows ?? [] });
        return;
      }
      if (xhr.status === 401) {
        window.location.href = `/signin?next=${encodeURIComponent(window.location.pathname + window.location.search)}`;
      }
      // A 422 lists row errors: either the import's own `errors`, or issues of a file-level problem (row 0).
      if (xhr.status === 422 && body) {
        const errors: RowIssue[] =
          body.errors ??
          (body.error?.issues ?? []).map((i) => ({ row: i.row ?? 0, column: i.column ?? i.path ?? '', message: body?.error?.message ?? i.message }));
        if (errors.length) {
          resolve({ rows: body.rows ?? 0, inserted: 0, updated: 0, unchanged: 0, errors, warnings: body.warnings ?? [], issueRows: body.issueRows ?? [] });
          return;
        }
      }
      reject(
        new ApiError(
          xhr.status,
          body?.error?.code ?? 'INTERNAL',
          body?.error?.message ?? `The upload failed (${xhr.status}).`,
          body?.error?.issues ?? [],
          body,
        ),
      );
    };
    const form = new FormData();
    form.append('file', file, file.name);
    xhr.send(form);
  });
  return { promise, abort: () => xhr.abort() };
}
