// Photo uploads: real JPEG and PNG images made by sharp are accepted, cleaned of metadata and served only
// inside the depot; a renamed executable, an oversized file, polyglots and an empty file are refused with a
// clear error and leave nothing behind (no row, no file).
import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import sharp from 'sharp';
import Database from 'better-sqlite3';
import { beforeAll, describe, expect, it } from 'vitest';
import { call, body } from '../setup/call';
import { addVehicle, baseFleet, personWithToken } from '../factories/fleet';
import * as defectsRoute from '../../src/pages/api/defects/index';
import * as photosRoute from '../../src/pages/api/defects/[id]/photos';
import * as photoRoute from '../../src/pages/api/photos/[id]';
import * as transitionsRoute from '../../src/pages/api/defects/[id]/transitions';
import * as defectRoute from '../../src/pages/api/defects/[id]';
import { MAX_PHOTO_BYTES } from '../../src/lib/photos/checks';

type Person = { token: string; id: number };
let tech: Person, tech2: Person, sup: Person, viewerSth: Person, techSth: Person, viewerNth: Person;
let defectId: number;
let jpeg: Buffer, png: Buffer;

const uploads = () => process.env.UPLOAD_DIR!;
function filesUnder(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { recursive: true, withFileTypes: true }).filter((e) => e.isFile()).map((e) => path.join(e.parentPath, e.name)).sort();
}
function photoRows(): number {
  const d = new Database(process.env.DATABASE_URL!, { readonly: true });
  try {
    return (d.prepare("select count(*) n from attachments where kind = 'photo'").get() as { n: number }).n;
  } finally {
    d.close();
  }
}
function form(bytes: Uint8Array, name: string, type: string, caption?: string) {
  const f = new FormData();
  f.set('file', new Blob([bytes as Uint8Array<ArrayBuffer>], { type }), name);
  if (caption !== undefined) f.set('caption', caption);
  return f;
}
const upload = (f: FormData, who: Person = tech, id = defectId) => call(photosRoute, 'POST', `/api/defects/${id}/photos`, { token: who.token, params: { id: String(id) }, body: f });
const fetchPhoto = (id: number, who: Person, size?: string) => call(photoRoute, 'GET', `/api/photos/${id}${size ? `?size=${size}` : ''}`, { token: who.token, params: { id: String(id) } });

beforeAll(async () => {
  baseFleet();
  const vin = addVehicle('NTH');
  tech = await personWithToken('technician', ['NTH']);
  tech2 = await personWithToken('technician', ['NTH']);
  sup = await personWithToken('supervisor', ['NTH']);
  viewerNth = await personWithToken('viewer', ['NTH']);
  viewerSth = await personWithToken('viewer', ['STH']);
  techSth = await personWithToken('technician', ['STH']);
  defectId = (await body(await call(defectsRoute, 'POST', '/api/defects', { token: tech.token, json: { vin, position: 'FL', moduleCode: 'WLR-2' } }))).id;
  // A tablet-camera-like JPEG: 640 × 480 pixels stored sideways (EXIF orientation 6), with camera make and a GPS tag.
  jpeg = await sharp({ create: { width: 640, height: 480, channels: 3, background: { r: 30, g: 110, b: 160 } } })
    .composite([{ input: { create: { width: 200, height: 100, channels: 3, background: { r: 220, g: 60, b: 40 } } }, left: 20, top: 30 }])
    .jpeg({ quality: 90 })
    .withMetadata({ orientation: 6 })
    .withExifMerge({ IFD0: { Make: 'TabletCam', Model: 'WS-1' }, IFD3: { GPSLatitudeRef: 'N', GPSLongitudeRef: 'W' } })
    .toBuffer();
  png = await sharp({ create: { width: 300, height: 200, channels: 4, background: { r: 10, g: 200, b: 90, alpha: 0.6 } } }).png().withExif({ IFD0: { Make: 'ScreenGrab' } }).toBuffer();
});

describe('accepted photos', () => {
  it('stores a camera JPEG upright, without any metadata, with a thumbnail, by content hash', async () => {
    const before = await sharp(jpeg).metadata();
    expect(before).toMatchObject({ width: 640, height: 480, orientation: 6 });
    expect(before.exif?.toString('latin1')).toContain('TabletCam');

    const res = await upload(form(jpeg, 'IMG_0042.jpg', 'image/jpeg', 'Corroded encoder board'));
    expect(res.status, await res.clone().text()).toBe(201);
    const p = await body(res);
    expect(p).toMatchObject({ defectId, mime: 'image/jpeg', width: 480, height: 640, caption: 'Corroded encoder board', originalName: 'IMG_0042.jpg', by: 'technician person', duplicate: false });

    const served = await fetchPhoto(p.id, tech);
    expect(served.status).toBe(200);
    expect(served.headers.get('content-type')).toBe('image/jpeg');
    expect(served.headers.get('x-content-type-options')).toBe('nosniff');
    expect(served.headers.get('content-security-policy')).toBe("default-src 'none'; sandbox");
    const bytes = Buffer.from(await served.arrayBuffer());
    const meta = await sharp(bytes).metadata();
    expect(meta).toMatchObject({ format: 'jpeg', width: 480, height: 640 });
    expect(meta.exif).toBeUndefined();
    expect(meta.orientation).toBeUndefined();
    expect(meta.xmp).toBeUndefined();
    expect(meta.icc).toBeUndefined();
    expect(bytes.includes(Buffer.from('TabletCam'))).toBe(false);

    const sha = crypto.createHash('sha256').update(bytes).digest('hex');
    const stored = filesUnder(uploads());
    expect(stored).toContain(path.join(uploads(), 'photos', sha.slice(0, 2), `${sha}.jpg`));
    expect(stored).toContain(path.join(uploads(), 'photos', sha.slice(0, 2), `${sha}.thumb.jpg`));

    const thumb = await fetchPhoto(p.id, tech, 'thumb');
    expect(thumb.status).toBe(200);
    const tm = await sharp(Buffer.from(await thumb.arrayBuffer())).metadata();
    expect(tm).toMatchObject({ format: 'jpeg', width: 270, height: 360 });
    expect(tm.exif).toBeUndefined();
  });
  it('stores a PNG as PNG, without its EXIF', async () => {
    const res = await upload(form(png, 'screen.png', 'image/png'));
    expect(res.status).toBe(201);
    const p = await body(res);
    expect(p).toMatchObject({ mime: 'image/png', width: 300, height: 200 });
    const meta = await sharp(Buffer.from(await (await fetchPhoto(p.id, viewerNth)).arrayBuffer())).metadata();
    expect(meta.format).toBe('png');
    expect(meta.exif).toBeUndefined();
  });
  it('answers the existing photo for the same image uploaded again, without a second copy', async () => {
    const rows = photoRows();
    const res = await upload(form(png, 'again.png', 'image/png'));
    expect(res.status).toBe(200);
    expect((await body(res)).duplicate).toBe(true);
    expect(photoRows()).toBe(rows);
  });
  it('lists the photos on the defect and in its record', async () => {
    const list = await body(await call(photosRoute, 'GET', '/x', { token: viewerNth.token, params: { id: String(defectId) } }));
    expect(list.items.map((p: { mime: string }) => p.mime)).toEqual(['image/jpeg', 'image/png']);
    expect(list.items[0].url).toBe(`/api/photos/${list.items[0].id}`);
    expect(list.items[0].thumbUrl).toBe(`/api/photos/${list.items[0].id}?size=thumb`);
  });
});

describe('refused uploads leave nothing behind', () => {
  const elf = () => Buffer.concat([Buffer.from([0x7f, 0x45, 0x4c, 0x46, 0x02, 0x01, 0x01, 0x00]), Buffer.alloc(120, 0x00)]);
  const pe = () => {
    const b = Buffer.alloc(256, 0);
    b.write('MZ', 0, 'latin1');
    b.writeUInt32LE(0x80, 0x3c);
    b.write('PE\0\0', 0x80, 'latin1');
    return b;
  };
  /** A minimal ZIP archive holding one stored file "a.txt" ("hi"), so that unzip tools can open the polyglot. */
  const zip = () => {
    const name = Buffer.from('a.txt');
    const data = Buffer.from('hi');
    const crc = 0x0d4a1185; // CRC-32 of "hi"
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(10, 4);
    local.writeUInt32LE(crc, 14);
    local.writeUInt32LE(2, 18);
    local.writeUInt32LE(2, 22);
    local.writeUInt16LE(name.length, 26);
    const central = Buffer.alloc(46);
    central.writeUInt32LE(0x02014b50, 0);
    central.writeUInt16LE(10, 4);
    central.writeUInt16LE(10, 6);
    central.writeUInt32LE(crc, 16);
    central.writeUInt32LE(2, 20);
    central.writeUInt32LE(2, 24);
    central.writeUInt16LE(name.length, 28);
    const end = Buffer.alloc(22);
    end.writeUInt32LE(0x06054b50, 0);
    end.writeUInt16LE(1, 8);
    end.writeUInt16LE(1, 10);
    end.writeUInt32LE(46 + name.length, 12);
    end.writeUInt32LE(30 + name.length + data.length, 16);
    return Buffer.concat([local, name, data, central, name, end]);
  };
  const gif = () => Buffer.concat([Buffer.from('GIF89a', 'latin1'), Buffer.from([1, 0, 1, 0, 0x80, 0, 0, 0, 0, 0, 255, 255, 255, 0x2c, 0, 0, 0, 0, 1, 0, 1, 0, 0, 2, 2, 0x44, 0x01, 0, 0x3b])]);

  it.each([
    ['an ELF executable named .jpg', () => elf(), 'photo.jpg', 'image/jpeg', 415, 'UNSUPPORTED_MEDIA_TYPE', /not a photo: its content is an ELF executable/],
    ['a Windows executable named .png', () => pe(), 'photo.png', 'image/png', 415, 'UNSUPPORTED_MEDIA_TYPE', /not a photo: its content is a Windows executable/],
    ['a file over the size limit', () => Buffer.concat([jpeg, Buffer.alloc(MAX_PHOTO_BYTES + 1 - jpeg.length)]), 'huge.jpg', 'image/jpeg', 413, 'PAYLOAD_TOO_LARGE', /the limit is 15 MB/],
    ['a JPEG with a ZIP archive appended', () => Buffer.concat([jpeg, zip()]), 'poly.jpg', 'image/jpeg', 422, 'INVALID_INPUT', /followed by \d+ bytes of other data/],
    ['a JPEG with an HTML page and script appended', () => Buffer.concat([jpeg, Buffer.from('<html><script>alert(document.cookie)</script></html>')]), 'poly.jpg', 'image/jpeg', 422, 'INVALID_INPUT', /followed by 52 bytes of other data/],
    ['a PNG with a ZIP archive appended', () => Buffer.concat([png, zip()]), 'poly.png', 'image/png', 422, 'INVALID_INPUT', /followed by/],
    ['a GIF with a Java archive appended (GIFAR)', () => Buffer.concat([gif(), zip()]), 'avatar.gif', 'image/gif', 415, 'UNSUPPORTED_MEDIA_TYPE', /not a photo: its content is a GIF image/],
    ['an empty file', () => Buffer.alloc(0), 'empty.jpg', 'image/jpeg', 422, 'INVALID_INPUT', /^The file is empty\.$/],
    ['a JPEG cut short', () => jpeg.subarray(0, Math.floor(jpeg.length / 2)), 'cut.jpg', 'image/jpeg', 422, 'INVALID_INPUT', /damaged or cut short/],
    ['text named .jpg', () => Buffer.from('just some notes about the door'), 'notes.jpg', 'image/jpeg', 415, 'UNSUPPORTED_MEDIA_TYPE', /not an image we recognise/],
  ])('refuses %s', async (_name, make, name, type, status, code, message) => {
    const rows = photoRows();
    const files = filesUnder(uploads());
    const res = await upload(form(make(), name, type));
    expect(res.status).toBe(status);
    const b = await body(res);
    expect(b.error.code).toBe(code);
    expect(b.error.message).toMatch(message);
    expect(b.error.issues).toEqual([{ path: 'file', message: b.error.message }]);
    expect(photoRows()).toBe(rows);
    expect(filesUnder(uploads())).toEqual(files);
  });
  it('refuses a body over the request limit before reading it all, and a form without a file', async () => {
    const big = Buffer.alloc(MAX_PHOTO_BYTES + 512 * 1024, 1);
    expect((await upload(form(big, 'big.jpg', 'image/jpeg'))).status).toBe(413);
    const f = new FormData();
    f.set('caption', 'no file');
    expect((await upload(f)).status).toBe(400);
    expect((await call(photosRoute, 'POST', '/x', { token: tech.token, params: { id: String(defectId) }, json: { file: 'x' } })).status).toBe(415);
  });
});

describe('access to photos', () => {
  it('401 without a token, 403 for viewers, 404 outside the depot, for uploads and images alike', async () => {
    const list = await body(await call(photosRoute, 'GET', '/x', { token: tech.token, params: { id: String(defectId) } }));
    const id = list.items[0].id as number;
    expect((await call(photoRoute, 'GET', `/api/photos/${id}`, { params: { id: String(id) } })).status).toBe(401);
    expect((await fetchPhoto(id, viewerSth)).status).toBe(404);
    expect((await fetchPhoto(id, techSth, 'thumb')).status).toBe(404);
    expect((await fetchPhoto(999999, tech)).status).toBe(404);
    expect((await fetchPhoto(id, tech, 'huge')).status).toBe(400);
    expect((await upload(form(png, 'x.png', 'image/png'), viewerNth)).status).toBe(403);
    expect((await upload(form(png, 'x.png', 'image/png'), techSth)).status).toBe(404);
    expect((await call(photosRoute, 'GET', '/x', { token: viewerSth.token, params: { id: String(defectId) } })).status).toBe(404);
  });
  it('removes a photo for its uploader or a supervisor, not for another technician; the files go with the last row', async () => {
    const small = await sharp({ create: { width: 40, height: 30, channels: 3, background: '#804020' } }).jpeg().toBuffer();
    const p = await body(await upload(form(small, 'mine.jpg', 'image/jpeg')));
    const other = await call(photoRoute, 'DELETE', '/x', { token: tech2.token, params: { id: String(p.id) } });
    expect(other.status).toBe(403);
    expect((await call(photoRoute, 'DELETE', '/x', { token: techSth.token, params: { id: String(p.id) } })).status).toBe(404);
    const files = filesUnder(uploads()).length;
    expect((await call(photoRoute, 'DELETE', '/x', { token: tech.token, params: { id: String(p.id) } })).status).toBe(204);
    expect(filesUnder(uploads()).length).toBe(files - 2);
    expect((await fetchPhoto(p.id, tech)).status).toBe(404);
    const q = await body(await upload(form(small, 'again.jpg', 'image/jpeg')));
    expect((await call(photoRoute, 'DELETE', '/x', { token: sup.token, params: { id: String(q.id) } })).status).toBe(204);
  });
  it('photos follow a defect moved to a vehicle of another depot', async () => {
    const manager = await personWithToken('manager');
    const vin = addVehicle('NTH');
    const d = await body(await call(defectsRoute, 'POST', '/api/defects', { token: tech.token, json: { vin, position: 'FL', moduleCode: 'LCK-1' } }));
    const small = await sharp({ create: { width: 24, height: 24, channels: 3, background: '#305070' } }).png().toBuffer();
    const p = await body(await upload(form(small, 'moved.png', 'image/png'), tech, d.id));
    const sthVin = addVehicle('STH');
    const moved = await call(defectRoute, 'PATCH', '/x', { token: manager.token, params: { id: String(d.id) }, json: { vin: sthVin } });
    expect(moved.status).toBe(200);
    expect((await fetchPhoto(p.id, techSth)).status).toBe(200);
    expect((await fetchPhoto(p.id, tech)).status).toBe(404);
  });
  it('a closed defect takes photos from supervisors only', async () => {
    const vin = addVehicle('NTH');
    const d = await body(await call(defectsRoute, 'POST', '/api/defects', { token: tech.token, json: { vin, position: 'RR', moduleCode: 'LCK-1', rootCause: 'mechanical', action: 'Replaced' } }));
    for (const to of ['diagnosing', 'repaired', 'closed']) {
      const cur = await body(await call(transitionsRoute, 'GET', '/x', { token: tech.token, params: { id: String(d.id) } }));
      const version = 1 + cur.items.length;
      expect((await call(transitionsRoute, 'POST', '/x', { token: tech.token, params: { id: String(d.id) }, json: { to, version } })).status).toBe(200);
    }
    const small = await sharp({ create: { width: 20, height: 20, channels: 3, background: '#102030' } }).png().toBuffer();
    const t = await upload(form(small, 'late.png', 'image/png'), tech, d.id);
    expect(t.status).toBe(403);
    expect((await upload(form(small, 'late.png', 'image/png'), sup, d.id)).status).toBe(201);
  });
});
