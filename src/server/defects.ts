/**
 * Defects: the list with its filters (scoped to the caller's depots), one record with decoded fault codes
 * and its audit trail, create, change (with a version check) and delete.
 */
import { and, eq, gte, inArray, lt, lte, or, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { getDb } from '@/db/client';
import { defectParts, defects, depots, modules, users, vehicles, DEFECT_STATUSES, MOISTURE, POSITIONS } from '@/db/schema';
import type { DefectListQuery, ListResponse } from '@/lib/contracts/lists';
import { cellsFromObject, validateRecord } from '@/lib/imports/rows';
import { describeDtc, parseDtc } from '@/lib/dtc/dtc';
import { parseInstant } from '@/lib/dates/dates';
import { inScope, requireDepotScope, type SessionUser } from './auth';
import { conflict, HttpError, invalid, notFound } from './http';
import { depotScope, iso, likePattern, listParam, orderBy, paging } from './list-helpers';
import { applyDefectRow } from './imports';
import { refreshRepeats } from './repeats';
import { listAudit, writeAudit, type Actor } from './audit';

const OPEN = ['reported', 'diagnosing', 'awaiting_parts', 'repaired', 'verified'];
const earlier = alias(defects, 'earlier');

const defectSelect = {
  d: defects,
  vin: vehicles.vin,
  fleetNumber: vehicles.fleetNumber,
  registration: vehicles.registration,
  make: vehicles.make,
  model: vehicles.model,
  depotCode: depots.code,
  moduleCode: modules.code,
  moduleName: modules.name,
  moduleFunction: modules.function,
  repeatOfRef: earlier.ref,
};
type DefectSel = {
  d: typeof defects.$inferSelect;
  vin: string;
  fleetNumber: string | null;
  registration: string | null;
  make: string | null;
  model: string | null;
  depotCode: string;
  moduleCode: string;
  moduleName: string;
  moduleFunction: string;
  repeatOfRef: string | null;
};

/** JSON of a defect in lists. */
export function defectJson(r: DefectSel) {
  const d = r.d;
  return {
    id: d.id,
    ref: d.ref,
    vin: r.vin,
    vehicleId: d.vehicleId,
    fleetNumber: r.fleetNumber,
    registration: r.registration,
    make: r.make,
    model: r.model,
    depotCode: r.depotCode,
    moduleCode: r.moduleCode,
    moduleName: r.moduleName,
    moduleFunction: r.moduleFunction,
    position: d.position,
    status: d.status,
    open: OPEN.includes(d.status),
    reportedAt: iso(d.reportedAt)!,
    symptom: d.symptom,
    dtcs: d.dtcs ? d.dtcs.split(' ') : [],
    moisture: d.moisture,
    rootCause: d.rootCause,
    action: d.action,
    odometerKm: d.odometerKm,
    labourMinutes: d.labourMinutes,
    costMinor: d.costMinor,
    closedAt: iso(d.closedAt),
    repeat: d.repeatOfId !== null,
    repeatOfId: d.repeatOfId,
    repeatOfRef: r.repeatOfRef,
    version: d.version,
    createdAt: iso(d.createdAt),
    updatedAt: iso(d.updatedAt),
  };
}
export type DefectJson = ReturnType<typeof defectJson>;

const DEFECT_SORT = {
  reportedAt: defects.reportedAt,
  ref: defects.ref,
  status: defects.status,
  position: defects.position,
  module: modules.code,
  moduleCode: modules.code,
  depot: depots.code,
  depotCode: depots.code,
  vin: vehicles.vin,
  fleetNumber: vehicles.fleetNumber,
  closedAt: defects.closedAt,
  moisture: defects.moisture,
  updatedAt: defects.updatedAt,
};

function bool(v: string | undefined): boolean | undefined {
  return v === undefined ? undefined : v === '1' || v === 'true';
}

function checkValues(name: string, values: string[], allowed: readonly string[], upper = false): string[] {
  const norm = values.map((v) => (upper ? v.toUpperCase() : v.toLowerCase()));
  const bad = norm.filter((v) => !allowed.includes(v));
  if (bad.length) throw invalid(`${name} must be one of ${allowed.join(', ')}; got ${bad.join(', ')}.`, [{ path: name, message: `Unknown ${name}` }]);
  return norm;
}

const DAY_MS = 86_400_000;

/** Epoch ms of a reportedFrom/reportedTo value: a bare UTC day covers the whole day (400 when not a date). */
function reportedBound(key: 'reportedFrom' | 'reportedTo', v: string): number {
  const t = parseInstant(v);
  if (t === null) throw invalid(`${key} must be a real date YYYY-MM-DD.`, [{ path: key, message: 'Not a date' }]);
  return key === 'reportedTo' && v.trim().length === 10 ? t + DAY_MS - 1 : t;
}

/** WHERE of the defect list for a caller and query (shared by the paged list and its CSV export). */
function defectListWhere(user: SessionUser, q: DefectListQuery, now: number): SQL | undefined {
  const conds: (SQL | undefined)[] = [depotScope(user, defects.depotId)];
  const depotCodes = listParam(q.depot);
  if (depotCodes.length) conds.push(inArray(depots.code, depotCodes.map((s) => s.toUpperCase())));
  if (q.vin) conds.push(eq(vehicles.vin, q.vin.trim().toUpperCase()));
  if (q.vehicleId) conds.push(eq(defects.vehicleId, q.vehicleId));
  if (q.ref) conds.push(eq(defects.ref, q.ref.trim().toUpperCase()));
  const statuses = listParam(q.status);
  if (statuses.length) conds.push(inArray(defects.status, checkValues('status', statuses, DEFECT_STATUSES) as (typeof DEFECT_STATUSES)[number][]));
  const mods = listParam(q.module);
  if (mods.length) conds.push(inArray(modules.code, mods.map((m) => m.toUpperCase())));
  const positions = listParam(q.position);
  if (positions.length) conds.push(inArray(defects.position, checkValues('position', positions, POSITIONS, true) as (typeof POSITIONS)[number][]));
  const moist = listParam(q.moisture);
  if (moist.length) conds.push(inArray(defects.moisture, checkValues('moisture', moist, MOISTURE) as (typeof MOISTURE)[number][]));
  const rep = bool(q.repeat);
  if (rep !== undefined) conds.push(rep ? sql`${defects.repeatOfId} is not null` : sql`${defects.repeatOfId} is null`);
  const open = bool(q.open);
  if (open !== undefined) conds.push(open ? inArray(defects.status, OPEN as (typeof DEFECT_STATUSES)[number][]) : sql`${defects.status} in ('closed','cancelled')`);
  if (bool(q.mine)) conds.push(or(eq(defects.assignedToId, user.id), eq(defects.reportedById, user.id)));
  // Age: reported more than N whole days before now (with open=1, "open longer than N days").
  if (q.olderThanDays !== undefined) conds.push(lt(defects.reportedAt, now - q.olderThanDays * DAY_MS));
  const from = q.reportedFrom ? reportedBound('reportedFrom', q.reportedFrom) : null;
  const to = q.reportedTo ? reportedBound('reportedTo', q.reportedTo) : null;
  if (from !== null && to !== null && from > to) {
    throw invalid('reportedFrom must not be after reportedTo.', [{ path: 'reportedFrom', message: 'After reportedTo' }]);
  }
  if (from !== null) conds.push(gte(defects.reportedAt, from));
  if (to !== null) conds.push(lte(defects.reportedAt, to));
  if (q.q) {
    const p = likePattern(q.q.trim());
    conds.push(
      or(
        sql`${defects.ref} like ${p} escape '\\'`,
        sql`${vehicles.vin} like ${p} escape '\\'`,
        sql`${vehicles.fleetNumber} like ${p} escape '\\'`,
        sql`${vehicles.registration} like ${p} escape '\\'`,
        sql`${defects.symptom} like ${p} escape '\\'`,
        sql`${defects.dtcs} like ${p} escape '\\'`,
      ),
    );
  }
  return and(...conds);
}

function defectListSelect() {
  return getDb()
    .select(defectSelect)
    .from(defects)
    .innerJoin(vehicles, eq(vehicles.id, defects.vehicleId))
    .innerJoin(depots, eq(depots.id, defects.depotId))
    .innerJoin(modules, eq(modules.id, defects.moduleId))
    .leftJoin(earlier, eq(earlier.id, defects.repeatOfId));
}

function defectListCount(where: SQL | undefined): number {
  return (
    getDb()
      .select({ n: sql<number>`count(*)` })
      .from(defects)
      .innerJoin(vehicles, eq(vehicles.id, defects.vehicleId))
      .innerJoin(depots, eq(depots.id, defects.depotId))
      .innerJoin(modules, eq(modules.id, defects.moduleId))
      .where(where)
      .get()?.n ?? 0
  );
}

/** Defects in the caller's depots, filtered, sorted and paged. */
export function listDefects(user: SessionUser, q: DefectListQuery, now = Date.now()): ListResponse<DefectJson> {
  const { page, pageSize, offset } = paging(q);
  const where = defectListWhere(user, q, now);
  const order = orderBy(q.sort, DEFECT_SORT, '-reportedAt', defects.id);
  const total = defectListCount(where);
  const rows = defectListSelect().where(where).orderBy(...order).limit(pageSize).offset(offset).all();
  return { items: rows.map(defectJson), total, page, pageSize };
}

/** Largest view the CSV export writes in one file. */
export const DEFECT_EXPORT_MAX_ROWS = 250_000;

/**
 * Every defect of a filtered view (all pages, the list's sort), read in one statement so the file is one
 * consistent snapshot; 400 when the view is larger than DEFECT_EXPORT_MAX_ROWS.
 */
export function listDefectsForExport(user: SessionUser, q: DefectListQuery, now = Date.now()): DefectJson[] {
  const where = defectListWhere(user, q, now);
  const order = orderBy(q.sort, DEFECT_SORT, '-reportedAt', defects.id);
  const total = defectListCount(where);
  if (total > DEFECT_EXPORT_MAX_ROWS) {
    throw invalid(`This view holds ${total} defects; a download takes at most ${DEFECT_EXPORT_MAX_ROWS}. Narrow the filters (for example by dates).`, [
      { path: 'reportedFrom', message: 'Too many rows for one file' },
    ]);
  }
  return defectListSelect().where(where).orderBy(...order).all().map(defectJson);
}

function loadDefect(id: number): DefectSel | undefined {
  return getDb()
    .select(defectSelect)
    .from(defects)
    .innerJoin(vehicles, eq(vehicles.id, defects.vehicleId))
    .innerJoin(depots, eq(depots.id, defects.depotId))
    .innerJoin(modules, eq(modules.id, defects.moduleId))
    .leftJoin(earlier, eq(earlier.id, defects.repeatOfId))
    .where(eq(defects.id, id))
    .get();
}

/** One defect with decoded codes, people and audit trail, inside the caller's depots (else 404). */
export function getDefect(user: SessionUser, id: number) {
  const r = loadDefect(id);
  if (!r) throw notFound('Defect');
  requireDepotScope(user, r.d.depotId, 'Defect');
  const d = r.d;
  const db = getDb();
  const name = (uid: number | null) => (uid ? (db.select({ name: users.name }).from(users).where(eq(users.id, uid)).get()?.name ?? null) : null);
  const codes = (d.dtcs ? d.dtcs.split(' ') : []).map((text) => {
    const p = parseDtc(text);
    return p.ok
      ? { display: p.display, code: p.code, failureType: p.failureType, system: p.system, scope: p.scope, description: describeDtc(p) }
      : { display: text, code: text, failureType: null, system: null, scope: null, description: 'Not a valid fault code' };
  });
  return {
    ...defectJson(r),
    codes,
    membraneCondition: d.membraneCondition,
    sealCondition: d.sealCondition,
    drainCondition: d.drainCondition,
    connectorCondition: d.connectorCondition,
    notes: d.notes,
    parts: db
      .select({ partNumber: defectParts.partNumber, description: defectParts.description, quantity: defectParts.quantity, unitCostMinor: defectParts.unitCostMinor })
      .from(defectParts)
      .where(eq(defectParts.defectId, d.id))
      .all(),
    reportedBy: name(d.reportedById),
    assignedTo: name(d.assignedToId),
    verification: d.verifiedAt
      ? { reinitialised: d.verifiedReinit, reversalVerified: d.verifiedReversal, by: name(d.verifiedById), at: iso(d.verifiedAt) }
      : null,
    audit: listAudit('defect', String(d.id)),
  };
}

function vehicleForWrite(user: SessionUser, vin: string) {
  const v = getDb()
    .select({ id: vehicles.id, depotId: vehicles.depotId, timezone: depots.timezone })
    .from(vehicles)
    .innerJoin(depots, eq(depots.id, vehicles.depotId))
    .where(eq(vehicles.vin, vin))
    .get();
  if (!v || !inScope(user, v.depotId)) {
    throw new HttpError(422, 'INVALID_INPUT', `No vehicle with VIN ${vin} in your depots.`, [{ path: 'vin', message: 'Unknown vehicle' }]);
  }
  return v;
}

function moduleForWrite(code: string): number {
  const m = getDb().select({ id: modules.id }).from(modules).where(eq(modules.code, code)).get();
  if (!m) throw new HttpError(422, 'INVALID_INPUT', `No module type ${code} in the catalogue.`, [{ path: 'module_code', message: 'Unknown module type' }]);
  return m.id;
}

function validatedDefect(body: Record<string, unknown>) {
  const r = validateRecord('defects', cellsFromObject('defects', body));
  if (!r.value || r.errors.length) {
    throw new HttpError(422, 'INVALID_INPUT', r.errors.map((e) => e.message).join(' '), r.errors.map((e) => ({ path: e.column, message: e.message })));
  }
  return r.value;
}

/** Report a defect on a vehicle in the caller's depots. */
export function createDefect(user: SessionUser, body: Record<string, unknown>, actor: Actor) {
  const row = validatedDefect({ reportedAt: new Date().toISOString(), ...body });
  const v = vehicleForWrite(user, row.vin);
  const moduleId = moduleForWrite(row.moduleCode);
  const db = getDb();
  if (row.ref && db.select({ id: defects.id }).from(defects).where(eq(defects.ref, row.ref)).get()) throw conflict(`A defect with ref ${row.ref} already exists.`);
  const id = db.transaction((tx) => {
    const out = applyDefectRow(tx, row, { vehicleId: v.id, depotId: v.depotId, timezone: v.timezone, moduleId }, actor, 'api');
    if (out.outcome !== 'inserted') throw conflict('The same defect (vehicle, time, door and module) is already recorded.', { id: out.id });
    if ('userId' in actor) tx.update(defects).set({ reportedById: actor.userId }).where(eq(defects.id, out.id)).run();
    refreshRepeats(tx, [v.id]);
    return out.id;
  });
  return getDefect(user, id);
}

/** Change a defect's recorded fields; a stale `version` gets 409 with the current record. */
export function updateDefect(user: SessionUser, id: number, body: Record<string, unknown>, actor: Actor) {
  const current = getDefect(user, id);
  if (body.version !== undefined && Number(body.version) !== current.version) {
    throw conflict('This defect was changed by someone else since you opened it.', { current });
  }
  const merged = {
    ref: current.ref,
    vin: current.vin,
    reportedAt: current.reportedAt,
    position: current.position,
    moduleCode: current.moduleCode,
    symptom: current.symptom,
    dtcs: current.dtcs,
    moisture: current.moisture,
    rootCause: current.rootCause,
    action: current.action,
    odometerKm: current.odometerKm,
    closedAt: current.closedAt,
    ...body,
  };
  const row = validatedDefect(merged);
  if (row.ref !== current.ref) throw invalid('ref cannot be changed.', [{ path: 'ref', message: 'ref is fixed' }]);
  const v = vehicleForWrite(user, row.vin);
  const moduleId = moduleForWrite(row.moduleCode);
  getDb().transaction((tx) => {
    applyDefectRow(tx, row, { vehicleId: v.id, depotId: v.depotId, timezone: v.timezone, moduleId }, actor, 'api');
    refreshRepeats(tx, [...new Set([v.id, current.vehicleId])]);
  });
  return getDefect(user, id);
}

/** Delete a defect (admins and managers; the audit trail keeps the deletion). */
export function deleteDefect(user: SessionUser, id: number, actor: Actor): void {
  const current = getDefect(user, id);
  getDb().transaction((tx) => {
    tx.update(defects).set({ repeatOfId: null }).where(eq(defects.repeatOfId, id)).run();
    tx.delete(defects).where(eq(defects.id, id)).run();
    writeAudit(tx, actor, { entity: 'defect', entityId: String(id), action: 'delete', oldValue: current.ref });
    refreshRepeats(tx, [current.vehicleId]);
  });
}
