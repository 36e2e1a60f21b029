/**
 * Depots, module catalogue and vehicles: lists (scoped to the caller's depots), records, create, change and
 * delete. Writes validate through the same row rules as the imports (src/lib/imports/rows.ts).
 */
import { and, asc, desc, eq, inArray, isNull, or, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { getDb } from '@/db/client';
import { defects, depots, modules, userDepots, users, vehicleOffRoad, vehicles } from '@/db/schema';
import { OPEN_STATUS_VALUES, verificationComplete } from '@/lib/defects/transitions';
import { checkReturnToService, OFF_ROAD_REASON_MAX, unverifiedForRelease } from '@/lib/vehicles/off-road';
import type { ListResponse, VehicleListQuery } from '@/lib/contracts/lists';
import { cellsFromObject, validateRecord, type ImportKind, type RowIssue } from '@/lib/imports/rows';
import { parseVin } from '@/lib/vin/vin';
import { can } from '@/lib/auth/permissions';
import { inScope, requireDepotScope, type SessionUser } from './auth';
import { conflict, HttpError, invalid, notFound } from './http';
import { depotScope, iso, likePattern, orderBy, paging, separatorFreePattern } from './list-helpers';
import { applyDepotRow, applyModuleRow, applyVehicleRow } from './imports';
import { writeAudit, type Actor } from './audit';

const OPEN_STATUSES = ['reported', 'diagnosing', 'awaiting_parts', 'repaired', 'verified'] as const;
export { OPEN_STATUSES };

/** 422 with the row issues of a single-record validation. */
function rejectIssues(errors: RowIssue[]): never {
  throw new HttpError(
    422,
    'INVALID_INPUT',
    errors.map((e) => e.message).join(' '),
    errors.map((e) => ({ path: e.column, message: e.message })),
  );
}

function validated<K extends ImportKind>(kind: K, body: Record<string, unknown>) {
  const r = validateRecord(kind, cellsFromObject(kind, body));
  if (!r.value || r.errors.length) rejectIssues(r.errors);
  return { value: r.value, warnings: r.warnings };
}

// ---------------------------------------------------------------- depots

type DepotDb = typeof depots.$inferSelect;

/** What keeps a depot from being deleted: every vehicle (retired ones too), defect and person attached to it. */
export type DepotUsage = { vehicles: number; defects: number; people: number };

/** JSON of a depot; `usage` only for people who may delete depots (the Depots page disables Delete with the reason). */
export function depotJson(d: DepotDb, counts?: { vehicles: number; openDefects: number }, usage?: DepotUsage) {
  return {
    id: d.id,
    code: d.code,
    name: d.name,
    region: d.region,
    coastal: d.coastal,
    rainDaysPerYear: d.rainDaysPerYear,
    meanRhPct: d.meanRhPct,
    washBay: d.washBay,
    inspectionSlotsPerDay: d.inspectionSlotsPerDay,
    timezone: d.timezone,
    ...(counts ?? {}),
    ...(usage ? { usage } : {}),
    createdAt: iso(d.createdAt),
    updatedAt: iso(d.updatedAt),
  };
}
export type DepotJson = ReturnType<typeof depotJson>;

const DEPOT_SORT = {
  code: depots.code,
  name: depots.name,
  region: depots.region,
  rainDaysPerYear: depots.rainDaysPerYear,
  meanRhPct: depots.meanRhPct,
  coastal: depots.coastal,
  createdAt: depots.createdAt,
};

/** Depots the caller may see, with vehicle and open-defect counts. */
export function listDepots(user: SessionUser, q: { page?: number; pageSize?: number; sort?: string; q?: string; depot?: string }): ListResponse<DepotJson> {
  const db = getDb();
  const { page, pageSize, offset } = paging(q);
  const conds: (SQL | undefined)[] = [depotScope(user, depots.id)];
  if (q.depot) conds.push(eq(depots.code, q.depot.toUpperCase()));
  if (q.q) {
    const p = likePattern(q.q.trim());
    conds.push(or(sql`${depots.code} like ${p} escape '\\'`, sql`${depots.name} like ${p} escape '\\'`, sql`${depots.region} like ${p} escape '\\'`));
  }
  const where = and(...conds);
  const total = db.select({ n: sql<number>`count(*)` }).from(depots).where(where).get()?.n ?? 0;
  const rows = db
    .select({
      d: depots,
      vehicles: sql<number>`(select count(*) from vehicles v where v.depot_id = "depots"."id" and v.retired_date is null)`,
      openDefects: sql<number>`(select count(*) from defects x where x.depot_id = "depots"."id" and x.status in ('reported','diagnosing','awaiting_parts','repaired','verified'))`,
      allVehicles: sql<number>`(select count(*) from vehicles v where v.depot_id = "depots"."id")`,
      allDefects: sql<number>`(select count(*) from defects x where x.depot_id = "depots"."id")`,
      people: sql<number>`(select count(*) from user_depots u where u.depot_id = "depots"."id")`,
    })
    .from(depots)
    .where(where)
    .orderBy(...orderBy(q.sort, DEPOT_SORT, 'code', depots.id))
    .limit(pageSize)
    .offset(offset)
    .all();
  const withUsage = can(user.role, 'depot:write');
  return {
    items: rows.map((r) =>
      depotJson(r.d, { vehicles: r.vehicles, openDefects: r.openDefects }, withUsage ? { vehicles: r.allVehicles, defects: r.allDefects, people: r.people } : undefined),
    ),
    total,
    page,
    pageSize,
  };
}

/** One depot by code, inside the caller's scope (else 404). */
export function getDepot(user: SessionUser, code: string): DepotJson {
  const d = getDb().select().from(depots).where(eq(depots.code, code.toUpperCase())).get();
  if (!d || !inScope(user, d.id)) throw notFound('Depot');
  return depotJson(d);
}

/** Create a depot (409 when the code exists). */
export function createDepot(body: Record<string, unknown>, actor: Actor): DepotJson {
  const { value } = validated('depots', body);
  const db = getDb();
  if (db.select({ id: depots.id }).from(depots).where(eq(depots.code, value.code)).get()) throw conflict(`A depot with code ${value.code} already exists.`);
  const id = db.transaction((tx) => applyDepotRow(tx, value, actor, 'api').id);
  return depotJson(db.select().from(depots).where(eq(depots.id, id)).get()!);
}

/** Change a depot: the body's fields replace the current ones. */
export function updateDepot(user: SessionUser, code: string, body: Record<string, unknown>, actor: Actor): DepotJson {
  const current = getDepot(user, code);
  const merged = { ...current, ...body, code: current.code };
  const { value } = validated('depots', merged);
  const db = getDb();
  db.transaction((tx) => applyDepotRow(tx, value, actor, 'api'));
  return depotJson(db.select().from(depots).where(eq(depots.id, current.id)).get()!);
}

/** Delete a depot that holds no vehicles, defects or people. */
export function deleteDepot(user: SessionUser, code: string, actor: Actor): void {
  const d = getDepot(user, code);
  const db = getDb();
  const used =
    (db.select({ n: sql<number>`count(*)` }).from(vehicles).where(eq(vehicles.depotId, d.id)).get()?.n ?? 0) +
    (db.select({ n: sql<number>`count(*)` }).from(defects).where(eq(defects.depotId, d.id)).get()?.n ?? 0) +
    (db.select({ n: sql<number>`count(*)` }).from(userDepots).where(eq(userDepots.depotId, d.id)).get()?.n ?? 0);
  if (used > 0) throw conflict(`Depot ${d.code} still has vehicles, defects or people; move them first.`);
  db.transaction((tx) => {
    tx.delete(depots).where(eq(depots.id, d.id)).run();
    writeAudit(tx, actor, { entity: 'depot', entityId: String(d.id), action: 'delete', oldValue: d.code });
  });
}

// ---------------------------------------------------------------- modules

type ModuleDb = typeof modules.$inferSelect;

/** JSON of a module type; `usage` (defects in every depot, which keep it from being deleted) only for people who may delete it. */
export function moduleJson(m: ModuleDb, counts?: { defects: number; openDefects: number }, usage?: { defects: number }) {
  return {
    id: m.id,
    code: m.code,
    name: m.name,
    function: m.function,
    partNumber: m.partNumber,
    supplier: m.supplier,
    ...(counts ?? {}),
    ...(usage ? { usage } : {}),
    createdAt: iso(m.createdAt),
    updatedAt: iso(m.updatedAt),
  };
}
export type ModuleJson = ReturnType<typeof moduleJson>;

const MODULE_SORT = { code: modules.code, name: modules.name, function: modules.function, supplier: modules.supplier, partNumber: modules.partNumber };

/** The module catalogue (every role reads it); defect counts are limited to the caller's depots. */
export function listModules(user: SessionUser, q: { page?: number; pageSize?: number; sort?: string; q?: string; depot?: string; function?: string }): ListResponse<ModuleJson> {
  const db = getDb();
  const { page, pageSize, offset } = paging(q);
  const conds: (SQL | undefined)[] = [];
  if (q.q) {
    const p = likePattern(q.q.trim());
    conds.push(
      or(
        sql`${modules.code} like ${p} escape '\\'`,
        sql`${modules.name} like ${p} escape '\\'`,
        sql`${modules.supplier} like ${p} escape '\\'`,
        sql`${modules.partNumber} like ${p} escape '\\'`,
      ),
    );
  }
  if (q.function) conds.push(eq(modules.function, q.function as ModuleDb['function']));
  const where = and(...conds);
  const scope =
    user.depotIds === null ? sql`1` : user.depotIds.length ? sql.raw(`x.depot_id in (${user.depotIds.map(Number).join(',')})`) : sql`0`;
  const depotFilter = q.depot ? sql`and x.depot_id = (select id from depots where code = ${q.depot.toUpperCase()})` : sql``;
  const total = db.select({ n: sql<number>`count(*)` }).from(modules).where(where).get()?.n ?? 0;
  const rows = db
    .select({
      m: modules,
      defects: sql<number>`(select count(*) from defects x where x.module_id = "modules"."id" and ${scope} ${depotFilter})`,
      openDefects: sql<number>`(select count(*) from defects x where x.module_id = "modules"."id" and ${scope} ${depotFilter} and x.status in ('reported','diagnosing','awaiting_parts','repaired','verified'))`,
      allDefects: sql<number>`(select count(*) from defects x where x.module_id = "modules"."id")`,
    })
    .from(modules)
    .where(where)
    .orderBy(...orderBy(q.sort, MODULE_SORT, 'code', modules.id))
    .limit(pageSize)
    .offset(offset)
    .all();
  const withUsage = can(user.role, 'module:write');
  return {
    items: rows.map((r) => moduleJson(r.m, { defects: r.defects, openDefects: r.openDefects }, withUsage ? { defects: r.allDefects } : undefined)),
    total,
    page,
    pageSize,
  };
}

/** One module type by code. */
export function getModule(code: string): ModuleJson {
  const m = getDb().select().from(modules).where(eq(modules.code, code.toUpperCase())).get();
  if (!m) throw notFound('Module type');
  return moduleJson(m);
}

/** Add a module type (409 when the code exists). */
export function createModule(body: Record<string, unknown>, actor: Actor): ModuleJson {
  const { value } = validated('modules', body);
  const db = getDb();
  if (db.select({ id: modules.id }).from(modules).where(eq(modules.code, value.code)).get()) throw conflict(`A module type with code ${value.code} already exists.`);
  db.transaction((tx) => applyModuleRow(tx, value, actor, 'api'));
  return getModule(value.code);
}

/** Change a module type. */
export function updateModule(code: string, body: Record<string, unknown>, actor: Actor): ModuleJson {
  const current = getModule(code);
  const { value } = validated('modules', { ...current, ...body, code: current.code });
  getDb().transaction((tx) => applyModuleRow(tx, value, actor, 'api'));
  return getModule(current.code);
}

/** Delete a module type no defect refers to. */
export function deleteModule(code: string, actor: Actor): void {
  const m = getModule(code);
  const db = getDb();
  const n = db.select({ n: sql<number>`count(*)` }).from(defects).where(eq(defects.moduleId, m.id)).get()?.n ?? 0;
  if (n > 0) throw conflict(`Module type ${m.code} has ${n} defects recorded against it and cannot be deleted.`);
  db.transaction((tx) => {
    tx.delete(modules).where(eq(modules.id, m.id)).run();
    writeAudit(tx, actor, { entity: 'module', entityId: String(m.id), action: 'delete', oldValue: m.code });
  });
}

// ---------------------------------------------------------------- vehicles

/** The caller's depots as a SQL condition on a defect alias `x` (defects stay with the depot that reported them). */
function defectScopeSql(user: SessionUser | null): SQL {
  if (!user || user.depotIds === null) return sql``;
  if (user.depotIds.length === 0) return sql` and 0`;
  return sql` and x.depot_id in (${sql.join(user.depotIds.map((d) => sql`${d}`), sql`, `)})`;
}

/** The columns of a vehicle row; its defect counts cover only defects the caller may see (a moved vehicle keeps its old depot's defects there). */
function vehicleSelectFor(user: SessionUser | null) {
  const scope = defectScopeSql(user);
  return {
    v: vehicles,
    depotCode: depots.code,
    depotName: depots.name,
    depotTimeZone: depots.timezone,
    // Why the vehicle is off road, as written when it was taken off (the open period's reason).
    offRoadReason: sql<string | null>`(select r.reason from vehicle_off_road r where r.vehicle_id = ${vehicles.id} and r.to_at is null order by r.from_at desc limit 1)`,
    openDefects: sql<number>`(select count(*) from defects x where x.vehicle_id = ${vehicles.id}${scope} and x.status in ('reported','diagnosing','awaiting_parts','repaired','verified'))`,
    defectCount: sql<number>`(select count(*) from defects x where x.vehicle_id = ${vehicles.id}${scope})`,
  };
}

type VehicleSel = {
  v: typeof vehicles.$inferSelect;
  depotCode: string;
  depotName: string;
  depotTimeZone: string | null;
  offRoadReason: string | null;
  openDefects: number;
  defectCount: number;
};

/** JSON of a vehicle. */
export function vehicleJson(r: VehicleSel) {
  const v = r.v;
  return {
    id: v.id,
    vin: v.vin,
    fleetNumber: v.fleetNumber,
    registration: v.registration,
    make: v.make,
    model: v.model,
    body: v.body,
    buildDate: v.buildDate,
    buildMonth: v.buildMonth,
    inServiceDate: v.inServiceDate,
    retiredDate: v.retiredDate,
    depotCode: r.depotCode,
    depotName: r.depotName,
    depotTimeZone: r.depotTimeZone,
    parking: v.parking,
    washesPerMonth: v.washesPerMonth,
    modelYear: v.modelYear,
    status: v.retiredDate ? 'retired' : v.offRoadSinceAt ? 'off_road' : 'active',
    offRoadSince: iso(v.offRoadSinceAt),
    offRoadReason: v.offRoadSinceAt !== null && !v.retiredDate ? r.offRoadReason : null,
    openDefects: r.openDefects,
    defects: r.defectCount,
    version: v.version,
    createdAt: iso(v.createdAt),
    updatedAt: iso(v.updatedAt),
  };
}
export type VehicleJson = ReturnType<typeof vehicleJson>;

const VEHICLE_SORT = {
  vin: vehicles.vin,
  fleetNumber: vehicles.fleetNumber,
  registration: vehicles.registration,
  make: vehicles.make,
  model: vehicles.model,
  body: vehicles.body,
  buildDate: vehicles.buildDate,
  inServiceDate: vehicles.inServiceDate,
  retiredDate: vehicles.retiredDate,
  depot: depots.code,
  depotCode: depots.code,
  parking: vehicles.parking,
  washesPerMonth: vehicles.washesPerMonth,
  modelYear: vehicles.modelYear,
  openDefects: vehicleSelectFor(null).openDefects,
  offRoadSince: vehicles.offRoadSinceAt,
  createdAt: vehicles.createdAt,
  updatedAt: vehicles.updatedAt,
};

/** Vehicles in the caller's depots with the list conventions of CONTRACT.md. */
export function listVehicles(user: SessionUser, q: VehicleListQuery): ListResponse<VehicleJson> {
  const db = getDb();
  const { page, pageSize, offset } = paging(q);
  const conds: (SQL | undefined)[] = [depotScope(user, vehicles.depotId)];
  if (q.depot) conds.push(inArray(depots.code, q.depot.split(',').map((s) => s.trim().toUpperCase())));
  if (q.vin) conds.push(eq(vehicles.vin, q.vin.trim().toUpperCase()));
  if (q.parking) conds.push(eq(vehicles.parking, q.parking));
  if (q.make) conds.push(eq(vehicles.make, q.make));
  if (q.status === 'retired') conds.push(sql`${vehicles.retiredDate} is not null`);
  if (q.status === 'active') conds.push(sql`${vehicles.retiredDate} is null`);
  if (q.status === 'off_road') conds.push(sql`${vehicles.offRoadSinceAt} is not null and ${vehicles.retiredDate} is null`);
  if (q.q) {
    const p = likePattern(q.q.trim());
    const bare = separatorFreePattern(q.q);
    conds.push(
      or(
        sql`${vehicles.vin} like ${p} escape '\\'`,
        sql`${vehicles.fleetNumber} like ${p} escape '\\'`,
        sql`${vehicles.registration} like ${p} escape '\\'`,
        // Plates and fleet numbers as people type them: "GHQ4941J" or "ghq 4941" finds "GHQ-4941-J".
        bare ? sql`${vehicles.searchKey} like ${bare} escape '\\'` : undefined,
        sql`${vehicles.make} like ${p} escape '\\'`,
        sql`${vehicles.model} like ${p} escape '\\'`,
      ),
    );
  }
  const where = and(...conds);
  const total =
    db.select({ n: sql<number>`count(*)` }).from(vehicles).innerJoin(depots, eq(depots.id, vehicles.depotId)).where(where).get()?.n ?? 0;
  const select = vehicleSelectFor(user);
  const sortColumns = { ...VEHICLE_SORT, openDefects: select.openDefects };
  const rows = db
    .select(select)
    .from(vehicles)
    .innerJoin(depots, eq(depots.id, vehicles.depotId))
    .where(where)
    .orderBy(...orderBy(q.sort, sortColumns, 'fleetNumber', vehicles.id))
    .limit(pageSize)
    .offset(offset)
    .all();
  // Off-road rows answer "why" with the open defects keeping them off road (one query for the page).
  const offIds = rows.filter((r) => r.v.offRoadSinceAt !== null && !r.v.retiredDate).map((r) => r.v.id);
  const openByVehicle = openDefectsOf(user, offIds);
  const items = rows.map((r) => {
    const j = vehicleJson(r);
    return j.status === 'off_road' ? { ...j, offRoadDefects: openByVehicle.get(r.v.id) ?? [] } : j;
  });
  return { items, total, page, pageSize };
}

/** An open defect of a vehicle as the off-road views show it. */
export type OffRoadDefect = {
  id: number;
  ref: string;
  status: (typeof OPEN_STATUS_VALUES)[number];
  position: string;
  moduleCode: string;
  moduleName: string;
  moduleFunction: string;
  /** The release verification is recorded complete. */
  verified: boolean;
  /** Still needs the release verification before the vehicle is released (src/lib/vehicles/off-road.ts). */
  needsVerification: boolean;
};

/** The open defects (that the caller may see) of some vehicles, oldest first, with whether each still needs the release verification. */
export function openDefectsOf(user: SessionUser, vehicleIds: number[]): Map<number, OffRoadDefect[]> {
  const out = new Map<number, OffRoadDefect[]>();
  if (vehicleIds.length === 0) return out;
  const rows = getDb()
    .select({
      id: defects.id,
      vehicleId: defects.vehicleId,
      ref: defects.ref,
      status: defects.status,
      position: defects.position,
      moduleCode: modules.code,
      moduleName: modules.name,
      moduleFunction: modules.function,
      reinit: defects.verifiedReinit,
      reversal: defects.verifiedReversal,
      verifiedById: defects.verifiedById,
      verifiedAt: defects.verifiedAt,
    })
    .from(defects)
    .innerJoin(modules, eq(modules.id, defects.moduleId))
    .where(and(inArray(defects.vehicleId, vehicleIds), inArray(defects.status, [...OPEN_STATUS_VALUES]), depotScope(user, defects.depotId)))
    .orderBy(asc(defects.reportedAt), asc(defects.id))
    .all();
  const list = rows.map((r) => ({
    id: r.id,
    vehicleId: r.vehicleId,
    ref: r.ref,
    status: r.status as OffRoadDefect['status'],
    position: r.position,
    moduleCode: r.moduleCode,
    moduleName: r.moduleName,
    moduleFunction: r.moduleFunction,
    verified: verificationComplete({ reinitialised: r.reinit, reversalVerified: r.reversal, byUserId: r.verifiedById, atMs: r.verifiedAt }),
  }));
  const needs = new Set(unverifiedForRelease(list).map((d) => d.id));
  for (const { vehicleId, ...d } of list) {
    const forVehicle = out.get(vehicleId) ?? [];
    forVehicle.push({ ...d, needsVerification: needs.has(d.id) });
    out.set(vehicleId, forVehicle);
  }
  return out;
}

const endedBy = alias(users, 'ended_by');

/** A vehicle's off-road periods, newest first: since when, until when, who and why each way. */
export function listOffRoadHistory(vehicleId: number, limit = 50) {
  return getDb()
    .select({ p: vehicleOffRoad, startedBy: users.name, endedBy: endedBy.name })
    .from(vehicleOffRoad)
    .leftJoin(users, eq(users.id, vehicleOffRoad.startedById))
    .leftJoin(endedBy, eq(endedBy.id, vehicleOffRoad.endedById))
    .where(eq(vehicleOffRoad.vehicleId, vehicleId))
    .orderBy(desc(vehicleOffRoad.fromAt), desc(vehicleOffRoad.id))
    .limit(limit)
    .all()
    .map(({ p, startedBy, endedBy: ended }) => ({
      id: p.id,
      from: iso(p.fromAt)!,
      to: iso(p.toAt),
      reason: p.reason,
      startedBy: startedBy ?? p.startedActor,
      returnReason: p.returnReason,
      endedBy: ended ?? p.endedActor,
      openDefectsAtReturn: p.openDefectsAtReturn ? p.openDefectsAtReturn.split(' ') : [],
      unverifiedAtReturn: p.unverifiedAtReturn ? p.unverifiedAtReturn.split(' ') : [],
    }));
}
/** One off-road period as the vehicle page shows it. */
export type OffRoadPeriod = ReturnType<typeof listOffRoadHistory>[number];

/** One vehicle by VIN inside the caller's depots (else 404). */
export function getVehicle(user: SessionUser, vinRaw: string): VehicleJson {
  const vin = vinRaw.trim().toUpperCase();
  const r = getDb()
    .select(vehicleSelectFor(user))
    .from(vehicles)
    .innerJoin(depots, eq(depots.id, vehicles.depotId))
    .where(eq(vehicles.vin, vin))
    .get();
  if (!r) throw notFound('Vehicle');
  requireDepotScope(user, r.v.depotId, 'Vehicle');
  return vehicleJson(r);
}

/** The depot id for a code inside the caller's scope; 422 naming the field otherwise. */
function depotForWrite(user: SessionUser, code: string): number {
  const d = getDb().select({ id: depots.id }).from(depots).where(eq(depots.code, code)).get();
  if (!d || !inScope(user, d.id)) {
    throw new HttpError(422, 'INVALID_INPUT', `No depot with code ${code} among your depots.`, [{ path: 'depot_code', message: `Unknown depot ${code}` }]);
  }
  return d.id;
}

/** Add a vehicle in one of the caller's depots (409 when the VIN exists). */
export function createVehicle(user: SessionUser, body: Record<string, unknown>, actor: Actor): { vehicle: VehicleJson; warnings: RowIssue[] } {
  const { value, warnings } = validated('vehicles', body);
  const depotId = depotForWrite(user, value.depotCode);
  const db = getDb();
  if (db.select({ id: vehicles.id }).from(vehicles).where(eq(vehicles.vin, value.vin)).get()) throw conflict(`A vehicle with VIN ${value.vin} already exists.`);
  db.transaction((tx) => applyVehicleRow(tx, value, depotId, actor, 'api'));
  return { vehicle: getVehicle(user, value.vin), warnings };
}

/** Change a vehicle (VIN fixed); `version`, when sent, must match the current one (else 409). */
export function updateVehicle(user: SessionUser, vin: string, body: Record<string, unknown>, actor: Actor): { vehicle: VehicleJson; warnings: RowIssue[] } {
  const current = getVehicle(user, vin);
  if (body.version !== undefined && Number(body.version) !== current.version) {
    throw conflict('This vehicle was changed by someone else since you opened it.', { current });
  }
  const merged: Record<string, unknown> = { ...current, ...body, vin: current.vin };
  const { value, warnings } = validated('vehicles', merged);
  const depotId = depotForWrite(user, value.depotCode);
  const db = getDb();
  const offRoadChange = body.offRoad === undefined ? null : readOffRoadChange(body);
  const was = current.status === 'off_road';
  // A return to service is checked before anything is written: a reason, and an explicit confirmation when an
  // open defect still needs the release verification (src/lib/vehicles/off-road.ts).
  let open: OffRoadDefect[] = [];
  if (offRoadChange && !offRoadChange.off && was) {
    open = openDefectsOf(user, [current.id]).get(current.id) ?? [];
    const check = checkReturnToService({
      reason: offRoadChange.reason,
      confirmUnverified: offRoadChange.confirmUnverified,
      openDefects: open,
    });
    if (!check.ok && check.code === 'reason_required') throw invalid(check.message, [{ path: 'offRoadReason', message: check.message }], 422);
    if (!check.ok && check.code === 'unverified') throw conflict(check.message, { unverified: open.filter((d) => d.needsVerification) });
  }
  db.transaction((tx) => {
    applyVehicleRow(tx, value, depotId, actor, 'api');
    if (offRoadChange && offRoadChange.off !== was && !current.retiredDate) {
      const now = Date.now();
      const who = 'userId' in actor ? { id: actor.userId, actor: null } : { id: null, actor: actor.system };
      tx.update(vehicles).set({ offRoadSinceAt: offRoadChange.off ? now : null, version: sql`${vehicles.version} + 1`, updatedAt: now }).where(eq(vehicles.id, current.id)).run();
      writeAudit(tx, actor, { entity: 'vehicle', entityId: current.vin, action: 'update', field: 'offRoad', oldValue: String(was), newValue: String(offRoadChange.off) }, now);
      if (offRoadChange.off) {
        tx.insert(vehicleOffRoad).values({ vehicleId: current.id, fromAt: now, reason: offRoadChange.reason, startedById: who.id, startedActor: who.actor }).run();
        if (offRoadChange.reason) writeAudit(tx, actor, { entity: 'vehicle', entityId: current.vin, action: 'off_road', field: 'offRoadReason', newValue: offRoadChange.reason }, now);
      } else {
        const unverified = open.filter((d) => d.needsVerification).map((d) => d.ref);
        const end = {
          toAt: now,
          returnReason: offRoadChange.reason,
          endedById: who.id,
          endedActor: who.actor,
          openDefectsAtReturn: open.length ? open.map((d) => d.ref).join(' ') : null,
          unverifiedAtReturn: unverified.length ? unverified.join(' ') : null,
        };
        const period = tx
          .select({ id: vehicleOffRoad.id })
          .from(vehicleOffRoad)
          .where(and(eq(vehicleOffRoad.vehicleId, current.id), isNull(vehicleOffRoad.toAt)))
          .orderBy(desc(vehicleOffRoad.fromAt))
          .get();
        const sinceMs = current.offRoadSince ? Date.parse(current.offRoadSince) : now;
        if (period) tx.update(vehicleOffRoad).set(end).where(eq(vehicleOffRoad.id, period.id)).run();
        else tx.insert(vehicleOffRoad).values({ vehicleId: current.id, fromAt: sinceMs, ...end }).run(); // taken off before the history was kept
        writeAudit(tx, actor, { entity: 'vehicle', entityId: current.vin, action: 'return_to_service', field: 'offRoadReturnReason', newValue: offRoadChange.reason }, now);
        if (unverified.length) {
          writeAudit(tx, actor, { entity: 'vehicle', entityId: current.vin, action: 'return_to_service', field: 'releasedWithUnverified', newValue: unverified.join(' ') }, now);
        }
      }
    }
  });
  return { vehicle: getVehicle(user, current.vin), warnings };
}

/** The off-road part of a vehicle change: `offRoad`, an optional `offRoadReason` (why; required to return) and `confirmUnverified`. */
function readOffRoadChange(body: Record<string, unknown>): { off: boolean; reason: string | null; confirmUnverified: boolean } {
  const off = body.offRoad === true || body.offRoad === 'true' || body.offRoad === 1;
  if (!off && !(body.offRoad === false || body.offRoad === 'false' || body.offRoad === 0)) {
    throw invalid('offRoad must be true or false.', [{ path: 'offRoad', message: 'Not a boolean' }]);
  }
  const raw = body.offRoadReason;
  if (raw !== undefined && raw !== null && typeof raw !== 'string') throw invalid('offRoadReason must be text.', [{ path: 'offRoadReason', message: 'Not text' }]);
  const reason = typeof raw === 'string' && raw.trim() !== '' ? raw.trim() : null;
  if (reason && reason.length > OFF_ROAD_REASON_MAX) {
    throw invalid(`offRoadReason is at most ${OFF_ROAD_REASON_MAX} characters.`, [{ path: 'offRoadReason', message: 'Too long' }]);
  }
  return { off, reason, confirmUnverified: body.confirmUnverified === true };
}

/** Delete a vehicle that has no defects (409 otherwise; retire it instead). */
export function deleteVehicle(user: SessionUser, vin: string, actor: Actor): void {
  const v = getVehicle(user, vin);
  if (v.defects > 0) throw conflict(`Vehicle ${v.vin} has ${v.defects} defects on record; set a retired date instead of deleting it.`);
  const db = getDb();
  db.transaction((tx) => {
    tx.delete(vehicles).where(eq(vehicles.id, v.id)).run();
    writeAudit(tx, actor, { entity: 'vehicle', entityId: v.vin, action: 'delete' });
  });
}

/** VIN decoding for display (model year, check digit, region). */
export function describeVin(vin: string) {
  const r = parseVin(vin);
  return r.ok ? { modelYear: r.modelYear, checkDigitValid: r.checkDigit.valid, region: r.region, wmi: r.wmi, warnings: r.warnings } : null;
}

/** A VIN path parameter; anything that cannot be a VIN is simply not found. */
export function assertVinParam(v: string | undefined): string {
  if (!v || v.length > 32 || !/^[A-Za-z0-9]+$/.test(v)) throw notFound('Vehicle');
  return v;
}
