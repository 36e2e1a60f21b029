/**
 * Defect photos (docs/decisions/009-photo-handling.md): the type is sniffed from the content (file-type), the
 * bytes checked (src/lib/photos/checks.ts: size, one image and nothing else), then decoded and re-encoded by
 * sharp after applying the EXIF orientation, which drops every piece of metadata (camera, GPS position, time,
 * embedded thumbnails). The clean image and a thumbnail are stored under UPLOAD_DIR/photos by the SHA-256 of
 * the stored bytes, with a row in `attachments` (kind `photo`). A refused upload writes nothing. Images are
 * served only through the authenticated route /api/photos/{id}, inside the caller's depots.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';
import { fileTypeFromBuffer } from 'file-type';
import { and, asc, eq, sql } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { attachments, defects, users } from '@/db/schema';
import { uploadDir } from '@/env';
import type { DefectPhoto } from '@/lib/contracts/defects';
import { canEditRecord, SUPERVISOR_ROLES } from '@/lib/defects/transitions';
import { ACCEPTED_PHOTO_TYPES, checkPhotoBytes, MAX_PHOTO_BYTES, MAX_PHOTO_PIXELS, PHOTO_MAX_EDGE_PX, THUMB_EDGE_PX, type PhotoMime } from '@/lib/photos/checks';
import { requireDepotScope, type SessionUser } from './auth';
import { forbidden, HttpError, notFound } from './http';
import { writeAudit, type Actor } from './audit';
import { iso } from './list-helpers';

/** JPEG/WebP quality of the stored photo (visually lossless for evidence) and of thumbnails. */
const QUALITY = { photo: 88, thumb: 76 } as const;

/** Words for what file-type found, for the refusal message. */
function describeDetected(t: { ext: string; mime: string } | undefined): string | null {
  if (!t) return null;
  const known: Record<string, string> = {
    elf: 'an ELF executable',
    exe: 'a Windows executable',
    zip: 'a ZIP archive',
    jar: 'a Java archive',
    pdf: 'a PDF document',
    gif: 'a GIF image',
    heic: 'a HEIC image (set the camera to JPEG, or export the photo as JPEG)',
    avif: 'an AVIF image',
    tif: 'a TIFF image',
    bmp: 'a BMP image',
    mp4: 'a video',
    mov: 'a video',
  };
  return known[t.ext] ?? `a ${t.ext.toUpperCase()} file (${t.mime})`;
}

/** The HTTP error for a refused upload. */
function refuse(code: string, message: string): HttpError {
  if (code === 'too_large') return new HttpError(413, 'PAYLOAD_TOO_LARGE', message, [{ path: 'file', message }]);
  if (code === 'type') return new HttpError(415, 'UNSUPPORTED_MEDIA_TYPE', message, [{ path: 'file', message }]);
  return new HttpError(422, 'INVALID_INPUT', message, [{ path: 'file', message }]);
}

type Encoded = { photo: Buffer; thumb: Buffer; width: number; height: number; mime: PhotoMime };

/** Decode, orient, re-encode without metadata, and make the thumbnail; undecodable input is a 422. */
async function reencode(bytes: Uint8Array, mime: PhotoMime): Promise<Encoded> {
  const opts = { limitInputPixels: MAX_PHOTO_PIXELS, failOn: 'error' as const };
  try {
    const meta = await sharp(bytes, opts).metadata();
    if (!meta.width || !meta.height) throw refuse('truncated', 'The image has no size; it cannot be read.');
    if ((meta.pages ?? 1) > 1) throw refuse('type', 'Animated or multi-page images are not accepted; upload a still photo.');
    // .rotate() with no angle applies the EXIF orientation; sharp writes no metadata unless asked to.
    let pipeline = sharp(bytes, opts).rotate().resize({ width: PHOTO_MAX_EDGE_PX, height: PHOTO_MAX_EDGE_PX, fit: 'inside', withoutEnlargement: true });
    if (mime === 'image/jpeg') pipeline = pipeline.jpeg({ quality: QUALITY.photo, mozjpeg: true });
    else if (mime === 'image/png') pipeline = pipeline.png({ compressionLevel: 9 });
    else pipeline = pipeline.webp({ quality: QUALITY.photo });
    const { data: photo, info } = await pipeline.toBuffer({ resolveWithObject: true });
    const thumb = await sharp(photo)
      .resize({ width: THUMB_EDGE_PX, height: THUMB_EDGE_PX, fit: 'inside', withoutEnlargement: true })
      .flatten({ background: '#ffffff' })
      .jpeg({ quality: QUALITY.thumb, mozjpeg: true })
      .toBuffer();
    return { photo, thumb, width: info.width, height: info.height, mime };
  } catch (e) {
    if (e instanceof HttpError) throw e;
    const why = (e instanceof Error ? e.message.split('\n')[0] : undefined) ?? 'unknown error';
    if (/pixel limit/i.test(why)) throw refuse('too_large', `The image is larger than ${MAX_PHOTO_PIXELS / 1_000_000} megapixels.`);
    throw refuse('truncated', `The image could not be read (${why}).`);
  }
}

/** Write bytes to a file by way of a temporary name, unless it exists; true when this call created it. */
function writeOnce(file: string, bytes: Uint8Array): boolean {
  if (fs.existsSync(file)) return false;
  fs.mkdirSync(path.dirname(file), { recursive: true });
  const tmp = `${file}.${process.pid}.${crypto.randomBytes(4).toString('hex')}.tmp`;
  fs.writeFileSync(tmp, bytes);
  fs.renameSync(tmp, file);
  return true;
}

type PhotoDb = typeof attachments.$inferSelect;

function photoJson(r: PhotoDb, by: string | null): DefectPhoto {
  return {
    id: r.id,
    defectId: r.defectId!,
    url: `/api/photos/${r.id}`,
    thumbUrl: `/api/photos/${r.id}?size=thumb`,
    mime: r.mime,
    bytes: r.bytes,
    width: r.width,
    height: r.height,
    caption: r.caption,
    originalName: r.originalName,
    by,
    byId: r.createdById,
    createdAt: iso(r.createdAt)!,
  };
}

/** The photos of a defect, oldest first (the caller has checked the defect's scope). */
export function listPhotos(defectId: number): DefectPhoto[] {
  return getDb()
    .select({ a: attachments, by: users.name })
    .from(attachments)
    .leftJoin(users, eq(users.id, attachments.createdById))
    .where(and(eq(attachments.defectId, defectId), eq(attachments.kind, 'photo')))
    .orderBy(asc(attachments.createdAt), asc(attachments.id))
    .all()
    .map((r) => photoJson(r.a, r.by));
}

function defectForPhotos(user: SessionUser, defectId: number) {
  const d = getDb().select({ id: defects.id, depotId: defects.depotId, status: defects.status, ref: defects.ref }).from(defects).where(eq(defects.id, defectId)).get();
  if (!d) throw notFound('Defect');
  requireDepotScope(user, d.depotId, 'Defect');
  return d;
}

/** The photos of a defect in the caller's depots (else 404). */
export function listDefectPhotos(user: SessionUser, defectId: number): DefectPhoto[] {
  defectForPhotos(user, defectId);
  return listPhotos(defectId);
}

/**
 * Check, clean and store a photo on a defect. Answers the stored photo; the same image uploaded to the same
 * defect again answers the existing photo with `duplicate: true` instead of a second copy.
 */
export async function storePhoto(
  user: SessionUser,
  defectId: number,
  upload: { bytes: Uint8Array; name: string | null; caption: string | null },
  actor: Actor,
): Promise<DefectPhoto & { duplicate: boolean }> {
  const d = defectForPhotos(user, defectId);
  if (!canEditRecord(d.status, user.role)) throw forbidden(`${d.ref} is ${d.status}; photos are added to it by supervisors, fleet managers and admins.`);
  const sniffed = upload.bytes.length ? await fileTypeFromBuffer(upload.bytes) : undefined;
  const check = checkPhotoBytes(upload.bytes, sniffed?.mime ?? null, describeDetected(sniffed));
  if (!check.ok) throw refuse(check.code, check.message);
  const enc = await reencode(upload.bytes, check.mime);
  const sha256 = crypto.createHash('sha256').update(enc.photo).digest('hex');
  const db = getDb();
  const existing = db
    .select({ a: attachments, by: users.name })
    .from(attachments)
    .leftJoin(users, eq(users.id, attachments.createdById))
    .where(and(eq(attachments.defectId, defectId), eq(attachments.kind, 'photo'), eq(attachments.sha256, sha256)))
    .get();
  if (existing) return { ...photoJson(existing.a, existing.by), duplicate: true };

  const root = uploadDir();
  const ext = ACCEPTED_PHOTO_TYPES[enc.mime];
  const rel = path.join('photos', sha256.slice(0, 2), `${sha256}.${ext}`);
  const relThumb = path.join('photos', sha256.slice(0, 2), `${sha256}.thumb.jpg`);
  const created = [writeOnce(path.join(root, rel), enc.photo) && rel, writeOnce(path.join(root, relThumb), enc.thumb) && relThumb].filter((x): x is string => !!x);
  try {
    const id = db.transaction((tx) => {
      const row = tx
        .insert(attachments)
        .values({
          defectId,
          depotId: d.depotId,
          kind: 'photo',
          sha256,
          mime: enc.mime,
          bytes: enc.photo.byteLength,
          originalName: upload.name ? upload.name.slice(0, 200) : null,
          storedPath: rel,
          thumbPath: relThumb,
          width: enc.width,
          height: enc.height,
          caption: upload.caption,
          createdById: user.id,
        })
        .returning({ id: attachments.id })
        .get();
      writeAudit(tx, actor, { entity: 'defect', entityId: String(defectId), action: 'photo:add', newValue: upload.caption ?? upload.name ?? `photo ${row.id}` });
      return row.id;
    });
    const r = db.select({ a: attachments, by: users.name }).from(attachments).leftJoin(users, eq(users.id, attachments.createdById)).where(eq(attachments.id, id)).get()!;
    return { ...photoJson(r.a, r.by), duplicate: false };
  } catch (e) {
    for (const f of created) fs.rmSync(path.join(root, f), { force: true });
    throw e;
  }
}

/** The bytes of a stored photo or its thumbnail, inside the caller's depots (else 404). */
export function readPhoto(user: SessionUser, id: number, size: 'full' | 'thumb'): { bytes: Buffer; mime: string; fileName: string } {
  const r = getDb()
    .select({ a: attachments, ref: defects.ref })
    .from(attachments)
    .leftJoin(defects, eq(defects.id, attachments.defectId))
    .where(and(eq(attachments.id, id), eq(attachments.kind, 'photo')))
    .get();
  if (!r || r.a.depotId === null) throw notFound('Photo');
  requireDepotScope(user, r.a.depotId, 'Photo');
  const rel = size === 'thumb' ? r.a.thumbPath : r.a.storedPath;
  if (!rel) throw notFound('Photo');
  const file = path.resolve(uploadDir(), rel);
  if (!file.startsWith(path.resolve(uploadDir()) + path.sep)) throw notFound('Photo');
  let bytes: Buffer;
  try {
    bytes = fs.readFileSync(file);
  } catch {
    throw notFound('Photo file');
  }
  const mime = size === 'thumb' ? 'image/jpeg' : r.a.mime;
  const ext = size === 'thumb' ? 'jpg' : (ACCEPTED_PHOTO_TYPES[r.a.mime as PhotoMime] ?? 'bin');
  return { bytes, mime, fileName: `${r.ref ?? 'defect'}-photo-${id}${size === 'thumb' ? '-thumb' : ''}.${ext}` };
}

/** Remove a photo: its uploader while the defect may be edited, or supervisors and above. Files go when no row uses them. */
export function deletePhoto(user: SessionUser, id: number, actor: Actor): void {
  const db = getDb();
  const r = db.select().from(attachments).where(and(eq(attachments.id, id), eq(attachments.kind, 'photo'))).get();
  if (!r || r.depotId === null || r.defectId === null) throw notFound('Photo');
  requireDepotScope(user, r.depotId, 'Photo');
  const d = defectForPhotos(user, r.defectId);
  const own = r.createdById === user.id && canEditRecord(d.status, user.role);
  if (!own && !SUPERVISOR_ROLES.includes(user.role)) throw forbidden('Photos are removed by the person who added them, or by supervisors, fleet managers and admins.');
  const orphaned = db.transaction((tx) => {
    tx.delete(attachments).where(eq(attachments.id, id)).run();
    writeAudit(tx, actor, { entity: 'defect', entityId: String(r.defectId), action: 'photo:remove', oldValue: r.caption ?? r.originalName ?? `photo ${id}` });
    const left = tx.select({ n: sql<number>`count(*)` }).from(attachments).where(eq(attachments.sha256, r.sha256)).get()?.n ?? 0;
    return left === 0;
  });
  if (orphaned) {
    for (const rel of [r.storedPath, r.thumbPath]) if (rel) fs.rmSync(path.resolve(uploadDir(), rel), { force: true });
  }
}

/** Upload size limit of the photo route (the multipart envelope may add a little). */
export const MAX_PHOTO_REQUEST_BYTES = MAX_PHOTO_BYTES + 256 * 1024;
