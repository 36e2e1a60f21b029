import { z } from 'zod';
import { handle, HttpError, invalid, json, methodNotAllowed, readQuery, tooLarge } from '@/server/http';
import { actorOf, requirePermission } from '@/server/auth';
import { listTraces, MAX_TRACE_UPLOAD_BYTES, storeTrace } from '@/server/traces/store';
import { TraceListQuery } from '@/lib/contracts/traces';

const positive = (name: string) =>
  z
    .string()
    .trim()
    .regex(/^\d+(\.\d+)?$/, `${name} must be a positive number`)
    .transform(Number)
    .pipe(z.number().positive(`${name} must be positive`).max(1000, `${name} is at most 1000`));

const TraceForm = z.object({
  defectId: z.string().trim().regex(/^\d+$/, 'defectId must be a defect id').transform(Number).optional(),
  pulsesPerRev: positive('pulsesPerRev').optional(),
  supplyV: positive('supplyV').optional(),
});

/** Upload a capture (multipart `file`), analyse it and store it (CONTRACT.md "Traces"). */
export const POST = handle(async (ctx) => {
  const user = requirePermission(ctx, 'trace:write');
  const type = (ctx.request.headers.get('content-type') ?? '').toLowerCase();
  if (!type.startsWith('multipart/form-data')) {
    throw new HttpError(415, 'UNSUPPORTED_MEDIA_TYPE', 'Send the capture as the field "file" of multipart/form-data.');
  }
  if (Number(ctx.request.headers.get('content-length') ?? '0') > MAX_TRACE_UPLOAD_BYTES + 64 * 1024) throw tooLarge(MAX_TRACE_UPLOAD_BYTES);
  let form: FormData;
  try {
    form = await ctx.request.formData();
  } catch {
    throw invalid('The multipart form could not be read.');
  }
  const file = form.get('file');
  if (!file || typeof file === 'string') throw invalid('Send the capture in the form field "file".', [{ path: 'file', message: 'Missing file' }]);
  if (file.size > MAX_TRACE_UPLOAD_BYTES) throw tooLarge(MAX_TRACE_UPLOAD_BYTES);
  if (file.size === 0) throw new HttpError(422, 'INVALID_INPUT', 'The capture file is empty.', [{ path: 'file', message: 'Empty file' }]);
  const fields: Record<string, string> = {};
  for (const k of ['defectId', 'pulsesPerRev', 'supplyV']) {
    const v = form.get(k);
    if (typeof v === 'string' && v.trim() !== '') fields[k] = v;
  }
  const parsed = TraceForm.safeParse(fields);
  if (!parsed.success) throw invalid(parsed.error.issues.map((i) => i.message).join('; '), parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })));
  const bytes = new Uint8Array(await file.arrayBuffer());
  return json(storeTrace(user, bytes, file.name || null, parsed.data, actorOf(user)), 201);
});

/** Stored traces in the caller's depots, newest first or by `sort` (filters: defectId, verdict, depot code). */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  const q = readQuery(ctx, TraceListQuery);
  return json(listTraces(user, { defectId: q.defectId, verdict: q.verdict, depot: q.depot, sort: q.sort, page: q.page ?? 1, pageSize: q.pageSize ?? 50 }));
});

export const ALL = methodNotAllowed('GET, POST');
