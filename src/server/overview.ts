/** Figures for the Overview page, limited to the caller's depots. */
import { and, asc, eq, sql } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { defects, depots, modules, vehicles } from '@/db/schema';
import type { SessionUser } from './auth';
import { depotScope, iso } from './list-helpers';

const OPEN_SQL = sql`('reported','diagnosing','awaiting_parts','repaired','verified')`;

/** Counts by status and depot, vehicles off road, repeats and the oldest open defects. */
export function getOverview(user: SessionUser, now = Date.now()) {
  const db = getDb();
  const vScope = depotScope(user, vehicles.depotId);
  const dScope = depotScope(user, defects.depotId);
  const vehiclesActive = db.select({ n: sql<number>`count(*)` }).from(vehicles).where(and(vScope, sql`${vehicles.retiredDate} is null`)).get()?.n ?? 0;
  const offRoad = db.select({ n: sql<number>`count(*)` }).from(vehicles).where(and(vScope, sql`${vehicles.retiredDate} is null and ${vehicles.offRoadSinceAt} is not null`)).get()?.n ?? 0;
  const byStatus = db
    .select({ status: defects.status, n: sql<number>`count(*)` })
    .from(defects)
    .where(and(dScope, sql`${defects.status} in ${OPEN_SQL}`))
    .groupBy(defects.status)
    .all();
  const byDepot = db
    .select({
      code: depots.code,
      name: depots.name,
      open: sql<number>`sum(case when ${defects.status} in ${OPEN_SQL} then 1 else 0 end)`,
      last90: sql<number>`sum(case when ${defects.reportedAt} >= ${now - 90 * 86_400_000} then 1 else 0 end)`,
      repeats90: sql<number>`sum(case when ${defects.reportedAt} >= ${now - 90 * 86_400_000} and ${defects.repeatOfId} is not null then 1 else 0 end)`,
    })
    .from(defects)
    .innerJoin(depots, eq(depots.id, defects.depotId))
    .where(dScope)
    .groupBy(depots.code)
    .orderBy(asc(depots.code))
    .all();
  const reported90 = byDepot.reduce((s, d) => s + (d.last90 ?? 0), 0);
  const repeats90 = byDepot.reduce((s, d) => s + (d.repeats90 ?? 0), 0);
  const topModules = db
    .select({ code: modules.code, name: modules.name, n: sql<number>`count(*)` })
    .from(defects)
    .innerJoin(modules, eq(modules.id, defects.moduleId))
    .where(and(dScope, sql`${defects.reportedAt} >= ${now - 365 * 86_400_000}`))
    .groupBy(modules.code)
    .orderBy(sql`count(*) desc`)
    .limit(6)
    .all();
  const oldest = db
    .select({ id: defects.id, ref: defects.ref, status: defects.status, reportedAt: defects.reportedAt, position: defects.position, vin: vehicles.vin, fleetNumber: vehicles.fleetNumber, depotCode: depots.code, moduleCode: modules.code, symptom: defects.symptom })
    .from(defects)
    .innerJoin(vehicles, eq(vehicles.id, defects.vehicleId))
    .innerJoin(depots, eq(depots.id, defects.depotId))
    .innerJoin(modules, eq(modules.id, defects.moduleId))
    .where(and(dScope, sql`${defects.status} in ${OPEN_SQL}`))
    .orderBy(asc(defects.reportedAt))
    .limit(8)
    .all()
    .map((r) => ({ ...r, reportedAt: iso(r.reportedAt)!, ageDays: Math.floor((now - r.reportedAt) / 86_400_000) }));
  const openTotal = byStatus.reduce((s, r) => s + r.n, 0);
  return { vehiclesActive, offRoad, openTotal, byStatus, byDepot, reported90, repeats90, repeatRate90: reported90 ? repeats90 / reported90 : null, topModules, oldest };
}
