// Depot scope in Patterns: a defect is seen only inside its own depot's scope (not its vehicle's current depot),
// and a depot-scoped reader never receives figures computed from other depots' vehicles or defects
// (docs/decisions/013-pattern-figures-per-depot.md). A generated fleet with one planted wet cohort spread over
// several depots, imported through the real CSV imports.
import { beforeAll, describe, expect, it } from 'vitest';
import { body, call } from '../setup/call';
import { personWithToken } from '../factories/fleet';
import { loadGeneratedFleet, type LoadedFleet } from '../factories/patterns-fleet';
import { getDb } from '../../src/db/client';
import type { McfResponse, PatternRecordDetail, PatternRecordsResponse, PatternsReportResponse } from '../../src/lib/contracts/patterns';
import type { OverviewResponse } from '../../src/lib/contracts/overview';
import * as report from '../../src/pages/api/patterns/index';
import * as mcf from '../../src/pages/api/patterns/mcf';
import * as records from '../../src/pages/api/patterns/records';
import * as sync from '../../src/pages/api/patterns/sync';
import * as record from '../../src/pages/api/patterns/[id]';
import * as vehicle from '../../src/pages/api/vehicles/[vin]';
import * as defect from '../../src/pages/api/defects/[id]';
import * as overview from '../../src/pages/api/overview';

let loaded: LoadedFleet;
let manager: string;
let full: PatternRecordDetail;
/** The depot with most cohort vehicles (A) and another depot with cohort vehicles (B). */
let depotA = '';
let depotB = '';
let supA: string;
let supB: string;
let recordId = 0;

beforeAll(async () => {
  loaded = loadGeneratedFleet({
    seed: 1,
    vehicleCount: 3000,
    planted: [{ label: 'wet', moduleCode: 'WLR-2', buildFrom: '2021-03', buildTo: '2021-09', band: 'high', rateMultiplier: 4, moistureShare: 0.9 }],
  });
  manager = (await personWithToken('manager')).token;
  expect(await body(await call(sync, 'POST', '/api/patterns/sync', { token: manager, json: {} }))).toMatchObject({ upToDate: false });
  const list = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: manager }));
  recordId = list.items.find((i) => i.key === 'WLR-2:high')!.id;
  full = await getRecord(manager, recordId).then((r) => r.json);
  const perDepot = new Map<string, number>();
  for (const v of full.vehicleList) perDepot.set(v.depotCode, (perDepot.get(v.depotCode) ?? 0) + 1);
  const ranked = [...perDepot.entries()].sort((a, b) => b[1] - a[1]);
  expect(ranked.length, 'the cohort spans several depots').toBeGreaterThanOrEqual(2);
  [depotA, depotB] = [ranked[0]![0], ranked[1]![0]];
  supA = (await personWithToken('supervisor', [depotA])).token;
  supB = (await personWithToken('supervisor', [depotB])).token;
}, 120_000);

async function getRecord(token: string, id: number) {
  const r = await call(record, 'GET', `/api/patterns/${id}`, { token, params: { id: String(id) } });
  return { status: r.status, json: (await body(r)) as PatternRecordDetail };
}
const getReport = async (token: string) => body<PatternsReportResponse>(await call(report, 'GET', `/api/patterns?asOf=${loaded.fleet.asOf}`, { token }));
const mcfEvents = async (token: string) => {
  const s = await body<McfResponse>(await call(mcf, 'GET', `/api/patterns/mcf?module=WLR-2&asOf=${loaded.fleet.asOf}`, { token }));
  return s.series[0]!.points.reduce((n, p) => n + p.events, 0);
};
const depotIdOf = (code: string) => (getDb().$client.prepare('select id from depots where code = ?').get(code) as { id: number }).id;

describe('a defect stays in its own depot after its vehicle moves (S1)', () => {
  it('the pattern page, the report and the MCF of the new depot leave out the defects reported at the old one', async () => {
    // A cohort vehicle at A with WLR-2 failures, moved by the manager to B.
    const moved = full.vehicleList.find((v) => v.depotCode === depotA && v.failures >= 2 && !v.retiredDate)!;
    expect(moved).toBeDefined();
    const movedDefects = full.defectList.filter((d) => d.vehicleId === moved.id);
    expect(movedDefects.length).toBe(moved.failures);
    const before = { report: (await getReport(supB)).counts, events: await mcfEvents(supB) };

    const r = await call(vehicle, 'PATCH', `/api/vehicles/${moved.vin}`, { token: manager, params: { vin: moved.vin }, json: { depotCode: depotB } });
    expect(r.status).toBe(200);
    // The defects stay A's: B's supervisor cannot open them.
    for (const d of movedDefects) expect((await call(defect, 'GET', `/api/defects/${d.id}`, { token: supB, params: { id: String(d.id) } })).status).toBe(404);

    const seen = await getRecord(supB, recordId);
    expect(seen.status).toBe(200);
    const refs = new Set(movedDefects.map((d) => d.ref));
    expect(seen.json.defectList.filter((d) => refs.has(d.ref))).toEqual([]);
    expect(seen.json.defectList.every((d) => d.depotCode === depotB)).toBe(true);
    expect(JSON.stringify(seen.json)).not.toContain(movedDefects[0]!.ref);

    // B's report gains the vehicle, not A's failures; so do B's MCF curves.
    const after = (await getReport(supB)).counts;
    expect(after.vehicles).toBe(before.report.vehicles + 1);
    expect(after.failuresCounted).toBe(before.report.failuresCounted);
    expect(await mcfEvents(supB)).toBe(before.events);
    // Independently, in SQL: B's counted failures are the non-cancelled defects reported at B on vehicles now at B.
    const b = depotIdOf(depotB);
    const n = getDb().$client
      .prepare("select count(*) as n from defects d join vehicles v on v.id = d.vehicle_id where d.depot_id = ? and v.depot_id = ? and d.status <> 'cancelled'")
      .get(b, b) as { n: number };
    expect(after.failuresCounted + after.failuresIgnored).toBe(n.n);
  });
});

describe('a depot-scoped reader gets no figure computed from other depots (S2)', () => {
  it('the record: identity, verdict and status, with every figure over their depots only', async () => {
    const { status, json } = await getRecord(supA, recordId);
    expect(status).toBe(200);
    expect(json).toMatchObject({ id: recordId, key: 'WLR-2:high', buildFrom: full.buildFrom, buildTo: full.buildTo, status: full.status, waterIngress: full.waterIngress });
    expect(json).toMatchObject({ figuresScope: 'depots', depotCodes: [depotA], scope: 'depots', qValue: null });
    expect(json.cohort.search).toBeNull();
    // Independently: the cohort's vehicles at A are the fleet-wide cohort's vehicles at A, less the one moved to B
    // above; its failures are the defects reported at A on those vehicles.
    const movedAway = new Set(full.vehicleList.filter((v) => v.depotCode === depotA).map((v) => v.id));
    for (const v of json.vehicleList) expect(movedAway.has(v.id)).toBe(true);
    expect(json.cohort.vehicles).toBe(movedAway.size - 1);
    expect(json.vehicleList).toHaveLength(json.cohort.vehicles);
    const mine = new Set(json.vehicleList.map((v) => v.id));
    const expectedFailures = full.defectList.filter((d) => d.depotCode === depotA && mine.has(d.vehicleId)).length;
    expect(json.cohort.failures).toBe(expectedFailures);
    expect(json.failures).toBe(expectedFailures);
    expect(json.defectList).toHaveLength(expectedFailures);
    // Expected failures at A's own rate for WLR-2 (A's report as of the record's day), not the fleet's.
    const own = await body<PatternsReportResponse>(await call(report, 'GET', `/api/patterns?asOf=${json.snapshotAsOf}`, { token: supA }));
    const ownModule = own.modules.find((m) => m.moduleCode === 'WLR-2')!;
    expect(json.baseline).toMatchObject({ failures: ownModule.failures, vehicles: own.counts.vehiclesObserved });
    expect(json.cohort.fleetRatePerVehicleYear).toBeCloseTo(ownModule.ratePerVehicleYear, 12);
    expect(json.cohort.expected).toBeCloseTo(json.cohort.vehicleYears * ownModule.ratePerVehicleYear, 9);
    expect(json.expected).toBeCloseTo(json.cohort.expected, 12);
    // None of the fleet-wide figures is in the answer.
    expect(json.failures).toBeLessThan(full.failures);
    expect(json.vehicles).toBeLessThan(full.vehicles);
    expect(json.baseline!.failures).toBeLessThan(full.baseline!.failures);
    const found = json.history.find((h) => h.action === 'found')!;
    expect(found.text).toBe('Found in the fleet-wide report');
    expect(full.history.find((h) => h.action === 'found')!.text).toMatch(/failures vs/);
  });

  it('the records list and the Overview give the same depot figures, labelled as such', async () => {
    const detail = (await getRecord(supA, recordId)).json;
    const list = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: supA }));
    const item = list.items.find((i) => i.id === recordId)!;
    expect(item).toMatchObject({ figuresScope: 'depots', depotCodes: [depotA], qValue: null, vehicles: detail.vehicles, failures: detail.failures, repeatVehicles: detail.repeatVehicles });
    expect(item.expected).toBeCloseTo(detail.expected, 12);
    const managerItem = (await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: manager }))).items.find((i) => i.id === recordId)!;
    expect(managerItem).toMatchObject({ figuresScope: 'fleet', depotCodes: null, failures: full.failures, vehicles: full.vehicles });

    const o = await body<OverviewResponse>(await call(overview, 'GET', '/api/overview', { token: supA }));
    const row = o.patterns!.items.find((i) => i.id === recordId)!;
    expect(row).toMatchObject({ figuresScope: 'depots', failures: detail.failures, vehicles: detail.vehicles });
    expect(row.expected).toBeCloseTo(detail.expected, 12);
  });

  it('a depot with none of the cohort’s vehicles does not see the record', async () => {
    const codes = new Set(full.vehicleList.map((v) => v.depotCode));
    const elsewhere = loaded.fleet.depots.map((d) => d.code).find((c) => !codes.has(c) && c !== depotB)!;
    const other = (await personWithToken('supervisor', [elsewhere])).token;
    expect((await getRecord(other, recordId)).status).toBe(404);
    expect((await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: other }))).items).toEqual([]);
  });
});
