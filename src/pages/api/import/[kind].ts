import { handle, HttpError, json, notFound, readBytesLimited, methodNotAllowed, tooLarge } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { IMPORT_KINDS, type ImportKind } from '@/lib/imports/rows';
import { MAX_IMPORT_BYTES, runImport } from '@/server/imports';

/** Read the CSV from a text/csv body or the `file` field of a multipart form. */
async function readCsvBody(request: Request): Promise<string> {
  const type = (request.headers.get('content-type') ?? '').toLowerCase();
  if (type.startsWith('multipart/form-data')) {
    const declared = Number(request.headers.get('content-length') ?? '0');
    if (declared > MAX_IMPORT_BYTES + 64 * 1024) throw tooLarge(MAX_IMPORT_BYTES);
    let form: FormData;
    try {
      form = await request.formData();
    } catch {
      throw new HttpError(400, 'INVALID_INPUT', 'The multipart form could not be read.');
    }
    const file = form.get('file');
    if (!file || typeof file === 'string') {
      if (typeof file === 'string' && file.length) return file;
      throw new HttpError(400, 'INVALID_INPUT', 'Send the CSV in the form field "file".', [{ path: 'file', message: 'Missing file' }]);
    }
    if (file.size > MAX_IMPORT_BYTES) throw tooLarge(MAX_IMPORT_BYTES);
    return decode(new Uint8Array(await file.arrayBuffer()));
  }
  if (type && !/^(text\/(csv|plain|comma-separated-values)|application\/(csv|octet-stream|vnd\.ms-excel))/.test(type)) {
    throw new HttpError(415, 'UNSUPPORTED_MEDIA_TYPE', 'Send the file as text/csv, or as the field "file" of multipart/form-data.');
  }
  return decode(await readBytesLimited(request, MAX_IMPORT_BYTES));
}

function decode(bytes: Uint8Array): string {
  if (bytes.includes(0)) throw new HttpError(422, 'INVALID_INPUT', 'This is not a text (CSV) file.', [{ row: 0, column: '', message: 'Binary content' }]);
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new HttpError(422, 'INVALID_INPUT', 'The file is not UTF-8 text; save it from the spreadsheet as "CSV UTF-8".', [{ row: 0, column: '', message: 'Not UTF-8' }]);
  }
}

export const POST = handle(async (ctx) => {
  const user = requirePermission(ctx, 'import');
  const kind = ctx.params.kind as ImportKind;
  if (!IMPORT_KINDS.includes(kind)) throw notFound(`Import kind "${ctx.params.kind}" (use depots, modules, vehicles or defects);`);
  const dryParam = ctx.url.searchParams.get('dryRun');
  const dryRun = dryParam === '1' || dryParam === 'true';
  const text = await readCsvBody(ctx.request);
  const result = runImport(kind, text, { dryRun, actor: actorOf(user) });
  if (result.errors.length > 0) {
    const first = result.errors[0]!;
    const line = result.issueRows.find((r) => r.row === first.row)?.line;
    return json(
      {
        ...result,
        error: {
          code: 'INVALID_INPUT',
          message: `${result.errors.length} problem${result.errors.length > 1 ? 's' : ''} in the file (first: row ${first.row}${line ? ` (spreadsheet line ${line})` : ''}, ${first.column || 'file'}: ${first.message}); nothing was written.`,
          issues: result.errors,
        },
      },
      422,
    );
  }
  return json(result);
});

export const ALL = methodNotAllowed('POST');
