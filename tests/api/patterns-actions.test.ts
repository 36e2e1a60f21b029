// Campaigns (target dates, overdue, revisions, the last campaign after it is resolved), the as-of view of the
// report, the read-only group route and the MCF cohort comparison, on a generated fleet with one planted wet cohort.
import { beforeAll, describe, expect, it } from 'vitest';
import { body, call } from '../setup/call';
import { personWithToken } from '../factories/fleet';
import { loadGeneratedFleet, type LoadedFleet } from '../factories/patterns-fleet';
import { getDb } from '../../src/db/client';
import { changePatternStatus } from '../../src/server/patterns-records';
import { overlapMonths } from '../../src/lib/patterns/records';
import type { McfResponse, PatternGroupDetail, PatternRecordDetail, PatternRecordsResponse, PatternsReportResponse } from '../../src/lib/contracts/patterns';
import type { OverviewResponse } from '../../src/lib/contracts/overview';
import * as report from '../../src/pages/api/patterns/index';
import * as mcf from '../../src/pages/api/patterns/mcf';
import * as records from '../../src/pages/api/patterns/records';
import * as sync from '../../src/pages/api/patterns/sync';
import * as record from '../../src/pages/api/patterns/[id]';
import * as status from '../../src/pages/api/patterns/[id]/status';
import * as group from '../../src/pages/api/patterns/group';
import * as overview from '../../src/pages/api/overview';

let loaded: LoadedFleet;
let manager: { token: string; id: number };
let recordId = 0;

const today = () => new Date().toISOString().slice(0, 10);
const daysAhead = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);
const getRecord = async (token: string, id = recordId) => body<PatternRecordDetail>(await call(record, 'GET', `/api/patterns/${id}`, { token, params: { id: String(id) } }));
const move = (token: string, json: unknown) => call(status, 'POST', `/api/patterns/${recordId}/status`, { token, params: { id: String(recordId) }, json });
const auditCount = () => (getDb().$client.prepare("select count(*) as n from audit_log where entity = 'pattern' and entity_id = ?").get(String(recordId)) as { n: number }).n;
const lastAudit = (n: number) =>
  (getDb().$client.prepare("select action, field, old_value as oldValue, new_value as newValue from audit_log where entity = 'pattern' and entity_id = ? order by id desc limit ?").all(String(recordId), n) as { action: string; field: string; oldValue: string | null; newValue: string | null }[]).reverse();

beforeAll(async () => {
  loaded = loadGeneratedFleet({
    seed: 2,
    vehicleCount: 3000,
    planted: [{ label: 'wet', moduleCode: 'WLR-2', buildFrom: '2021-03', buildTo: '2021-09', band: 'high', rateMultiplier: 4, moistureShare: 0.9 }],
  });
  manager = await personWithToken('manager');
  await call(sync, 'POST', '/api/patterns/sync', { token: manager.token, json: {} });
  const list = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: manager.token }));
  recordId = list.items.find((i) => i.key === 'WLR-2:high')!.id;
}, 120_000);

describe('campaign target dates (C1)', () => {
  it('a target date before today is refused in the error shape, and nothing is written', async () => {
    const before = auditCount();
    const r = await move(manager.token, { status: 'campaign_planned', campaign: { kind: 'inspect_cohort', note: 'Inspect every van', targetDate: '2019-01-01' } });
    expect(r.status).toBe(400);
    const j = await body(r);
    expect(j.error.code).toBe('INVALID_INPUT');
    expect(j.error.message).toMatch(/in the past/);
    expect(j.error.issues).toEqual([expect.objectContaining({ path: 'campaign.targetDate' })]);
    expect(auditCount()).toBe(before);
    expect(await getRecord(manager.token)).toMatchObject({ status: 'new', version: 1, campaign: null });
  });

  it('today is accepted', async () => {
    const r = await move(manager.token, { status: 'campaign_planned', campaign: { kind: 'inspect_cohort', note: 'Inspect every van', targetDate: today() }, version: 1 });
    expect(r.status).toBe(200);
    expect(await body(r)).toMatchObject({ status: 'campaign_planned', campaign: { targetDate: today(), inForce: true, overdue: false } });
  });
});

describe('revising a campaign (C2)', () => {
  it('records "campaign revised" with only the changed field, as one history entry', async () => {
    const before = auditCount();
    const target = daysAhead(60);
    const r = await move(manager.token, { status: 'campaign_planned', campaign: { kind: 'inspect_cohort', note: 'Inspect every van', targetDate: target } });
    expect(r.status).toBe(200);
    expect(auditCount()).toBe(before + 1);
    expect(lastAudit(1)).toEqual([{ action: 'campaign_revised', field: 'campaignTargetDate', oldValue: today(), newValue: target }]);
    const j = (await body(r)) as PatternRecordDetail;
    expect(j.history[0]).toMatchObject({ action: 'campaign_revised', changes: [{ field: 'campaignTargetDate', oldValue: today(), newValue: target }] });
    expect(j.history.filter((h) => h.action === 'campaign_revised')).toHaveLength(1);
  });

  it('a revision that changes nothing is refused; one with a note and a new kind is one entry of two fields', async () => {
    const current = await getRecord(manager.token);
    const same = { kind: current.campaign!.kind, note: current.campaign!.note, targetDate: current.campaign!.targetDate };
    const before = auditCount();
    const r = await move(manager.token, { status: 'campaign_planned', campaign: same });
    expect(r.status).toBe(400);
    expect((await body(r)).error.message).toMatch(/Nothing to change/);
    expect(auditCount()).toBe(before);
    const ok = await move(manager.token, { status: 'campaign_planned', campaign: { ...same, kind: 'new_membranes' }, note: 'Membranes found torn on the first vans' });
    expect(ok.status).toBe(200);
    expect(lastAudit(2).map((a) => [a.action, a.field])).toEqual([
      ['campaign_revised', 'campaignKind'],
      ['campaign_revised', 'note'],
    ]);
    expect(((await body(ok)) as PatternRecordDetail).history[0]!.changes.map((c) => c.field)).toEqual(['campaignKind', 'note']);
  });
});

describe('an overdue campaign (C1)', () => {
  it('shows as overdue on the record, the records list, the report and the Overview', async () => {
    // Planned on 2025-01-01 for 2025-06-30: valid then, past now.
    const user = { id: manager.id, email: 'm', name: 'M', role: 'manager' as const, depotIds: null, via: 'token' as const };
    changePatternStatus(user, recordId, { status: 'campaign_planned', campaign: { kind: 'new_membranes', note: 'Fit new membranes', targetDate: '2025-06-30' } }, { userId: manager.id }, Date.parse('2025-01-01T09:00:00Z'));
    expect((await getRecord(manager.token)).campaign).toMatchObject({ targetDate: '2025-06-30', inForce: true, overdue: true });
    const list = await body<PatternRecordsResponse>(await call(records, 'GET', '/api/patterns/records', { token: manager.token }));
    expect(list.items.find((i) => i.id === recordId)!.campaign).toMatchObject({ overdue: true });
    const rep = await body<PatternsReportResponse>(await call(report, 'GET', '/api/patterns', { token: manager.token }));
    expect(rep.cohorts.find((c) => c.record?.id === recordId)!.record).toMatchObject({ overdue: true });
    const o = await body<OverviewResponse>(await call(overview, 'GET', '/api/overview', { token: manager.token }));
    expect(o.patterns!.overdue).toBe(1);
    expect(o.patterns!.items.find((i) => i.id === recordId)).toMatchObject({ overdue: true, campaignTargetDate: '2025-06-30', needsAttention: true });
  });
});

describe('the last campaign after it is resolved (E5)', () => {
  it('is no longer in force, and says when it was resolved', async () => {
    expect((await move(manager.token, { status: 'resolved', note: 'Done' })).status).toBe(200);
    const resolved = await getRecord(manager.token);
    expect(resolved.campaign).toMatchObject({ inForce: false, overdue: false });
    const at = resolved.campaignResolvedAt!;
    expect(Date.now() - Date.parse(at)).toBeLessThan(60_000);
    expect((await move(manager.token, { status: 'acknowledged', note: 'Failures again' })).status).toBe(200);
    const reopened = await getRecord(manager.token);
    expect(reopened).toMatchObject({ status: 'acknowledged', campaign: { inForce: false, overdue: false }, campaignResolvedAt: at });
  });
});

describe('the report as of a past day (T1)', () => {
  it('names a record only for significant cohorts', async () => {
    const rec = await getRecord(manager.token);
    // Walk back until the WLR-2 high group is no longer significant but its range still overlaps the record's.
    let checked = false;
    for (const asOf of ['2022-12-31', '2022-06-30', '2021-12-31', '2023-06-30']) {
      const rep = await body<PatternsReportResponse>(await call(report, 'GET', `/api/patterns?asOf=${asOf}`, { token: manager.token }));
      for (const c of rep.cohorts) if (c.record) expect(c.significant, `${c.key} at ${asOf}`).toBe(true);
      const weak = rep.cohorts.find((c) => c.key === 'WLR-2:high' && !c.significant && overlapMonths(c, rec) > 0);
      if (weak) {
        expect(weak.record).toBeNull();
        checked = true;
      }
    }
    expect(checked, 'a past day with a weaker, overlapping WLR-2 high group').toBe(true);
  });
});

describe('GET /api/patterns/group (T2)', () => {
  it('any group of the report, significant or not, with the vehicles and defects behind it', async () => {
    const asOf = loaded.fleet.asOf;
    const rep = await body<PatternsReportResponse>(await call(report, 'GET', `/api/patterns?asOf=${asOf}`, { token: manager.token }));
    const weak = rep.cohorts.find((c) => !c.significant)!;
    const [moduleCode, band] = weak.key.split(':');
    const r = await call(group, 'GET', `/api/patterns/group?module=${moduleCode}&band=${band}&asOf=${asOf}`, { token: manager.token });
    expect(r.status).toBe(200);
    const g = (await body(r)) as PatternGroupDetail;
    expect(g).toMatchObject({ asOf, scope: 'all', depotCodes: null, record: null, cohortsTested: rep.counts.cohortsTested });
    expect(g.cohort).toMatchObject({ id: weak.id, vehicles: weak.vehicles, failures: weak.failures, significant: false, verdict: 'not_significant' });
    expect(g.cohort.search).toMatchObject({ qValue: weak.qValue, pValue: weak.pValue, windowsTested: weak.windowsTested });
    expect(g.vehicleList).toHaveLength(weak.vehicles);
    expect(g.defectList).toHaveLength(weak.failures);
    expect(g.cohort.byMonth.filter((m) => m.inCohort).map((m) => m.month)[0]).toBe(weak.buildFrom);

    const strong = await body<PatternGroupDetail>(await call(group, 'GET', `/api/patterns/group?module=wlr-2&band=high`, { token: manager.token }));
    expect(strong.record).toMatchObject({ id: recordId });
  });

  it('401, 403, 400 and 404 in the error shape', async () => {
    expect((await call(group, 'GET', '/api/patterns/group?module=WLR-2&band=high')).status).toBe(401);
    const tech = await personWithToken('technician', [loaded.fleet.depots[0]!.code]);
    expect((await call(group, 'GET', '/api/patterns/group?module=WLR-2&band=high', { token: tech.token })).status).toBe(403);
    const bad = await call(group, 'GET', '/api/patterns/group?module=WLR-2&band=wet', { token: manager.token });
    expect(bad.status).toBe(400);
    expect((await body(bad)).error.code).toBe('INVALID_INPUT');
    expect((await call(group, 'GET', '/api/patterns/group?module=WLR-2&band=high&asOf=2024-13-01', { token: manager.token })).status).toBe(400);
    const none = await call(group, 'GET', '/api/patterns/group?module=NOPE-1&band=high', { token: manager.token });
    expect(none.status).toBe(404);
    expect((await body(none)).error.code).toBe('NOT_FOUND');
  });

  it('a supervisor reads the group of their own depots’ report', async () => {
    const code = loaded.fleet.depots[0]!.code;
    const sup = await personWithToken('supervisor', [code]);
    const own = await body<PatternsReportResponse>(await call(report, 'GET', `/api/patterns?asOf=${loaded.fleet.asOf}`, { token: sup.token }));
    const c = own.cohorts[0]!;
    const [m, b] = c.key.split(':');
    const g = await body<PatternGroupDetail>(await call(group, 'GET', `/api/patterns/group?module=${m}&band=${b}&asOf=${loaded.fleet.asOf}`, { token: sup.token }));
    expect(g).toMatchObject({ scope: 'depots', depotCodes: [code] });
    expect(g.cohort).toMatchObject({ id: c.id, failures: c.failures, vehicles: c.vehicles });
    expect(new Set(g.vehicleList.map((v) => v.depotCode))).toEqual(new Set([code]));
    expect(g.defectList.every((d) => d.depotCode === code)).toBe(true);
  });
});

describe('GET /api/patterns/mcf with a cohort to compare (T4)', () => {
  it('adds the cohort and the rest of its band; their events add up to the band’s curve', async () => {
    const q = `module=WLR-2&asOf=${loaded.fleet.asOf}&by=exposureBand`;
    const plain = await body<McfResponse>(await call(mcf, 'GET', `/api/patterns/mcf?${q}`, { token: manager.token }));
    expect(plain).not.toHaveProperty('compare');
    const r = await body<McfResponse>(await call(mcf, 'GET', `/api/patterns/mcf?${q}&band=high&buildFrom=2021-03&buildTo=2021-09`, { token: manager.token }));
    expect(r.series).toEqual(plain.series);
    expect(r.compare).toMatchObject({ band: 'high', buildFrom: '2021-03', buildTo: '2021-09' });
    expect(r.compare!.series.map((s) => s.key)).toEqual(['cohort', 'rest']);
    const events = (pts: { events: number }[]) => pts.reduce((n, p) => n + p.events, 0);
    const high = r.series.find((s) => s.key === 'high')!;
    expect(events(r.compare!.series[0]!.points) + events(r.compare!.series[1]!.points)).toBe(events(high.points));
    // At the first age, the cohort's and the rest's vehicles at risk make up the band's.
    const [c0, r0, h0] = [r.compare!.series[0]!.points[0]!, r.compare!.series[1]!.points[0]!, high.points[0]!];
    expect(Math.max(c0.atRisk, r0.atRisk)).toBeLessThanOrEqual(h0.atRisk);
    // The planted cohort fails more per vehicle than the rest of its band.
    expect(r.compare!.series[0]!.points.at(-1)!.mcf).toBeGreaterThan(r.compare!.series[1]!.points.at(-1)!.mcf);
  });

  it('refuses a partial or malformed comparison with 400', async () => {
    for (const extra of ['band=high', 'band=high&buildFrom=2021-03', 'band=wet&buildFrom=2021-03&buildTo=2021-09', 'band=high&buildFrom=2021-9&buildTo=2021-10', 'band=high&buildFrom=2021-09&buildTo=2021-03']) {
      const r = await call(mcf, 'GET', `/api/patterns/mcf?module=WLR-2&${extra}`, { token: manager.token });
      expect(r.status, extra).toBe(400);
      expect((await body(r)).error.code).toBe('INVALID_INPUT');
    }
  });
});
