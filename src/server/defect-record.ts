/**
 * One defect: the record the defect page shows (decoded codes, findings, parts and cost, verification,
 * timeline, repeat links, photos, audit trail), reporting a defect, changing it with the version check, moving
 * it through the lifecycle, and deleting it. Every write runs in one transaction with its audit rows; a stale
 * `version` is refused with 409 and the current record, so nobody overwrites work they have not seen.
 */
import fs from 'node:fs';
import path from 'node:path';
import { and, asc, eq, inArray } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { attachments, defectParts, defects, defectTransitions, depots, modules, settings, users, vehicles } from '@/db/schema';
import { uploadDir } from '@/env';
import type { AuditRow, DefectCreate, DefectPatch, DefectRecord, Part, TimelineEntry, TransitionRequest } from '@/lib/contracts/defects';
import { describeDtc, parseDtc, parseDtcList } from '@/lib/dtc/dtc';
import { parseInstant } from '@/lib/dates/dates';
import { cellsFromObject, validateRecord } from '@/lib/imports/rows';
import { canEditRecord, requiresSafetyVerification } from '@/lib/defects/transitions';
import { can } from '@/lib/auth/permissions';
import { partsTotalMinor, repairCostMinor } from '@/lib/defects/cost';
import { beforeBuildMessage, reportedBeforeBuild } from '@/lib/defects/times';
import { parseVin } from '@/lib/vin/vin';
import { inScope, requireDepotScope, type SessionUser } from './auth';
import { conflict, forbidden, HttpError, invalid, notFound } from './http';
import { iso } from './list-helpers';
import { defectJson, defectSelect, earlier } from './defect-json';
import { currencyCode } from './currency';
import { applyDefectRow, writeDefectCodes } from './imports';
import { refreshRepeats, repeatWindowDays } from './repeats';
import { listAudit, writeAudit, type Actor } from './audit';
import { listPhotos } from './photos';
import { affectsRepeats, applyTransition, loadForWrite, patchLifecycle, StaleVersionError, writeChange, type DefectDb, type Tx } from './defect-workflow';

const DAY_MS = 86_400_000;

/** Words for system actors on the timeline. */
const ACTOR_WORDS: Record<string, string> = { seed: 'Demo data', import: 'Import', cli: 'Command line', system: 'System' };

function loadRecordRow(id: number) {
  return getDb()
    .select({ ...defectSelect, repeatOfClosedAt: earlier.closedAt })
    .from(defects)
    .innerJoin(vehicles, eq(vehicles.id, defects.vehicleId))
    .innerJoin(depots, eq(depots.id, defects.depotId))
    .innerJoin(modules, eq(modules.id, defects.moduleId))
    .leftJoin(earlier, eq(earlier.id, defects.repeatOfId))
    .where(eq(defects.id, id))
    .get();
}

/** The repeat window in days (setting `repeat_window_days`), for the report form's hint. */
export function currentRepeatWindowDays(): number {
  return repeatWindowDays(getDb());
}

/** The hourly labour rate for costs (setting `labour_rate_minor_per_hour`), or null when none is set. */
export function labourRateMinorPerHour(tx: Pick<Tx, 'select'> = getDb()): number | null {
  const v = Number(tx.select().from(settings).where(eq(settings.key, 'labour_rate_minor_per_hour')).get()?.value);
  return Number.isInteger(v) && v >= 0 ? v : null;
}

function partsOf(tx: Pick<Tx, 'select'>, defectId: number): Part[] {
  return tx
    .select({ partNumber: defectParts.partNumber, description: defectParts.description, quantity: defectParts.quantity, unitCostMinor: defectParts.unitCostMinor })
    .from(defectParts)
    .where(eq(defectParts.defectId, defectId))
    .orderBy(asc(defectParts.id))
    .all();
}

/** One defect with everything its page shows, inside the caller's depots (else 404). */
export function getDefect(user: SessionUser, id: number): DefectRecord {
  const r = loadRecordRow(id);
  if (!r) throw notFound('Defect');
  requireDepotScope(user, r.d.depotId, 'Defect');
  const d = r.d;
  const db = getDb();
  const steps = db
    .select({ t: defectTransitions, name: users.name })
    .from(defectTransitions)
    .leftJoin(users, eq(users.id, defectTransitions.userId))
    .where(eq(defectTransitions.defectId, d.id))
    .orderBy(asc(defectTransitions.at), asc(defectTransitions.id))
    .all();
  const ids = [d.reportedById, d.assignedToId, d.verifiedById].filter((x): x is number => x !== null);
  const names = new Map(ids.length ? db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids)).all().map((u) => [u.id, u.name]) : []);
  const name = (uid: number | null) => (uid === null ? null : (names.get(uid) ?? null));
  const timeline: TimelineEntry[] = steps.map((s) => ({
    at: iso(s.t.at)!,
    from: s.t.fromStatus,
    to: s.t.toStatus,
    by: s.name ?? (s.t.actor ? (ACTOR_WORDS[s.t.actor] ?? s.t.actor) : null),
    reason: s.t.reason,
  }));
  if (d.status === 'closed' && d.closedAt !== null && steps.at(-1)?.t.toStatus !== 'closed') {
    // Closed by an import row or entered as a closed record: there was no step in Seepline to show.
    timeline.push({ at: iso(d.closedAt)!, from: steps.at(-1)?.t.toStatus ?? 'reported', to: 'closed', by: null, reason: 'Closed on record (imported or entered closed)' });
    timeline.sort((a, b) => a.at.localeCompare(b.at));
  }
  const codes = (d.dtcs ? d.dtcs.split(' ') : []).map((text) => {
    const p = parseDtc(text);
    return p.ok
      ? { display: p.display, code: p.code, failureType: p.failureType, system: p.system, scope: p.scope, description: describeDtc(p) }
      : { display: text, code: text, failureType: null, system: null, scope: null, description: 'Not a valid fault code' };
  });
  const parts = partsOf(db, d.id);
  const repeatedBy = db
    .select({ id: defects.id, ref: defects.ref, reportedAt: defects.reportedAt, status: defects.status })
    .from(defects)
    .where(eq(defects.repeatOfId, d.id))
    .orderBy(asc(defects.reportedAt))
    .all()
    .map((x) => ({ ...x, reportedAt: iso(x.reportedAt)! }));
  const record: DefectRecord = {
    ...defectJson(r),
    codes,
    membraneCondition: d.membraneCondition,
    sealCondition: d.sealCondition,
    drainCondition: d.drainCondition,
    connectorCondition: d.connectorCondition,
    notes: d.notes,
    reporterName: d.reporterName,
    parts,
    partsTotalMinor: partsTotalMinor(parts),
    labourRateMinorPerHour: labourRateMinorPerHour(db),
    currency: currencyCode(db),
    reportedBy: name(d.reportedById),
    reportedById: d.reportedById,
    assignedTo: name(d.assignedToId),
    assignedToId: d.assignedToId,
    verification:
      d.verifiedAt !== null || d.verifiedById !== null
        ? { reinitialised: d.verifiedReinit, reversalVerified: d.verifiedReversal, by: name(d.verifiedById), byId: d.verifiedById, at: iso(d.verifiedAt), note: d.verificationNote }
        : null,
    safetyVerificationRequired: requiresSafetyVerification(r.moduleFunction),
    repeatOf:
      d.repeatOfId !== null && r.repeatOfRef !== null
        ? {
            id: d.repeatOfId,
            ref: r.repeatOfRef,
            closedAt: iso(r.repeatOfClosedAt),
            daysAfterClose: r.repeatOfClosedAt === null ? null : Math.floor((d.reportedAt - r.repeatOfClosedAt) / DAY_MS),
          }
        : null,
    repeatedBy,
    repeatWindowDays: repeatWindowDays(db),
    timeline,
    photos: listPhotos(d.id),
    audit: withAuditLabels(listAudit('defect', String(d.id))),
  };
  return record;
}

/** Audit fields that hold the id of another record, and how to name that record. */
const ID_FIELDS: Record<string, (ids: number[]) => Array<{ id: number; label: string }>> = {
  assignedToId: (ids) => getDb().select({ id: users.id, label: users.name }).from(users).where(inArray(users.id, ids)).all(),
  verifiedById: (ids) => getDb().select({ id: users.id, label: users.name }).from(users).where(inArray(users.id, ids)).all(),
  reportedById: (ids) => getDb().select({ id: users.id, label: users.name }).from(users).where(inArray(users.id, ids)).all(),
  moduleId: (ids) => getDb().select({ id: modules.id, label: modules.code }).from(modules).where(inArray(modules.id, ids)).all(),
  depotId: (ids) => getDb().select({ id: depots.id, label: depots.code }).from(depots).where(inArray(depots.id, ids)).all(),
  repeatOfId: (ids) => getDb().select({ id: defects.id, label: defects.ref }).from(defects).where(inArray(defects.id, ids)).all(),
  vehicleId: (ids) =>
    getDb()
      .select({ id: vehicles.id, vin: vehicles.vin, fleet: vehicles.fleetNumber })
      .from(vehicles)
      .where(inArray(vehicles.id, ids))
      .all()
      .map((v) => ({ id: v.id, label: v.fleet ? `${v.fleet} (${v.vin})` : v.vin })),
};

/**
 * Name the records that audit rows refer to by id (people, module types, depots, vehicles, defects), so the
 * trail reads "Assigned to – → Oskar Lindvale" rather than "→ 4". The stored values stay as they are.
 */
function withAuditLabels(rows: ReturnType<typeof listAudit>): AuditRow[] {
  const wanted = new Map<string, Set<number>>();
  for (const r of rows) {
    if (!r.field || !(r.field in ID_FIELDS)) continue;
    for (const v of [r.oldValue, r.newValue]) if (v !== null && /^\d+$/.test(v)) (wanted.get(r.field) ?? wanted.set(r.field, new Set()).get(r.field)!).add(Number(v));
  }
  const names = new Map<string, string>();
  for (const [field, ids] of wanted) for (const x of ID_FIELDS[field]!([...ids])) names.set(`${field}:${x.id}`, x.label);
  const label = (field: string | null, v: string | null) => (field && v !== null && field in ID_FIELDS ? (names.get(`${field}:${v}`) ?? null) : null);
  return rows.map((r) => ({ ...r, oldLabel: label(r.field, r.oldValue), newLabel: label(r.field, r.newValue) }));
}

function vehicleForWrite(user: SessionUser, vinRaw: string) {
  const vin = vinRaw.trim().toUpperCase();
  const v = getDb()
    .select({ id: vehicles.id, depotId: vehicles.depotId, timezone: depots.timezone, buildMonth: vehicles.buildMonth })
    .from(vehicles)
    .innerJoin(depots, eq(depots.id, vehicles.depotId))
    .where(eq(vehicles.vin, vin))
    .get();
  if (!v || !inScope(user, v.depotId)) {
    throw new HttpError(422, 'INVALID_INPUT', `No vehicle with VIN ${vin} in your depots.`, [{ path: 'vin', message: 'Unknown vehicle' }]);
  }
  return v;
}

function moduleForWrite(code: string): { id: number; fn: string } {
  const m = getDb().select({ id: modules.id, fn: modules.function }).from(modules).where(eq(modules.code, code.toUpperCase())).get();
  if (!m) throw new HttpError(422, 'INVALID_INPUT', `No module type ${code} in the catalogue.`, [{ path: 'moduleCode', message: 'Unknown module type' }]);
  return m;
}

/** The import-format rules on a record (one source of truth with the CSV import). */
function validatedRow(body: Record<string, unknown>) {
  const r = validateRecord('defects', cellsFromObject('defects', body));
  if (!r.value || r.errors.length) {
    throw new HttpError(422, 'INVALID_INPUT', r.errors.map((e) => e.message).join(' '), r.errors.map((e) => ({ path: e.column, message: e.message })));
  }
  return r.value;
}

/**
 * Report a defect on a vehicle in the caller's depots. A body may carry a whole record in the import format,
 * including `closedAt` for work done before or outside Seepline (accepted as history, like an import row).
 */
export function createDefect(user: SessionUser, input: DefectCreate, actor: Actor): DefectRecord {
  const row = validatedRow({ ...input, reportedAt: input.reportedAt ?? new Date().toISOString() });
  if (row.closedAtText !== null && !can(user.role, 'import')) {
    // A record entered already closed is history (like an import row) and skips the steps and their checks.
    throw forbidden('Entering a defect that is already closed is for fleet managers and admins; report it, then work it through its steps.');
  }
  checkReportedAt(row.reportedAtText);
  const v = vehicleForWrite(user, row.vin);
  checkNotBeforeBuild(parseInstant(row.reportedAtText, v.timezone), v.buildMonth, v.timezone);
  const moduleId = moduleForWrite(row.moduleCode).id;
  const db = getDb();
  if (row.ref && db.select({ id: defects.id }).from(defects).where(eq(defects.ref, row.ref)).get()) throw conflict(`A defect with ref ${row.ref} already exists.`);
  // IMMEDIATE: the write lock is taken before the next ref of the year is read (src/server/defect-refs.ts).
  const id = db.transaction((tx) => {
    const out = applyDefectRow(tx, row, { vehicleId: v.id, depotId: v.depotId, timezone: v.timezone, moduleId }, actor, 'api');
    if (out.outcome !== 'inserted') throw conflict('The same defect (vehicle, time, door and module) is already recorded.', { id: out.id });
    tx.update(defects)
      .set({ reportedById: 'userId' in actor ? actor.userId : null, reporterName: input.reporterName ?? null })
      .where(eq(defects.id, out.id))
      .run();
    refreshRepeats(tx, [v.id]);
    return out.id;
  }, { behavior: 'immediate' });
  return getDefect(user, id);
}

/** How far ahead of the server's clock a reported time may be (devices and time zones drift). */
const REPORTED_AHEAD_TOLERANCE_MS = DAY_MS;

/** A defect cannot be reported in the future (beyond a day of clock drift). */
function checkReportedAt(text: string): void {
  const t = parseInstant(text);
  if (t !== null && t > Date.now() + REPORTED_AHEAD_TOLERANCE_MS) {
    throw new HttpError(422, 'INVALID_INPUT', `reportedAt ${text} is in the future.`, [{ path: 'reportedAt', message: 'In the future' }]);
  }
}

/** A defect cannot be reported before its vehicle's build month (a slip of the date picker, not history). */
function checkNotBeforeBuild(reportedAtMs: number | null, buildMonth: string, tz: string | null): void {
  if (reportedAtMs !== null && reportedBeforeBuild(reportedAtMs, buildMonth, tz)) {
    const message = beforeBuildMessage(buildMonth);
    throw new HttpError(422, 'INVALID_INPUT', message, [{ path: 'reportedAt', message }]);
  }
}

const str = (v: unknown) => (v === null || v === undefined ? null : String(v));
const partsText = (parts: Part[]) =>
  parts.length ? parts.map((p) => `${p.partNumber} ×${p.quantity}${p.unitCostMinor === null ? '' : ` @ ${(p.unitCostMinor / 100).toFixed(2)}`}`).join('; ') : null;

const SIMPLE_FIELDS = [
  'symptom',
  'odometerKm',
  'reporterName',
  'moisture',
  'membraneCondition',
  'sealCondition',
  'drainCondition',
  'connectorCondition',
  'rootCause',
  'action',
  'notes',
  'labourMinutes',
] as const;

/**
 * Change a defect: only the fields given change. With `version`, a stale write is refused (409 with the
 * current record). Closed and cancelled records are changed by supervisors and above. `status`, or a
 * `closedAt` that closes or re-opens, goes through the lifecycle rules.
 */
export function updateDefect(user: SessionUser, id: number, patch: DefectPatch, actor: Actor): DefectRecord {
  const now = Date.now();
  try {
    getDb().transaction((tx) => {
      const { row, moduleFunction, timezone } = loadForWrite(tx, user, id);
      if (patch.version !== undefined && patch.version !== row.version) throw new StaleVersionError();
      if (patch.ref != null && patch.ref.toUpperCase() !== row.ref) throw invalid('ref cannot be changed.', [{ path: 'ref', message: 'ref is fixed' }]);
      const set: Partial<DefectDb> = {};
      const vehicleIds = new Set([row.vehicleId]);
      let tz = timezone;
      let buildMonth: string | null = null;
      if (patch.vin !== undefined) {
        const parsed = parseVin(patch.vin);
        if (!parsed.ok && parsed.code !== 'check_digit') throw invalid(parsed.message, [{ path: 'vin', message: parsed.message }]);
        const v = vehicleForWrite(user, patch.vin);
        if (v.id !== row.vehicleId) {
          set.vehicleId = v.id;
          set.depotId = v.depotId;
          vehicleIds.add(v.id);
          tz = v.timezone;
          buildMonth = v.buildMonth;
        }
      }
      if (patch.position !== undefined) set.position = patch.position;
      let fn = moduleFunction;
      if (patch.moduleCode !== undefined) {
        const m = moduleForWrite(patch.moduleCode);
        set.moduleId = m.id;
        fn = m.fn;
      }
      for (const f of SIMPLE_FIELDS) {
        const v = patch[f];
        if (v !== undefined) (set as Record<string, unknown>)[f] = v;
      }
      let codes: ReturnType<typeof parseDtcList> | null = null;
      if (patch.dtcs !== undefined) {
        set.dtcs = patch.dtcs;
        codes = parseDtcList(patch.dtcs ?? '');
      }
      if (patch.reportedAt !== undefined) {
        checkReportedAt(patch.reportedAt);
        set.reportedAt = parseInstant(patch.reportedAt, tz)!;
        set.reportedAtText = patch.reportedAt;
      }
      const closedAtMs = patch.closedAt === undefined ? undefined : patch.closedAt === null ? null : parseInstant(patch.closedAt, tz)!;
      const currentParts = partsOf(tx, row.id);
      const partsChanged = patch.parts !== undefined && partsText(patch.parts) !== partsText(currentParts);

      // A closing time given on a closed defect corrects it; on an open one it closes (lifecycle below).
      if (row.status === 'closed' && typeof closedAtMs === 'number' && (patch.status === undefined || patch.status === 'closed')) {
        set.closedAt = closedAtMs;
        set.closedAtText = patch.closedAt ?? null;
      }
      const recordChanged = partsChanged || (Object.keys(set) as Array<keyof DefectDb>).some((k) => str(set[k]) !== str(row[k]));
      if (recordChanged && !canEditRecord(row.status, user.role)) {
        throw forbidden(`${row.ref} is ${row.status}; its record is changed by supervisors, fleet managers and admins (re-open it to work on it again).`);
      }

      const action = 'action' in set ? set.action : row.action;
      const rootCause = 'rootCause' in set ? set.rootCause : row.rootCause;
      const life = patchLifecycle(
        user,
        { ...row, ...set } as DefectDb,
        fn,
        {
          status: patch.status,
          closedAtMs: row.status === 'closed' && typeof closedAtMs === 'number' ? undefined : closedAtMs,
          reason: patch.reason ?? null,
          hasAction: !!action?.trim(),
          hasRootCause: rootCause !== null && rootCause !== undefined,
        },
        now,
      );
      const merged: Partial<DefectDb> = { ...set, ...(life?.set ?? {}) };
      const reportedAt = merged.reportedAt ?? row.reportedAt;
      if (patch.reportedAt !== undefined || buildMonth !== null) {
        // A new report time, or another vehicle: the report must not be before that vehicle was built.
        buildMonth ??= tx.select({ m: vehicles.buildMonth }).from(vehicles).where(eq(vehicles.id, row.vehicleId)).get()?.m ?? null;
        if (buildMonth !== null) checkNotBeforeBuild(reportedAt, buildMonth, tz);
      }
      const closedAt = 'closedAt' in merged ? merged.closedAt : row.closedAt;
      if (closedAt !== null && closedAt !== undefined && closedAt < reportedAt) {
        throw new HttpError(422, 'INVALID_INPUT', 'The closing time is before the defect was reported.', [{ path: 'closedAt', message: 'Before reported_at' }]);
      }
      if (partsChanged || 'labourMinutes' in set) {
        const parts = patch.parts ?? currentParts;
        const labour = 'labourMinutes' in set ? (set.labourMinutes ?? null) : row.labourMinutes;
        merged.costMinor = repairCostMinor(parts, labour, labourRateMinorPerHour(tx));
      }
      writeChange(tx, row, merged, actor, now, life?.step, partsChanged);
      if (partsChanged) {
        tx.delete(defectParts).where(eq(defectParts.defectId, row.id)).run();
        if (patch.parts!.length) tx.insert(defectParts).values(patch.parts!.map((p) => ({ defectId: row.id, ...p }))).run();
        writeAudit(tx, actor, { entity: 'defect', entityId: String(row.id), action: 'update', field: 'parts', oldValue: partsText(currentParts), newValue: partsText(patch.parts!) }, now);
      }
      // Photos and traces follow the defect into its new vehicle's depot (their scope is checked against it).
      if (merged.depotId !== undefined && merged.depotId !== row.depotId) tx.update(attachments).set({ depotId: merged.depotId }).where(eq(attachments.defectId, row.id)).run();
      if (codes?.ok && str(merged.dtcs) !== str(row.dtcs)) writeDefectCodes(tx, row.id, codes.codes.map((c) => ({ code: c.code, failureType: c.failureType, display: c.display })));
      if (affectsRepeats(row, merged)) refreshRepeats(tx, [...vehicleIds]);
    });
  } catch (e) {
    if (e instanceof StaleVersionError) throw staleConflict(user, id);
    throw e;
  }
  return getDefect(user, id);
}

/** 409 with the record as it is now. */
function staleConflict(user: SessionUser, id: number): HttpError {
  return conflict('This defect was changed by someone else since you opened it. Nothing was saved: compare their changes with yours and re-apply.', {
    current: getDefect(user, id),
  });
}

/** Move a defect to another status by the lifecycle rules (POST /api/defects/{id}/transitions). */
export function transitionDefect(user: SessionUser, id: number, req: TransitionRequest, actor: Actor): DefectRecord {
  try {
    getDb().transaction((tx) => applyTransition(tx, user, id, req, actor, Date.now()));
  } catch (e) {
    if (e instanceof StaleVersionError) throw staleConflict(user, id);
    throw e;
  }
  return getDefect(user, id);
}

/** The status changes of a defect, oldest first (GET /api/defects/{id}/transitions). */
export function listTransitions(user: SessionUser, id: number): { items: TimelineEntry[] } {
  return { items: getDefect(user, id).timeline };
}

/** Delete a defect (admins and managers; the audit trail keeps the deletion), with its photos. */
export function deleteDefect(user: SessionUser, id: number, actor: Actor): void {
  const current = getDefect(user, id);
  const db = getDb();
  const photoFiles = db
    .select({ sha256: attachments.sha256, storedPath: attachments.storedPath, thumbPath: attachments.thumbPath })
    .from(attachments)
    .where(and(eq(attachments.defectId, id), eq(attachments.kind, 'photo')))
    .all();
  const orphans = db.transaction((tx) => {
    tx.delete(attachments).where(and(eq(attachments.defectId, id), eq(attachments.kind, 'photo'))).run();
    tx.update(defects).set({ repeatOfId: null }).where(eq(defects.repeatOfId, id)).run();
    tx.delete(defects).where(eq(defects.id, id)).run();
    writeAudit(tx, actor, { entity: 'defect', entityId: String(id), action: 'delete', oldValue: current.ref });
    refreshRepeats(tx, [current.vehicleId]);
    const stillUsed = new Set(
      photoFiles.length ? tx.select({ sha256: attachments.sha256 }).from(attachments).where(inArray(attachments.sha256, photoFiles.map((p) => p.sha256))).all().map((x) => x.sha256) : [],
    );
    return photoFiles.filter((p) => !stillUsed.has(p.sha256));
  });
  for (const p of orphans) for (const rel of [p.storedPath, p.thumbPath]) if (rel) fs.rmSync(path.resolve(uploadDir(), rel), { force: true });
}
