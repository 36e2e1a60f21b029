// The Overview figures against tests/factories/overview-fleet.ts, whose right answers are worked out by hand
// from how it is built (below), then GET /api/overview's access rules and a check that every figure's link
// opens a Defects list with exactly that many rows.
//
// Twelve-month window as of 2026-06-15: 2025-07-01 onwards. Defects in it: D2 D3 D4 D5 D6 D7 D9 D10 D11 (9);
// repeats D2 D3 D6 (3). NTH: D2 D3 D4 D5 D6 (5 reported, 3 repeats); STH: D7 D9 D10 D11 (4, 0).
// WLR-2: D2 D3 D7 D9 D10 D11 (6, 2); LCK-1: D4 D5 D6 (3, 1). Open: D4 diagnosing and D6 awaiting parts at NTH,
// D7 reported and D10 verified at STH. Open more than 30 days before 2026-06-15: D4, D6.
import { beforeAll, describe, expect, it } from 'vitest';
import { call, body } from '../setup/call';
import { baseFleet, personWithToken } from '../factories/fleet';
import { buildOverviewFleet, OVERVIEW_NOW } from '../factories/overview-fleet';
import * as overviewRoute from '../../src/pages/api/overview';
import * as defectsRoute from '../../src/pages/api/defects/index';
import { getOverview } from '../../src/server/overview';
import type { OverviewResponse } from '../../src/lib/contracts/overview';
import type { SessionUser } from '../../src/server/auth';

let admin: string, supNth: string, techNth: string, viewerSth: string, techId: number;
const adminUser: SessionUser = { id: 0, email: 'x', name: 'x', role: 'admin', depotIds: null, via: 'token' } as SessionUser;

beforeAll(async () => {
  baseFleet();
  admin = (await personWithToken('admin')).token;
  supNth = (await personWithToken('supervisor', ['NTH'])).token;
  const t = await personWithToken('technician', ['NTH']);
  techNth = t.token;
  techId = t.id;
  viewerSth = (await personWithToken('viewer', ['STH'])).token;
  buildOverviewFleet(techId);
});

const counts = (m: { reported: number; repeats: number; rate: number | null }) => [m.reported, m.repeats, m.rate];

describe('getOverview figures (as of 2026-06-15)', () => {
  let o: OverviewResponse;
  beforeAll(() => {
    o = getOverview(adminUser, OVERVIEW_NOW);
  });

  it('counts open work by status and depot', () => {
    expect(o.openTotal).toBe(4);
    expect(o.openByStatus).toEqual({ reported: 1, diagnosing: 1, awaiting_parts: 1, repaired: 0, verified: 1 });
    const nth = o.depots.find((d) => d.code === 'NTH')!;
    const sth = o.depots.find((d) => d.code === 'STH')!;
    expect(nth.open).toEqual({ reported: 0, diagnosing: 1, awaiting_parts: 1, repaired: 0, verified: 0 });
    expect(sth.open).toEqual({ reported: 1, diagnosing: 0, awaiting_parts: 0, repaired: 0, verified: 1 });
    expect([nth.openTotal, sth.openTotal]).toEqual([2, 2]);
  });
  it('counts vehicles in service and off road', () => {
    expect([o.vehiclesInService, o.offRoad]).toEqual([4, 1]);
    expect(o.depots.map((d) => [d.code, d.vehiclesInService, d.offRoad])).toEqual([
      ['NTH', 2, 1],
      ['STH', 2, 0],
    ]);
  });
  it('counts what has been open for more than 30 days and lists the oldest open first', () => {
    expect(o.staleDays).toBe(30);
    expect(o.openStale).toBe(2);
    expect(o.oldest.map((d) => d.ref)).toEqual(['D4', 'D6', 'D7', 'D10']);
    expect(o.oldest[0]!.ageDays).toBe(151);
    expect(o.oldest[1]).toMatchObject({ ref: 'D6', repeatOfRef: 'D5' });
  });
  it('counts reported and repeats over the twelve-month window, the first instant of the window included', () => {
    expect(o.windowFrom).toBe('2025-07-01');
    expect(counts(o.window)).toEqual([9, 3, 1 / 3]);
  });
  it('gives the monthly trend with zero months', () => {
    expect(o.trend.map((m) => [m.month, m.reported, m.repeats])).toEqual([
      ['2025-07', 2, 1],
      ['2025-08', 0, 0],
      ['2025-09', 1, 1],
      ['2025-10', 0, 0],
      ['2025-11', 0, 0],
      ['2025-12', 0, 0],
      ['2026-01', 1, 0],
      ['2026-02', 1, 0],
      ['2026-03', 1, 0],
      ['2026-04', 0, 0],
      ['2026-05', 1, 1],
      ['2026-06', 2, 0],
    ]);
    expect(o.trend[0]).toMatchObject({ from: '2025-07-01', to: '2025-07-31', rate: 0.5 });
    expect(o.trend[1]!.rate).toBeNull();
  });
  it('marks the month still running (June 2026, as of the 15th) as partial, and only that one', () => {
    expect(o.trend.filter((m) => m.partial).map((m) => m.month)).toEqual(['2026-06']);
    expect(o.windowTo).toBe('2026-06-15');
    expect(o.oldest[0]!.depotTimeZone).toBe('Europe/London');
  });
  it('counts repeats per depot and per module type', () => {
    expect(o.depots.map((d) => [d.code, ...counts(d)])).toEqual([
      ['NTH', 5, 3, 0.6],
      ['STH', 4, 0, 0],
    ]);
    expect(o.modules.map((m) => [m.code, ...counts(m)])).toEqual([
      ['WLR-2', 6, 2, 1 / 3],
      ['LCK-1', 3, 1, 1 / 3],
    ]);
  });
  it('keeps a supervisor to their depot and gives a technician their own open work', () => {
    const sup = getOverview({ ...adminUser, role: 'supervisor', depotIds: [1] }, OVERVIEW_NOW);
    expect(sup.depots.map((d) => d.code)).toEqual(['NTH']);
    expect([sup.openTotal, sup.window.reported, sup.window.repeats, sup.offRoad]).toEqual([2, 5, 3, 1]);
    expect(sup.mine).toBeNull();
    const tech = getOverview({ ...adminUser, id: techId, role: 'technician', depotIds: [1] }, OVERVIEW_NOW);
    expect(tech.mine?.total).toBe(1);
    expect(tech.mine?.items.map((d) => d.ref)).toEqual(['D4']);
  });
  it('shows an empty scope as zeros, not an error', () => {
    const none = getOverview({ ...adminUser, role: 'viewer', depotIds: [] }, OVERVIEW_NOW);
    expect([none.openTotal, none.window.reported, none.depots.length, none.modules.length, none.oldest.length]).toEqual([0, 0, 0, 0, 0]);
    expect(none.window.rate).toBeNull();
  });
});

describe('GET /api/overview', () => {
  it('answers 401 without credentials and 405 for writes', async () => {
    const r = await call(overviewRoute, 'GET', '/api/overview');
    expect(r.status).toBe(401);
    expect((await body(r)).error.code).toBe('UNAUTHENTICATED');
    expect((await call(overviewRoute, 'POST', '/api/overview', { token: admin })).status).toBe(405);
  });
  it('answers per role and scope', async () => {
    const all = (await body(await call(overviewRoute, 'GET', '/api/overview', { token: admin }))) as OverviewResponse;
    expect([all.role, all.allDepots, all.openTotal, all.depots.length, all.mine]).toEqual(['admin', true, 4, 2, null]);
    const sup = (await body(await call(overviewRoute, 'GET', '/api/overview', { token: supNth }))) as OverviewResponse;
    expect([sup.allDepots, sup.openTotal, sup.depots.map((d) => d.code)]).toEqual([false, 2, ['NTH']]);
    const tech = (await body(await call(overviewRoute, 'GET', '/api/overview', { token: techNth }))) as OverviewResponse;
    expect(tech.mine?.items.map((d) => d.ref)).toEqual(['D4']);
    const viewer = (await body(await call(overviewRoute, 'GET', '/api/overview', { token: viewerSth }))) as OverviewResponse;
    expect([viewer.role, viewer.openTotal, viewer.depots.map((d) => d.code), viewer.oldest.map((d) => d.ref)]).toEqual(['viewer', 2, ['STH'], ['D7', 'D10']]);
  });
});

describe('every Overview figure links to a list with that many defects', () => {
  async function listTotal(query: string, token = admin): Promise<number> {
    const r = await call(defectsRoute, 'GET', `/api/defects?${query}`, { token });
    expect(r.status, query).toBe(200);
    return (await body(r)).total;
  }

  it('for the window, month, depot, module and status figures', async () => {
    const o = getOverview(adminUser, OVERVIEW_NOW);
    const w = o.windowFrom;
    expect(await listTotal(`reportedFrom=${w}`)).toBe(o.window.reported);
    expect(await listTotal(`repeat=1&reportedFrom=${w}`)).toBe(o.window.repeats);
    for (const m of o.trend) {
      expect(await listTotal(`reportedFrom=${m.from}&reportedTo=${m.to}`), m.month).toBe(m.reported);
      expect(await listTotal(`repeat=1&reportedFrom=${m.from}&reportedTo=${m.to}`), m.month).toBe(m.repeats);
    }
    for (const d of o.depots) {
      expect(await listTotal(`depot=${d.code}&reportedFrom=${w}`)).toBe(d.reported);
      expect(await listTotal(`depot=${d.code}&repeat=1&reportedFrom=${w}`)).toBe(d.repeats);
      expect(await listTotal(`depot=${d.code}&open=1`)).toBe(d.openTotal);
      for (const [s, n] of Object.entries(d.open)) expect(await listTotal(`depot=${d.code}&status=${s}`), `${d.code} ${s}`).toBe(n);
    }
    for (const m of o.modules) {
      expect(await listTotal(`module=${m.code}&reportedFrom=${w}`)).toBe(m.reported);
      expect(await listTotal(`module=${m.code}&repeat=1&reportedFrom=${w}`)).toBe(m.repeats);
    }
    expect(await listTotal('open=1')).toBe(o.openTotal);
  });
  it('for the figures that count from now (open for long, my open work)', async () => {
    const live = (await body(await call(overviewRoute, 'GET', '/api/overview', { token: techNth }))) as OverviewResponse;
    expect(await listTotal(`open=1&olderThanDays=${live.staleDays}`, techNth)).toBe(live.openStale);
    expect(await listTotal('mine=1&open=1', techNth)).toBe(live.mine!.total);
  });
});
