// GET /api/defects filters (each alone, combined, bad values, depot scope) and GET /api/defects/export (the
// whole filtered view as CSV that re-imports unchanged). Expected counts come from how the fleet is built below.
import { beforeAll, describe, expect, it } from 'vitest';
import { call, body } from '../setup/call';
import { addVehicle, baseFleet, personWithToken } from '../factories/fleet';
import { addDefects, DAY_MS, utcDay } from '../factories/defects';
import * as defectsRoute from '../../src/pages/api/defects/index';
import * as exportRoute from '../../src/pages/api/defects/export';
import * as importRoute from '../../src/pages/api/import/[kind]';
import { readCsv } from '../../src/lib/imports/csv-read';
import { DEFECT_CSV_COLUMNS, DEFECT_CSV_REPORT_COLUMNS } from '../../src/lib/exports/defects-csv';
import { eq } from 'drizzle-orm';
import { getDb } from '../../src/db/client';
import { defectParts, defects, settings } from '../../src/db/schema';

let admin: string, supNth: string, viewerSth: string, techNth: string, techNthId: number, techSth: string;
const now = Date.now();
const ago = (days: number, hours = 0) => now - days * DAY_MS - hours * 3_600_000;

beforeAll(async () => {
  baseFleet();
  const a = addVehicle('NTH');
  const b = addVehicle('NTH');
  const c = addVehicle('STH');
  admin = (await personWithToken('admin')).token;
  supNth = (await personWithToken('supervisor', ['NTH'])).token;
  viewerSth = (await personWithToken('viewer', ['STH'])).token;
  const t = await personWithToken('technician', ['NTH']);
  techNth = t.token;
  techNthId = t.id;
  techSth = (await personWithToken('technician', ['STH'])).token;
  // Vehicle A, front left window lifter: closed, then again 40 days after that repair (a repeat), then again
  // 130 days after the second repair (outside the 90-day window: not a repeat). Plus an open lock fault.
  addDefects([
    { ref: 'T-001', vin: a, reportedAt: ago(200, 3), closedAt: ago(190), position: 'FL', module: 'WLR-2', moisture: 'corrosion', symptom: 'window stops half way' },
    { ref: 'T-002', vin: a, reportedAt: ago(150, 3), closedAt: ago(140), position: 'FL', module: 'WLR-2', moisture: 'traces', symptom: 'window reverses, comma, "quoted"' },
    { ref: 'T-003', vin: a, reportedAt: ago(40, 3), position: 'FR', module: 'LCK-1', status: 'diagnosing', assignedToId: techNthId, symptom: 'lock will not lock' },
    { ref: 'T-004', vin: a, reportedAt: ago(10, 3), position: 'FL', module: 'WLR-2', symptom: 'no auto up' },
    // Vehicle B: one open lock fault waiting for parts.
    { ref: 'T-005', vin: b, reportedAt: ago(20, 3), position: 'RL', module: 'LCK-1', status: 'awaiting_parts', moisture: 'none' },
    // Vehicle C at STH: a new window fault and an old closed tailgate lock.
    { ref: 'T-006', vin: c, reportedAt: ago(2, 3), position: 'FL', module: 'WLR-2' },
    { ref: 'T-007', vin: c, reportedAt: ago(100, 3), closedAt: ago(95), position: 'TG', module: 'LCK-1' },
  ]);
});

async function refs(query: string, token = admin): Promise<string[]> {
  const r = await call(defectsRoute, 'GET', `/api/defects${query}`, { token });
  expect(r.status, `${query}: ${r.status}`).toBe(200);
  const b = await body(r);
  expect(b.items).toHaveLength(b.total);
  return (b.items as { ref: string }[]).map((d) => d.ref).sort();
}

async function bad(query: string, path: string): Promise<void> {
  const r = await call(defectsRoute, 'GET', `/api/defects${query}`, { token: admin });
  expect(r.status, query).toBe(400);
  const e = (await body(r)).error;
  expect(e.code).toBe('INVALID_INPUT');
  expect(typeof e.message).toBe('string');
  expect(e.issues.map((i: { path?: string }) => i.path)).toContain(path);
}

describe('GET /api/defects filters', () => {
  it('lists every defect for an admin, with the repeat link to the earlier defect', async () => {
    expect(await refs('')).toEqual(['T-001', 'T-002', 'T-003', 'T-004', 'T-005', 'T-006', 'T-007']);
    const r = await body(await call(defectsRoute, 'GET', '/api/defects?ref=T-002', { token: admin }));
    expect(r.items[0]).toMatchObject({ ref: 'T-002', repeat: true, repeatOfRef: 'T-001' });
  });
  it('filters by depot (one, several, any case)', async () => {
    expect(await refs('?depot=NTH')).toEqual(['T-001', 'T-002', 'T-003', 'T-004', 'T-005']);
    expect(await refs('?depot=sth')).toEqual(['T-006', 'T-007']);
    expect(await refs('?depot=NTH,STH')).toHaveLength(7);
  });
  it('filters by one or several statuses', async () => {
    expect(await refs('?status=reported')).toEqual(['T-004', 'T-006']);
    expect(await refs('?status=reported,diagnosing')).toEqual(['T-003', 'T-004', 'T-006']);
    expect(await refs('?status=closed')).toEqual(['T-001', 'T-002', 'T-007']);
  });
  it('filters by module type and door position', async () => {
    expect(await refs('?module=LCK-1')).toEqual(['T-003', 'T-005', 'T-007']);
    expect(await refs('?module=wlr-2')).toEqual(['T-001', 'T-002', 'T-004', 'T-006']);
    expect(await refs('?position=fl')).toEqual(['T-001', 'T-002', 'T-004', 'T-006']);
    expect(await refs('?position=RL,TG')).toEqual(['T-005', 'T-007']);
  });
  it('filters by moisture found', async () => {
    expect(await refs('?moisture=corrosion')).toEqual(['T-001']);
    expect(await refs('?moisture=corrosion,traces')).toEqual(['T-001', 'T-002']);
    expect(await refs('?moisture=none')).toEqual(['T-005']);
  });
  it('filters repeats and first-time defects', async () => {
    expect(await refs('?repeat=1')).toEqual(['T-002']);
    expect(await refs('?repeat=0')).toHaveLength(6);
  });
  it('filters open and closed', async () => {
    expect(await refs('?open=1')).toEqual(['T-003', 'T-004', 'T-005', 'T-006']);
    expect(await refs('?open=false')).toEqual(['T-001', 'T-002', 'T-007']);
  });
  it('filters by age: reported more than N days ago, and open for longer than N days', async () => {
    expect(await refs('?olderThanDays=30')).toEqual(['T-001', 'T-002', 'T-003', 'T-007']);
    expect(await refs('?olderThanDays=30&open=1')).toEqual(['T-003']);
    expect(await refs('?olderThanDays=7&open=1')).toEqual(['T-003', 'T-004', 'T-005']);
    expect(await refs('?olderThanDays=3650')).toEqual([]);
  });
  it('filters by reported date range, each bound an inclusive UTC day', async () => {
    const cut = utcDay(ago(45));
    expect(await refs(`?reportedFrom=${cut}`)).toEqual(['T-003', 'T-004', 'T-005', 'T-006']);
    expect(await refs(`?reportedTo=${cut}`)).toEqual(['T-001', 'T-002', 'T-007']);
    const day = utcDay(ago(20, 3));
    expect(await refs(`?reportedFrom=${day}&reportedTo=${day}`)).toEqual(['T-005']);
  });
  it('combines filters (AND across filters, OR within one)', async () => {
    expect(await refs('?depot=NTH&module=WLR-2&open=1')).toEqual(['T-004']);
    expect(await refs('?depot=STH&repeat=1')).toEqual([]);
    expect(await refs('?position=FL&repeat=0&open=0')).toEqual(['T-001']);
    expect(await refs(`?status=reported,awaiting_parts&depot=NTH&reportedFrom=${utcDay(ago(30))}`)).toEqual(['T-004', 'T-005']);
    expect(await refs('?q=reverses&moisture=traces')).toEqual(['T-002']);
  });
  it('"mine" is what is assigned to or reported by the caller', async () => {
    expect(await refs('?mine=1', techNth)).toEqual(['T-003']);
    expect(await refs('?mine=1&open=1', techNth)).toEqual(['T-003']);
    expect(await refs('?mine=0', techNth)).toEqual(['T-001', 'T-002', 'T-003', 'T-004', 'T-005']);
    expect(await refs('?mine=1', techSth)).toEqual([]);
  });
  it('sorts oldest first and pages', async () => {
    const r = await body(await call(defectsRoute, 'GET', '/api/defects?sort=reportedAt&pageSize=2&page=2', { token: admin }));
    expect(r.total).toBe(7);
    expect(r.items.map((d: { ref: string }) => d.ref)).toEqual(['T-007', 'T-003']);
  });
  it('answers 400 in the error shape for bad values', async () => {
    await bad('?status=broken', 'status');
    await bad('?position=XX', 'position');
    await bad('?moisture=wet', 'moisture');
    await bad('?repeat=maybe', 'repeat');
    await bad('?open=yes', 'open');
    await bad('?olderThanDays=0', 'olderThanDays');
    await bad('?olderThanDays=abc', 'olderThanDays');
    await bad('?olderThanDays=3651', 'olderThanDays');
    await bad('?reportedFrom=2026-02-30', 'reportedFrom');
    await bad('?reportedFrom=soon', 'reportedFrom');
    await bad('?reportedFrom=2026-05-02&reportedTo=2026-05-01', 'reportedFrom');
    await bad('?sort=-nonsense', 'sort');
    await bad('?pageSize=201', 'pageSize');
    await bad('?page=0', 'page');
  });
  it('answers 401 without credentials', async () => {
    const r = await call(defectsRoute, 'GET', '/api/defects?open=1');
    expect(r.status).toBe(401);
    expect((await body(r)).error.code).toBe('UNAUTHENTICATED');
  });
  it('keeps every filter inside the caller\'s depots', async () => {
    expect(await refs('', supNth)).toEqual(['T-001', 'T-002', 'T-003', 'T-004', 'T-005']);
    expect(await refs('?depot=STH', supNth)).toEqual([]);
    expect(await refs('?module=WLR-2&open=1', viewerSth)).toEqual(['T-006']);
    expect(await refs('?repeat=1', viewerSth)).toEqual([]);
  });
});

describe('GET /api/defects/export', () => {
  async function exportCsv(query: string, token = admin) {
    const r = await call(exportRoute, 'GET', `/api/defects/export${query}`, { token });
    expect(r.status, query).toBe(200);
    expect(r.headers.get('content-type')).toContain('text/csv');
    expect(r.headers.get('content-disposition')).toMatch(/^attachment; filename="seepline-defects-\d{4}-\d{2}-\d{2}\.csv"$/);
    return r.text();
  }

  it('writes every row of the view (not one page), in the list\'s sort, with the import columns then the report columns', async () => {
    const csv = await exportCsv('?depot=NTH&sort=reportedAt&page=2&pageSize=1');
    const t = readCsv(csv);
    expect(t.headers).toEqual([...DEFECT_CSV_COLUMNS, ...DEFECT_CSV_REPORT_COLUMNS]);
    expect(t.records.map((r) => r.cells.ref)).toEqual(['T-001', 'T-002', 'T-003', 'T-005', 'T-004']);
  });
  it('applies the same filters as the list', async () => {
    const t = readCsv(await exportCsv('?open=1&olderThanDays=7'));
    expect(t.records.map((r) => r.cells.ref).sort()).toEqual(['T-003', 'T-004', 'T-005']);
    expect(readCsv(await exportCsv('?repeat=1&module=LCK-1')).records).toEqual([]);
  });
  it('re-imports through the defects import with nothing changed', async () => {
    const csv = await exportCsv('?sort=ref');
    const r = await call(importRoute, 'POST', '/api/import/defects?dryRun=1', { token: admin, params: { kind: 'defects' }, body: csv, headers: { 'content-type': 'text/csv' } });
    expect(r.status).toBe(200);
    expect(await body(r)).toMatchObject({ inserted: 0, updated: 0, unchanged: 7, errors: [] });
  });
  it('writes status, depot, findings, parts, labour and cost with the currency in force', async () => {
    const db = getDb();
    const id = db.select({ id: defects.id }).from(defects).where(eq(defects.ref, 'T-005')).get()!.id;
    db.update(defects).set({ labourMinutes: 45, costMinor: 12345, sealCondition: 'perished' }).where(eq(defects.id, id)).run();
    db.insert(defectParts).values([
      { defectId: id, partNumber: 'BL-LA-2210', description: 'Lock actuator', quantity: 1, unitCostMinor: 6420 },
      { defectId: id, partNumber: 'CLIP-4', description: null, quantity: 3, unitCostMinor: 125 },
    ]).run();
    db.insert(settings).values({ key: 'currency', value: 'EUR' }).run();
    try {
      const t = readCsv(await exportCsv('?ref=T-005'));
      const c = t.records[0]!.cells;
      expect([c.ref, c.status, c.depot_code, c.seal_condition, c.labour_minutes]).toEqual(['T-005', 'awaiting_parts', 'NTH', 'perished', '45']);
      expect(c.parts).toBe('BL-LA-2210 ×1 (Lock actuator); CLIP-4 ×3');
      // 64.20 + 3 × 1.25 = 67.95
      expect([c.parts_cost, c.cost, c.currency]).toEqual(['67.95', '123.45', 'EUR']);
      const other = readCsv(await exportCsv('?ref=T-004')).records[0]!.cells;
      expect([other.status, other.parts, other.cost, other.currency]).toEqual(['reported', '', '', '']);
    } finally {
      db.delete(settings).where(eq(settings.key, 'currency')).run();
    }
  });
  it('keeps to the caller\'s depots', async () => {
    expect(readCsv(await exportCsv('', viewerSth)).records.map((r) => r.cells.ref).sort()).toEqual(['T-006', 'T-007']);
  });
  it('answers 401 without credentials and 400 for bad filters', async () => {
    expect((await call(exportRoute, 'GET', '/api/defects/export')).status).toBe(401);
    const r = await call(exportRoute, 'GET', '/api/defects/export?status=nope', { token: admin });
    expect(r.status).toBe(400);
    expect((await body(r)).error.code).toBe('INVALID_INPUT');
    expect((await call(exportRoute, 'POST', '/api/defects/export', { token: admin })).status).toBe(405);
  });
});
