// The patterns routes on a factory fleet from the seeded generator (6,000 vehicles, imported through the real CSV
// imports) with two planted cohorts: a wet WLR-2 batch at the high exposure band and a dry DLA-1 batch at the low
// band. The report must find both; pattern records, status moves with their audit rows, a changed cohort,
// supervisor scope and the evidence CSV are checked through the routes.
import { beforeAll, describe, expect, it } from 'vitest';
import { body, call } from '../setup/call';
import { importCsv, personWithToken } from '../factories/fleet';
import { loadGeneratedFleet, type LoadedFleet } from '../factories/patterns-fleet';
import { getDb } from '../../src/db/client';
import { getPatternsAttention } from '../../src/server/patterns-records';
import { toMonthIndex } from '../../src/lib/patterns/calendar';
import { EVIDENCE_CSV_COLUMNS } from '../../src/lib/patterns/evidence-csv';
import type { PatternsReportCohort, PatternRecordDetail, PatternRecordsResponse } from '../../src/lib/contracts/patterns';
import type { PlantedCohort } from '../../src/lib/patterns/fleet-generator';
import * as report from '../../src/pages/api/patterns/index';
import * as records from '../../src/pages/api/patterns/records';
import * as sync from '../../src/pages/api/patterns/sync';
import * as record from '../../src/pages/api/patterns/[id]';
import * as status from '../../src/pages/api/patterns/[id]/status';
import * as evidence from '../../src/pages/api/patterns/[id]/evidence.csv';
import * as overview from '../../src/pages/api/overview';
import type { OverviewResponse } from '../../src/lib/contracts/overview';
import * as traces from '../../src/pages/api/traces/index';
import { captureToCsv, generateCapture } from '../../src/lib/traces/generate';

const WET: PlantedCohort = { label: 'wet', moduleCode: 'WLR-2', buildFrom: '2021-03', buildTo: '2021-09', band: 'high', rateMultiplier: 3, moistureShare: 0.9 };
const DRY: PlantedCohort = { label: 'dry', moduleCode: 'DLA-1', buildFrom: '2022-05', buildTo: '2022-12', band: 'low', rateMultiplier: 3, moistureShare: 0.05 };

let loaded: LoadedFleet;
let manager: { token: string; id: number };
let admin: string;

beforeAll(async () => {
  loaded = loadGeneratedFleet({ seed: 1, vehicleCount: 6000, planted: [WET, DRY] });
  manager = await personWithToken('manager');
  admin = (await personWithToken('admin')).token;
}, 120_000);

/** A day `days` after today (UTC), `YYYY-MM-DD`: campaign target dates may not be in the past. */
const daysAhead = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);
const monthsApart = (a: string, b: string) => Math.abs(toMonthIndex(a) - toMonthIndex(b));
const getReport = async (token: string, asOf?: string) => {
  const r = await call(report, 'GET', `/api/patterns${asOf ? `?asOf=${asOf}` : ''}`, { token });
  expect(r.status).toBe(200);
  return body<{ asOf: string; cohorts: PatternsReportCohort[] }>(r);
};
const getRecord = async (token: string, id: number) => {
  const r = await call(record, 'GET', `/api/patterns/${id}`, { token, params: { id: String(id) } });
  return { status: r.status, json: (await body(r)) as PatternRecordDetail };
};
const move = (token: string, id: number, json: unknown) => call(status, 'POST', `/api/patterns/${id}/status`, { token, params: { id: String(id) }, json });
const auditRows = (id: number) =>
  getDb().$client.prepare("select user_id as userId, actor, action, field, old_value as oldValue, new_value as newValue from audit_log where entity = 'pattern' and entity_id = ? order by id").all(String(id)) as {
    userId: number | null;
    actor: string | null;
    action: string;
    field: string | null;
    oldValue: string | null;
    newValue: string | null;
  }[];

describe('the planted cohorts, found through GET /api/patterns', () => {
  let cohorts: PatternsReportCohort[];
  beforeAll(async () => {
    cohorts = (await getReport(manager.token, loaded.fleet.asOf)).cohorts;
  });

  it('finds the wet WLR-2 batch in the high band, with its build range, and calls it water ingress', () => {
    const c = cohorts.find((x) => x.moduleCode === 'WLR-2' && x.exposureBand === 'high')!;
    expect(c).toBeDefined();
    expect(monthsApart(c.buildFrom, WET.buildFrom)).toBeLessThanOrEqual(1);
    expect(monthsApart(c.buildTo, WET.buildTo)).toBeLessThanOrEqual(1);
    expect(c.significant).toBe(true);
    expect(c.waterIngress).toBe(true);
    expect(c.qValue).toBeLessThan(0.05);
    expect(c.ciLow).toBeGreaterThan(1);
    expect(c.failures).toBeGreaterThan(c.expected * 2);
    expect(c.moistureShare).toBeGreaterThanOrEqual(0.5);
  });

  it('finds the dry DLA-1 batch in the low band: significant, not water ingress', () => {
    const c = cohorts.find((x) => x.moduleCode === 'DLA-1' && x.exposureBand === 'low')!;
    expect(monthsApart(c.buildFrom, DRY.buildFrom)).toBeLessThanOrEqual(1);
    expect(monthsApart(c.buildTo, DRY.buildTo)).toBeLessThanOrEqual(1);
    expect(c.significant).toBe(true);
    expect(c.waterIngress).toBe(false);
    expect(c.moistureShare).toBeLessThan(0.5);
  });

  it('lists the strongest evidence first and nothing else as significant', () => {
    for (let i = 1; i < cohorts.length; i++) expect(cohorts[i]!.qValue).toBeGreaterThanOrEqual(cohorts[i - 1]!.qValue);
    expect(cohorts.filter((c) => c.significant).map((c) => `${c.moduleCode}:${c.exposureBand}`).sort()).toEqual(['DLA-1:low', 'WLR-2:high']);
  });

  it('the failures of a cohort are the imported defects of its vehicles (checked in SQL)', () => {
    const c = cohorts.find((x) => x.moduleCode === 'DLA-1' && x.exposureBand === 'low')!;
    // Count DLA-1 defects on low-band vehicles built in the cohort's months, reported by asOf, independently of the
    // engine: the low band is every vehicle whose exposure index is 0-3; the factory fleet records it per vehicle.
    const low = loaded.fleet.vehicles.filter((v) => v.exposureBand === 'low' && v.buildMonth >= c.buildFrom && v.buildMonth <= c.buildTo && v.inServiceDate < loaded.fleet.asOf);
    const vins = new Set(low.map((v) => v.vin));
    const rows = getDb().$client
      .prepare("select v.vin from defects d join vehicles v on v.id = d.vehicle_id join modules m on m.id = d.module_id where m.code = 'DLA-1' and d.reported_at <= ?")
      .all(Date.parse(`${loaded.fleet.asOf}T23:59:59Z`)) as { vin: string }[];
    expect(c.vehicles).toBe(low.length);
    expect(c.failures).toBe(rows.filter((r) => vins.has(r.vin)).length);
  });
});

describe('pattern records', () => {
  let wetId: number;
  let dryId: number;

  it('a manager syncs the records from the fleet-wide report; a second sync has nothing to do', async () => {
    const r = await call(sync, 'POST', '/api/patterns/sync', { token: manager.token, json: {} });
    expect(r.status).toBe(200);
    const first = await body(r);
    expect(first).toMatchObject({ upToDate: false, created: 2, updated: 0 });
    const again = await body(await call(sync, 'POST', '/api/patterns/sync', { token: manager.token, json: {} }));
    expect(again).toMatchObject({ upToDate: true, syncId: first.syncId });

    const list = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: manager.token }));
    expect(list.total).toBe(2);
    expect(list.items.map((i) => i.status)).toEqual(['new', 'new']);
    wetId = list.items.find((i) => i.key === 'WLR-2:high')!.id;
    dryId = list.items.find((i) => i.key === 'DLA-1:low')!.id;
    expect(list.items.find((i) => i.id === wetId)!.waterIngress).toBe(true);
    const water = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records?water=1', { token: manager.token }));
    expect(water.items.map((i) => i.id)).toEqual([wetId]);
    // One audit row per pattern found, by the system.
    expect(auditRows(wetId)).toEqual([expect.objectContaining({ userId: null, actor: 'system', action: 'found' })]);
  });

  it('today’s report names each cohort’s record', async () => {
    const { cohorts } = await getReport(manager.token);
    const wet = cohorts.find((c) => c.moduleCode === 'WLR-2' && c.exposureBand === 'high')!;
    expect(wet.record).toMatchObject({ id: wetId, status: 'new', changed: false });
    expect(cohorts.filter((c) => c.record !== null)).toHaveLength(2);
  });

  it('the pattern page data: cohort, months, the vehicles and defects behind it', async () => {
    const { status: s, json } = await getRecord(manager.token, wetId);
    expect(s).toBe(200);
    expect(json.scope).toBe('all');
    expect(json.vehicleList).toHaveLength(json.cohort.vehicles);
    expect(json.defectList).toHaveLength(json.cohort.failures);
    expect(json.cohort.byMonth.filter((m) => m.inCohort).map((m) => m.month)[0]).toBe(json.buildFrom);
    expect(json.allowedStatuses).toEqual(['acknowledged', 'campaign_planned', 'dismissed']);
    // Each listed defect is a WLR-2 defect of a listed vehicle.
    const vehicleIds = new Set(json.vehicleList.map((v) => v.id));
    expect(json.defectList.every((d) => vehicleIds.has(d.vehicleId) && /^GF-/.test(d.ref))).toBe(true);
    expect(json.vehicleList.reduce((s2, v) => s2 + v.failures, 0)).toBe(json.cohort.failures);
  });

  it('moves through the statuses with an audit row for each change', async () => {
    const ack = await move(manager.token, wetId, { status: 'acknowledged', note: 'Seen; checking with the depots', version: 1 });
    expect(ack.status).toBe(200);
    const a = (await body(ack)) as PatternRecordDetail;
    expect(a).toMatchObject({ status: 'acknowledged', statusReason: 'Seen; checking with the depots', version: 2, statusBy: { id: manager.id } });
    const target = daysAhead(90);
    const campaign = { kind: 'new_membranes', note: 'Fit new membranes and clear drains on every cohort van', targetDate: target };
    const plan = await move(manager.token, wetId, { status: 'campaign_planned', campaign, version: 2 });
    expect(plan.status).toBe(200);
    expect(await body(plan)).toMatchObject({ status: 'campaign_planned', campaign: { ...campaign, inForce: true, overdue: false }, allowedStatuses: ['campaign_planned', 'resolved', 'dismissed'] });
    const rows = auditRows(wetId).filter((r) => r.action === 'status');
    expect(rows).toEqual([
      { userId: manager.id, actor: null, action: 'status', field: 'status', oldValue: 'new', newValue: 'acknowledged' },
      { userId: manager.id, actor: null, action: 'status', field: 'note', oldValue: null, newValue: 'Seen; checking with the depots' },
      { userId: manager.id, actor: null, action: 'status', field: 'status', oldValue: 'acknowledged', newValue: 'campaign_planned' },
      { userId: manager.id, actor: null, action: 'status', field: 'campaignKind', oldValue: null, newValue: 'new_membranes' },
      { userId: manager.id, actor: null, action: 'status', field: 'campaignNote', oldValue: null, newValue: campaign.note },
      { userId: manager.id, actor: null, action: 'status', field: 'campaignTargetDate', oldValue: null, newValue: target },
    ]);
    // The history shows one entry per action: acknowledged with its note, then the campaign with its three fields.
    const { json } = await getRecord(manager.token, wetId);
    expect(json.history.filter((h) => h.action === 'status').map((h) => h.changes.map((c) => c.field))).toEqual([
      ['status', 'campaignKind', 'campaignNote', 'campaignTargetDate'],
      ['status', 'note'],
    ]);
  });

  it('refuses moves the rules do not allow (409) and writes nothing', async () => {
    const before = auditRows(dryId).length;
    const r = await move(manager.token, dryId, { status: 'resolved', note: 'done' });
    expect(r.status).toBe(409);
    const j = await body(r);
    expect(j.error.code).toBe('CONFLICT');
    expect(j.allowed).toEqual(['acknowledged', 'campaign_planned', 'dismissed']);
    expect((await move(admin, dryId, { status: 'dismissed', reason: 'Known batch issue, supplier informed' })).status).toBe(200);
    expect((await move(admin, dryId, { status: 'dismissed', reason: 'again' })).status).toBe(409);
    expect((await move(admin, dryId, { status: 'campaign_planned', campaign: { kind: 'replace_module', note: 'replace all', targetDate: daysAhead(30) } })).status).toBe(409);
    // A stale version is a conflict too.
    const stale = await move(admin, dryId, { status: 'acknowledged', version: 1 });
    expect(stale.status).toBe(409);
    expect((await body(stale)).current).toEqual({ status: 'dismissed', version: 2 });
    const { json } = await getRecord(admin, dryId);
    expect(json).toMatchObject({ status: 'dismissed', statusReason: 'Known batch issue, supplier informed', version: 2 });
    expect(auditRows(dryId)).toHaveLength(before + 2); // status + reason of the one allowed move
  });

  it('reopens a dismissed pattern and resolves a planned campaign', async () => {
    expect((await move(admin, dryId, { status: 'acknowledged', note: 'Reopened: failures continue' })).status).toBe(200);
    const done = await move(manager.token, wetId, { status: 'resolved', note: 'All cohort vans refitted' });
    expect(done.status).toBe(200);
    expect(await body(done)).toMatchObject({ status: 'resolved', campaign: { kind: 'new_membranes' }, allowedStatuses: ['acknowledged'] });
  });

  it('a cohort with new failures since the last action shows as changed', async () => {
    const { json } = await getRecord(manager.token, wetId);
    // A vehicle of the range's last build month, so that the range keeps that month (more failures only strengthen it).
    const vin = json.vehicleList.find((v) => v.buildMonth === json.buildTo)!.vin;
    importCsv('defects', `ref,vin,reported_at,position,module_code,moisture,root_cause\nNEW-1,${vin},2026-07-15T09:00:00Z,FL,WLR-2,corrosion,water_ingress\nNEW-2,${vin},2026-08-20T09:00:00Z,FR,WLR-2,traces,water_ingress\n`);
    const s = await body(await call(sync, 'POST', '/api/patterns/sync', { token: manager.token, json: {} }));
    expect(s).toMatchObject({ upToDate: false, created: 0, updated: 2 });
    const after = (await getRecord(manager.token, wetId)).json;
    expect([after.buildFrom, after.buildTo]).toEqual([json.buildFrom, json.buildTo]);
    expect(after.failures).toBe(json.failures + 2);
    expect(after.changes).toMatchObject({ changed: true, newFailures: 2 });
    expect(after.changes.summary).toContain('2 new failures');
    expect(after.status).toBe('resolved');
    const changedOnly = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records?changed=1', { token: manager.token }));
    expect(changedOnly.items.map((i) => i.id)).toEqual([wetId]);
    const { cohorts } = await getReport(manager.token);
    expect(cohorts.find((c) => c.record?.id === wetId)!.record).toMatchObject({ changed: true, changes: ['2 new failures'] });
    // Acting again resets the baseline.
    expect((await move(manager.token, wetId, { status: 'acknowledged', note: 'Failures after the refit' })).status).toBe(200);
    expect((await getRecord(manager.token, wetId)).json.changes.changed).toBe(false);
  });
});

describe('a cohort whose build range widens keeps its record', () => {
  it('shows the widened range as a change, with an audit row from the report', async () => {
    const list = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: manager.token }));
    const wet = list.items.find((i) => i.key === 'WLR-2:high')!;
    // Many wet failures on high-band vans built in the month after the range.
    const next = toMonthIndex(wet.buildTo) + 1;
    const month = `${Math.floor(next / 12)}-${String((next % 12) + 1).padStart(2, '0')}`;
    const vans = loaded.fleet.vehicles.filter((v) => v.exposureBand === 'high' && v.buildMonth === month && !v.retiredDate).slice(0, 10);
    expect(vans.length).toBeGreaterThanOrEqual(5);
    const lines = vans.flatMap((v, i) => [
      `W${i}-A,${v.vin},2025-03-1${i % 10}T08:00:00Z,FL,WLR-2,corrosion,water_ingress`,
      `W${i}-B,${v.vin},2025-11-1${i % 10}T08:00:00Z,FR,WLR-2,standing_water,water_ingress`,
      `W${i}-C,${v.vin},2026-04-1${i % 10}T08:00:00Z,FL,WLR-2,traces,water_ingress`,
    ]);
    importCsv('defects', `ref,vin,reported_at,position,module_code,moisture,root_cause\n${lines.join('\n')}\n`);
    const s = await body(await call(sync, 'POST', '/api/patterns/sync', { token: manager.token, json: {} }));
    expect(s).toMatchObject({ upToDate: false, created: 0 });
    const after = (await getRecord(manager.token, wet.id)).json;
    expect(after.key).toBe('WLR-2:high');
    expect(after.buildFrom <= wet.buildFrom && after.buildTo >= month).toBe(true);
    expect(after.firstBuildTo).toBe(wet.firstBuildTo);
    expect(after.changes.range).toBe('widened');
    expect(after.changes.summary[0]).toMatch(/^Build range widened from /);
    expect(auditRows(wet.id).filter((r) => r.field === 'buildRange').at(-1)).toMatchObject({ actor: 'system', oldValue: `${wet.buildFrom}..${wet.buildTo}`, newValue: `${after.buildFrom}..${after.buildTo}` });
    const count = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: manager.token }));
    expect(count.total).toBe(2);
  });

  it('the Overview figure counts it as needing attention (changed since the last action)', () => {
    const me = { id: manager.id, email: 'm', name: 'M', role: 'manager' as const, depotIds: null, via: 'token' as const };
    // WLR-2 (acknowledged, range widened since) needs attention; DLA-1 (acknowledged, unchanged) does not.
    expect(getPatternsAttention(me)).toEqual({ needsAttention: 1, new: 0, changed: 1, overdue: 0, open: 2, waterIngressOpen: 1, href: '/patterns' });
    expect(getPatternsAttention({ ...me, role: 'technician', depotIds: [] })).toBeNull();
  });

  it('GET /api/overview lists the changed WLR-2 record first for the manager, and no patterns for a technician', async () => {
    const o = await body<OverviewResponse>(await call(overview, 'GET', '/api/overview', { token: manager.token }));
    expect(o.patterns).toMatchObject({ open: 2, needsAttention: 1, waterIngressOpen: 1 });
    expect(o.patterns!.lastSyncAt).not.toBeNull();
    expect(o.patterns!.items.map((i) => [i.moduleCode, i.exposureBand, i.needsAttention, i.waterIngress])).toEqual([
      ['WLR-2', 'high', true, true],
      ['DLA-1', 'low', false, false],
    ]);
    expect(o.patterns!.items[0]!.changes[0]).toMatch(/^Build range widened from /);
    const tech = await personWithToken('technician', [loaded.fleet.depots[0]!.code]);
    const t = await body<OverviewResponse>(await call(overview, 'GET', '/api/overview', { token: tech.token }));
    expect(t.patterns).toBeNull();
  });
});

describe('supervisors: read only, for their depots', () => {
  it('see the records with vehicles at their depots, the lists cut to those depots, and nothing else', async () => {
    const list = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: manager.token }));
    const wet = list.items.find((i) => i.key === 'WLR-2:high')!;
    const full = (await getRecord(manager.token, wet.id)).json;
    const perDepot = new Map<string, number>();
    for (const v of full.vehicleList) perDepot.set(v.depotCode, (perDepot.get(v.depotCode) ?? 0) + 1);
    const [home] = [...perDepot.entries()].sort((a, b) => b[1] - a[1])[0]!;
    const elsewhere = loaded.fleet.depots.map((d) => d.code).find((code) => !perDepot.has(code))!;
    expect(elsewhere, 'a depot without high-exposure vehicles in the cohort').toBeDefined();

    const sup = await personWithToken('supervisor', [home]);
    const mine = await getRecord(sup.token, wet.id);
    expect(mine.status).toBe(200);
    expect(mine.json.scope).toBe('depots');
    expect(mine.json.allowedStatuses).toEqual([]);
    expect(mine.json.vehicleList).toHaveLength(perDepot.get(home)!);
    expect(new Set(mine.json.vehicleList.map((v) => v.depotCode))).toEqual(new Set([home]));
    expect(mine.json.defectList.every((d) => d.depotCode === home)).toBe(true);
    expect((await move(sup.token, wet.id, { status: 'dismissed', reason: 'not mine' })).status).toBe(403);

    const other = await personWithToken('supervisor', [elsewhere]);
    expect((await getRecord(other.token, wet.id)).status).toBe(404);
    const theirs = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: other.token }));
    expect(theirs.items.map((i) => i.id)).not.toContain(wet.id);
    // Their report is computed over their depot only.
    const scoped = await getReport(other.token, loaded.fleet.asOf);
    const vehiclesAtDepot = loaded.fleet.vehicles.filter((v) => v.depotCode === elsewhere && v.inServiceDate < loaded.fleet.asOf).length;
    const body2 = await body(await call(report, 'GET', `/api/patterns?asOf=${loaded.fleet.asOf}`, { token: other.token }));
    expect(body2.counts.vehiclesObserved).toBe(vehiclesAtDepot);
    expect(scoped.cohorts.every((c) => c.record === null || theirs.items.some((i) => i.id === c.record!.id))).toBe(true);
  });
});

describe('warranty evidence CSV', () => {
  it('lists every cohort vehicle and failure under the documented header', async () => {
    const list = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: manager.token }));
    const wet = list.items.find((i) => i.key === 'WLR-2:high')!;
    const full = (await getRecord(manager.token, wet.id)).json;
    const r = await call(evidence, 'GET', `/api/patterns/${wet.id}/evidence.csv`, { token: manager.token, params: { id: String(wet.id) } });
    expect(r.status).toBe(200);
    expect(r.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    expect(r.headers.get('content-disposition')).toBe(`attachment; filename="seepline-pattern-${wet.id}-WLR-2-high-${wet.buildFrom}-${wet.buildTo}.csv"`);
    const text = await r.text();
    const lines = text.replace(/^\uFEFF/, '').trimEnd().split('\r\n');
    expect(lines[0]).toBe(EVIDENCE_CSV_COLUMNS.map((c) => c[0]).join(','));
    const withoutFailures = full.vehicleList.filter((v) => v.failures === 0).length;
    expect(lines.length - 1).toBe(full.defectList.length + withoutFailures);
    const refIndex = EVIDENCE_CSV_COLUMNS.findIndex((c) => c[0] === 'defect_ref');
    const refs = lines.slice(1).map((l) => l.split(',')[refIndex]).filter(Boolean).sort();
    expect(refs).toEqual(full.defectList.map((d) => d.ref).sort());
    for (const l of lines.slice(1)) expect(l.startsWith(`${wet.id},WLR-2,high,${wet.buildFrom},${wet.buildTo},`)).toBe(true);
  });

  it('carries the verdicts of the hall-sensor traces stored with a cohort defect', async () => {
    const list = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: manager.token }));
    const wet = list.items.find((i) => i.key === 'WLR-2:high')!;
    const target = (await getRecord(manager.token, wet.id)).json.defectList[0]!;
    const store = async (cap: ReturnType<typeof generateCapture>) => {
      const f = new FormData();
      f.set('file', new Blob([captureToCsv(cap)], { type: 'text/csv' }), 'door.csv');
      f.set('defectId', String(target.id));
      const r = await call(traces, 'POST', '/api/traces', { token: manager.token, body: f });
      expect(r.status).toBe(201);
      return (await body(r)).verdict as string;
    };
    // Captures generated from known parameters (as in tests/api/traces.test.ts): healthy quadrature, then two channels bridged.
    const v1 = await store(generateCapture({ freqHz: 200, dutyPct: 50, phaseDeg: 90, highV: 5, lowV: 0, sampleRateHz: 50_000, samples: 5000, noiseV: 0.02, seed: 3 }));
    const v2 = await store(generateCapture({ freqHz: 150, dutyPct: 50, phaseDeg: 90, highV: 5, lowV: 0, sampleRateHz: 40_000, samples: 4000, bridged: 'wired-and', spikeV: 1, seed: 4 }));
    expect([v1, v2]).toEqual(['healthy', 'channels_shorted']);
    const d = (await getRecord(manager.token, wet.id)).json.defectList.find((x) => x.id === target.id)!;
    expect(d.traces.map((t) => t.verdict)).toEqual(['healthy', 'channels_shorted']);
    const text = await (await call(evidence, 'GET', `/api/patterns/${wet.id}/evidence.csv`, { token: manager.token, params: { id: String(wet.id) } })).text();
    const row = text.split('\r\n').find((l) => l.includes(`,${target.ref},`))!;
    expect(row.endsWith(',healthy; channels_shorted')).toBe(true);
  });
});
