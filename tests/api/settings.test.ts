// GET/PATCH /api/settings: access (401/403), bad input (400 in the error shape, nothing written), and the
// repeat-window change recomputing every repeat link in one audited transaction. The fleet is
// tests/factories/overview-fleet.ts: its three repeats come 69 (D2), 41 (D3) and 57 (D6) days after the
// earlier repair, so a 60-day window keeps D3 and D6, a 45-day one keeps D3, a 30-day one none.
import { beforeAll, describe, expect, it } from 'vitest';
import { and, eq, isNotNull } from 'drizzle-orm';
import { call, body } from '../setup/call';
import { baseFleet, personWithToken } from '../factories/fleet';
import { buildOverviewFleet } from '../factories/overview-fleet';
import * as settingsRoute from '../../src/pages/api/settings';
import { getDb } from '../../src/db/client';
import { auditLog, defects, settings } from '../../src/db/schema';

let admin: string, manager: string, tech: string, viewer: string, adminId: number;

beforeAll(async () => {
  baseFleet();
  const a = await personWithToken('admin');
  admin = a.token;
  adminId = a.id;
  manager = (await personWithToken('manager')).token;
  const t = await personWithToken('technician', ['NTH']);
  tech = t.token;
  viewer = (await personWithToken('viewer')).token;
  buildOverviewFleet(t.id);
});

/** The refs that are repeats now, with the ref they repeat, straight from the table. */
function repeatPairs(): string[] {
  const rows = getDb().select({ id: defects.id, ref: defects.ref, of: defects.repeatOfId }).from(defects).where(isNotNull(defects.repeatOfId)).all();
  const refOf = new Map(getDb().select({ id: defects.id, ref: defects.ref }).from(defects).all().map((r) => [r.id, r.ref]));
  return rows.map((r) => `${r.ref}<${refOf.get(r.of!)}`).sort();
}
const settingsAudit = () => getDb().select().from(auditLog).where(eq(auditLog.entity, 'settings')).all();
const patch = (token: string | undefined, json: unknown, query = '') => call(settingsRoute, 'PATCH', `/api/settings${query}`, { token, json });

describe('GET /api/settings', () => {
  it('answers 401 without credentials', async () => {
    expect((await call(settingsRoute, 'GET', '/api/settings')).status).toBe(401);
  });
  it('gives everyone the repeat window (default 90), the labour rate (none set) and the currency (default GBP), and only admins the change history', async () => {
    const v = await body(await call(settingsRoute, 'GET', '/api/settings', { token: viewer }));
    expect(v).toEqual({ repeatWindowDays: 90, labourRateMinorPerHour: null, currency: 'GBP' });
    const a = await body(await call(settingsRoute, 'GET', '/api/settings', { token: admin }));
    expect(a).toEqual({ repeatWindowDays: 90, labourRateMinorPerHour: null, currency: 'GBP', changes: [] });
  });
});

describe('PATCH /api/settings', () => {
  it('answers 401 without credentials and 403 for every role but admin, writing nothing', async () => {
    expect((await patch(undefined, { repeatWindowDays: 30 })).status).toBe(401);
    for (const token of [manager, tech, viewer]) {
      const r = await patch(token, { repeatWindowDays: 30 });
      expect(r.status).toBe(403);
      expect((await body(r)).error.code).toBe('FORBIDDEN');
    }
    expect(getDb().select().from(settings).all()).toEqual([]);
    expect(repeatPairs()).toEqual(['D2<D1', 'D3<D2', 'D6<D5']);
  });
  it.each([
    [{ repeatWindowDays: 0 }, 'repeatWindowDays'],
    [{ repeatWindowDays: 3651 }, 'repeatWindowDays'],
    [{ repeatWindowDays: 12.5 }, 'repeatWindowDays'],
    [{ repeatWindowDays: '30' }, 'repeatWindowDays'],
    [{}, 'repeatWindowDays'],
    [{ repeatWindowDays: 30, colour: 'red' }, ''],
    [{ currency: 'JPY' }, 'currency'],
    [{ currency: 'XYZ' }, 'currency'],
    [{ currency: 'pounds' }, 'currency'],
    [{ currency: 978 }, 'currency'],
    [{ labourRateMinorPerHour: -1 }, 'labourRateMinorPerHour'],
    [{ labourRateMinorPerHour: 45.5 }, 'labourRateMinorPerHour'],
    [{ labourRateMinorPerHour: '4800' }, 'labourRateMinorPerHour'],
    [{ labourRateMinorPerHour: 10_000_001 }, 'labourRateMinorPerHour'],
  ])('answers 400 for %j, writing nothing', async (json, path) => {
    const r = await patch(admin, json);
    expect(r.status).toBe(400);
    const e = (await body(r)).error;
    expect(e.code).toBe('INVALID_INPUT');
    if (path) expect(e.issues.map((i: { path?: string }) => i.path)).toContain(path);
    expect(getDb().select().from(settings).all()).toEqual([]);
    expect(settingsAudit()).toEqual([]);
  });
  it('answers 400 for a body that is not JSON and for a bad dryRun', async () => {
    const r = await call(settingsRoute, 'PATCH', '/api/settings', { token: admin, body: '{"repeatWindowDays":', headers: { 'content-type': 'application/json' } });
    expect(r.status).toBe(400);
    expect((await patch(admin, { repeatWindowDays: 30 }, '?dryRun=perhaps')).status).toBe(400);
  });

  it('previews a change with dryRun=1 without writing anything', async () => {
    const r = await patch(admin, { repeatWindowDays: 60 }, '?dryRun=1');
    expect(r.status).toBe(200);
    expect(await body(r)).toEqual({
      settings: { repeatWindowDays: 60, labourRateMinorPerHour: null, currency: 'GBP' },
      dryRun: true,
      recompute: { defectsChanged: 1, repeatsBefore: 3, repeatsAfter: 2, vehiclesChecked: 4 },
    });
    expect(getDb().select().from(settings).all()).toEqual([]);
    expect(settingsAudit()).toEqual([]);
    expect(repeatPairs()).toEqual(['D2<D1', 'D3<D2', 'D6<D5']);
  });

  it('changes the window, recomputes every repeat link and audits it', async () => {
    const r = await patch(admin, { repeat_window_days: 45 });
    expect(r.status).toBe(200);
    expect(await body(r)).toEqual({
      settings: { repeatWindowDays: 45, labourRateMinorPerHour: null, currency: 'GBP' },
      dryRun: false,
      recompute: { defectsChanged: 2, repeatsBefore: 3, repeatsAfter: 1, vehiclesChecked: 4 },
    });
    expect(repeatPairs()).toEqual(['D3<D2']);
    expect((await body(await call(settingsRoute, 'GET', '/api/settings', { token: viewer }))).repeatWindowDays).toBe(45);
    const audit = settingsAudit();
    expect(audit.map((a) => [a.action, a.field, a.oldValue, a.newValue, a.userId])).toEqual([
      ['update', 'repeat_window_days', '90', '45', adminId],
      ['recompute_repeats', 'repeat_links', '3 repeats', '1 repeats; 2 defects changed', adminId],
    ]);
  });

  it('counts a link that moves or comes back as a change, and going back restores the original links', async () => {
    expect((await body(await patch(admin, { repeatWindowDays: 30 }))).recompute).toMatchObject({ defectsChanged: 1, repeatsAfter: 0 });
    expect(repeatPairs()).toEqual([]);
    expect((await body(await patch(admin, { repeatWindowDays: 90 }))).recompute).toMatchObject({ defectsChanged: 3, repeatsAfter: 3 });
    expect(repeatPairs()).toEqual(['D2<D1', 'D3<D2', 'D6<D5']);
  });

  it('writes nothing when the value does not change', async () => {
    const before = settingsAudit().length;
    const r = await body(await patch(admin, { repeatWindowDays: 90 }));
    expect(r.recompute).toEqual({ defectsChanged: 0, repeatsBefore: 3, repeatsAfter: 3, vehiclesChecked: 0 });
    expect(settingsAudit()).toHaveLength(before);
  });

  it('lists the changes for admins, newest first', async () => {
    const a = await body(await call(settingsRoute, 'GET', '/api/settings', { token: admin }));
    const updates = a.changes.filter((c: { action: string }) => c.action === 'update').map((c: { oldValue: string; newValue: string }) => `${c.oldValue}>${c.newValue}`);
    expect(updates).toEqual(['30>90', '45>30', '90>45']);
    const still = getDb().select().from(defects).where(and(eq(defects.ref, 'D6'), isNotNull(defects.repeatOfId))).all();
    expect(still).toHaveLength(1);
  });

  it('sets, changes and clears the labour rate with an audit row each time, leaving the repeat links alone', async () => {
    const lastId = Math.max(0, ...settingsAudit().map((a) => a.id));
    const set = await body(await patch(admin, { labourRateMinorPerHour: 4800 }));
    expect(set).toEqual({ settings: { repeatWindowDays: 90, labourRateMinorPerHour: 4800, currency: 'GBP' }, dryRun: false, recompute: { defectsChanged: 0, repeatsBefore: 3, repeatsAfter: 3, vehiclesChecked: 0 } });
    expect((await body(await call(settingsRoute, 'GET', '/api/settings', { token: viewer }))).labourRateMinorPerHour).toBe(4800);
    await patch(admin, { labour_rate_minor_per_hour: 5250 });
    const cleared = await body(await patch(admin, { labourRateMinorPerHour: null }));
    expect(cleared.settings.labourRateMinorPerHour).toBeNull();
    expect(getDb().select().from(settings).all().map((r) => r.key)).toEqual(['repeat_window_days']);
    const added = settingsAudit().filter((a) => a.id > lastId).sort((a, b) => a.id - b.id);
    expect(added.map((a) => [a.field, a.oldValue, a.newValue])).toEqual([
      ['labour_rate_minor_per_hour', null, '4800'],
      ['labour_rate_minor_per_hour', '4800', '5250'],
      ['labour_rate_minor_per_hour', '5250', null],
    ]);
    expect(repeatPairs()).toEqual(['D2<D1', 'D3<D2', 'D6<D5']);
  });

  it('sets the currency (any case, stored upper case) with an audit row, and a dry run writes nothing', async () => {
    const lastId = Math.max(0, ...settingsAudit().map((a) => a.id));
    const preview = await body(await patch(admin, { currency: 'sek' }, '?dryRun=1'));
    expect(preview.settings.currency).toBe('SEK');
    expect((await body(await call(settingsRoute, 'GET', '/api/settings', { token: viewer }))).currency).toBe('GBP');
    const r = await body(await patch(admin, { currency: 'eur' }));
    expect(r.settings.currency).toBe('EUR');
    expect((await body(await call(settingsRoute, 'GET', '/api/settings', { token: tech }))).currency).toBe('EUR');
    const added = settingsAudit().filter((a) => a.id > lastId);
    expect(added.map((a) => [a.field, a.oldValue, a.newValue, a.userId])).toEqual([['currency', 'GBP', 'EUR', adminId]]);
    expect((await patch(manager, { currency: 'USD' })).status).toBe(403);
    expect((await body(await call(settingsRoute, 'GET', '/api/settings', { token: admin }))).currency).toBe('EUR');
  });
});
