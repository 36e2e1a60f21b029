// Vehicles: the off-road switch (a reason to return, confirmation when a defect still needs the release
// verification, the history and the audit trail), the off-road list's "since" and open defects, search by
// registration however it is typed, and what keeps a depot or module type from being deleted.
import { beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { call, body } from '../setup/call';
import { addVehicle, baseFleet, importCsv, makeVin, personWithToken } from '../factories/fleet';
import { addDefects, DAY_MS } from '../factories/defects';
import { getDb } from '../../src/db/client';
import { auditLog, defects, vehicleOffRoad } from '../../src/db/schema';
import * as vehiclesRoute from '../../src/pages/api/vehicles/index';
import * as vehicleRoute from '../../src/pages/api/vehicles/[vin]';
import * as depotsRoute from '../../src/pages/api/depots/index';
import * as modulesRoute from '../../src/pages/api/modules/index';
import * as defectsRoute from '../../src/pages/api/defects/index';
import { listOffRoadHistory } from '../../src/server/fleet';
import { vehicleSearchKey } from '../../src/lib/vehicles/search-key';
import fs from 'node:fs';

let sup: string, supSth: string, viewer: string, manager: string, supId: number;
let vin: string, vinClean: string, vinPlate: string;

const patch = (token: string, v: string, json: unknown) => call(vehicleRoute, 'PATCH', `/api/vehicles/${v}`, { token, params: { vin: v }, json });
const get = async (token: string, v: string) => body(await call(vehicleRoute, 'GET', `/api/vehicles/${v}`, { token, params: { vin: v } }));

beforeAll(async () => {
  baseFleet();
  vin = addVehicle('NTH', { fleet: 'LV1159' });
  vinClean = addVehicle('NTH', { fleet: 'LV2000' });
  vinPlate = makeVin();
  importCsv(
    'vehicles',
    `vin,fleet_number,registration,build_date,in_service_date,depot_code,parking,washes_per_month\n${vinPlate},LV 1016,GHQ-4941-J,2022-11,2023-01-10,NTH,outdoor,4\n`,
  );
  const s = await personWithToken('supervisor', ['NTH']);
  sup = s.token;
  supId = s.id;
  supSth = (await personWithToken('supervisor', ['STH'])).token;
  viewer = (await personWithToken('viewer', ['NTH'])).token;
  manager = (await personWithToken('manager')).token;
  const now = Date.now();
  // An open window-lifter defect without the release verification, and an open lock-actuator defect (needs none).
  addDefects([
    { ref: 'DF-T-001', vin, reportedAt: now - 5 * DAY_MS, position: 'FR', module: 'WLR-2', status: 'awaiting_parts', symptom: 'Window stops half way' },
    { ref: 'DF-T-002', vin, reportedAt: now - 3 * DAY_MS, position: 'RL', module: 'LCK-1', status: 'diagnosing' },
    { ref: 'DF-T-003', vin: vinClean, reportedAt: now - 9 * DAY_MS, position: 'FL', module: 'WLR-2', closedAt: now - 2 * DAY_MS },
  ]);
});

describe('taking a vehicle off road and back', () => {
  it('records who, when and why when it goes off road', async () => {
    const v0 = await get(sup, vin);
    const r = await patch(sup, vin, { offRoad: true, offRoadReason: 'FR window stuck open', version: v0.version });
    expect(r.status).toBe(200);
    const v = await body(r);
    expect(v.status).toBe('off_road');
    expect(v.offRoadReason).toBe('FR window stuck open');
    const p = listOffRoadHistory(v.id);
    expect(p).toHaveLength(1);
    expect(p[0]).toMatchObject({ reason: 'FR window stuck open', to: null, startedBy: 'supervisor person' });
    expect(Date.parse(p[0]!.from)).toBe(Date.parse(v.offRoadSince));
  });

  it('lists the off-road vehicle with since, reason and the open defects keeping it off road', async () => {
    const r = await call(vehiclesRoute, 'GET', '/api/vehicles?status=off_road&sort=-offRoadSince', { token: sup });
    expect(r.status).toBe(200);
    const list = await body(r);
    const row = list.items.find((x: { vin: string }) => x.vin === vin);
    expect(row.offRoadSince).not.toBeNull();
    expect(row.offRoadReason).toBe('FR window stuck open');
    expect(row.depotTimeZone).toBe('Europe/London');
    expect(row.offRoadDefects.map((d: { ref: string; needsVerification: boolean }) => [d.ref, d.needsVerification])).toEqual([
      ['DF-T-001', true],
      ['DF-T-002', false],
    ]);
  });

  it('refuses to return it without a reason (422) and changes nothing', async () => {
    const v0 = await get(sup, vin);
    const r = await patch(sup, vin, { offRoad: false, version: v0.version });
    expect(r.status).toBe(422);
    const e = await body(r);
    expect(e.error.code).toBe('INVALID_INPUT');
    expect(e.error.issues[0].path).toBe('offRoadReason');
    expect((await get(sup, vin)).status).toBe('off_road');
  });

  it('refuses an unconfirmed return while a window-lifter defect lacks the release verification (409, listing it)', async () => {
    const v0 = await get(sup, vin);
    const r = await patch(sup, vin, { offRoad: false, offRoadReason: 'Needed for the Saturday round', version: v0.version });
    expect(r.status).toBe(409);
    const e = await body(r);
    expect(e.error.code).toBe('CONFLICT');
    expect(e.error.message).toContain('DF-T-001');
    expect(e.unverified.map((d: { ref: string }) => d.ref)).toEqual(['DF-T-001']);
    const v1 = await get(sup, vin);
    expect(v1.status).toBe('off_road');
    expect(v1.version).toBe(v0.version);
  });

  it('returns it when confirmed, closing the period and auditing who, when, why and what was unverified', async () => {
    const v0 = await get(sup, vin);
    const r = await patch(sup, vin, { offRoad: false, offRoadReason: 'Needed for the Saturday round; door taped', confirmUnverified: true, version: v0.version });
    expect(r.status).toBe(200);
    const v = await body(r);
    expect([v.status, v.offRoadSince, v.offRoadReason]).toEqual(['active', null, null]);
    const [p] = listOffRoadHistory(v.id);
    expect(p).toMatchObject({
      reason: 'FR window stuck open',
      returnReason: 'Needed for the Saturday round; door taped',
      endedBy: 'supervisor person',
      openDefectsAtReturn: ['DF-T-001', 'DF-T-002'],
      unverifiedAtReturn: ['DF-T-001'],
    });
    expect(p!.to).not.toBeNull();
    const audit = getDb().select().from(auditLog).where(eq(auditLog.entityId, vin)).all();
    const byField = Object.fromEntries(audit.filter((a) => a.field).map((a) => [a.field, a]));
    expect(byField.offRoadReturnReason).toMatchObject({ userId: supId, newValue: 'Needed for the Saturday round; door taped' });
    expect(byField.releasedWithUnverified).toMatchObject({ userId: supId, newValue: 'DF-T-001' });
    expect(audit.filter((a) => a.field === 'offRoad').map((a) => [a.oldValue, a.newValue])).toEqual([
      ['false', 'true'],
      ['true', 'false'],
    ]);
  });

  it('keeps earlier periods when it goes off road again', async () => {
    const v0 = await get(sup, vin);
    expect((await patch(sup, vin, { offRoad: true, version: v0.version })).status).toBe(200);
    const hist = listOffRoadHistory(v0.id);
    expect(hist).toHaveLength(2);
    expect(hist[0]!.to).toBeNull();
    expect(hist[1]!.returnReason).toBe('Needed for the Saturday round; door taped');
  });

  it('returns a vehicle without open defects with just a reason, and records a period begun before the history', async () => {
    // Taken off road directly in the database, as the demo seed and older versions did: no open period row.
    const v0 = await get(sup, vinClean);
    const { vehicles } = await import('../../src/db/schema');
    getDb().update(vehicles).set({ offRoadSinceAt: Date.now() - 4 * DAY_MS }).where(eq(vehicles.vin, vinClean)).run();
    const r = await patch(sup, vinClean, { offRoad: false, offRoadReason: 'Repaired and checked', version: v0.version });
    expect(r.status).toBe(200);
    const [p] = listOffRoadHistory(v0.id);
    expect(p).toMatchObject({ reason: null, startedBy: null, returnReason: 'Repaired and checked', openDefectsAtReturn: [], unverifiedAtReturn: [] });
    expect(Date.now() - Date.parse(p!.from)).toBeGreaterThan(3.9 * DAY_MS);
  });

  it('refuses bad input, other roles and other depots', async () => {
    const v0 = await get(sup, vinClean);
    expect((await patch(sup, vinClean, { offRoad: 'maybe', version: v0.version })).status).toBe(400);
    expect((await patch(sup, vinClean, { offRoad: true, offRoadReason: 'x'.repeat(501), version: v0.version })).status).toBe(400);
    expect((await patch(sup, vinClean, { offRoad: true, offRoadReason: 42, version: v0.version })).status).toBe(400);
    expect((await patch(viewer, vinClean, { offRoad: true })).status).toBe(403);
    expect((await patch(supSth, vinClean, { offRoad: true })).status).toBe(404);
    expect((await call(vehicleRoute, 'PATCH', `/api/vehicles/${vinClean}`, { params: { vin: vinClean }, json: { offRoad: true } })).status).toBe(401);
    expect(getDb().select().from(vehicleOffRoad).all().filter((p) => p.toAt === null && p.vehicleId === v0.id)).toHaveLength(0);
  });
});

describe('search by registration or fleet number however it is typed', () => {
  const search = async (q: string) =>
    (await body(await call(vehiclesRoute, 'GET', `/api/vehicles?q=${encodeURIComponent(q)}`, { token: sup }))).items.map((v: { vin: string }) => v.vin);
  it('finds "GHQ-4941-J" from GHQ4941J, ghq 4941, GHQ-4941 and 4941', async () => {
    for (const q of ['GHQ4941J', 'ghq 4941', 'GHQ-4941', '4941', 'ghq.4941.j']) expect(await search(q), q).toEqual([vinPlate]);
  });
  it('finds "LV 1016" from lv1016 and LV-1016', async () => {
    for (const q of ['lv1016', 'LV-1016']) expect(await search(q), q).toEqual([vinPlate]);
  });
  it('does not find it from a different plate, and treats % and _ literally', async () => {
    expect(await search('GHQ4942J')).toEqual([]);
    expect(await search('GHQ%J')).toEqual([]);
    expect(await search('G_Q4941')).toEqual([]);
  });
  it('finds defects by a plate typed without dashes too', async () => {
    addDefects([{ ref: 'DF-T-010', vin: vinPlate, reportedAt: Date.now() - DAY_MS, position: 'FL', module: 'LCK-1' }]);
    const r = await body(await call(defectsRoute, 'GET', '/api/defects?q=GHQ4941J', { token: sup }));
    expect(r.items.map((d: { ref: string }) => d.ref)).toEqual(['DF-T-010']);
  });
});

describe('the stored search key', () => {
  it('is what the fill migration writes for vehicles stored before it, the same as the app writes', async () => {
    const { vehicles } = await import('../../src/db/schema');
    const db = getDb();
    const written = db.select({ key: vehicles.searchKey }).from(vehicles).where(eq(vehicles.vin, vinPlate)).get()!.key;
    expect(written).toBe(vehicleSearchKey('GHQ-4941-J', 'LV 1016'));
    // A vehicle as an older version stored it (no key), with every kind of separator, then the migration's SQL.
    db.update(vehicles).set({ registration: 'ab-12 c.d/e_f', fleetNumber: 'lv 7', searchKey: null }).where(eq(vehicles.vin, vinClean)).run();
    db.$client.exec(fs.readFileSync('drizzle/0007_vehicle-search-key-fill.sql', 'utf8'));
    const filled = db.select({ key: vehicles.searchKey }).from(vehicles).where(eq(vehicles.vin, vinClean)).get()!.key;
    expect(filled).toBe(vehicleSearchKey('ab-12 c.d/e_f', 'lv 7'));
    expect(filled).toBe('AB12CDEF|LV7');
  });
});

describe('what keeps a depot or module type from being deleted', () => {
  it('sends the usage counts to people who may delete, and only to them', async () => {
    const d = await body(await call(depotsRoute, 'GET', '/api/depots?sort=code', { token: manager }));
    const nth = d.items.find((x: { code: string }) => x.code === 'NTH');
    const nVehicles = getDb().select().from((await import('../../src/db/schema')).vehicles).all().length;
    const nDefects = getDb().select().from(defects).all().length;
    expect(nth.usage).toEqual({ vehicles: nVehicles, defects: nDefects, people: 2 }); // the NTH supervisor and viewer
    const sth = d.items.find((x: { code: string }) => x.code === 'STH');
    expect(sth.usage).toEqual({ vehicles: 0, defects: 0, people: 1 });
    const asSup = await body(await call(depotsRoute, 'GET', '/api/depots', { token: sup }));
    expect(asSup.items[0].usage).toBeUndefined();
    const m = await body(await call(modulesRoute, 'GET', '/api/modules?sort=code', { token: manager }));
    expect(m.items.map((x: { code: string; usage: { defects: number } }) => [x.code, x.usage.defects])).toEqual([
      ['LCK-1', 2],
      ['WLR-2', 2],
    ]);
    expect((await body(await call(modulesRoute, 'GET', '/api/modules', { token: viewer }))).items[0].usage).toBeUndefined();
  });
});
