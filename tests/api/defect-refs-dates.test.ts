// Refs of new defects (one DF-YY-NNNNN format, by year of report, unique under concurrent reports), report
// times before the vehicle was built (refused by POST and PATCH), release verifications dated before the
// repair they verify (refused), and audit rows that name the people they refer to.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { call, body } from '../setup/call';
import { addVehicle, baseFleet, importCsv, makeVin, personWithToken } from '../factories/fleet';
import * as defectsRoute from '../../src/pages/api/defects/index';
import * as defectRoute from '../../src/pages/api/defects/[id]';
import * as transitionsRoute from '../../src/pages/api/defects/[id]/transitions';

type Person = { token: string; id: number };
let tech: Person, manager: Person;

function rows<T>(q: string, ...args: unknown[]): T[] {
  const d = new Database(process.env.DATABASE_URL!, { readonly: true });
  try {
    return d.prepare(q).all(...args) as T[];
  } finally {
    d.close();
  }
}
const create = (json: unknown, who: Person = tech) => call(defectsRoute, 'POST', '/api/defects', { token: who.token, json });
const patch = (id: number, json: unknown, who: Person = tech) => call(defectRoute, 'PATCH', `/api/defects/${id}`, { token: who.token, params: { id: String(id) }, json });
const step = (id: number, json: unknown, who: Person = tech) => call(transitionsRoute, 'POST', `/api/defects/${id}/transitions`, { token: who.token, params: { id: String(id) }, json });

/** A vehicle built in a given month (YYYY-MM) at NTH. */
function vehicleBuilt(buildDate: string): string {
  const vin = makeVin();
  importCsv('vehicles', `vin,build_date,in_service_date,depot_code,parking,washes_per_month\n${vin},${buildDate},${buildDate.slice(0, 7)}-20,NTH,outdoor,4\n`);
  return vin;
}

beforeAll(async () => {
  baseFleet();
  tech = await personWithToken('technician', ['NTH']);
  manager = await personWithToken('manager');
});

describe('defect refs', () => {
  it('numbers reports DF-YY-NNNNN by the UTC year of the report, after the highest of that year', async () => {
    const vin = addVehicle('NTH');
    // History already holds DF-25-00733 and an odd ref that is not in the generated form.
    importCsv('defects', `ref,vin,reported_at,position,module_code\nDF-25-00733,${vin},2025-04-01T10:00Z,FL,LCK-1\nLEGACY-9,${vin},2025-04-02T10:00Z,FR,LCK-1\n`);
    const a = await body(await create({ vin, position: 'SL', moduleCode: 'LCK-1', reportedAt: '2025-06-01T10:00Z' }));
    const b = await body(await create({ vin, position: 'SR', moduleCode: 'LCK-1', reportedAt: '2025-06-02T10:00Z' }));
    expect([a.ref, b.ref]).toEqual(['DF-25-00734', 'DF-25-00735']);
    // A year with no defect yet starts at 1; the report of 31 Dec 23:30 UTC counts for that year.
    const c = await body(await create({ vin, position: 'RL', moduleCode: 'LCK-1', reportedAt: '2024-12-31T23:30Z' }));
    expect(c.ref).toBe('DF-24-00001');
    // Without a reported time it is now, so this year.
    const d = await body(await create({ vin, position: 'RR', moduleCode: 'LCK-1' }));
    expect(d.ref).toBe(`DF-${String(new Date().getUTCFullYear()).slice(2)}-00001`);
  });
  it('numbers import rows without a ref the same way, after refs given in the same file', async () => {
    const vin = addVehicle('NTH');
    importCsv(
      'defects',
      `ref,vin,reported_at,position,module_code\n,${vin},2023-02-01,FL,LCK-1\nDF-23-00041,${vin},2023-03-01,FR,LCK-1\n,${vin},2023-04-01,SL,LCK-1\n,${vin},2022-12-01,SR,LCK-1\n`,
    );
    const got = rows<{ ref: string; p: string }>('select ref, position p from defects where vehicle_id = (select id from vehicles where vin = ?) order by position', vin);
    expect(got).toEqual([
      { ref: 'DF-23-00042', p: 'FL' },
      { ref: 'DF-23-00041', p: 'FR' },
      { ref: 'DF-23-00043', p: 'SL' },
      { ref: 'DF-22-00001', p: 'SR' },
    ]);
  });
  it('stays unique when three processes report on the same database at once', async () => {
    const vin = addVehicle('NTH');
    const script = path.resolve('tests/api/helpers/report-many.ts');
    const run = () =>
      new Promise<string[]>((resolve, reject) => {
        const child = spawn(process.execPath, ['--import', 'tsx', script, vin, '15', '2023-05-03T08:00:00Z'], { env: { ...process.env }, stdio: ['ignore', 'pipe', 'pipe'] });
        let out = '';
        let err = '';
        child.stdout.on('data', (d) => (out += d));
        child.stderr.on('data', (d) => (err += d));
        child.on('exit', (code) => (code === 0 ? resolve(JSON.parse(out) as string[]) : reject(new Error(`child failed (${code}): ${err}`))));
      });
    const highest = rows<{ n: number }>("select max(cast(substr(ref, 7) as integer)) n from defects where ref like 'DF-23-%'")[0]!.n;
    const all = (await Promise.all([run(), run(), run()])).flat();
    expect(all).toHaveLength(45);
    // 45 different refs, the next 45 numbers of 2023 with no gap and no duplicate.
    expect(new Set(all).size).toBe(45);
    expect([...all].sort()).toEqual(Array.from({ length: 45 }, (_, i) => `DF-23-${String(highest + i + 1).padStart(5, '0')}`));
  }, 60_000);
});

describe('a report before the vehicle was built', () => {
  it('is refused by POST with 422 naming reportedAt, and nothing is written', async () => {
    const vin = vehicleBuilt('2022-01');
    const before = rows<{ n: number }>('select count(*) n from defects')[0]!.n;
    const res = await create({ vin, position: 'FL', moduleCode: 'LCK-1', reportedAt: '2019-01-01T10:00' });
    expect(res.status).toBe(422);
    const b = await body(res);
    expect(b.error).toMatchObject({ code: 'INVALID_INPUT', message: 'Reported at is before the vehicle was built (Jan 2022): check the date' });
    expect(b.error.issues.map((i: { path: string }) => i.path)).toEqual(['reportedAt']);
    expect(rows<{ n: number }>('select count(*) n from defects')[0]!.n).toBe(before);
    // The last day of the month before is refused; the first day of the build month is fine (London time).
    expect((await create({ vin, position: 'FL', moduleCode: 'LCK-1', reportedAt: '2021-12-31T23:59' })).status).toBe(422);
    expect((await create({ vin, position: 'FL', moduleCode: 'LCK-1', reportedAt: '2022-01-01T00:00' })).status).toBe(201);
  });
  it('is refused by PATCH, for a new report time or a move to a younger vehicle', async () => {
    const old = vehicleBuilt('2019-03');
    const young = vehicleBuilt('2023-06');
    const d = await body(await create({ vin: old, position: 'FR', moduleCode: 'LCK-1', reportedAt: '2020-05-01T09:00' }));
    const p1 = await patch(d.id, { version: d.version, reportedAt: '2019-02-28T12:00' });
    expect(p1.status).toBe(422);
    expect((await body(p1)).error.issues.map((i: { path: string }) => i.path)).toEqual(['reportedAt']);
    const p2 = await patch(d.id, { version: d.version, vin: young });
    expect(p2.status).toBe(422);
    expect((await body(p2)).error.message).toBe('Reported at is before the vehicle was built (Jun 2023): check the date');
    expect(rows('select vehicle_id v, reported_at r, version from defects where id = ?', d.id)).toEqual([
      { v: rows<{ id: number }>('select id from vehicles where vin = ?', old)[0]!.id, r: Date.parse('2020-05-01T08:00:00Z'), version: 1 },
    ]);
    // A later date on the same vehicle is fine.
    expect((await patch(d.id, { version: d.version, reportedAt: '2019-03-02T08:00' })).status).toBe(200);
  });
});

describe('a release verification dated before the repair', () => {
  it('is refused; at or after the repair it is recorded', async () => {
    const vin = addVehicle('NTH');
    const d = await body(await create({ vin, position: 'FL', moduleCode: 'WLR-2', reportedAt: '2026-01-05T08:00Z' }));
    let v = d.version;
    for (const to of ['diagnosing']) v = (await body(await step(d.id, { to, version: v }))).version;
    v = (await body(await patch(d.id, { version: v, action: 'Replaced the motor', rootCause: 'water_ingress' }))).version;
    const repaired = await body(await step(d.id, { to: 'repaired', version: v }));
    const repairedAt = Date.parse(repaired.timeline.at(-1).at);
    const checks = { reinitialised: true, reversalVerified: true };
    // After the report, but a minute before the repair was recorded.
    const early = await step(d.id, { to: 'verified', version: repaired.version, verification: { ...checks, at: new Date(repairedAt - 60_000).toISOString() } });
    expect(early.status).toBe(422);
    const eb = await body(early);
    expect(eb.error.message).toBe('The verification cannot be before the repair was recorded: check the time it was done.');
    expect(eb.error.issues.map((i: { path: string }) => i.path)).toEqual(['verification.at']);
    expect(rows('select status, verified_at a from defects where id = ?', d.id)).toEqual([{ status: 'repaired', a: null }]);
    const at = new Date(repairedAt).toISOString();
    const ok = await body(await step(d.id, { to: 'verified', version: repaired.version, verification: { ...checks, at } }));
    expect(ok).toMatchObject({ status: 'verified', verification: { at } });
  });
  it('is refused with the close step too (verification given with the close)', async () => {
    const vin = addVehicle('NTH');
    const d = await body(await create({ vin, position: 'FR', moduleCode: 'WLR-2', reportedAt: '2026-01-05T08:00Z' }));
    let v = (await body(await step(d.id, { to: 'diagnosing', version: d.version }))).version;
    v = (await body(await patch(d.id, { version: v, action: 'Replaced the motor', rootCause: 'water_ingress' }))).version;
    const r = await body(await step(d.id, { to: 'repaired', version: v }));
    const res = await step(d.id, { to: 'closed', version: r.version, verification: { reinitialised: true, reversalVerified: true, at: '2026-01-06T08:00Z' } }, manager);
    expect(res.status).toBe(422);
  });
});

describe('the audit trail', () => {
  it('names the person an assignment or a verification refers to, beside the stored id', async () => {
    const vin = addVehicle('NTH');
    const d = await body(await create({ vin, position: 'TG', moduleCode: 'WLR-2', reportedAt: '2026-01-05T08:00Z' }));
    let v = (await body(await step(d.id, { to: 'diagnosing', version: d.version }))).version;
    v = (await body(await patch(d.id, { version: v, action: 'Replaced the motor', rootCause: 'water_ingress' }))).version;
    v = (await body(await step(d.id, { to: 'repaired', version: v }))).version;
    const r = await body(await step(d.id, { to: 'verified', version: v, verification: { reinitialised: true, reversalVerified: true } }));
    const row = (field: string) => r.audit.find((a: { field: string }) => a.field === field);
    expect(row('assignedToId')).toMatchObject({ oldValue: null, newValue: String(tech.id), oldLabel: null, newLabel: 'technician person' });
    expect(row('verifiedById')).toMatchObject({ newValue: String(tech.id), newLabel: 'technician person' });
    // Other fields carry no label.
    expect(row('action')).toMatchObject({ newValue: 'Replaced the motor', newLabel: null });
  });
});
