// Byte-level photo checks on literal images (2 × 2 pixels, written once by sharp 0.34 and pasted here as
// base64) and on hand-built byte sequences. Signatures: JPEG SOI FF D8 / EOI FF D9 and segment lengths
// (ITU-T T.81 Annex B), PNG signature and chunk layout (PNG spec §5), RIFF/WebP container; ZIP record
// signatures PK\3\4, PK\1\2, PK\5\6 (PKWARE APPNOTE) — common practice.
import { describe, expect, it } from 'vitest';
import { checkPhotoBytes, findForeignContent, jpegLayout, MAX_PHOTO_BYTES, pngLayout, webpLayout } from './checks';

const b64 = (s: string) => new Uint8Array(Buffer.from(s, 'base64'));
const JPEG = b64(
  '/9j/2wBDABALDA4MChAODQ4SERATGCgaGBYWGDEjJR0oOjM9PDkzODdASFxOQERXRTc4UG1RV19iZ2hnPk1xeXBkeFxlZ2P/2wBDARESEhgVGC8aGi9jQjhCY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2P/wAARCAACAAIDASIAAhEBAxEB/8QAFQABAQAAAAAAAAAAAAAAAAAAAAX/xAAUEAEAAAAAAAAAAAAAAAAAAAAA/8QAFQEBAQAAAAAAAAAAAAAAAAAABAb/xAAUEQEAAAAAAAAAAAAAAAAAAAAA/9oADAMBAAIRAxEAPwCOACqH/9k=',
);
const PNG = b64('iVBORw0KGgoAAAANSUhEUgAAAAIAAAACCAIAAAD91JpzAAAACXBIWXMAAAPoAAAD6AG1e1JrAAAAEklEQVR4nGM4ISd3Qk6OAUIBAB8mBBG4glMAAAAAAElFTkSuQmCC');
const WEBP = b64('UklGRjoAAABXRUJQVlA4IC4AAACwAQCdASoCAAIAAUAmJaACdLoABDAAAP7x3I/4DdfFtMv/vYL/3YL/3YL/WwAA');

const cat = (...parts: Array<Uint8Array | number[] | string>) =>
  new Uint8Array(parts.flatMap((p) => (typeof p === 'string' ? [...Buffer.from(p, 'latin1')] : [...p])));
/** A JPEG COM segment holding `text`. */
const com = (text: string) => {
  const body = Buffer.from(text, 'latin1');
  return [0xff, 0xfe, (body.length + 2) >> 8, (body.length + 2) & 0xff, ...body];
};
const ZIP_EMPTY = [0x50, 0x4b, 0x05, 0x06, ...new Array(18).fill(0)];

describe('layouts', () => {
  it('finds the end of each literal image at its last byte', () => {
    expect(JPEG.length).toBe(269);
    expect(jpegLayout(JPEG)?.end).toBe(269);
    expect(pngLayout(PNG)?.end).toBe(96);
    expect(webpLayout(WEBP)?.end).toBe(66);
  });
  it('lists a JPEG comment as metadata and the PNG pHYs chunk as metadata', () => {
    const withCom = cat(JPEG.slice(0, 2), com('hello'), JPEG.slice(2));
    expect(jpegLayout(withCom)).toEqual({ end: 278, metadata: [[6, 11]] });
    expect(pngLayout(PNG)?.metadata).toEqual([[41, 50]]);
  });
  it('follows stuffed FF 00 bytes and restart markers inside the scan data', () => {
    // SOI, SOS (length 8: 1 component), data with FF00 and RST0, EOI.
    const j = cat([0xff, 0xd8, 0xff, 0xda, 0x00, 0x08, 1, 1, 0, 0, 0x3f, 0], [0x12, 0xff, 0x00, 0x34, 0xff, 0xd0, 0x56], [0xff, 0xd9]);
    expect(jpegLayout(j)?.end).toBe(j.length);
  });
  it('gives null for cut-short or malformed images', () => {
    expect(jpegLayout(JPEG.slice(0, 200))).toBeNull();
    expect(jpegLayout(cat([0xff, 0xd8, 0x00]))).toBeNull();
    expect(jpegLayout(cat([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x01]))).toBeNull();
    expect(pngLayout(PNG.slice(0, 80))).toBeNull();
    expect(webpLayout(WEBP.slice(0, 40))).toBeNull();
    expect(jpegLayout(PNG)).toBeNull();
  });
});

describe('findForeignContent', () => {
  it('finds markup case-insensitively and ZIP records, only inside the given ranges', () => {
    const b = cat('xx<ScRiPt>yy', ZIP_EMPTY);
    expect(findForeignContent(b, [[0, 12]])).toBe('<script');
    expect(findForeignContent(b, [[12, b.length]])).toBe('a ZIP archive');
    expect(findForeignContent(b, [[3, 12]])).toBeNull();
    expect(findForeignContent(cat('see JAVASCRIPT:alert(1)'), [[0, 23]])).toBe('javascript:');
    expect(findForeignContent(cat('plain words'), [[0, 11]])).toBeNull();
  });
});

describe('checkPhotoBytes', () => {
  it('accepts plain JPEG, PNG and WebP images', () => {
    expect(checkPhotoBytes(JPEG, 'image/jpeg')).toEqual({ ok: true, mime: 'image/jpeg' });
    expect(checkPhotoBytes(PNG, 'image/png')).toEqual({ ok: true, mime: 'image/png' });
    expect(checkPhotoBytes(WEBP, 'image/webp')).toEqual({ ok: true, mime: 'image/webp' });
  });
  it('refuses an empty file and one over the limit', () => {
    expect(checkPhotoBytes(new Uint8Array(), null)).toMatchObject({ ok: false, code: 'empty', message: 'The file is empty.' });
    expect(MAX_PHOTO_BYTES).toBe(15 * 1024 * 1024);
    const big = new Uint8Array(MAX_PHOTO_BYTES + 1);
    big.set(JPEG);
    expect(checkPhotoBytes(big, 'image/jpeg')).toMatchObject({ ok: false, code: 'too_large', message: 'The photo is 15.0 MB; the limit is 15 MB.' });
  });
  it('refuses other types by content, naming what was found', () => {
    const elf = cat([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0]);
    expect(checkPhotoBytes(elf, 'application/x-elf', 'an ELF executable')).toEqual({
      ok: false,
      code: 'type',
      message: 'This file is not a photo: its content is an ELF executable. Upload a JPEG, PNG or WebP image.',
    });
    expect(checkPhotoBytes(cat('GIF89a'), 'image/gif', 'a GIF image')).toMatchObject({ ok: false, code: 'type' });
    expect(checkPhotoBytes(cat('hello'), null)).toMatchObject({ ok: false, code: 'type', message: 'This file is not a photo: its content is not an image we recognise. Upload a JPEG, PNG or WebP image.' });
  });
  it('refuses a JPEG with a ZIP or a script appended, and a PNG or WebP with data after its end', () => {
    expect(checkPhotoBytes(cat(JPEG, ZIP_EMPTY), 'image/jpeg')).toMatchObject({ ok: false, code: 'trailing_data' });
    const html = checkPhotoBytes(cat(JPEG, '<script>alert(1)</script>'), 'image/jpeg');
    expect(html).toMatchObject({ ok: false, code: 'trailing_data' });
    if (!html.ok) expect(html.message).toContain('followed by 25 bytes of other data');
    expect(checkPhotoBytes(cat(PNG, ZIP_EMPTY), 'image/png')).toMatchObject({ ok: false, code: 'trailing_data' });
    expect(checkPhotoBytes(cat(WEBP, [0, 0]), 'image/webp')).toMatchObject({ ok: false, code: 'trailing_data' });
  });
  it('refuses a JPEG that hides a page or an archive in a comment segment', () => {
    const hidden = cat(JPEG.slice(0, 2), com('<html><body onload=x()>'), JPEG.slice(2));
    expect(checkPhotoBytes(hidden, 'image/jpeg')).toMatchObject({ ok: false, code: 'embedded_content' });
    const zipped = cat(JPEG.slice(0, 2), com(String.fromCharCode(...ZIP_EMPTY)), JPEG.slice(2));
    expect(checkPhotoBytes(zipped, 'image/jpeg')).toEqual({
      ok: false,
      code: 'embedded_content',
      message: "The image's metadata hides a ZIP archive; only plain photos are accepted.",
    });
  });
  it('refuses a cut-short image', () => {
    expect(checkPhotoBytes(JPEG.slice(0, 150), 'image/jpeg')).toMatchObject({ ok: false, code: 'truncated' });
  });
});
