import fs from 'node:fs';
import { Readable } from 'node:stream';
import { handle, idParam, methodNotAllowed } from '@/server/http';
import { requirePermission } from '@/server/auth';
import { getTraceFile } from '@/server/traces/store';

/** The original capture file as it was uploaded (a download). */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  const file = getTraceFile(user, idParam(ctx.params.id, 'Trace'));
  const ascii = file.fileName.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  const stream = Readable.toWeb(fs.createReadStream(file.path)) as ReadableStream<Uint8Array>;
  return new Response(stream, {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-length': String(file.bytes),
      'content-disposition': `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(file.fileName)}`,
      'cache-control': 'private, max-age=3600',
      'x-content-type-options': 'nosniff',
    },
  });
});

export const ALL = methodNotAllowed('GET');
