// Imports (CONTRACT.md "Imports"): formats, row errors, all-or-nothing, idempotent re-import, dry runs.
import { beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { call, body } from '../setup/call';
import { makeVin, personWithToken } from '../factories/fleet';
import * as importRoute from '../../src/pages/api/import/[kind]';
import * as vehiclesRoute from '../../src/pages/api/vehicles/index';
import * as defectsRoute from '../../src/pages/api/defects/index';
import { getDb } from '../../src/db/client';

let manager: string;
const post = (kind: string, csv: string | Uint8Array, query = '', contentType = 'text/csv') =>
  call(importRoute, 'POST', `/api/import/${kind}${query}`, { token: manager, params: { kind }, body: csv as BodyInit, headers: { 'content-type': contentType } });
const count = (table: string) => getDb().get<{ n: number }>(sql.raw(`select count(*) as n from ${table}`)).n;

const DEPOTS =
  'code,name,region,coastal,rain_days_per_year,mean_rh_pct,wash_bay,inspection_slots_per_day,timezone\n' +
  'HRB,Harbour Row,Coast,yes,210,87,yes,3,Europe/London\n' +
  'UPL,Upland Yard,Hills,no,150,80,no,1,Europe/London\n';

beforeAll(async () => {
  manager = (await personWithToken('manager')).token;
});

describe('depots and modules', () => {
  it('imports, then re-imports the same file as unchanged', async () => {
    const first = await body(await post('depots', DEPOTS));
    expect(first).toMatchObject({ inserted: 2, updated: 0, unchanged: 0, errors: [] });
    const again = await body(await post('depots', DEPOTS));
    expect(again).toMatchObject({ inserted: 0, updated: 0, unchanged: 2, errors: [] });
  });
  it('reads semicolons, a BOM, CRLF, any column order, odd header case and spaces, quoted fields', async () => {
    const csv =
      '\uFEFF Function ;CODE; name ;Supplier;extra\r\n' +
      'window_lifter;WLR-9;"Lifter; gen ""9""";"Quay\r\nComponents";ignored\r\n' +
      'mirror;MRR-9;Mirror motor;;\r\n\r\n\r\n';
    const r = await body(await post('modules', csv));
    expect(r).toMatchObject({ inserted: 2, errors: [] });
    const row = getDb().get<{ name: string; supplier: string | null }>(sql`select name, supplier from modules where code = 'WLR-9'`);
    expect(row).toEqual({ name: 'Lifter; gen "9"', supplier: 'Quay\r\nComponents' });
    expect(getDb().get<{ s: string | null }>(sql`select supplier as s from modules where code = 'MRR-9'`).s).toBeNull();
  });
  it('updates a changed row and counts the rest as unchanged', async () => {
    const changed = DEPOTS.replace('Upland Yard,Hills,no,150', 'Upland Yard,Hills,no,155');
    expect(await body(await post('depots', changed))).toMatchObject({ inserted: 0, updated: 1, unchanged: 1 });
  });
});

describe('vehicles', () => {
  const header = 'vin,fleet_number,registration,make,model,body,build_date,in_service_date,retired_date,depot_code,parking,washes_per_month\n';
  it('refuses the whole file when one row is bad, listing each error by row and column', async () => {
    const before = count('vehicles');
    const good = makeVin(901);
    const csv =
      header +
      `${good},V1,AB12CDE,Kestrel,Porter,van,2022-03,2022-04-01,,HRB,outdoor,4\n` +
      `1M8GDM9A1KP042788,V2,,Kestrel,Porter,van,2022-03,2022-04-01,,HRB,outdoor,4\n` + // NA check digit wrong
      `${makeVin(902)},V3,,Kestrel,Porter,van,2022-13,2022-04-01,,NOPE,boat,99\n`;
    const res = await post('vehicles', csv);
    expect(res.status).toBe(422);
    const r = await body(res);
    expect(r.error.code).toBe('INVALID_INPUT');
    const cols = r.errors.map((e: { row: number; column: string }) => `${e.row}:${e.column}`);
    expect(cols).toEqual(expect.arrayContaining(['2:vin', '3:build_date', '3:parking', '3:washes_per_month']));
    expect(r.errors.every((e: { row: number }) => e.row !== 1)).toBe(true);
    expect(count('vehicles')).toBe(before);
  });
  it('names an unknown depot code', async () => {
    const res = await post('vehicles', header + `${makeVin(903)},V4,,,,,2022-03,2022-04-01,,NOPE,indoor,1\n`);
    expect(res.status).toBe(422);
    expect((await body(res)).errors).toEqual([{ row: 1, column: 'depot_code', message: expect.stringMatching(/NOPE/) }]);
  });
  it('warns, not errors, on a non-North-American check-digit mismatch', async () => {
    const vin = makeVin(904);
    const wrong = vin.slice(0, 8) + (vin[8] === '5' ? '6' : '5') + vin.slice(9);
    const res = await post('vehicles', header + `${wrong},V5,,,,,2022-03,2022-04-01,,HRB,indoor,1\n`);
    expect(res.status).toBe(200);
    const r = await body(res);
    expect(r.inserted).toBe(1);
    expect(r.warnings[0]).toMatchObject({ row: 1, column: 'vin' });
  });
  it('a dry run reports the counts and writes nothing', async () => {
    const before = count('vehicles');
    const csv = header + `${makeVin(905)},V6,,,,,2022-05-15,2022-06-01,,UPL,mixed,2\n`;
    const dry = await body(await post('vehicles', csv, '?dryRun=1'));
    expect(dry).toMatchObject({ inserted: 1, dryRun: true, errors: [] });
    expect(count('vehicles')).toBe(before);
    const real = await body(await post('vehicles', csv));
    expect(real.inserted).toBe(1);
    expect(count('vehicles')).toBe(before + 1);
    expect((await body(await post('vehicles', csv))).unchanged).toBe(1);
  });
  it('accepts multipart uploads in the field "file"', async () => {
    const form = new FormData();
    form.set('file', new Blob([header + `${makeVin(906)},V7,,,,,2022-05,2022-06-01,,UPL,mixed,2\n`], { type: 'text/csv' }), 'v.csv');
    const res = await call(importRoute, 'POST', '/api/import/vehicles', { token: manager, params: { kind: 'vehicles' }, body: form });
    expect(res.status).toBe(200);
    expect((await body(res)).inserted).toBe(1);
  });
  it('refuses an in-service date before the build month', async () => {
    const res = await post('vehicles', header + `${makeVin(907)},V8,,,,,2022-05,2022-04-30,,UPL,mixed,2\n`);
    expect(res.status).toBe(422);
    expect((await body(res)).errors[0].column).toBe('in_service_date');
  });
});

describe('defects', () => {
  const vin = makeVin(950);
  beforeAll(async () => {
    await post('modules', 'code,name,function\nDCM-1,Door control module,door_control\n');
    await post('vehicles', `vin,build_date,in_service_date,depot_code,parking,washes_per_month\n${vin},2022-01,2022-02-01,HRB,outdoor,6\n`);
  });
  const header = 'ref,vin,reported_at,position,module_code,symptom,dtcs,moisture,root_cause,action,odometer_km,closed_at\n';
  it('imports defects by ref and by natural key, idempotently', async () => {
    const csv =
      header +
      `R-1,${vin},2024-01-10,FL,DCM-1,resets,B1A21-29 U0100,corrosion,water_ingress,replaced module,40100,2024-01-12\n` +
      `,${vin},2024-03-01T08:30,FR,DCM-1,no lock,,none,,,41000,\n`;
    expect(await body(await post('defects', csv))).toMatchObject({ inserted: 2, errors: [] });
    expect(await body(await post('defects', csv))).toMatchObject({ inserted: 0, updated: 0, unchanged: 2 });
    const list = await body(await call(defectsRoute, 'GET', `/api/defects?vin=${vin}&sort=reportedAt`, { token: manager }));
    expect(list.items.map((d: { position: string; status: string; dtcs: string[] }) => [d.position, d.status, d.dtcs])).toEqual([
      ['FL', 'closed', ['B1A21-29', 'U0100']],
      ['FR', 'reported', []],
    ]);
  });
  it('lists bad codes, unknown vehicles and modules, and writes nothing', async () => {
    const before = count('defects');
    const csv =
      header +
      `R-2,${vin},2024-02-10,FL,DCM-1,x,B12G4,,,,,\n` +
      `R-3,${makeVin(951)},2024-02-10,FL,DCM-1,x,,,,,,\n` +
      `R-4,${vin},2024-02-10,XX,NOPE,x,,wet,,,,2024-01-01\n`;
    const res = await post('defects', csv);
    expect(res.status).toBe(422);
    const errs = (await body(res)).errors.map((e: { row: number; column: string }) => `${e.row}:${e.column}`);
    expect(errs).toEqual(expect.arrayContaining(['1:dtcs', '2:vin', '3:position', '3:moisture']));
    expect(count('defects')).toBe(before);
  });
  it('reports every problem of a row in one pass: field problems, unknown VIN and unknown module together', async () => {
    const before = count('defects');
    const unknownVin = makeVin(952);
    const csv =
      header +
      `QA-IMP-001,${vin},2024-02-10,FL,DCM-1,ok,,,,,,\n` +
      '\n' + // a blank line in the sheet
      `QA-IMP-002,${unknownVin},2024-02-31,XX,WLR-7,x,B12G4,wet,,,-5,\n` +
      `QA-IMP-003,${vin},2024-02-12,FR,DCM-1,ok,,,,,,\n`;
    const res = await post('defects', csv);
    expect(res.status).toBe(422);
    const r = await body(res);
    const row2 = r.errors.filter((e: { row: number }) => e.row === 2).map((e: { column: string }) => e.column);
    // The field problems and both unknown references of row 2, in one answer.
    expect(row2).toEqual(expect.arrayContaining(['reported_at', 'position', 'dtcs', 'moisture', 'odometer_km', 'vin', 'module_code']));
    expect(r.errors.find((e: { column: string }) => e.column === 'vin').message).toContain(unknownVin);
    expect(r.errors.find((e: { column: string }) => e.column === 'module_code').message).toContain('WLR-7');
    expect(r.errors.every((e: { row: number }) => e.row === 2)).toBe(true);
    // Data row 2 is spreadsheet line 4 (header on line 1, QA-IMP-001 on line 2, a blank line 3), named by its ref.
    expect(r.issueRows).toEqual([{ row: 2, line: 4, record: 'ref QA-IMP-002' }]);
    expect(r.error.message).toContain('row 2 (spreadsheet line 4)');
    expect(count('defects')).toBe(before);
  });
  it('reports an unknown depot together with the field problems of a vehicle row', async () => {
    const res = await post('vehicles', 'vin,build_date,in_service_date,depot_code,parking,washes_per_month\n' + `${makeVin(953)},2022-13,2022-04-01,NOPE,boat,1\n`);
    expect(res.status).toBe(422);
    const r = await body(res);
    expect(r.errors.map((e: { column: string }) => e.column).sort()).toEqual(['build_date', 'depot_code', 'parking']);
    expect(r.issueRows).toEqual([{ row: 1, line: 2, record: `VIN ${makeVin(953)}` }]);
  });
  it('marks a repeat repair within 90 days of an earlier closed one on the same door', async () => {
    const csv = header + `R-5,${vin},2024-03-20,FL,DCM-1,resets again,,traces,,,,\n`;
    expect((await body(await post('defects', csv))).inserted).toBe(1);
    const r = await body(await call(defectsRoute, 'GET', '/api/defects?ref=R-5', { token: manager }));
    expect(r.items[0]).toMatchObject({ repeat: true, repeatOfRef: 'R-1' });
  });
});

describe('file problems', () => {
  it('an empty file, a header-only file, a missing column, binary content', async () => {
    const empty = await post('depots', '');
    expect(empty.status).toBe(422);
    expect(await body(await post('depots', 'code,name,coastal,rain_days_per_year,mean_rh_pct,wash_bay\n'))).toMatchObject({ inserted: 0, errors: [] });
    const missing = await post('depots', 'code,name\nX,Y\n');
    expect(missing.status).toBe(422);
    expect((await body(missing)).errors.map((e: { column: string }) => e.column)).toEqual(['coastal', 'rain_days_per_year', 'mean_rh_pct', 'wash_bay']);
    const bin = await post('depots', new Uint8Array([0x4d, 0x5a, 0x00, 0x01, 0x02]));
    expect(bin.status).toBe(422);
  });
  it('an unknown import kind is 404 and a wrong content type 415', async () => {
    expect((await post('wheels', 'a\n1\n')).status).toBe(404);
    expect((await post('depots', '{}', '', 'application/json')).status).toBe(415);
  });
});

describe('vehicle list conventions', () => {
  it('pages, sorts and filters', async () => {
    const all = await body(await call(vehiclesRoute, 'GET', '/api/vehicles?pageSize=2&sort=-vin', { token: manager }));
    expect(all.pageSize).toBe(2);
    expect(all.items).toHaveLength(2);
    expect(all.items[0].vin > all.items[1].vin).toBe(true);
    const p2 = await body(await call(vehiclesRoute, 'GET', '/api/vehicles?pageSize=2&page=2&sort=-vin', { token: manager }));
    expect(p2.page).toBe(2);
    expect(p2.items[0].vin < all.items[1].vin).toBe(true);
    const upl = await body(await call(vehiclesRoute, 'GET', '/api/vehicles?depot=UPL', { token: manager }));
    expect(upl.items.every((v: { depotCode: string }) => v.depotCode === 'UPL')).toBe(true);
    expect(upl.total).toBeGreaterThan(0);
    const mixed = await body(await call(vehiclesRoute, 'GET', '/api/vehicles?parking=mixed', { token: manager }));
    expect(mixed.items.every((v: { parking: string }) => v.parking === 'mixed')).toBe(true);
    const q = await body(await call(vehiclesRoute, 'GET', '/api/vehicles?q=V6', { token: manager }));
    expect(q.items.map((v: { fleetNumber: string }) => v.fleetNumber)).toEqual(['V6']);
  });
});
