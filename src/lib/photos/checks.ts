/**
 * Checks on an uploaded photo's bytes before anything is decoded or stored (docs/decisions/009-photo-handling.md).
 * The type comes from the content (sniffed by the server with file-type), never from the name or the browser's
 * claim. A photo is accepted only when it is exactly one image: the file must end where the image's own
 * structure ends (no archive, script or other file appended — the usual polyglot trick), and carry no archive
 * signature and no HTML/script markup in its metadata. Pure: works on a Uint8Array.
 */

/** Largest photo accepted (a 12-megapixel tablet camera JPEG is 3-8 MB). */
export const MAX_PHOTO_BYTES = 15 * 1024 * 1024;
/** Largest image accepted, in pixels (guards the decoder against "decompression bombs"). */
export const MAX_PHOTO_PIXELS = 50_000_000;
/** Stored photos are scaled to fit this long edge (enough to read a connector's pins). */
export const PHOTO_MAX_EDGE_PX = 4096;
/** Thumbnails fit this long edge. */
export const THUMB_EDGE_PX = 360;

/** The image types accepted, by sniffed MIME type, with their file extension. */
export const ACCEPTED_PHOTO_TYPES = { 'image/jpeg': 'jpg', 'image/png': 'png', 'image/webp': 'webp' } as const;
/** An accepted MIME type. */
export type PhotoMime = keyof typeof ACCEPTED_PHOTO_TYPES;

/** True for an accepted MIME type. */
export function isAcceptedPhotoType(mime: string | null | undefined): mime is PhotoMime {
  return !!mime && Object.hasOwn(ACCEPTED_PHOTO_TYPES, mime);
}

/** Why a photo is refused. */
export type PhotoRefusal = {
  ok: false;
  code: 'empty' | 'too_large' | 'type' | 'truncated' | 'trailing_data' | 'embedded_content';
  message: string;
};

/** The outcome of the byte checks. */
export type PhotoCheck = { ok: true; mime: PhotoMime } | PhotoRefusal;

const u16be = (b: Uint8Array, i: number) => (b[i]! << 8) | b[i + 1]!;
const u32be = (b: Uint8Array, i: number) => ((b[i]! << 24) >>> 0) + (b[i + 1]! << 16) + (b[i + 2]! << 8) + b[i + 3]!;
const u32le = (b: Uint8Array, i: number) => b[i]! + (b[i + 1]! << 8) + (b[i + 2]! << 16) + ((b[i + 3]! << 24) >>> 0);
const fourcc = (b: Uint8Array, o: number) => String.fromCharCode(b[o]!, b[o + 1]!, b[o + 2]!, b[o + 3]!);

/** Where an image's own data ends, and the byte ranges that hold metadata (not pixels), as [start, end). */
export interface ImageLayout {
  end: number;
  metadata: Array<[number, number]>;
}

/**
 * A JPEG's layout: follows the marker segments and the entropy-coded data of every scan to the EOI marker.
 * APPn and COM segments are metadata. Null when the structure is broken or ends early.
 */
export function jpegLayout(b: Uint8Array): ImageLayout | null {
  if (b.length < 4 || b[0] !== 0xff || b[1] !== 0xd8) return null;
  const metadata: Array<[number, number]> = [];
  let i = 2;
  while (i < b.length) {
    if (b[i] !== 0xff) return null;
    while (i < b.length && b[i] === 0xff) i++; // fill bytes before a marker
    if (i >= b.length) return null;
    const m = b[i]!;
    i++;
    if (m === 0xd9) return { end: i, metadata }; // EOI
    if ((m >= 0xd0 && m <= 0xd7) || m === 0x01) continue; // RSTn, TEM: no length
    if (m === 0xd8 || m === 0x00) return null;
    if (i + 2 > b.length) return null;
    const len = u16be(b, i);
    if (len < 2 || i + len > b.length) return null;
    if ((m >= 0xe0 && m <= 0xef) || m === 0xfe) metadata.push([i + 2, i + len]);
    i += len;
    if (m === 0xda) {
      // Entropy-coded data runs to the next marker: FF followed by anything but 00 (stuffing), RSTn or FF.
      while (i < b.length) {
        if (b[i] === 0xff) {
          const n = b[i + 1];
          if (n === undefined) return null;
          if (n === 0x00 || (n >= 0xd0 && n <= 0xd7)) {
            i += 2;
            continue;
          }
          if (n !== 0xff) break;
        }
        i++;
      }
    }
  }
  return null;
}

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
const PNG_PIXEL_CHUNKS = new Set(['IHDR', 'PLTE', 'IDAT', 'IEND', 'tRNS', 'fdAT', 'acTL', 'fcTL']);

/** A PNG's layout: every chunk (length, type, data, CRC) to IEND; chunks other than image data are metadata. */
export function pngLayout(b: Uint8Array): ImageLayout | null {
  if (b.length < 8 || PNG_SIGNATURE.some((v, k) => b[k] !== v)) return null;
  const metadata: Array<[number, number]> = [];
  let i = 8;
  while (i + 12 <= b.length) {
    const len = u32be(b, i);
    if (len > 0x7fffffff) return null;
    const type = fourcc(b, i + 4);
    const next = i + 12 + len;
    if (next > b.length) return null;
    if (type === 'IEND') return { end: next, metadata };
    if (!PNG_PIXEL_CHUNKS.has(type)) metadata.push([i + 8, i + 8 + len]);
    i = next;
  }
  return null;
}

const WEBP_PIXEL_CHUNKS = new Set(['VP8 ', 'VP8L', 'VP8X', 'ALPH', 'ANIM', 'ANMF']);

/** A WebP's layout: the RIFF container (8 + its size, padded to even); chunks other than image data are metadata. */
export function webpLayout(b: Uint8Array): ImageLayout | null {
  if (b.length < 12 || fourcc(b, 0) !== 'RIFF' || fourcc(b, 8) !== 'WEBP') return null;
  const size = u32le(b, 4);
  const end = 8 + size + (size % 2);
  if (size < 4 || end > b.length) return null;
  const metadata: Array<[number, number]> = [];
  let i = 12;
  while (i + 8 <= end) {
    const len = u32le(b, i + 4);
    const next = i + 8 + len + (len % 2);
    if (next > end) return null;
    if (!WEBP_PIXEL_CHUNKS.has(fourcc(b, i))) metadata.push([i + 8, i + 8 + len]);
    i = next;
  }
  return { end, metadata };
}

/** The layout of an image of the given type, or null when its structure is broken. */
export function imageLayout(b: Uint8Array, mime: PhotoMime): ImageLayout | null {
  switch (mime) {
    case 'image/jpeg':
      return jpegLayout(b);
    case 'image/png':
      return pngLayout(b);
    case 'image/webp':
      return webpLayout(b);
  }
}

/** Signatures that make metadata readable as a ZIP/JAR archive (local header, directory entry, directory end). */
const ZIP_SIGNATURES = [
  [0x50, 0x4b, 0x03, 0x04],
  [0x50, 0x4b, 0x01, 0x02],
  [0x50, 0x4b, 0x05, 0x06],
];
/** Markup that makes bytes readable as a web page or a script (ASCII, matched case-insensitively). */
const MARKUP = ['<script', '<html', '<body', '<iframe', '<svg', '<?php', '<!doctype', 'javascript:'];

function matchesAt(b: Uint8Array, i: number, needle: readonly number[], foldCase: boolean): boolean {
  for (let k = 0; k < needle.length; k++) {
    let c = b[i + k];
    if (c === undefined) return false;
    if (foldCase && c >= 0x41 && c <= 0x5a) c += 0x20;
    if (c !== needle[k]) return false;
  }
  return true;
}

/**
 * Look for another file format hidden in the given ranges: returns what was found ("a ZIP archive" or the
 * markup, e.g. "<script") or null. Only metadata is searched, because compressed pixel data is effectively
 * random and would match short signatures by chance.
 */
export function findForeignContent(b: Uint8Array, ranges: ReadonlyArray<readonly [number, number]>): string | null {
  const markup = MARKUP.map((m) => [...m].map((c) => c.charCodeAt(0)));
  for (const [start, end] of ranges) {
    for (let i = start; i < end; i++) {
      const c = b[i];
      if (c === 0x50 && ZIP_SIGNATURES.some((z) => i + z.length <= end && matchesAt(b, i, z, false))) return 'a ZIP archive';
      if (c === 0x3c || c === 0x6a || c === 0x4a) {
        for (let k = 0; k < markup.length; k++) {
          const m = markup[k]!;
          if (i + m.length <= end && matchesAt(b, i, m, true)) return MARKUP[k]!;
        }
      }
    }
  }
  return null;
}

function formatMb(n: number): string {
  return `${(n / 1024 / 1024).toFixed(n % (1024 * 1024) === 0 ? 0 : 1)} MB`;
}

/**
 * Check an upload's bytes given the type sniffed from its content (null when nothing was recognised,
 * `detected` naming what was found, e.g. "an ELF executable"). Returns the accepted type or why not.
 */
export function checkPhotoBytes(b: Uint8Array, sniffed: string | null, detected?: string | null): PhotoCheck {
  if (b.length === 0) return { ok: false, code: 'empty', message: 'The file is empty.' };
  if (b.length > MAX_PHOTO_BYTES) {
    return { ok: false, code: 'too_large', message: `The photo is ${formatMb(b.length)}; the limit is ${formatMb(MAX_PHOTO_BYTES)}.` };
  }
  if (!isAcceptedPhotoType(sniffed)) {
    const what = detected ? `its content is ${detected}` : 'its content is not an image we recognise';
    return { ok: false, code: 'type', message: `This file is not a photo: ${what}. Upload a JPEG, PNG or WebP image.` };
  }
  const layout = imageLayout(b, sniffed);
  if (layout === null) return { ok: false, code: 'truncated', message: 'The image is damaged or cut short; it cannot be read to its end.' };
  if (layout.end < b.length) {
    return {
      ok: false,
      code: 'trailing_data',
      message: `The image is followed by ${(b.length - layout.end).toLocaleString('en-GB')} bytes of other data (for example a hidden archive, a script, or a motion-photo clip). Only plain photos are accepted; save or export it as a still image.`,
    };
  }
  const foreign = findForeignContent(b, layout.metadata);
  if (foreign) {
    return { ok: false, code: 'embedded_content', message: `The image's metadata hides ${foreign.startsWith('a ') ? foreign : `web-page or script content ("${foreign}")`}; only plain photos are accepted.` };
  }
  return { ok: true, mime: sniffed };
}
