/**
 * Defects: the list with its filters (scoped to the caller's depots). One record, create, change (with a
 * version check), the lifecycle and delete are in defect-record.ts and re-exported here.
 */
import { and, eq, gte, inArray, lt, lte, or, sql, type SQL } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { defectParts, defects, depots, modules, vehicles, DEFECT_STATUSES, MOISTURE, POSITIONS } from '@/db/schema';
import type { DefectCsvPart, DefectCsvSource } from '@/lib/exports/defects-csv';
import type { DefectListQuery, ListResponse } from '@/lib/contracts/lists';
import { parseInstant } from '@/lib/dates/dates';
import type { SessionUser } from './auth';
import { invalid } from './http';
import { depotScope, likePattern, listParam, orderBy, paging, separatorFreePattern } from './list-helpers';

const OPEN = ['reported', 'diagnosing', 'awaiting_parts', 'repaired', 'verified'];
import { defectJson, defectSelect, earlier, type DefectJson, type DefectSel } from './defect-json';

export { defectJson, type DefectJson };

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
    const bare = separatorFreePattern(q.q);
    conds.push(
      or(
        sql`${defects.ref} like ${p} escape '\\'`,
        sql`${vehicles.vin} like ${p} escape '\\'`,
        sql`${vehicles.fleetNumber} like ${p} escape '\\'`,
        sql`${vehicles.registration} like ${p} escape '\\'`,
        // A plate or fleet number typed without (or with other) dashes and spaces: "GHQ4941J" for "GHQ-4941-J".
        bare ? sql`${vehicles.searchKey} like ${bare} escape '\\'` : undefined,
        sql`${defects.symptom} like ${p} escape '\\'`,
        sql`${defects.dtcs} like ${p} escape '\\'`,
      ),
    );
  }
  return and(...conds);
}

/** The list's columns: those of every defect JSON, plus the depot's time zone (dates are shown in it). */
const defectListColumns = { ...defectSelect, depotTimeZone: depots.timezone };
type DefectListSel = DefectSel & { depotTimeZone: string | null };

/** JSON of a defect in the list: the common JSON and the depot's time zone. */
function defectListJson(r: DefectListSel) {
  return { ...defectJson(r), depotTimeZone: r.depotTimeZone };
}
/** One defect of the list (GET /api/defects). */
export type DefectListJson = ReturnType<typeof defectListJson>;

function defectListSelect() {
  return getDb()
    .select(defectListColumns)
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
export function listDefects(user: SessionUser, q: DefectListQuery, now = Date.now()): ListResponse<DefectListJson> {
  const { page, pageSize, offset } = paging(q);
  const where = defectListWhere(user, q, now);
  const order = orderBy(q.sort, DEFECT_SORT, '-reportedAt', defects.id);
  const total = defectListCount(where);
  const rows = defectListSelect().where(where).orderBy(...order).limit(pageSize).offset(offset).all();
  return { items: rows.map(defectListJson), total, page, pageSize };
}

/** Largest view the CSV export writes in one file. */
export const DEFECT_EXPORT_MAX_ROWS = 250_000;

/**
 * Every defect of a filtered view (all pages, the list's sort), read in one statement so the file is one
 * consistent snapshot; 400 when the view is larger than DEFECT_EXPORT_MAX_ROWS.
 */
export function listDefectsForExport(user: SessionUser, q: DefectListQuery, now = Date.now()): DefectCsvSource[] {
  const where = defectListWhere(user, q, now);
  const order = orderBy(q.sort, DEFECT_SORT, '-reportedAt', defects.id);
  const total = defectListCount(where);
  if (total > DEFECT_EXPORT_MAX_ROWS) {
    throw invalid(`This view holds ${total} defects; a download takes at most ${DEFECT_EXPORT_MAX_ROWS}. Narrow the filters (for example by dates).`, [
      { path: 'reportedFrom', message: 'Too many rows for one file' },
    ]);
  }
  const rows = defectListSelect().where(where).orderBy(...order).all();
  // Part lines of the view's defects, in chunks (SQLite's variable limit), in the order they were entered.
  const partsByDefect = new Map<number, DefectCsvPart[]>();
  const ids = rows.map((r) => r.d.id);
  for (let i = 0; i < ids.length; i += 500) {
    const part = getDb()
      .select({ defectId: defectParts.defectId, partNumber: defectParts.partNumber, description: defectParts.description, quantity: defectParts.quantity, unitCostMinor: defectParts.unitCostMinor })
      .from(defectParts)
      .where(inArray(defectParts.defectId, ids.slice(i, i + 500)))
      .orderBy(defectParts.defectId, defectParts.id)
      .all();
    for (const { defectId, ...p } of part) {
      const list = partsByDefect.get(defectId) ?? [];
      list.push(p);
      partsByDefect.set(defectId, list);
    }
  }
  return rows.map((r) => {
    const j = defectJson(r);
    return {
      ...j,
      depotCode: r.depotCode,
      repeatOfRef: r.repeatOfRef,
      membraneCondition: r.d.membraneCondition,
      sealCondition: r.d.sealCondition,
      drainCondition: r.d.drainCondition,
      connectorCondition: r.d.connectorCondition,
      parts: partsByDefect.get(r.d.id) ?? [],
    };
  });
}

// One record, reporting, changing, lifecycle steps and deleting live in defect-record.ts.
export { createDefect, currentRepeatWindowDays, deleteDefect, getDefect, listTransitions, transitionDefect, updateDefect } from './defect-record';
