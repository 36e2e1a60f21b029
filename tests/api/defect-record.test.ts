// Reporting a defect and recording the diagnosis and repair: the shared contracts, parts and cost, the audit
// trail field by field, and bad input refused without writing anything.
import { beforeAll, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { call, body } from '../setup/call';
import { addVehicle, baseFleet, personWithToken } from '../factories/fleet';
import * as defectsRoute from '../../src/pages/api/defects/index';
import * as defectRoute from '../../src/pages/api/defects/[id]';

let tech: { token: string; id: number }, techSth: { token: string; id: number }, manager: { token: string; id: number }, vin: string;

function sql<T = Record<string, unknown>>(q: string, ...args: unknown[]): T[] {
  const d = new Database(process.env.DATABASE_URL!);
  try {
    return q.trim().toLowerCase().startsWith('select') ? (d.prepare(q).all(...args) as T[]) : (d.prepare(q).run(...args), []);
  } finally {
    d.close();
  }
}
const create = (json: unknown, token = tech.token) => call(defectsRoute, 'POST', '/api/defects', { token, json });
const patch = (id: number, json: unknown, token = tech.token) => call(defectRoute, 'PATCH', `/api/defects/${id}`, { token, params: { id: String(id) }, json });

beforeAll(async () => {
  baseFleet();
  vin = addVehicle('NTH');
  tech = await personWithToken('technician', ['NTH']);
  techSth = await personWithToken('technician', ['STH']);
  manager = await personWithToken('manager');
});

describe('reporting a defect', () => {
  it('takes snake_case or camelCase, a list of codes, a lower-case door and the reporter', async () => {
    const res = await create({ vin: vin.toLowerCase(), position: 'fr', module_code: 'wlr-2', symptom: ' Reverses when closing ', dtcs: ['b1a21-29', 'B1A22'], odometer_km: '48211', reporter_name: 'Driver of van 12' });
    expect(res.status, await res.clone().text()).toBe(201);
    const d = await body(res);
    expect(d).toMatchObject({
      vin,
      position: 'FR',
      moduleCode: 'WLR-2',
      moduleFunction: 'window_lifter',
      symptom: 'Reverses when closing',
      dtcs: ['B1A21-29', 'B1A22'],
      odometerKm: 48211,
      reporterName: 'Driver of van 12',
      reportedBy: 'technician person',
      status: 'reported',
      version: 1,
      safetyVerificationRequired: true,
    });
    expect(d.codes[0]).toMatchObject({ display: 'B1A21-29', system: 'body', scope: 'manufacturer' });
    expect(d.codes[0].description).toBe('Body, manufacturer-specific · failure type 29: signal invalid (General Signal)');
    expect(sql('select code, failure_type from defect_codes where defect_id = ? order by seq', d.id)).toEqual([
      { code: 'B1A21', failure_type: '29' },
      { code: 'B1A22', failure_type: null },
    ]);
  });
  it.each([
    ['an invalid fault code', { dtcs: 'B1A21 X9999' }, 400, 'dtcs'],
    ['a door that does not exist', { position: 'FX' }, 400, 'position'],
    ['an odometer with decimals', { odometerKm: 12.5 }, 400, 'odometerKm'],
    ['a symptom of 501 characters', { symptom: 'x'.repeat(501) }, 400, 'symptom'],
    ['a vehicle in another depot', { vin: null }, 422, 'vin'],
  ])('refuses %s and writes nothing', async (_name, over, status, path) => {
    const before = sql<{ n: number }>('select count(*) n from defects')[0]!.n;
    const json = { vin, position: 'FL', moduleCode: 'WLR-2', ...over };
    const res = (over as { vin?: null }).vin === null ? await create({ ...json, vin }, techSth.token) : await create(json);
    expect(res.status).toBe(status);
    const b = await body(res);
    expect(b.error.issues.map((i: { path: string }) => i.path)).toContain(path);
    expect(sql<{ n: number }>('select count(*) n from defects')[0]!.n).toBe(before);
  });
});

describe('the diagnosis and repair record', () => {
  it('saves findings, parts and labour, prices them at the labour rate, and audits every field', async () => {
    sql("insert or replace into settings (key, value) values ('labour_rate_minor_per_hour', '7800')");
    const d = await body(await create({ vin, position: 'FL', moduleCode: 'WLR-2', symptom: 'No auto up' }));
    const res = await patch(d.id, {
      version: 1,
      moisture: 'corrosion',
      membraneCondition: 'damaged',
      sealCondition: 'ok',
      drainCondition: 'blocked',
      connectorCondition: 'corroded',
      rootCause: 'water_ingress',
      action: 'Replaced the motor, fitted a new membrane, cleared the drains',
      notes: 'Green corrosion on the encoder board',
      labourMinutes: '95',
      parts: [
        { partNumber: 'PN-100', description: 'Window lifter motor', quantity: 1, unitCostMinor: 18900 },
        { partNumber: 'LV-MBK-210', quantity: '2', unitCostMinor: 2450 },
      ],
    });
    expect(res.status, await res.clone().text()).toBe(200);
    const r = await body(res);
    // 18900 + 2 × 2450 = 23800 in parts; 95 min at 78.00/h = 12350.
    expect(r).toMatchObject({ version: 2, partsTotalMinor: 23800, costMinor: 36150, labourMinutes: 95, labourRateMinorPerHour: 7800, currency: 'GBP', drainCondition: 'blocked' });
    expect(r.parts).toEqual([
      { partNumber: 'PN-100', description: 'Window lifter motor', quantity: 1, unitCostMinor: 18900 },
      { partNumber: 'LV-MBK-210', description: null, quantity: 2, unitCostMinor: 2450 },
    ]);
    const fields = r.audit.filter((a: { action: string }) => a.action === 'update').map((a: { field: string }) => a.field).sort();
    expect(fields).toEqual(
      ['action', 'connectorCondition', 'costMinor', 'drainCondition', 'labourMinutes', 'membraneCondition', 'moisture', 'notes', 'parts', 'rootCause', 'sealCondition'].sort(),
    );
    expect(r.audit.find((a: { field: string }) => a.field === 'parts')).toMatchObject({ oldValue: null, newValue: 'PN-100 ×1 @ 189.00; LV-MBK-210 ×2 @ 24.50', who: 'technician person' });

    // Only the fields given change; clearing a field is null; the old value is kept in the audit trail.
    const r2 = await body(await patch(d.id, { version: 2, notes: null, parts: [{ partNumber: 'PN-100', quantity: 1, unitCostMinor: 18900 }] }));
    expect(r2).toMatchObject({ version: 3, notes: null, moisture: 'corrosion', costMinor: 31250 });
    expect(r2.audit.find((a: { field: string }) => a.field === 'notes')).toMatchObject({ oldValue: 'Green corrosion on the encoder board', newValue: null });
    sql("delete from settings where key = 'labour_rate_minor_per_hour'");
  });
  it('saving the same values again changes nothing and keeps the version', async () => {
    const d = await body(await create({ vin, position: 'RL', moduleCode: 'LCK-1' }));
    const r = await body(await patch(d.id, { version: 1, moisture: 'none' }));
    expect(r.version).toBe(2);
    const again = await body(await patch(d.id, { version: 2, moisture: 'none', parts: [] }));
    expect(again.version).toBe(2);
  });
  it.each([
    ['a condition that does not exist', { membraneCondition: 'soggy' }],
    ['moisture in other words', { moisture: 'damp' }],
    ['a part without a number', { parts: [{ partNumber: '', quantity: 1 }] }],
    ['a part quantity of 0', { parts: [{ partNumber: 'A', quantity: 0 }] }],
    ['a negative unit cost', { parts: [{ partNumber: 'A', quantity: 1, unitCostMinor: -1 }] }],
    ['51 part lines', { parts: Array.from({ length: 51 }, (_, i) => ({ partNumber: `P${i}`, quantity: 1 })) }],
    ['labour of 10,001 minutes', { labourMinutes: 10_001 }],
    ['notes of 4,001 characters', { notes: 'n'.repeat(4001) }],
    ['a status that does not exist', { status: 'fixed' }],
    ['a changed ref', { ref: 'OTHER-1' }],
  ])('refuses %s (4xx, error shape, nothing written)', async (_name, over) => {
    const d = await body(await create({ vin, position: 'SL', moduleCode: 'LCK-1' }));
    const res = await patch(d.id, { version: 1, ...over });
    expect(res.status).toBeGreaterThanOrEqual(400);
    expect(res.status).toBeLessThan(500);
    expect(typeof (await body(res)).error.message).toBe('string');
    const after = sql<{ version: number }>('select version from defects where id = ?', d.id)[0]!;
    expect(after.version).toBe(1);
    expect(sql<{ n: number }>("select count(*) n from audit_log where entity = 'defect' and entity_id = ? and action != 'create'", String(d.id))[0]!.n).toBe(0);
  });
  it('moving a defect to another door re-links repeats and is audited', async () => {
    const v2 = addVehicle('NTH');
    const a = await body(await create({ vin: v2, position: 'FL', moduleCode: 'LCK-1', reportedAt: '2025-05-01', closedAt: '2025-05-02' }, manager.token));
    const b = await body(await create({ vin: v2, position: 'FR', moduleCode: 'LCK-1', reportedAt: '2025-06-01' }));
    expect(b.repeat).toBe(false);
    const moved = await body(await patch(b.id, { version: b.version, position: 'fl' }));
    expect(moved).toMatchObject({ position: 'FL', repeat: true, repeatOfId: a.id, repeatOf: { daysAfterClose: 30 } });
    expect(moved.audit.find((x: { field: string }) => x.field === 'position')).toMatchObject({ oldValue: 'FR', newValue: 'FL' });
  });
});
