import { z } from 'zod';
import { handle, idParam, methodNotAllowed, readQuery } from '@/server/http';
import { actorOf, requirePermission } from '@/server/auth';
import { deletePhoto, readPhoto } from '@/server/photos';

const PhotoQuery = z.object({ size: z.enum(['full', 'thumb'], 'size must be full or thumb').optional() });

/**
 * A stored photo or its thumbnail, for signed-in people whose depots hold the defect (else 404). The bytes
 * were re-encoded on upload; the headers still forbid sniffing and scripting as a second line of defence.
 */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  const id = idParam(ctx.params.id, 'Photo');
  const { size } = readQuery(ctx, PhotoQuery);
  const p = readPhoto(user, id, size ?? 'full');
  return new Response(new Uint8Array(p.bytes), {
    status: 200,
    headers: {
      'content-type': p.mime,
      'content-length': String(p.bytes.byteLength),
      'cache-control': 'private, max-age=86400',
      'x-content-type-options': 'nosniff',
      'content-security-policy': "default-src 'none'; sandbox",
      'content-disposition': `inline; filename="${p.fileName}"`,
    },
  });
});

/** Remove a photo (its uploader while the defect is open, or supervisors and above). */
export const DELETE = handle((ctx) => {
  const user = requirePermission(ctx, 'defect:write');
  deletePhoto(user, idParam(ctx.params.id, 'Photo'), actorOf(user));
  return new Response(null, { status: 204 });
});

export const ALL = methodNotAllowed('GET, DELETE');
