/**
 * Defects: the list with its filters (scoped to the caller's depots). One record, create, change (with a
 * version check), the lifecycle and delete are in defect-record.ts and re-exported here.
 */
import { and, eq, gte, inArray, lte, or, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { getDb } from '@/db/client';
import { defects, depots, modules, vehicles, DEFECT_STATUSES, MOISTURE, POSITIONS } from '@/db/schema';
import type { DefectListQuery, ListResponse } from '@/lib/contracts/lists';
import { parseInstant } from '@/lib/dates/dates';
import type { SessionUser } from './auth';
import { invalid } from './http';
import { depotScope, iso, likePattern, listParam, orderBy, paging } from './list-helpers';

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

/** Defects in the caller's depots, filtered, sorted and paged. */
export function listDefects(user: SessionUser, q: DefectListQuery): ListResponse<DefectJson> {
  const db = getDb();
  const { page, pageSize, offset } = paging(q);
  const conds: (SQL | undefined)[] = [depotScope(user, defects.depotId)];
  if (q.depot) conds.push(inArray(depots.code, listParam(q.depot).map((s) => s.toUpperCase())));
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
  for (const [key, op] of [['reportedFrom', gte], ['reportedTo', lte]] as const) {
    const v = q[key];
    if (v) {
      const t = parseInstant(v);
      if (t === null) throw invalid(`${key} must be a date YYYY-MM-DD.`, [{ path: key, message: 'Not a date' }]);
      conds.push(op(defects.reportedAt, key === 'reportedTo' && v.length === 10 ? t + 86_399_999 : t));
    }
  }
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
  const where = and(...conds);
  const base = () =>
    db
      .select(defectSelect)
      .from(defects)
      .innerJoin(vehicles, eq(vehicles.id, defects.vehicleId))
      .innerJoin(depots, eq(depots.id, defects.depotId))
      .innerJoin(modules, eq(modules.id, defects.moduleId))
      .leftJoin(earlier, eq(earlier.id, defects.repeatOfId));
  const total =
    db
      .select({ n: sql<number>`count(*)` })
      .from(defects)
      .innerJoin(vehicles, eq(vehicles.id, defects.vehicleId))
      .innerJoin(depots, eq(depots.id, defects.depotId))
      .innerJoin(modules, eq(modules.id, defects.moduleId))
      .where(where)
      .get()?.n ?? 0;
  const rows = base()
    .where(where)
    .orderBy(...orderBy(q.sort, DEFECT_SORT, '-reportedAt', defects.id))
    .limit(pageSize)
    .offset(offset)
    .all();
  return { items: rows.map(defectJson), total, page, pageSize };
}

// One record, reporting, changing, lifecycle steps and deleting live in defect-record.ts.
export { createDefect, currentRepeatWindowDays, deleteDefect, getDefect, listTransitions, transitionDefect, updateDefect } from './defect-record';
