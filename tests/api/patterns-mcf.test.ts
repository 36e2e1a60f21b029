// The patterns routes on a tiny hand-made fleet: access rules, bad input in the error shape, and the mean
// cumulative function of CONTRACT.md checked against values worked out by hand below.
import { beforeAll, describe, expect, it } from 'vitest';
import { body, call } from '../setup/call';
import { baseFleet, importCsv, makeVin, personWithToken } from '../factories/fleet';
import * as report from '../../src/pages/api/patterns/index';
import * as mcf from '../../src/pages/api/patterns/mcf';
import * as records from '../../src/pages/api/patterns/records';
import * as sync from '../../src/pages/api/patterns/sync';
import * as record from '../../src/pages/api/patterns/[id]';
import * as status from '../../src/pages/api/patterns/[id]/status';
import * as evidence from '../../src/pages/api/patterns/[id]/evidence.csv';

let manager: string, admin: string, supNth: string, supSth: string, tech: string, viewer: string;

/*
 * The fleet (asOf 2024-01-01; NTH is wet and coastal, so its outdoor vans are in the high band; STH is dry, low band):
 *   V1 NTH in service 2023-01-01, observed to asOf: end age 365; WLR-2 failures at ages 10, 60, 300
 *   V2 NTH in service 2023-01-01, retired 2023-07-20: end age 200; WLR-2 failures at ages 60 and 200 (on its last day)
 *   V3 NTH in service 2023-07-01: end age 184; a WLR-2 failure at age 10, and a lock (LCK-1) failure that must not count
 *   V4 NTH in service 2023-01-01: end age 365; no failure
 *   V5 STH in service 2023-01-01: end age 365; no failure
 *   V6 NTH enters service 2024-02-01, after asOf: not a unit
 * Failures are written as date-times at 10:00Z, so the failure day is the day written.
 */
const V = Array.from({ length: 6 }, () => makeVin());

beforeAll(async () => {
  baseFleet();
  importCsv(
    'vehicles',
    'vin,fleet_number,build_date,in_service_date,retired_date,depot_code,parking,washes_per_month\n' +
      `${V[0]},M1,2022-12,2023-01-01,,NTH,outdoor,4\n` +
      `${V[1]},M2,2022-12,2023-01-01,2023-07-20,NTH,outdoor,4\n` +
      `${V[2]},M3,2023-06,2023-07-01,,NTH,outdoor,4\n` +
      `${V[3]},M4,2022-12,2023-01-01,,NTH,outdoor,4\n` +
      `${V[4]},M5,2022-12,2023-01-01,,STH,outdoor,4\n` +
      `${V[5]},M6,2024-01,2024-02-01,,NTH,outdoor,4\n`,
  );
  importCsv(
    'defects',
    'vin,reported_at,position,module_code,moisture,root_cause\n' +
      `${V[0]},2023-01-11T10:00:00Z,FL,WLR-2,traces,water_ingress\n` + // age 10
      `${V[0]},2023-03-02T10:00:00Z,FR,WLR-2,none,mechanical\n` + // age 60
      `${V[0]},2023-10-28T10:00:00Z,FL,WLR-2,corrosion,water_ingress\n` + // age 300
      `${V[1]},2023-03-02T10:00:00Z,FL,WLR-2,,\n` + // age 60
      `${V[1]},2023-07-20T10:00:00Z,FL,WLR-2,,\n` + // age 200, the day it retired
      `${V[2]},2023-07-11T10:00:00Z,FL,WLR-2,,\n` + // age 10
      `${V[2]},2023-07-11T10:00:00Z,FL,LCK-1,,\n` + // another module type
      `${V[5]},2024-03-01T10:00:00Z,FL,WLR-2,,\n`, // after asOf
  );
  manager = (await personWithToken('manager')).token;
  admin = (await personWithToken('admin')).token;
  supNth = (await personWithToken('supervisor', ['NTH'])).token;
  supSth = (await personWithToken('supervisor', ['STH'])).token;
  tech = (await personWithToken('technician', ['NTH'])).token;
  viewer = (await personWithToken('viewer')).token;
});

type Point = { ageDays: number; mcf: number; lower: number; upper: number; atRisk: number };
const series = async (token: string, query: string) => {
  const r = await call(mcf, 'GET', `/api/patterns/mcf?${query}`, { token });
  expect(r.status).toBe(200);
  return (await body<{ series: { key: string; points: Point[] }[] }>(r)).series;
};
function expectPoints(points: Point[], expected: [number, number, number, number, number][]) {
  expect(points.map((p) => [p.ageDays, p.atRisk])).toEqual(expected.map(([t, n]) => [t, n]));
  expected.forEach(([, , m, lo, hi], i) => {
    expect(points[i]!.mcf).toBeCloseTo(m, 10);
    expect(points[i]!.lower).toBeCloseTo(lo, 8);
    expect(points[i]!.upper).toBeCloseTo(hi, 8);
  });
}

describe('mean cumulative function, worked out by hand', () => {
  /*
   * NTH only (V1-V4). Distinct event ages 10, 60, 200, 300; n(t) = units with end age ≥ t (a unit ending at t is
   * still at risk): n(10) = n(60) = 4, n(200) = 3 (V3 ended at 184), n(300) = 2 (V1, V4).
   *   MCF(10) = 2/4 = 0.5; MCF(60) = 0.5 + 2/4 = 1; MCF(200) = 1 + 1/3 = 4/3; MCF(300) = 4/3 + 1/2 = 11/6.
   * Robust (Lawless–Nadeau) variance, REFERENCES.md §1 variant 2: each unit at risk adds (d_i − d/n)/n at each age;
   * Var(t) = Σ_i (its running sum)².
   *   t=10:  V1 +1/8, V2 −1/8, V3 +1/8, V4 −1/8                 → Var = 4/64 = 1/16
   *   t=60:  V1 +1/8, V2 +1/8, V3 −1/8, V4 −1/8; sums 1/4, 0, 0, −1/4 → Var = 1/8
   *   t=200: n=3, d/n=1/3: V1 −1/9, V2 +2/9, V4 −1/9; sums 5/36, 2/9, 0, −13/36 → Var = (25+64+169)/1296 = 43/216
   *   t=300: n=2: V1 +1/4, V4 −1/4; sums 7/18, 2/9, 0, −11/18 → Var = (49+16+121)/324 = 31/54
   * 95% limits, log-normal form (docs/patterns-method.md §6): MCF·exp(∓1.959964·√Var/MCF), e.g. at t=10:
   *   0.5·exp(∓1.959964·0.25/0.5) = 0.187658929 / 1.332204131 (python math.exp).
   */
  const nth: [number, number, number, number, number][] = [
    [10, 4, 0.5, 0.1876589287, 1.3322041308],
    [60, 4, 1, 0.5000976437, 1.9996095014],
    [200, 3, 4 / 3, 0.6919882335, 2.5690867152],
    [300, 2, 11 / 6, 0.8155645965, 4.12120772],
  ];

  it('a supervisor of NTH gets the NTH vehicles only', async () => {
    const s = await series(supNth, 'module=WLR-2&asOf=2024-01-01');
    expect(s.map((x) => x.key)).toEqual(['all']);
    expectPoints(s[0]!.points, nth);
  });

  it('by exposure band: the NTH vans make the high band, the STH van the low band (no events)', async () => {
    const s = await series(manager, 'module=wlr-2&asOf=2024-01-01&by=exposureBand');
    expect(s.map((x) => x.key)).toEqual(['low', 'high']);
    expect(s[0]!.points).toEqual([]);
    expectPoints(s[1]!.points, nth);
  });

  /*
   * Every depot (V1-V5): V5 adds one unit at risk throughout. n = 5, 5, 4, 3.
   *   MCF = 2/5, 4/5, 4/5 + 1/4 = 21/20, 21/20 + 1/3 = 83/60.
   *   t=10: V1, V3 +(1 − 2/5)/5 = 0.12; V2, V4, V5 −0.08      → Var = 2·0.0144 + 3·0.0064 = 0.048
   *   t=60: V1, V2 +0.12; V3, V4, V5 −0.08; sums 0.24, 0.04, 0.04, −0.16, −0.16 → Var = 0.112
   *   t=200: n=4: V2 +3/16, V1, V4, V5 −1/16 → sums 0.1775, 0.2275, 0.04, −0.2225, −0.2225 → Var = 0.183875
   *   t=300: n=3: V1 +2/9, V4, V5 −1/9 → Var = 0.4357268519 (= 94117/216000)
   */
  it('a manager gets every depot', async () => {
    const s = await series(manager, 'module=WLR-2&asOf=2024-01-01');
    expectPoints(s[0]!.points, [
      [10, 5, 0.4, 0.1367217804, 1.1702597753],
      [60, 5, 0.8, 0.352376416, 1.8162395973],
      [200, 4, 1.05, 0.471595385, 2.3378091368],
      [300, 3, 83 / 60, 0.5429405499, 3.5245315746],
    ]);
  });

  it('a supervisor of STH sees one unit and no events', async () => {
    const s = await series(supSth, 'module=WLR-2&asOf=2024-01-01');
    expect(s).toEqual([{ key: 'all', points: [] }]);
  });

  it('the report lists the contract fields for each cohort', async () => {
    const r = await call(report, 'GET', '/api/patterns?asOf=2024-01-01', { token: manager });
    expect(r.status).toBe(200);
    const j = await body(r);
    expect(j.asOf).toBe('2024-01-01');
    expect(Array.isArray(j.cohorts)).toBe(true);
    for (const c of j.cohorts) {
      for (const k of ['id', 'moduleCode', 'buildFrom', 'buildTo', 'exposureBand', 'vehicles', 'vehicleYears', 'failures', 'expected', 'rateRatio', 'ciLow', 'ciHigh', 'pValue', 'qValue', 'moistureShare', 'repeatVehicles', 'significant', 'waterIngress']) {
        expect(c).toHaveProperty(k);
      }
      expect(c.record).toBeNull();
    }
  });
});

describe('access', () => {
  const routes = [
    { name: 'report', mod: report, method: 'GET', url: '/api/patterns' },
    { name: 'mcf', mod: mcf, method: 'GET', url: '/api/patterns/mcf?module=WLR-2' },
    { name: 'records', mod: records, method: 'GET', url: '/api/patterns/records' },
    { name: 'record', mod: record, method: 'GET', url: '/api/patterns/1', params: { id: '1' } },
    { name: 'evidence', mod: evidence, method: 'GET', url: '/api/patterns/1/evidence.csv', params: { id: '1' } },
    { name: 'sync', mod: sync, method: 'POST', url: '/api/patterns/sync', json: {} },
    { name: 'status', mod: status, method: 'POST', url: '/api/patterns/1/status', params: { id: '1' }, json: { status: 'acknowledged' } },
  ] as const;

  it.each(routes)('$name answers 401 without credentials', async (rt) => {
    const r = await call(rt.mod, rt.method, rt.url, { params: 'params' in rt ? { ...rt.params } : {}, json: 'json' in rt ? rt.json : undefined });
    expect(r.status).toBe(401);
    expect((await body(r)).error.code).toBe('UNAUTHENTICATED');
  });

  it.each(routes)('$name answers 403 to technicians and viewers', async (rt) => {
    for (const token of [tech, viewer]) {
      const r = await call(rt.mod, rt.method, rt.url, { token, params: 'params' in rt ? { ...rt.params } : {}, json: 'json' in rt ? rt.json : undefined });
      expect(r.status).toBe(403);
      expect((await body(r)).error.code).toBe('FORBIDDEN');
    }
  });

  it('supervisors may read but not sync, change a status or take the evidence CSV', async () => {
    expect((await call(report, 'GET', '/api/patterns?asOf=2024-01-01', { token: supNth })).status).toBe(200);
    expect((await call(records, 'GET', '/api/patterns/records', { token: supNth })).status).toBe(200);
    expect((await call(sync, 'POST', '/api/patterns/sync', { token: supNth, json: {} })).status).toBe(403);
    expect((await call(status, 'POST', '/api/patterns/1/status', { token: supNth, params: { id: '1' }, json: { status: 'acknowledged' } })).status).toBe(403);
    expect((await call(evidence, 'GET', '/api/patterns/1/evidence.csv', { token: supNth, params: { id: '1' } })).status).toBe(403);
  });

  it('other methods are 405 for signed-in callers', async () => {
    expect((await call(report, 'DELETE', '/api/patterns', { token: manager })).status).toBe(405);
    expect((await call(sync, 'GET', '/api/patterns/sync', { token: manager })).status).toBe(405);
  });
});

describe('bad input comes back in the error shape, never a 500', () => {
  const bad = async (mod: Parameters<typeof call>[0], method: string, url: string, status: number, extra: Parameters<typeof call>[3] = {}) => {
    const r = await call(mod, method, url, { token: admin, ...extra });
    expect(r.status, url).toBe(status);
    const j = await body(r);
    expect(typeof j.error.code).toBe('string');
    expect(typeof j.error.message).toBe('string');
    return j.error;
  };

  it('asOf must be a real date', async () => {
    for (const asOf of ['2024-02-30', '2024-1-1', 'yesterday', '20240101', "2024-01-01'--"]) {
      const e = await bad(report, 'GET', `/api/patterns?asOf=${encodeURIComponent(asOf)}`, 400);
      expect(e.code).toBe('INVALID_INPUT');
      await bad(mcf, 'GET', `/api/patterns/mcf?module=WLR-2&asOf=${encodeURIComponent(asOf)}`, 400);
    }
  });

  it('a date before any vehicle was in service gives an empty report', async () => {
    const r = await call(report, 'GET', '/api/patterns?asOf=1999-01-01', { token: admin });
    expect(r.status).toBe(200);
    expect((await body(r)).cohorts).toEqual([]);
  });

  it('module is required and must exist; by may only be exposureBand', async () => {
    expect((await bad(mcf, 'GET', '/api/patterns/mcf', 400)).code).toBe('INVALID_INPUT');
    expect((await bad(mcf, 'GET', '/api/patterns/mcf?module=NOPE-9', 404)).code).toBe('NOT_FOUND');
    expect((await bad(mcf, 'GET', `/api/patterns/mcf?module=${'X'.repeat(40)}`, 400)).code).toBe('INVALID_INPUT');
    expect((await bad(mcf, 'GET', '/api/patterns/mcf?module=WLR-2&by=depot', 400)).code).toBe('INVALID_INPUT');
  });

  it('unknown or malformed pattern ids are 404', async () => {
    for (const id of ['999', 'abc', '-1', '1e3', '99999999999999999999']) {
      expect((await bad(record, 'GET', `/api/patterns/${id}`, 404, { params: { id } })).code).toBe('NOT_FOUND');
      await bad(evidence, 'GET', `/api/patterns/${id}/evidence.csv`, 404, { params: { id } });
    }
    await bad(status, 'POST', '/api/patterns/999/status', 404, { params: { id: '999' }, json: { status: 'acknowledged' } });
  });

  it('status bodies are checked before anything else', async () => {
    const cases: unknown[] = [
      {},
      { status: 'new' },
      { status: 'resolved', note: 5 },
      { status: 'dismissed' },
      { status: 'dismissed', reason: ' ' },
      { status: 'campaign_planned' },
      { status: 'campaign_planned', campaign: { kind: 'paint', note: 'x y z', targetDate: '2027-01-01' } },
      { status: 'campaign_planned', campaign: { kind: 'inspect_cohort', note: 'check doors', targetDate: '2027-02-30' } },
      { status: 'acknowledged', version: 'one' },
      { status: 'acknowledged', note: 'x'.repeat(2001) },
    ];
    for (const json of cases) {
      const e = await bad(status, 'POST', '/api/patterns/1/status', 400, { params: { id: '1' }, json });
      expect(e.code).toBe('INVALID_INPUT');
    }
    const r = await call(status, 'POST', '/api/patterns/1/status', { token: admin, params: { id: '1' }, body: 'not json', headers: { 'content-type': 'application/json' } });
    expect(r.status).toBe(400);
    const t = await call(status, 'POST', '/api/patterns/1/status', { token: admin, params: { id: '1' }, body: 'status=acknowledged', headers: { 'content-type': 'text/plain' } });
    expect(t.status).toBe(415);
  });

  it('records filters are validated', async () => {
    expect((await bad(records, 'GET', '/api/patterns/records?status=closed', 400)).code).toBe('INVALID_INPUT');
    expect((await bad(records, 'GET', '/api/patterns/records?water=maybe', 400)).code).toBe('INVALID_INPUT');
    const ok = await call(records, 'GET', '/api/patterns/records?status=new,dismissed&water=1&module=WLR-2', { token: admin });
    expect(ok.status).toBe(200);
    expect(await body(ok)).toMatchObject({ items: [], total: 0 });
  });
});
