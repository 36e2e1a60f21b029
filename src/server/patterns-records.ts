/**
 * Pattern records: patterns kept across re-runs of the report so that fleet managers can act on them (status,
 * campaign, audit trail), synced from the fleet-wide report, and read by supervisors for their depots — with every
 * figure recomputed over their depots, never the fleet's. Identity and sync: docs/decisions/011-pattern-records.md;
 * what a depot-scoped reader sees: docs/decisions/013-pattern-figures-per-depot.md. Edit when a record gains a field
 * or a status gains a rule.
 */
import { and, desc, eq, gt, inArray, sql, type SQL } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { attachments, defects, depots, modules, patternRecords, patternSyncs, users, vehicles } from '@/db/schema';
import { computeExposureScore } from '@/lib/patterns/exposure';
import { buildEvidenceCsv, evidenceCsvFileName } from '@/lib/patterns/evidence-csv';
import {
  canMovePatternStatus,
  computePatternChanges,
  diffCampaign,
  formatBuildRange,
  groupPatternHistory,
  isCampaignOverdue,
  matchPatternRecord,
  planPatternSync,
  PATTERN_STATUS_TRANSITIONS,
  type PatternStatus,
} from '@/lib/patterns/records';
import type { CohortFigures, ExposureBand, ModuleBaseline, PatternCohort, PatternsReport } from '@/lib/patterns/types';
import type {
  CohortRecordRef,
  CohortView,
  PatternDefectRow,
  PatternGroupDetail,
  PatternHistoryRow,
  PatternRecordDetail,
  PatternRecordsQuery,
  PatternRecordsResponse,
  PatternRecordSummary,
  PatternStatusChange,
  PatternSyncResponse,
  PatternVehicleRow,
} from '@/lib/contracts/patterns';
import { can } from '@/lib/auth/permissions';
import type { SessionUser } from './auth';
import { conflict, invalid, notFound } from './http';
import { iso } from './list-helpers';
import { listAudit, writeAudit, type Actor } from './audit';
import { cohortFiguresFor, dataVersion, FLEET_WIDE, getPatternsReport, listDepotCodes, todayIso } from './patterns';

type RecordRow = typeof patternRecords.$inferSelect;

/** What a record keeps of the report that last matched it (the pattern page and the evidence pack read it). */
export interface PatternSnapshot {
  asOf: string;
  cohort: PatternCohort;
  module: ModuleBaseline | null;
  method: PatternsReport['method'];
  counts: PatternsReport['counts'];
}

const SYSTEM: Actor = { system: 'system' };

function latestSync() {
  return getDb().select().from(patternSyncs).orderBy(desc(patternSyncs.id)).limit(1).get() ?? null;
}

function selectRecords(where: SQL | undefined) {
  return getDb()
    .select({ r: patternRecords, moduleName: modules.name })
    .from(patternRecords)
    .leftJoin(modules, eq(modules.code, patternRecords.moduleCode))
    .where(where)
    .orderBy(desc(patternRecords.significant), patternRecords.qValue, patternRecords.id)
    .all();
}

// ---------------------------------------------------------------------------------------------------------------
// Sync

/** Result of a sync (`upToDate`: the latest sync already covered this day and data; nothing recomputed). */
export type PatternSyncResult = PatternSyncResponse;

function snapshotOf(report: PatternsReport, cohort: PatternCohort): PatternSnapshot {
  return {
    asOf: report.asOf,
    cohort,
    module: report.modules.find((m) => m.moduleId === cohort.moduleId) ?? null,
    method: report.method,
    counts: report.counts,
  };
}

function figures(c: PatternCohort) {
  return {
    cohortId: c.id,
    buildFrom: c.buildFrom,
    buildTo: c.buildTo,
    vehicles: c.vehicles,
    failures: c.failures,
    expected: c.expected,
    rateRatio: c.rateRatio,
    ciLow: c.ciLow,
    ciHigh: c.ciHigh,
    qValue: c.qValue,
    moistureShare: c.moistureShare,
    repeatVehicles: c.repeatVehicles,
    significant: c.significant,
    waterIngress: c.waterIngress,
  };
}

const verdictWords = (c: { significant: boolean; waterIngress: boolean }) =>
  !c.significant ? 'not significant' : c.waterIngress ? 'water ingress' : 'significant, dry';

/**
 * Bring the pattern records up to date with the fleet-wide report as of today: a significant cohort without a
 * record becomes a new record (status new), a cohort that belongs to a record updates its figures and range, and
 * every created record and every change of range or verdict leaves an audit row (actor: system). Nothing is
 * recomputed when the latest sync already covered today and the current data.
 */
export function syncPatternRecords(by: SessionUser | null, now = Date.now()): PatternSyncResult {
  const db = getDb();
  const asOf = todayIso(now);
  const version = dataVersion();
  const last = latestSync();
  if (last && last.asOf === asOf && last.dataVersion === version) {
    return { syncId: last.id, asOf, upToDate: true, created: 0, updated: 0, at: new Date(last.at).toISOString() };
  }
  const report = getPatternsReport(FLEET_WIDE, asOf);
  return db.transaction(
    (tx) => {
      const existing = tx.select().from(patternRecords).all();
      const plan = planPatternSync(report.cohorts, existing);
      const sync = tx
        .insert(patternSyncs)
        .values({
          at: now,
          asOf,
          dataVersion: version,
          byUserId: by && by.id > 0 ? by.id : null,
          cohortsTested: report.cohorts.length,
          cohortsSignificant: report.counts.cohortsSignificant,
          recordsCreated: plan.create.length,
          recordsUpdated: plan.update.length,
        })
        .returning({ id: patternSyncs.id })
        .get();
      for (const c of plan.create) {
        const row = tx
          .insert(patternRecords)
          .values({
            key: c.key,
            moduleCode: c.moduleCode,
            exposureBand: c.exposureBand,
            ...figures(c),
            firstBuildFrom: c.buildFrom,
            firstBuildTo: c.buildTo,
            status: 'new',
            actedAt: now,
            actedFailures: c.failures,
            actedBuildFrom: c.buildFrom,
            actedBuildTo: c.buildTo,
            snapshot: JSON.stringify(snapshotOf(report, c)),
            snapshotAsOf: asOf,
            lastSyncId: sync.id,
            firstSeenAt: now,
            lastSeenAt: now,
            createdAt: now,
            updatedAt: now,
          })
          .returning({ id: patternRecords.id })
          .get();
        writeAudit(tx, SYSTEM, { entity: 'pattern', entityId: String(row.id), action: 'found', newValue: `${c.moduleCode} ${c.exposureBand} ${formatBuildRange(c)}: ${c.failures} failures vs ${c.expected.toFixed(1)} expected, ${verdictWords(c)}` }, now);
      }
      for (const { record: r, cohort: c } of plan.update) {
        tx.update(patternRecords)
          .set({ ...figures(c), snapshot: JSON.stringify(snapshotOf(report, c)), snapshotAsOf: asOf, lastSyncId: sync.id, lastSeenAt: now, updatedAt: now })
          .where(eq(patternRecords.id, r.id))
          .run();
        const id = String(r.id);
        if (r.buildFrom !== c.buildFrom || r.buildTo !== c.buildTo) {
          writeAudit(tx, SYSTEM, { entity: 'pattern', entityId: id, action: 'report', field: 'buildRange', oldValue: `${r.buildFrom}..${r.buildTo}`, newValue: `${c.buildFrom}..${c.buildTo}` }, now);
        }
        if (r.significant !== c.significant || r.waterIngress !== c.waterIngress) {
          writeAudit(tx, SYSTEM, { entity: 'pattern', entityId: id, action: 'report', field: 'verdict', oldValue: verdictWords(r), newValue: verdictWords(c) }, now);
        }
      }
      return { syncId: sync.id, asOf, upToDate: false, created: plan.create.length, updated: plan.update.length, at: new Date(now).toISOString() };
    },
    { behavior: 'immediate' },
  );
}

// ---------------------------------------------------------------------------------------------------------------
// Who sees what. Managers and admins (every depot) read a record's fleet-wide figures. A depot-scoped reader
// (a supervisor) reads the same record — identity, verdict, status, campaign, history — with every figure computed
// over their depots only: the record's module type, band and build range applied to the vehicles now at their
// depots and the defects reported there, as of the record's day. They see a record when that holds a vehicle.

/** The caller's depots, or null for people who see every depot. */
type ReaderScope = { depotIds: number[]; depotCodes: string[] } | null;

function readerScope(user: SessionUser): ReaderScope {
  return user.depotIds === null ? null : { depotIds: user.depotIds, depotCodes: listDepotCodes(user.depotIds) };
}

/** A record's figures over the caller's depots (null: no vehicle of the cohort there, or an unknown module). */
function depotFigures(user: SessionUser, r: RecordRow): CohortFigures | null {
  const f = cohortFiguresFor(user, r.snapshotAsOf).figures({
    moduleCode: r.moduleCode,
    band: r.exposureBand as ExposureBand,
    buildFrom: r.buildFrom,
    buildTo: r.buildTo,
  });
  return f && f.vehicles > 0 ? f : null;
}

/** Failures among `failureIds` entered since `sinceMs` (the new failures a depot-scoped reader is told about). */
function failuresEnteredSince(failureIds: number[], sinceMs: number | null): number {
  if (failureIds.length === 0) return 0;
  const ids = sql`${defects.id} in (select value from json_each(${JSON.stringify(failureIds)}))`;
  const row = getDb()
    .select({ n: sql<number>`count(*)` })
    .from(defects)
    .where(sinceMs === null ? ids : and(ids, gt(defects.createdAt, sinceMs)))
    .get();
  return row?.n ?? 0;
}

type Visible = { r: RecordRow; moduleName: string | null; scoped: CohortFigures | null };

/** Records the caller may see among those matching `where`, each with its figures over the caller's depots. */
function visibleRecords(user: SessionUser, where?: SQL): Visible[] {
  const rows = selectRecords(where);
  if (user.depotIds === null) return rows.map(({ r, moduleName }) => ({ r, moduleName, scoped: null }));
  const out: Visible[] = [];
  for (const { r, moduleName } of rows) {
    const scoped = depotFigures(user, r);
    if (scoped) out.push({ r, moduleName, scoped });
  }
  return out;
}

function campaignOf(r: RecordRow, today: string): PatternRecordSummary['campaign'] {
  if (!r.campaignKind) return null;
  const status = r.status as PatternStatus;
  return {
    kind: r.campaignKind,
    note: r.campaignNote ?? '',
    targetDate: r.campaignTargetDate ?? '',
    inForce: status === 'campaign_planned',
    overdue: isCampaignOverdue(status, r.campaignTargetDate, today),
  };
}

function recordSummary(v: Visible, latestSyncId: number | null, scope: ReaderScope, today = todayIso()): PatternRecordSummary {
  const { r, scoped } = v;
  const inLatestReport = latestSyncId !== null && r.lastSyncId === latestSyncId;
  // A depot-scoped reader is told of new failures at their depots only: those entered since the last action.
  const changes = scoped
    ? computePatternChanges({ ...r, failures: failuresEnteredSince(scoped.failureIds, r.actedAt), actedFailures: 0, inLatestReport }, 'in your depots')
    : computePatternChanges({ ...r, inLatestReport });
  const f = scoped ?? r;
  return {
    id: r.id,
    key: r.key,
    moduleCode: r.moduleCode,
    moduleName: v.moduleName ?? null,
    exposureBand: r.exposureBand as ExposureBand,
    cohortId: r.cohortId,
    buildFrom: r.buildFrom,
    buildTo: r.buildTo,
    firstBuildFrom: r.firstBuildFrom,
    firstBuildTo: r.firstBuildTo,
    vehicles: f.vehicles,
    failures: f.failures,
    expected: f.expected,
    rateRatio: f.rateRatio,
    ciLow: f.ciLow,
    ciHigh: f.ciHigh,
    qValue: scoped ? null : r.qValue,
    moistureShare: f.moistureShare,
    repeatVehicles: f.repeatVehicles,
    significant: r.significant,
    waterIngress: r.waterIngress,
    figuresScope: scoped ? 'depots' : 'fleet',
    depotCodes: scope ? scope.depotCodes : null,
    status: r.status as PatternStatus,
    statusReason: r.statusReason,
    statusAt: iso(r.statusAt),
    campaign: campaignOf(r, today),
    changes,
    actedAt: iso(r.actedAt),
    snapshotAsOf: r.snapshotAsOf,
    firstSeenAt: iso(r.firstSeenAt),
    lastSeenAt: iso(r.lastSeenAt),
    version: r.version,
  };
}

/**
 * For `GET /api/patterns`: a function giving each cohort its record (id, today's status, changed, overdue) among the
 * caller's. For a past as-of day only a significant cohort names a record — a record is made only from a
 * significant cohort, so a weaker group of another day is not that pattern.
 */
export function recordMatcher(user: SessionUser, asOf: string = todayIso()) {
  const today = todayIso();
  const scope = readerScope(user);
  const visible = visibleRecords(user);
  const latest = latestSync()?.id ?? null;
  const records = visible.map((v) => v.r);
  return (c: { key: string; buildFrom: string; buildTo: string; significant: boolean }): CohortRecordRef => {
    if (asOf !== today && !c.significant) return null;
    const r = matchPatternRecord(c, records);
    if (!r) return null;
    const s = recordSummary(visible.find((v) => v.r.id === r.id)!, latest, scope, today);
    return { id: r.id, status: s.status, changed: s.changes.changed, changes: s.changes.summary, overdue: s.campaign?.overdue ?? false };
  };
}

/** Pattern records the caller may see, filtered; strongest evidence first. */
export function listPatternRecords(user: SessionUser, q: PatternRecordsQuery): PatternRecordsResponse {
  const conds: (SQL | undefined)[] = [];
  if (q.status?.length) conds.push(inArray(patternRecords.status, q.status as PatternStatus[]));
  if (q.module) conds.push(eq(patternRecords.moduleCode, q.module.toUpperCase()));
  if (q.water) conds.push(eq(patternRecords.waterIngress, q.water === '1' || q.water === 'true'));
  const latest = latestSync();
  const scope = readerScope(user);
  const today = todayIso();
  let items = visibleRecords(user, and(...conds)).map((v) => recordSummary(v, latest?.id ?? null, scope, today));
  if (q.changed) {
    const want = q.changed === '1' || q.changed === 'true';
    items = items.filter((i) => i.changes.changed === want);
  }
  return {
    items,
    total: items.length,
    lastSync: latest ? { id: latest.id, at: new Date(latest.at).toISOString(), asOf: latest.asOf } : null,
  };
}

function loadVisibleRecord(user: SessionUser, id: number): Visible {
  const [v] = visibleRecords(user, eq(patternRecords.id, id));
  if (!v) throw notFound('Pattern');
  return v;
}

/** True when the record exists and the caller may see it (pages answer 404 otherwise). */
export function patternRecordVisible(user: SessionUser, id: number): boolean {
  return visibleRecords(user, eq(patternRecords.id, id)).length > 0;
}

function depotFilter(user: SessionUser, column: SQL | typeof vehicles.depotId | typeof defects.depotId): SQL | undefined {
  if (user.depotIds === null) return undefined;
  if (user.depotIds.length === 0) return sql`0`;
  return sql`${column} in (${sql.join(user.depotIds.map((d) => sql`${d}`), sql`, `)})`;
}

const WET = new Set(['traces', 'corrosion', 'standing_water']);

/**
 * The vehicles and failures behind a cohort, within the caller's scope, with trace verdicts per defect: vehicles now
 * at the caller's depots, defects reported at them (a defect's depot is its own, not its vehicle's current one).
 */
function cohortMembers(user: SessionUser, ids: { vehicleIds: number[]; failureIds: number[]; repeatVehicleIds: number[] }): { vehicles: PatternVehicleRow[]; defects: PatternDefectRow[] } {
  const db = getDb();
  const vehicleIdsJson = JSON.stringify(ids.vehicleIds);
  const failureIdsJson = JSON.stringify(ids.failureIds);
  const repeat = new Set(ids.repeatVehicleIds);
  const vs = db
    .select({
      id: vehicles.id,
      vin: vehicles.vin,
      fleetNumber: vehicles.fleetNumber,
      registration: vehicles.registration,
      make: vehicles.make,
      model: vehicles.model,
      buildMonth: vehicles.buildMonth,
      inServiceDate: vehicles.inServiceDate,
      retiredDate: vehicles.retiredDate,
      parking: vehicles.parking,
      washesPerMonth: vehicles.washesPerMonth,
      depotCode: depots.code,
      coastal: depots.coastal,
      rainDaysPerYear: depots.rainDaysPerYear,
      meanRhPct: depots.meanRhPct,
      washBay: depots.washBay,
    })
    .from(vehicles)
    .innerJoin(depots, eq(depots.id, vehicles.depotId))
    .where(and(sql`${vehicles.id} in (select value from json_each(${vehicleIdsJson}))`, depotFilter(user, vehicles.depotId)))
    .all();
  const ds = db
    .select({
      id: defects.id,
      ref: defects.ref,
      vehicleId: defects.vehicleId,
      reportedAt: defects.reportedAt,
      position: defects.position,
      status: defects.status,
      symptom: defects.symptom,
      dtcs: defects.dtcs,
      moisture: defects.moisture,
      rootCause: defects.rootCause,
      action: defects.action,
      closedAt: defects.closedAt,
      membraneCondition: defects.membraneCondition,
      sealCondition: defects.sealCondition,
      drainCondition: defects.drainCondition,
      connectorCondition: defects.connectorCondition,
      depotCode: depots.code,
      vin: vehicles.vin,
      fleetNumber: vehicles.fleetNumber,
    })
    .from(defects)
    .innerJoin(depots, eq(depots.id, defects.depotId))
    .innerJoin(vehicles, eq(vehicles.id, defects.vehicleId))
    .where(and(sql`${defects.id} in (select value from json_each(${failureIdsJson}))`, depotFilter(user, defects.depotId)))
    .orderBy(defects.reportedAt, defects.id)
    .all();
  const traces = new Map<number, { id: number; verdict: string; fileName: string | null }[]>();
  if (ds.length) {
    const defectIdsJson = JSON.stringify(ds.map((d) => d.id));
    const rows = db
      .select({ id: attachments.id, defectId: attachments.defectId, analysis: attachments.analysis, originalName: attachments.originalName })
      .from(attachments)
      .where(and(eq(attachments.kind, 'trace'), sql`${attachments.defectId} in (select value from json_each(${defectIdsJson}))`))
      .orderBy(attachments.id)
      .all();
    for (const t of rows) {
      let verdict = 'unknown';
      try {
        verdict = String((JSON.parse(t.analysis ?? '{}') as { verdict?: string }).verdict ?? 'unknown');
      } catch {
        verdict = 'unknown';
      }
      const list = traces.get(t.defectId as number) ?? [];
      list.push({ id: t.id, verdict, fileName: t.originalName });
      traces.set(t.defectId as number, list);
    }
  }
  const failuresPerVehicle = new Map<number, number>();
  for (const d of ds) failuresPerVehicle.set(d.vehicleId, (failuresPerVehicle.get(d.vehicleId) ?? 0) + 1);
  const vehicleRows = vs
    .map((v) => {
      const score = computeExposureScore({ coastal: v.coastal, rainDaysPerYear: v.rainDaysPerYear, meanRhPct: v.meanRhPct, washBay: v.washBay }, { parking: v.parking, washesPerMonth: v.washesPerMonth });
      return {
        id: v.id,
        vin: v.vin,
        fleetNumber: v.fleetNumber,
        registration: v.registration,
        make: v.make,
        model: v.model,
        buildMonth: v.buildMonth,
        inServiceDate: v.inServiceDate,
        retiredDate: v.retiredDate,
        depotCode: v.depotCode,
        parking: v.parking,
        washesPerMonth: v.washesPerMonth,
        exposureIndex: score.index,
        exposureBand: score.band,
        failures: failuresPerVehicle.get(v.id) ?? 0,
        repeat: repeat.has(v.id),
      };
    })
    .sort((a, b) => b.failures - a.failures || (a.fleetNumber ?? a.vin).localeCompare(b.fleetNumber ?? b.vin));
  const defectRows = ds.map((d) => ({
    id: d.id,
    ref: d.ref,
    vehicleId: d.vehicleId,
    vin: d.vin,
    fleetNumber: d.fleetNumber,
    depotCode: d.depotCode,
    reportedAt: iso(d.reportedAt)!,
    position: d.position,
    status: d.status,
    symptom: d.symptom,
    dtcs: d.dtcs ? d.dtcs.split(' ') : [],
    moisture: d.moisture,
    rootCause: d.rootCause,
    action: d.action,
    closedAt: iso(d.closedAt),
    conditions: { membrane: d.membraneCondition, seal: d.sealCondition, drain: d.drainCondition, connector: d.connectorCondition },
    diagnosed: d.moisture !== null || d.rootCause !== null,
    wet: (d.moisture !== null && WET.has(d.moisture)) || d.rootCause === 'water_ingress',
    traces: traces.get(d.id) ?? [],
  }));
  return { vehicles: vehicleRows, defects: defectRows };
}

function statusPerson(id: number | null): { id: number; name: string } | null {
  if (id === null) return null;
  const u = getDb().select({ id: users.id, name: users.name }).from(users).where(eq(users.id, id)).get();
  return u ?? null;
}

function moduleFacts(code: string): PatternRecordDetail['module'] {
  const mod = getDb()
    .select({ name: modules.name, function: modules.function, partNumber: modules.partNumber, supplier: modules.supplier })
    .from(modules)
    .where(eq(modules.code, code))
    .get();
  return mod ? { code, ...mod } : { code, name: null, function: null, partNumber: null, supplier: null };
}

/** A report's cohort as the pages show it (ids dropped, the scan's figures under `search`). */
function cohortView(c: PatternCohort): CohortView {
  const {
    vehicleIds: _v, failureIds: _f, repeatVehicleIds: _r,
    pValue, qValue, scanLlr, scanExpected, mcP, gumbelP, pValueMethod, replicates, windowsTested,
    ...figures
  } = c;
  return { ...figures, search: { pValue, qValue, scanLlr, scanExpected, mcP, gumbelP, pValueMethod, replicates, windowsTested } };
}

/** A record's range read over the caller's depots: its figures there, with the record's fleet-wide verdict. */
function depotCohortView(f: CohortFigures, r: RecordRow): CohortView {
  const { vehicleIds: _v, failureIds: _f, repeatVehicleIds: _r, ...figures } = f;
  const verdict = !r.significant ? 'not_significant' : r.waterIngress ? 'water_ingress' : 'significant_dry';
  return { ...figures, significant: r.significant, waterIngress: r.waterIngress, verdict, search: null };
}

/**
 * The history in entries of one action each. A depot-scoped reader sees when the pattern was found, not the fleet's
 * counts written with it.
 */
function patternHistory(id: number, scoped: boolean): PatternHistoryRow[] {
  const rows = listAudit('pattern', String(id)).map((h) => ({
    id: h.id,
    at: h.at,
    who: h.who,
    action: h.action,
    field: h.field,
    oldValue: h.oldValue,
    newValue: scoped && h.action === 'found' ? 'Found in the fleet-wide report' : h.newValue,
  }));
  return groupPatternHistory(rows);
}

/** One pattern record with its cohort, the vehicles and defects behind it (caller's depots), and its history. */
export function getPatternRecord(user: SessionUser, id: number): PatternRecordDetail {
  const v = loadVisibleRecord(user, id);
  const r = v.r;
  const latest = latestSync();
  const scope = readerScope(user);
  const snap = JSON.parse(r.snapshot) as PatternSnapshot;
  const scoped = v.scoped;
  const members = cohortMembers(user, scoped ?? snap.cohort);
  const writer = can(user.role, 'pattern:write');
  const history = patternHistory(r.id, scoped !== null);
  // History is newest first: the first "→ resolved" entry is when the last campaign was resolved.
  const lastResolved = history.find((h) => h.changes.some((c) => c.field === 'status' && c.newValue === 'resolved'));
  return {
    ...recordSummary(v, latest?.id ?? null, scope),
    statusBy: statusPerson(r.statusById),
    module: moduleFacts(r.moduleCode),
    baseline: scoped ? cohortFiguresFor(user, r.snapshotAsOf).baseline(r.moduleCode) : snap.module,
    cohort: scoped ? depotCohortView(scoped, r) : cohortView(snap.cohort),
    method: snap.method,
    scope: scope === null ? 'all' : 'depots',
    cohortsTested: scoped ? null : snap.counts.cohortsTested,
    campaignResolvedAt: r.campaignKind && r.status !== 'campaign_planned' ? (lastResolved?.at ?? null) : null,
    vehicleList: members.vehicles,
    defectList: members.defects,
    history,
    allowedStatuses: writer ? [...PATTERN_STATUS_TRANSITIONS[r.status as PatternStatus]] : [],
    lastSync: latest ? { id: latest.id, at: new Date(latest.at).toISOString(), asOf: latest.asOf } : null,
  };
}

/**
 * One module type × band of the report as of a day over the caller's depots, read only: the group's cohort (the
 * build range its scan found, significant or not), the vehicles and defects behind it, and the record it belongs
 * to (today's status), if any. 404 when the report has no such group.
 */
export function getPatternGroup(user: SessionUser, q: { moduleCode: string; band: ExposureBand; asOf: string }): PatternGroupDetail {
  const report = getPatternsReport(user, q.asOf);
  const code = q.moduleCode.trim().toUpperCase();
  const c = report.cohorts.find((x) => x.key === `${code}:${q.band}`);
  if (!c) throw notFound(`Group ${code} ${q.band} exposure`);
  const scope = readerScope(user);
  const members = cohortMembers(user, c);
  return {
    asOf: report.asOf,
    today: todayIso(),
    module: moduleFacts(code),
    baseline: report.modules.find((m) => m.moduleCode === code) ?? null,
    cohort: cohortView(c),
    method: report.method,
    scope: scope === null ? 'all' : 'depots',
    depotCodes: scope ? scope.depotCodes : null,
    cohortsTested: report.counts.cohortsTested,
    vehicleList: members.vehicles,
    defectList: members.defects,
    record: recordMatcher(user, report.asOf)(c),
  };
}

// ---------------------------------------------------------------------------------------------------------------
// Acting

/**
 * Move a record to a new status (with the campaign or reason it needs), in one transaction with an audit row per
 * changed field; the rows of one action share its moment, so the history shows one entry per action. Revising a
 * planned campaign records only the fields that changed (action `campaign_revised`). 409 for a move the rules do
 * not allow or a stale `version`; 400 for a campaign target date before today or a revision that changes nothing.
 */
export function changePatternStatus(user: SessionUser, id: number, body: PatternStatusChange, actor: Actor, now = Date.now()) {
  const db = getDb();
  const today = todayIso(now);
  db.transaction(
    (tx) => {
      const r = tx.select().from(patternRecords).where(eq(patternRecords.id, id)).get();
      if (!r) throw notFound('Pattern');
      if (body.version !== undefined && body.version !== r.version) {
        throw conflict('This pattern was changed by someone else; reload it and try again.', { current: { status: r.status, version: r.version } });
      }
      const from = r.status as PatternStatus;
      if (!canMovePatternStatus(from, body.status)) {
        throw conflict(`A pattern that is ${from.replace('_', ' ')} cannot be moved to ${body.status.replace('_', ' ')}.`, {
          current: { status: from, version: r.version },
          allowed: PATTERN_STATUS_TRANSITIONS[from],
        });
      }
      const revising = from === 'campaign_planned' && body.status === 'campaign_planned';
      const campaignChanges =
        body.status === 'campaign_planned'
          ? diffCampaign(revising ? { kind: r.campaignKind ?? undefined, note: r.campaignNote ?? undefined, targetDate: r.campaignTargetDate ?? undefined } : null, body.campaign)
          : [];
      if (body.status === 'campaign_planned') {
        if (body.campaign.targetDate < today) {
          throw invalid(`The target date ${body.campaign.targetDate} is in the past; choose today (${today}) or later.`, [
            { path: 'campaign.targetDate', message: `The target date must be today (${today}) or later` },
          ]);
        }
        if (revising && campaignChanges.length === 0 && !body.note) {
          throw invalid('Nothing to change: the campaign is as planned. Change its kind, description or target date, or add a note.', [
            { path: 'campaign', message: 'Unchanged' },
          ]);
        }
      }
      const reason = body.status === 'dismissed' ? body.reason : (body.note ?? null);
      const next: Partial<RecordRow> = {
        status: body.status,
        statusReason: reason && reason.length ? reason : null,
        statusById: user.id > 0 ? user.id : null,
        statusAt: now,
        actedAt: now,
        actedFailures: r.failures,
        actedBuildFrom: r.buildFrom,
        actedBuildTo: r.buildTo,
        version: r.version + 1,
        updatedAt: now,
      };
      if (body.status === 'campaign_planned') {
        next.campaignKind = body.campaign.kind;
        next.campaignNote = body.campaign.note;
        next.campaignTargetDate = body.campaign.targetDate;
      }
      tx.update(patternRecords).set(next).where(eq(patternRecords.id, id)).run();
      const entityId = String(id);
      const action = revising ? 'campaign_revised' : 'status';
      const audit = (field: string, oldValue: string | null, newValue: string | null) =>
        writeAudit(tx, actor, { entity: 'pattern', entityId, action, field, oldValue, newValue }, now);
      if (!revising) audit('status', from, body.status);
      for (const c of campaignChanges) audit(c.field, c.oldValue, c.newValue);
      if (next.statusReason) audit(body.status === 'dismissed' ? 'reason' : 'note', null, next.statusReason);
    },
    { behavior: 'immediate' },
  );
  return getPatternRecord(user, id);
}

// ---------------------------------------------------------------------------------------------------------------
// Evidence pack and the Overview figure

/** The warranty evidence CSV of a record (its vehicles and defects; documented columns) and its file name. */
export function getPatternEvidenceCsv(user: SessionUser, id: number): { csv: string; fileName: string } {
  const p = getPatternRecord(user, id);
  const pattern = { id: p.id, moduleCode: p.moduleCode, exposureBand: p.exposureBand, buildFrom: p.buildFrom, buildTo: p.buildTo, asOf: p.snapshotAsOf };
  return { csv: buildEvidenceCsv(pattern, p.vehicleList, p.defectList), fileName: evidenceCsvFileName(pattern) };
}

/**
 * For the Overview: patterns that need a fleet manager's attention among the caller's records — significant and
 * new, changed since someone last acted on them (new failures or a changed build range, whatever the status), or a
 * campaign past its target date. Null for roles that do not read patterns. Reads the records as last synced.
 */
export function getPatternsAttention(user: SessionUser) {
  if (!can(user.role, 'pattern:read')) return null;
  const { items } = listPatternRecords(user, {});
  const open = items.filter((i) => i.status !== 'dismissed' && i.status !== 'resolved');
  const isNew = items.filter((i) => i.status === 'new' && i.significant);
  // New failures after a campaign was resolved (or a pattern dismissed) matter most: the decision may not hold.
  const changed = items.filter((i) => i.status !== 'new' && (i.changes.newFailures > 0 || i.changes.range !== 'same'));
  const overdue = items.filter((i) => i.campaign?.overdue);
  return {
    needsAttention: new Set([...isNew, ...changed, ...overdue].map((i) => i.id)).size,
    new: isNew.length,
    changed: changed.length,
    overdue: overdue.length,
    open: open.length,
    waterIngressOpen: open.filter((i) => i.waterIngress).length,
    href: '/patterns',
  };
}
