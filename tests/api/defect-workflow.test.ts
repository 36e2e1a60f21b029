// The defect lifecycle over HTTP: every allowed step per role, refused steps, depot scope, the version check,
// the release-verification gate (POST …/transitions and PATCH), the timeline and repeat links.
import { beforeAll, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { call, body } from '../setup/call';
import { addVehicle, baseFleet, importCsv, personWithToken } from '../factories/fleet';
import * as defectsRoute from '../../src/pages/api/defects/index';
import * as defectRoute from '../../src/pages/api/defects/[id]';
import * as transitionsRoute from '../../src/pages/api/defects/[id]/transitions';

type Person = { token: string; id: number };
let tech: Person, tech2: Person, sup: Person, manager: Person, admin: Person, viewer: Person, techSth: Person, supSth: Person;

const db = () => new Database(process.env.DATABASE_URL!, { readonly: true });
function count(sql: string, ...args: unknown[]): number {
  const d = db();
  try {
    return (d.prepare(sql).get(...args) as { n: number }).n;
  } finally {
    d.close();
  }
}

beforeAll(async () => {
  baseFleet();
  importCsv('modules', 'code,name,function\nDCM-1,Door control module,door_control\nHRN-1,Front door harness,harness\nMRM-1,Mirror motor,mirror\n');
  tech = await personWithToken('technician', ['NTH']);
  tech2 = await personWithToken('technician', ['NTH']);
  sup = await personWithToken('supervisor', ['NTH']);
  manager = await personWithToken('manager');
  admin = await personWithToken('admin');
  viewer = await personWithToken('viewer', ['NTH']);
  techSth = await personWithToken('technician', ['STH']);
  supSth = await personWithToken('supervisor', ['STH']);
});

let posSerial = 0;
const POSITIONS = ['FL', 'FR', 'RL', 'RR', 'SL', 'SR', 'TG'];
/** Report a defect through the API (a fresh door each time, so that repeat links stay out of the way). */
async function report(moduleCode = 'LCK-1', who: Person = tech, extra: Record<string, unknown> = {}) {
  const vin = addVehicle('NTH');
  const res = await call(defectsRoute, 'POST', '/api/defects', {
    token: who.token,
    json: { vin, position: POSITIONS[posSerial++ % 7], moduleCode, symptom: 'Window stops part way', ...extra },
  });
  expect(res.status, await res.clone().text()).toBe(201);
  return body(res);
}
const get = async (id: number, who: Person = admin) => body(await call(defectRoute, 'GET', `/api/defects/${id}`, { token: who.token, params: { id: String(id) } }));
const step = (id: number, json: unknown, who: Person) => call(transitionsRoute, 'POST', `/api/defects/${id}/transitions`, { token: who.token, params: { id: String(id) }, json });
const patch = (id: number, json: unknown, who: Person) => call(defectRoute, 'PATCH', `/api/defects/${id}`, { token: who.token, params: { id: String(id) }, json });
const verification = { reinitialised: true, reversalVerified: true, note: 'Test rod at the top of travel' };

/** Move a defect to `to` with the current version; returns the response. */
async function go(id: number, to: string, who: Person, extra: Record<string, unknown> = {}) {
  const { version } = await get(id);
  return step(id, { to, version, ...extra }, who);
}
async function goOk(id: number, to: string, who: Person = admin, extra: Record<string, unknown> = {}) {
  const res = await go(id, to, who, extra);
  expect(res.status, `${to}: ${await res.clone().text()}`).toBe(200);
  return body(res);
}

/** A defect brought to `status` through the API as an admin. */
async function reach(status: string, moduleCode = 'LCK-1') {
  const d = await report(moduleCode);
  const path: Record<string, string[]> = {
    reported: [],
    diagnosing: ['diagnosing'],
    awaiting_parts: ['diagnosing', 'awaiting_parts'],
    repaired: ['diagnosing', 'repaired'],
    verified: ['diagnosing', 'repaired', 'verified'],
    closed: ['diagnosing', 'repaired', 'verified', 'closed'],
    cancelled: ['cancelled'],
  };
  const steps = path[status]!;
  expect((await patch(d.id, { action: 'Replaced the actuator', rootCause: 'mechanical' }, admin)).status).toBe(200);
  for (const s of steps) {
    await goOk(d.id, s, admin, { ...(s === 'verified' ? { verification } : {}), ...(s === 'cancelled' ? { reason: 'Duplicate' } : {}) });
  }
  return get(d.id);
}

describe('a technician works a defect from report to closed', () => {
  it('records who and when for every step, claims the defect and closes it', async () => {
    const d = await report('LCK-1');
    expect(d).toMatchObject({ status: 'reported', version: 1, assignedToId: null, timeline: [] });
    let r = await goOk(d.id, 'diagnosing', tech);
    expect(r).toMatchObject({ status: 'diagnosing', version: 2, assignedToId: tech.id, assignedTo: 'technician person' });
    r = await goOk(d.id, 'awaiting_parts', tech);
    r = await goOk(d.id, 'diagnosing', tech);
    const refused = await go(d.id, 'repaired', tech);
    expect(refused.status).toBe(422);
    expect((await body(refused)).error.message).toBe('Write down the action (what was done) before marking the defect repaired.');
    expect((await patch(d.id, { version: r.version, action: 'Replaced the lock actuator', rootCause: 'mechanical' }, tech)).status).toBe(200);
    r = await goOk(d.id, 'repaired', tech);
    r = await goOk(d.id, 'verified', tech);
    const before = Date.now();
    r = await goOk(d.id, 'closed', tech);
    expect(r.status).toBe('closed');
    expect(Date.parse(r.closedAt)).toBeGreaterThanOrEqual(before - 1000);
    expect(r.timeline.map((t: { from: string; to: string; by: string }) => `${t.from}>${t.to}:${t.by}`)).toEqual([
      'reported>diagnosing:technician person',
      'diagnosing>awaiting_parts:technician person',
      'awaiting_parts>diagnosing:technician person',
      'diagnosing>repaired:technician person',
      'repaired>verified:technician person',
      'verified>closed:technician person',
    ]);
    expect(count('select count(*) n from defect_transitions where defect_id = ?', d.id)).toBe(6);
    const statusAudit = r.audit.filter((a: { field: string }) => a.field === 'status').map((a: { oldValue: string; newValue: string }) => `${a.oldValue}>${a.newValue}`);
    expect(statusAudit.reverse()).toEqual(['reported>diagnosing', 'diagnosing>awaiting_parts', 'awaiting_parts>diagnosing', 'diagnosing>repaired', 'repaired>verified', 'verified>closed']);
  });
});

// Allowed steps and who may take them (docs/decisions/008-defect-workflow.md).
const STEPS: Array<[string, string, 'workers' | 'supervisors']> = [
  ['reported', 'diagnosing', 'workers'],
  ['diagnosing', 'awaiting_parts', 'workers'],
  ['diagnosing', 'repaired', 'workers'],
  ['awaiting_parts', 'diagnosing', 'workers'],
  ['awaiting_parts', 'repaired', 'workers'],
  ['repaired', 'verified', 'workers'],
  ['repaired', 'closed', 'workers'],
  ['repaired', 'diagnosing', 'workers'],
  ['verified', 'closed', 'workers'],
  ['verified', 'diagnosing', 'workers'],
  ['reported', 'cancelled', 'supervisors'],
  ['diagnosing', 'cancelled', 'supervisors'],
  ['awaiting_parts', 'cancelled', 'supervisors'],
  ['repaired', 'cancelled', 'supervisors'],
  ['verified', 'cancelled', 'supervisors'],
  ['closed', 'diagnosing', 'supervisors'],
  ['cancelled', 'reported', 'supervisors'],
];
const ROLE_NAMES = ['technician', 'supervisor', 'manager', 'admin', 'viewer'] as const;
const MAY: Record<'workers' | 'supervisors', readonly string[]> = {
  workers: ['technician', 'supervisor', 'manager', 'admin'],
  supervisors: ['supervisor', 'manager', 'admin'],
};
const person = (role: (typeof ROLE_NAMES)[number]) => ({ technician: tech, supervisor: sup, manager, admin, viewer })[role];

describe('every step, for every role', () => {
  it.each(STEPS.flatMap(([from, to, who]) => ROLE_NAMES.map((role) => [from, to, role, MAY[who].includes(role)] as const)))(
    '%s → %s as %s: allowed %s',
    async (from, to, role, allowed) => {
      // A window lifter, so that the verified and closed steps pass the release gate with the record supplied.
      const d = await reach(from, 'WLR-2');
      const extra = { reason: 'Checked with the depot', ...(to === 'verified' || to === 'closed' ? { verification } : {}) };
      const res = await step(d.id, { to, version: d.version, ...extra }, person(role));
      const b = await body(res);
      if (allowed) {
        expect(res.status, JSON.stringify(b)).toBe(200);
        expect(b.status).toBe(to);
        expect(b.version).toBe(d.version + 1);
        expect(b.timeline.at(-1)).toMatchObject({ from, to, reason: 'Checked with the depot' });
      } else {
        expect(res.status).toBe(403);
        expect(b.error.code).toBe('FORBIDDEN');
        expect((await get(d.id)).version).toBe(d.version);
      }
    },
  );
});

describe('refused steps', () => {
  it.each([
    ['reported', 'closed'],
    ['reported', 'verified'],
    ['reported', 'repaired'],
    ['diagnosing', 'verified'],
    ['awaiting_parts', 'closed'],
    ['closed', 'reported'],
    ['closed', 'cancelled'],
    ['cancelled', 'closed'],
    ['cancelled', 'diagnosing'],
    ['verified', 'repaired'],
  ])('%s → %s is not a step (422, nothing written)', async (from, to) => {
    const d = await reach(from);
    const res = await step(d.id, { to, version: d.version, reason: 'x', verification }, admin);
    expect(res.status).toBe(422);
    const b = await body(res);
    expect(b.error.code).toBe('INVALID_INPUT');
    expect(b.error.message).toMatch(/cannot be moved to/);
    const after = await get(d.id);
    expect(after.status).toBe(from);
    expect(after.version).toBe(d.version);
  });
  it('cancelling, re-opening and restoring need a reason', async () => {
    const d = await reach('diagnosing');
    const res = await step(d.id, { to: 'cancelled', version: d.version }, sup);
    expect(res.status).toBe(422);
    expect((await body(res)).error.issues).toEqual([{ path: 'reason', message: 'reason' }]);
    const ok = await step(d.id, { to: 'cancelled', version: d.version, reason: 'Reported twice' }, sup);
    expect((await body(ok)).timeline.at(-1)).toMatchObject({ to: 'cancelled', reason: 'Reported twice', by: 'supervisor person' });
  });
  it('closing needs the root cause', async () => {
    const d = await report('LCK-1');
    await goOk(d.id, 'diagnosing', tech);
    expect((await patch(d.id, { action: 'Cleaned the connector' }, tech)).status).toBe(200);
    await goOk(d.id, 'repaired', tech);
    const res = await go(d.id, 'closed', tech);
    expect(res.status).toBe(422);
    expect((await body(res)).error.message).toBe('Record the root cause before closing.');
  });
});

describe('access', () => {
  it('answers 404 for a defect in another depot, for every role limited to that depot', async () => {
    const d = await report('LCK-1');
    for (const p of [techSth, supSth]) {
      expect((await step(d.id, { to: 'diagnosing', version: 1 }, p)).status).toBe(404);
      expect((await call(transitionsRoute, 'GET', `/x`, { token: p.token, params: { id: String(d.id) } })).status).toBe(404);
      expect((await patch(d.id, { symptom: 'changed' }, p)).status).toBe(404);
    }
    expect((await get(d.id)).version).toBe(1);
    expect((await step(d.id, { to: 'diagnosing', version: 1 }, manager)).status).toBe(200);
  });
  it('401 without credentials, 403 for viewers, 404 for an unknown id, 400/415 for bad bodies', async () => {
    const d = await report('LCK-1');
    const params = { id: String(d.id) };
    expect((await call(transitionsRoute, 'POST', `/api/defects/${d.id}/transitions`, { params, json: { to: 'diagnosing', version: 1 } })).status).toBe(401);
    const v = await step(d.id, { to: 'diagnosing', version: 1 }, viewer);
    expect(v.status).toBe(403);
    expect((await body(v)).error.message).toBe('Your role can read defects but not change them.');
    expect((await call(transitionsRoute, 'GET', '/x', { token: viewer.token, params })).status).toBe(200);
    expect((await step(999999, { to: 'diagnosing', version: 1 }, admin)).status).toBe(404);
    for (const bad of [{ to: 'lost', version: 1 }, { to: 'diagnosing' }, { to: 'diagnosing', version: '1' }, { to: 'diagnosing', version: 0 }, { to: 'cancelled', version: 1, reason: 'x'.repeat(501) }, { to: 'verified', version: 1, verification: { reinitialised: true, reversalVerified: false } }]) {
      const res = await step(d.id, bad, admin);
      expect(res.status, JSON.stringify(bad)).toBe(400);
      expect((await body(res)).error.code).toBe('INVALID_INPUT');
    }
    const raw = await call(transitionsRoute, 'POST', '/x', { token: admin.token, params, body: 'to=diagnosing', headers: { 'content-type': 'application/x-www-form-urlencoded' } });
    expect(raw.status).toBe(415);
    expect((await get(d.id)).version).toBe(1);
  });
});

describe('no lost work: the version check', () => {
  it('refuses a stale step with 409 and the current record, changing nothing', async () => {
    const d = await report('LCK-1');
    await goOk(d.id, 'diagnosing', tech);
    const res = await step(d.id, { to: 'awaiting_parts', version: 1 }, tech2);
    expect(res.status).toBe(409);
    const b = await body(res);
    expect(b.error.code).toBe('CONFLICT');
    expect(b.current).toMatchObject({ id: d.id, status: 'diagnosing', version: 2, assignedToId: tech.id });
    expect(b.current.timeline).toHaveLength(1);
    expect(count('select count(*) n from defect_transitions where defect_id = ?', d.id)).toBe(1);
  });
  it('refuses a stale PATCH with 409 and the current record, so the form can show theirs against yours', async () => {
    const d = await report('LCK-1');
    await goOk(d.id, 'diagnosing', tech);
    expect((await patch(d.id, { version: 2, moisture: 'traces', notes: 'Damp inside the door' }, tech)).status).toBe(200);
    const stale = await patch(d.id, { version: 2, moisture: 'none', labourMinutes: 30 }, tech2);
    expect(stale.status).toBe(409);
    const b = await body(stale);
    expect(b.current).toMatchObject({ version: 3, moisture: 'traces', notes: 'Damp inside the door', labourMinutes: null });
    const now = await get(d.id);
    expect(now).toMatchObject({ version: 3, moisture: 'traces', labourMinutes: null });
    // Re-applied with the current version, it goes through.
    const again = await patch(d.id, { version: 3, labourMinutes: 30 }, tech2);
    expect(again.status).toBe(200);
    expect(await body(again)).toMatchObject({ version: 4, moisture: 'traces', labourMinutes: 30 });
  });
  it('a PATCH without a version (an integration) is applied as it comes', async () => {
    const d = await report('LCK-1');
    const res = await patch(d.id, { symptom: 'Lock does not engage' }, tech);
    expect(res.status).toBe(200);
    expect(await body(res)).toMatchObject({ symptom: 'Lock does not engage', version: 2 });
  });
});

describe('the release verification', () => {
  it.each(['WLR-2', 'DCM-1', 'HRN-1'])('a repaired %s cannot be closed or verified without it; with it, it can', async (code) => {
    const d = await reach('repaired', code);
    const close = await go(d.id, 'closed', tech);
    expect(close.status).toBe(422);
    const cb = await body(close);
    expect(cb.error.code).toBe('INVALID_INPUT');
    expect(cb.error.message).toMatch(/record the release verification before closing it — the window re-initialised per the vehicle maker's procedure and automatic closing seen to reverse on an obstruction/);
    expect(cb.error.issues).toEqual([{ path: 'verification', message: 'safety_verification' }]);
    expect((await go(d.id, 'verified', tech)).status).toBe(422);
    const before = Date.now();
    const v = await goOk(d.id, 'verified', tech, { verification });
    expect(v.verification).toMatchObject({ reinitialised: true, reversalVerified: true, by: 'technician person', byId: tech.id, note: 'Test rod at the top of travel' });
    expect(Date.parse(v.verification.at)).toBeGreaterThanOrEqual(before - 1000);
    expect((await goOk(d.id, 'closed', tech)).status).toBe('closed');
  });
  it('a lock actuator or mirror needs no verification', async () => {
    for (const code of ['LCK-1', 'MRM-1']) {
      const d = await reach('repaired', code);
      expect((await goOk(d.id, 'closed', tech)).status).toBe('closed');
    }
  });
  it('the check time may be given, but not in the future nor before the report or the repair', async () => {
    const d = await reach('repaired', 'WLR-2');
    const future = new Date(Date.now() + 3_600_000).toISOString();
    expect((await go(d.id, 'verified', tech, { verification: { ...verification, at: future } })).status).toBe(422);
    expect((await go(d.id, 'verified', tech, { verification: { ...verification, at: '2001-01-01T10:00' } })).status).toBe(422);
    // The moment the repair was recorded (the latest step to repaired) is the earliest allowed.
    const at = (await get(d.id)).timeline.findLast((t: { to: string }) => t.to === 'repaired').at;
    const ok = await goOk(d.id, 'verified', tech, { verification: { ...verification, at } });
    expect(ok.verification.at).toBe(at);
  });
  it('is recorded and closed in one step when given with the close', async () => {
    const d = await reach('repaired', 'WLR-2');
    const r = await goOk(d.id, 'closed', tech, { verification });
    expect(r).toMatchObject({ status: 'closed', verification: { reinitialised: true, reversalVerified: true, byId: tech.id } });
  });
  it('stepping back or re-opening clears it, so the repair is verified again', async () => {
    const d = await reach('closed', 'WLR-2');
    expect(d.verification).not.toBeNull();
    const techReopen = await go(d.id, 'diagnosing', tech, { reason: 'Came back' });
    expect(techReopen.status).toBe(403);
    expect((await go(d.id, 'diagnosing', sup)).status).toBe(422);
    const r = await goOk(d.id, 'diagnosing', sup, { reason: 'Driver says it still stops part way' });
    expect(r).toMatchObject({ status: 'diagnosing', closedAt: null, verification: null });
    expect(r.audit.some((a: { field: string; oldValue: string }) => a.field === 'verifiedReversal' && a.oldValue === 'true')).toBe(true);
  });
  it('applies to PATCH too: a closing time or status on an open window lifter is refused without it', async () => {
    const d = await reach('repaired', 'WLR-2');
    const p1 = await patch(d.id, { closedAt: new Date().toISOString() }, tech);
    expect(p1.status).toBe(422);
    expect((await body(p1)).error.message).toMatch(/release verification/);
    const p2 = await patch(d.id, { status: 'closed', version: d.version }, tech);
    expect(p2.status).toBe(422);
    expect((await get(d.id)).status).toBe('repaired');
    // A lock actuator closes by recording its closing time, from any open status (as an import row would).
    const l = await reach('diagnosing', 'LCK-1');
    const p3 = await patch(l.id, { closedAt: '2030-01-01T10:00' }, tech);
    expect(p3.status).toBe(200);
    expect(await body(p3)).toMatchObject({ status: 'closed', closedAt: '2030-01-01T10:00:00.000Z' });
  });
  it('closing by PATCH needs the root cause, as the Close step does; given in the same PATCH it closes', async () => {
    const d = await report('LCK-1');
    expect(d.rootCause).toBeNull();
    const refused = await patch(d.id, { closedAt: new Date().toISOString(), version: d.version }, tech);
    expect(refused.status).toBe(422);
    expect((await body(refused)).error.message).toMatch(/root cause/i);
    expect((await get(d.id)).status).toBe('reported');
    const ok = await patch(d.id, { closedAt: new Date().toISOString(), rootCause: 'mechanical', action: 'Refitted the actuator rod', version: d.version }, tech);
    expect(ok.status).toBe(200);
    expect(await body(ok)).toMatchObject({ status: 'closed', rootCause: 'mechanical' });
  });
  it('a defect cannot be reported in the future, by POST or by PATCH', async () => {
    const vin = addVehicle('NTH');
    const ahead = new Date(Date.now() + 3 * 86_400_000).toISOString();
    const r = await call(defectsRoute, 'POST', '/x', { token: tech.token, json: { vin, position: 'FL', moduleCode: 'LCK-1', reportedAt: ahead } });
    expect(r.status).toBe(422);
    expect((await body(r)).error.issues).toEqual([{ path: 'reportedAt', message: 'In the future' }]);
    const d = await report('LCK-1');
    const p = await patch(d.id, { reportedAt: '2099-01-01', version: d.version }, tech);
    expect(p.status).toBe(422);
    expect((await get(d.id)).reportedAt).toBe(d.reportedAt);
  });
  it('a record entered closed (work done before Seepline) is history for managers and admins, refused to a technician', async () => {
    const vin = addVehicle('NTH');
    const refused = await call(defectsRoute, 'POST', '/x', { token: tech.token, json: { vin, position: 'FL', moduleCode: 'WLR-2', reportedAt: '2025-03-01T09:00', closedAt: '2025-03-04T16:00' } });
    expect(refused.status).toBe(403);
    expect((await body(refused)).error.message).toMatch(/already closed is for fleet managers and admins/);
    expect((await body(await call(defectsRoute, 'GET', `/x?vin=${vin}`, { token: manager.token }))).total).toBe(0);
    const d = await report('WLR-2', manager, { reportedAt: '2025-03-01T09:00', closedAt: '2025-03-04T16:00' });
    expect(d).toMatchObject({ status: 'closed', verification: null, safetyVerificationRequired: true });
    expect(d.timeline).toEqual([{ at: '2025-03-04T16:00:00.000Z', from: 'reported', to: 'closed', by: null, reason: 'Closed on record (imported or entered closed)' }]);
  });
});

describe('closed records', () => {
  it('are changed by supervisors and above only', async () => {
    const d = await reach('closed');
    const t = await patch(d.id, { notes: 'late note' }, tech);
    expect(t.status).toBe(403);
    expect((await body(t)).error.message).toMatch(/is closed; its record is changed by supervisors/);
    const s = await patch(d.id, { notes: 'late note' }, sup);
    expect(s.status).toBe(200);
    expect(await body(s)).toMatchObject({ notes: 'late note', status: 'closed' });
  });
});

describe('repeat links follow closing, re-opening and cancelling', () => {
  it('links a new defect on the same door and function to the one closed before it, and unlinks on re-open', async () => {
    const vin = addVehicle('NTH');
    const first = await body(await call(defectsRoute, 'POST', '/x', { token: tech.token, json: { vin, position: 'FL', moduleCode: 'WLR-2', symptom: 'No auto up' } }));
    expect((await patch(first.id, { action: 'Replaced the motor', rootCause: 'water_ingress' }, tech)).status).toBe(200);
    await goOk(first.id, 'diagnosing', tech);
    await goOk(first.id, 'repaired', tech);
    await goOk(first.id, 'closed', tech, { verification });
    const second = await body(await call(defectsRoute, 'POST', '/x', { token: tech.token, json: { vin, position: 'FL', moduleCode: 'WLR-2', symptom: 'No auto up again' } }));
    expect(second).toMatchObject({ repeat: true, repeatOfId: first.id, repeatOfRef: first.ref, repeatOf: { id: first.id, ref: first.ref, daysAfterClose: 0 } });
    expect((await get(first.id)).repeatedBy).toEqual([{ id: second.id, ref: second.ref, reportedAt: second.reportedAt, status: 'reported' }]);
    const other = await body(await call(defectsRoute, 'POST', '/x', { token: tech.token, json: { vin, position: 'FR', moduleCode: 'WLR-2' } }));
    expect(other.repeat).toBe(false);

    await goOk(first.id, 'diagnosing', sup, { reason: 'Not fixed' });
    expect((await get(second.id)).repeat).toBe(false);
    await goOk(first.id, 'repaired', tech);
    await goOk(first.id, 'closed', tech, { verification });
    // Closed again, after the second was reported: the second is no longer "after" the earlier closing.
    expect((await get(second.id)).repeat).toBe(false);

    const third = await body(await call(defectsRoute, 'POST', '/x', { token: tech.token, json: { vin, position: 'FL', moduleCode: 'WLR-2' } }));
    expect(third.repeatOfId).toBe(first.id);
    await goOk(third.id, 'cancelled', sup, { reason: 'Same fault as the open one' });
    expect((await get(third.id)).repeat).toBe(false);
    await goOk(third.id, 'reported', sup, { reason: 'It is a separate report after all' });
    expect((await get(third.id)).repeatOfId).toBe(first.id);
  });
  it.each([
    [89, true],
    [90, true],
    [91, false],
  ])('a defect reported %i days after the earlier one closed is a repeat: %s', async (days, isRepeat) => {
    const vin = addVehicle('NTH');
    const earlier = await call(defectsRoute, 'POST', '/x', { token: manager.token, json: { vin, position: 'RR', moduleCode: 'HRN-1', reportedAt: '2025-01-02T08:00Z', closedAt: '2025-01-05T12:00Z' } });
    expect(earlier.status).toBe(201);
    const later = new Date(Date.UTC(2025, 0, 5, 12) + days * 86_400_000).toISOString();
    const d = await body(await call(defectsRoute, 'POST', '/x', { token: tech.token, json: { vin, position: 'RR', moduleCode: 'HRN-1', reportedAt: later } }));
    expect(d.repeat).toBe(isRepeat);
  });
});
