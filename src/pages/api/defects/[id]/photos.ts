import { handle, HttpError, idParam, invalid, json, methodNotAllowed, readBytesLimited } from '@/server/http';
import { actorOf, requirePermission } from '@/server/auth';
import { PhotoFormSchema } from '@/lib/contracts/defects';
import { listDefectPhotos, MAX_PHOTO_REQUEST_BYTES, storePhoto } from '@/server/photos';

/** The defect's photos, oldest first. */
export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json({ items: listDefectPhotos(user, idParam(ctx.params.id, 'Defect')) });
});

/** Upload a photo: multipart field `file` (and optional `caption`); 201 with the stored photo, 200 for a duplicate. */
export const POST = handle(async (ctx) => {
  const user = requirePermission(ctx, 'defect:write');
  const id = idParam(ctx.params.id, 'Defect');
  const type = ctx.request.headers.get('content-type') ?? '';
  if (!type.toLowerCase().startsWith('multipart/form-data')) {
    throw new HttpError(415, 'UNSUPPORTED_MEDIA_TYPE', 'Send the photo as the field "file" of multipart/form-data.');
  }
  // Read at most the limit (413 beyond it) before parsing the form, so no upload is held in memory unbounded.
  const raw = await readBytesLimited(ctx.request, MAX_PHOTO_REQUEST_BYTES);
  let form: FormData;
  try {
    form = await new Response(raw as Uint8Array<ArrayBuffer>, { headers: { 'content-type': type } }).formData();
  } catch {
    throw invalid('The multipart form could not be read.');
  }
  const file = form.get('file');
  if (!file || typeof file === 'string') throw invalid('Send the photo in the form field "file".', [{ path: 'file', message: 'Missing file' }]);
  const caption = form.get('caption');
  const fields = PhotoFormSchema.parse({ caption: typeof caption === 'string' ? caption : undefined });
  const bytes = new Uint8Array(await file.arrayBuffer());
  const photo = await storePhoto(user, id, { bytes, name: file.name || null, caption: fields.caption ?? null }, actorOf(user));
  return json(photo, photo.duplicate ? 200 : 201);
});

export const ALL = methodNotAllowed('GET, POST');
