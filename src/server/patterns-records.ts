/**
 * Pattern records: patterns kept across re-runs of the report so that fleet managers can act on them (status,
 * campaign, audit trail), synced from the fleet-wide report, and read by supervisors for their depots.
 * Identity, sync and scope rules: docs/decisions/011-pattern-records.md. Edit when a record gains a field or a
 * status gains a rule.
 */
import { and, desc, eq, inArray, sql, type SQL } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { attachments, defects, depots, modules, patternRecords, patternSyncs, users, vehicles } from '@/db/schema';
import { computeExposureScore } from '@/lib/patterns/exposure';
import { buildEvidenceCsv, evidenceCsvFileName } from '@/lib/patterns/evidence-csv';
import {
  canMovePatternStatus,
  computePatternChanges,
  formatBuildRange,
  matchPatternRecord,
  planPatternSync,
  PATTERN_STATUS_TRANSITIONS,
  type PatternStatus,
} from '@/lib/patterns/records';
import type { ModuleBaseline, PatternCohort, PatternsReport } from '@/lib/patterns/types';
import type {
  CohortRecordRef,
  PatternRecordDetail,
  PatternRecordsQuery,
  PatternRecordsResponse,
  PatternRecordSummary,
  PatternStatusChange,
  PatternSyncResponse,
} from '@/lib/contracts/patterns';
import { can } from '@/lib/auth/permissions';
import type { SessionUser } from './auth';
import { conflict, notFound } from './http';
import { iso } from './list-helpers';
import { listAudit, writeAudit, type Actor } from './audit';
import { dataVersion, FLEET_WIDE, getPatternsReport, todayIso } from './patterns';

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

// ---------------------------------------------------------------------------------------------------------------
// Visibility: managers and admins see every record; a supervisor sees a record whose cohort has a vehicle at one
// of their depots (the vehicle's current depot).

function visibleCondition(user: SessionUser): SQL | undefined {
  if (user.depotIds === null) return undefined;
  if (user.depotIds.length === 0) return sql`0`;
  return sql`exists (select 1 from json_each(${patternRecords.snapshot}, '$.cohort.vehicleIds') j
    join ${vehicles} v on v.id = j.value where v.depot_id in (${sql.join(user.depotIds.map((d) => sql`${d}`), sql`, `)}))`;
}

function latestSync() {
  return getDb().select().from(patternSyncs).orderBy(desc(patternSyncs.id)).limit(1).get() ?? null;
}

function recordSummary(r: RecordRow & { moduleName?: string | null }, latestSyncId: number | null): PatternRecordSummary {
  const changes = computePatternChanges({ ...r, inLatestReport: latestSyncId !== null && r.lastSyncId === latestSyncId });
  return {
    id: r.id,
    key: r.key,
    moduleCode: r.moduleCode,
    moduleName: r.moduleName ?? null,
    exposureBand: r.exposureBand as PatternCohort['exposureBand'],
    cohortId: r.cohortId,
    buildFrom: r.buildFrom,
    buildTo: r.buildTo,
    firstBuildFrom: r.firstBuildFrom,
    firstBuildTo: r.firstBuildTo,
    vehicles: r.vehicles,
    failures: r.failures,
    expected: r.expected,
    rateRatio: r.rateRatio,
    ciLow: r.ciLow,
    ciHigh: r.ciHigh,
    qValue: r.qValue,
    moistureShare: r.moistureShare,
    repeatVehicles: r.repeatVehicles,
    significant: r.significant,
    waterIngress: r.waterIngress,
    status: r.status as PatternStatus,
    statusReason: r.statusReason,
    statusAt: iso(r.statusAt),
    campaign: r.campaignKind ? { kind: r.campaignKind, note: r.campaignNote ?? '', targetDate: r.campaignTargetDate ?? '' } : null,
    changes,
    actedAt: iso(r.actedAt),
    snapshotAsOf: r.snapshotAsOf,
    firstSeenAt: iso(r.firstSeenAt),
    lastSeenAt: iso(r.lastSeenAt),
    version: r.version,
  };
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
// Reading

/** For `GET /api/patterns`: a function giving each cohort its record (id, status, changed) among the caller's. */
export function recordMatcher(user: SessionUser) {
  const rows = selectRecords(visibleCondition(user));
  const latest = latestSync()?.id ?? null;
  const records = rows.map(({ r }) => r);
  return (c: { key: string; buildFrom: string; buildTo: string }): CohortRecordRef => {
    const r = matchPatternRecord(c, records);
    if (!r) return null;
    const s = recordSummary(r, latest);
    return { id: r.id, status: s.status, changed: s.changes.changed, changes: s.changes.summary };
  };
}

/** Pattern records the caller may see, filtered; strongest evidence first. */
export function listPatternRecords(user: SessionUser, q: PatternRecordsQuery): PatternRecordsResponse {
  const conds: (SQL | undefined)[] = [visibleCondition(user)];
  if (q.status?.length) conds.push(inArray(patternRecords.status, q.status as PatternStatus[]));
  if (q.module) conds.push(eq(patternRecords.moduleCode, q.module.toUpperCase()));
  if (q.water) conds.push(eq(patternRecords.waterIngress, q.water === '1' || q.water === 'true'));
  const latest = latestSync();
  let items = selectRecords(and(...conds)).map(({ r, moduleName }) => recordSummary({ ...r, moduleName }, latest?.id ?? null));
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

function loadVisibleRecord(user: SessionUser, id: number): RecordRow & { moduleName: string | null } {
  const row = getDb()
    .select({ r: patternRecords, moduleName: modules.name })
    .from(patternRecords)
    .leftJoin(modules, eq(modules.code, patternRecords.moduleCode))
    .where(and(eq(patternRecords.id, id), visibleCondition(user)))
    .get();
  if (!row) throw notFound('Pattern');
  return { ...row.r, moduleName: row.moduleName };
}

/** True when the record exists and the caller may see it (pages answer 404 otherwise). */
export function patternRecordVisible(user: SessionUser, id: number): boolean {
  return !!getDb().select({ id: patternRecords.id }).from(patternRecords).where(and(eq(patternRecords.id, id), visibleCondition(user))).get();
}

function depotFilter(user: SessionUser, column: SQL | typeof vehicles.depotId): SQL | undefined {
  if (user.depotIds === null) return undefined;
  if (user.depotIds.length === 0) return sql`0`;
  return sql`${column} in (${sql.join(user.depotIds.map((d) => sql`${d}`), sql`, `)})`;
}

const WET = new Set(['traces', 'corrosion', 'standing_water']);

/** The vehicles and failures behind a record, limited to the caller's depots, with trace verdicts per defect. */
function cohortMembers(user: SessionUser, snap: PatternSnapshot) {
  const db = getDb();
  const vehicleIdsJson = JSON.stringify(snap.cohort.vehicleIds);
  const failureIdsJson = JSON.stringify(snap.cohort.failureIds);
  const repeat = new Set(snap.cohort.repeatVehicleIds);
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
    })
    .from(defects)
    .innerJoin(depots, eq(depots.id, defects.depotId))
    .innerJoin(vehicles, eq(vehicles.id, defects.vehicleId))
    .where(and(sql`${defects.id} in (select value from json_each(${failureIdsJson}))`, depotFilter(user, vehicles.depotId)))
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
  const vehicleById = new Map(vs.map((v) => [v.id, v]));
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
  const defectRows = ds.map((d) => {
    const v = vehicleById.get(d.vehicleId);
    return {
      id: d.id,
      ref: d.ref,
      vehicleId: d.vehicleId,
      vin: v?.vin ?? '',
      fleetNumber: v?.fleetNumber ?? null,
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
    };
  });
  return { vehicles: vehicleRows, defects: defectRows };
}

function statusPerson(id: number | null): { id: number; name: string } | null {
  if (id === null) return null;
  const u = getDb().select({ id: users.id, name: users.name }).from(users).where(eq(users.id, id)).get();
  return u ?? null;
}

/** One pattern record with its latest cohort, the vehicles and defects behind it (caller's depots), and its history. */
export function getPatternRecord(user: SessionUser, id: number): PatternRecordDetail {
  const r = loadVisibleRecord(user, id);
  const latest = latestSync();
  const snap = JSON.parse(r.snapshot) as PatternSnapshot;
  const { vehicleIds: _v, failureIds: _f, repeatVehicleIds: _r, ...cohort } = snap.cohort;
  const mod = getDb()
    .select({ name: modules.name, function: modules.function, partNumber: modules.partNumber, supplier: modules.supplier })
    .from(modules)
    .where(eq(modules.code, r.moduleCode))
    .get();
  const members = cohortMembers(user, snap);
  const writer = can(user.role, 'pattern:write');
  return {
    ...recordSummary(r, latest?.id ?? null),
    statusBy: statusPerson(r.statusById),
    module: mod ? { code: r.moduleCode, ...mod } : { code: r.moduleCode, name: null, function: null, partNumber: null, supplier: null },
    baseline: snap.module,
    cohort,
    method: snap.method,
    /** Whose depots the vehicle and defect lists cover: every depot, or the caller's. */
    scope: user.depotIds === null ? ('all' as const) : ('depots' as const),
    vehicleList: members.vehicles,
    defectList: members.defects,
    history: listAudit('pattern', String(r.id)),
    allowedStatuses: writer ? [...PATTERN_STATUS_TRANSITIONS[r.status as PatternStatus]] : [],
    lastSync: latest ? { id: latest.id, at: new Date(latest.at).toISOString(), asOf: latest.asOf } : null,
  };
}

// ---------------------------------------------------------------------------------------------------------------
// Acting

/**
 * Move a record to a new status (with the campaign or reason it needs), in one transaction with an audit row
 * per changed field. 409 for a move the rules do not allow or a stale `version`.
 */
export function changePatternStatus(user: SessionUser, id: number, body: PatternStatusChange, actor: Actor, now = Date.now()) {
  const db = getDb();
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
      const audit = (field: string, oldValue: string | null, newValue: string | null) =>
        writeAudit(tx, actor, { entity: 'pattern', entityId, action: 'status', field, oldValue, newValue }, now);
      audit('status', from, body.status);
      if (next.statusReason) audit(body.status === 'dismissed' ? 'reason' : 'note', null, next.statusReason);
      if (body.status === 'campaign_planned') {
        if (r.campaignKind !== body.campaign.kind) audit('campaignKind', r.campaignKind, body.campaign.kind);
        if (r.campaignNote !== body.campaign.note) audit('campaignNote', r.campaignNote, body.campaign.note);
        if (r.campaignTargetDate !== body.campaign.targetDate) audit('campaignTargetDate', r.campaignTargetDate, body.campaign.targetDate);
      }
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
 * new, or changed since someone last acted on them (new failures or a changed build range, whatever the status).
 * Null for roles that do not read patterns. Reads the records as last synced (no report is computed).
 */
export function getPatternsAttention(user: SessionUser) {
  if (!can(user.role, 'pattern:read')) return null;
  const { items } = listPatternRecords(user, {});
  const open = items.filter((i) => i.status !== 'dismissed' && i.status !== 'resolved');
  const isNew = items.filter((i) => i.status === 'new' && i.significant);
  // New failures after a campaign was resolved (or a pattern dismissed) matter most: the decision may not hold.
  const changed = items.filter((i) => i.status !== 'new' && (i.changes.newFailures > 0 || i.changes.range !== 'same'));
  return {
    needsAttention: new Set([...isNew, ...changed].map((i) => i.id)).size,
    new: isNew.length,
    changed: changed.length,
    open: open.length,
    waterIngressOpen: open.filter((i) => i.waterIngress).length,
    href: '/patterns',
  };
}
