/**
 * Figures of the Overview page (and GET /api/overview), aggregated in SQLite over the caller's depots: open
 * work by depot and status, vehicles off road, the oldest open defects, and, over the trailing twelve UTC
 * calendar months, defects reported and repeats per month, per depot and per module type. Six grouped
 * queries whatever the fleet size (see docs/benchmarks.md); every window is whole UTC days so that each figure
 * equals the Defects list filtered by its link. Roles that read patterns also get the open pattern records.
 */
import { and, asc, eq, gte, inArray, isNull, lt, or, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import { getDb } from '@/db/client';
import { defects, depots, modules, vehicles } from '@/db/schema';
import { OPEN_STATUSES, type OpenStatus, type OverviewDefect, type OverviewPatterns, type OverviewResponse, type RepeatCounts } from '@/lib/contracts/overview';
import { can } from '@/lib/auth/permissions';
import { fillMonths, monthWindows, repeatRate } from '@/lib/overview/windows';
import type { SessionUser } from './auth';
import { depotScope, iso } from './list-helpers';
import { repeatWindowDays } from './repeats';
import { listPatternRecords } from './patterns-records';

const DAY_MS = 86_400_000;
/** Days after which an open defect counts as "open for long" on the Overview. */
export const OVERVIEW_STALE_DAYS = 30;
/** Rows in the "oldest open" and "my open work" lists. */
export const OVERVIEW_LIST_ROWS = 8;

const earlier = alias(defects, 'earlier');
const openStatuses = [...OPEN_STATUSES];

const zeroStatuses = (): Record<OpenStatus, number> => Object.fromEntries(OPEN_STATUSES.map((s) => [s, 0])) as Record<OpenStatus, number>;

/** Everything the Overview shows for this caller, as of `now`. */
export function getOverview(user: SessionUser, now = Date.now()): OverviewResponse {
  const db = getDb();
  const months = monthWindows(now, 12);
  const windowStart = months[0]!;
  const dScope = depotScope(user, defects.depotId);
  const isOpen = inArray(defects.status, openStatuses);

  // 1. Depots in scope (every depot shows, even without defects), and vehicles in service and off road per depot.
  const depotRows = db.select({ id: depots.id, code: depots.code, name: depots.name }).from(depots).where(depotScope(user, depots.id)).orderBy(asc(depots.code)).all();
  // NOTE: grouping on `depot_id + 0` makes SQLite scan the table once instead of walking the depot index and
  // fetching every row from it (157 → 28 ms at 100,000 vehicles, docs/benchmarks.md).
  const fleetRows = db
    .select({
      depotId: vehicles.depotId,
      inService: sql<number>`count(*)`,
      offRoad: sql<number>`sum(${vehicles.offRoadSinceAt} is not null)`,
    })
    .from(vehicles)
    .where(and(depotScope(user, vehicles.depotId), isNull(vehicles.retiredDate)))
    .groupBy(sql`${vehicles.depotId} + 0`)
    .all();
  const fleetByDepot = new Map(fleetRows.map((r) => [r.depotId, r]));

  // 2. Open defects by depot and status (index defects_depot_status_idx).
  const openRows = db
    .select({ depotId: defects.depotId, status: defects.status, n: sql<number>`count(*)` })
    .from(defects)
    .where(and(dScope, isOpen))
    .groupBy(defects.depotId, defects.status)
    .all();

  // 3. Open for longer than OVERVIEW_STALE_DAYS (the list's olderThanDays rule).
  const openStale =
    db
      .select({ n: sql<number>`count(*)` })
      .from(defects)
      .where(and(dScope, isOpen, lt(defects.reportedAt, now - OVERVIEW_STALE_DAYS * DAY_MS)))
      .get()?.n ?? 0;

  // 4. Reported and repeats in the twelve-month window by depot, module type and UTC month, in one pass.
  const windowRows = db
    .select({
      depotId: defects.depotId,
      moduleId: defects.moduleId,
      month: sql<string>`strftime('%Y-%m', ${defects.reportedAt} / 1000, 'unixepoch')`,
      reported: sql<number>`count(*)`,
      repeats: sql<number>`sum(${defects.repeatOfId} is not null)`,
    })
    .from(defects)
    .where(and(dScope, gte(defects.reportedAt, windowStart.fromMs)))
    // NOTE: `+ 0` keeps SQLite from walking the whole (depot, status) index for the grouping; with it the
    // reported_at index narrows to the window first (68 → 17 ms at 80,000 defects, docs/benchmarks.md).
    .groupBy(sql`${defects.depotId} + 0`, defects.moduleId, sql`3`)
    .all();

  // 5. Oldest open defects, and 6. the caller's own open work (technicians).
  const shortList = (where: ReturnType<typeof and>) =>
    db
      .select({
        id: defects.id,
        ref: defects.ref,
        status: defects.status,
        reportedAt: defects.reportedAt,
        position: defects.position,
        vin: vehicles.vin,
        fleetNumber: vehicles.fleetNumber,
        depotCode: depots.code,
        depotTimeZone: depots.timezone,
        moduleCode: modules.code,
        symptom: defects.symptom,
        repeatOfId: defects.repeatOfId,
        repeatOfRef: earlier.ref,
      })
      .from(defects)
      .innerJoin(vehicles, eq(vehicles.id, defects.vehicleId))
      .innerJoin(depots, eq(depots.id, defects.depotId))
      .innerJoin(modules, eq(modules.id, defects.moduleId))
      .leftJoin(earlier, eq(earlier.id, defects.repeatOfId))
      .where(where)
      .orderBy(asc(defects.reportedAt), asc(defects.id))
      .limit(OVERVIEW_LIST_ROWS)
      .all()
      .map((r): OverviewDefect => ({ ...r, reportedAt: iso(r.reportedAt)!, ageDays: Math.floor((now - r.reportedAt) / DAY_MS) }));
  const oldest = shortList(and(dScope, isOpen));
  let mine: OverviewResponse['mine'] = null;
  if (user.role === 'technician') {
    const own = and(dScope, isOpen, or(eq(defects.assignedToId, user.id), eq(defects.reportedById, user.id)));
    const total = db.select({ n: sql<number>`count(*)` }).from(defects).where(own).get()?.n ?? 0;
    mine = { total, items: shortList(own) };
  }

  // Fold the grouped rows into the figures.
  const openByDepot = new Map<number, Record<OpenStatus, number>>();
  const openByStatus = zeroStatuses();
  for (const r of openRows) {
    const s = r.status as OpenStatus;
    let d = openByDepot.get(r.depotId);
    if (!d) openByDepot.set(r.depotId, (d = zeroStatuses()));
    d[s] += r.n;
    openByStatus[s] += r.n;
  }
  const add = (m: Map<string | number, { reported: number; repeats: number }>, k: string | number, reported: number, repeats: number) => {
    const c = m.get(k) ?? { reported: 0, repeats: 0 };
    c.reported += reported;
    c.repeats += repeats;
    m.set(k, c);
  };
  const byDepot = new Map<string | number, { reported: number; repeats: number }>();
  const byModule = new Map<string | number, { reported: number; repeats: number }>();
  const byMonth = new Map<string, { reported: number; repeats: number }>();
  for (const r of windowRows) {
    const reps = r.repeats ?? 0;
    add(byDepot, r.depotId, r.reported, reps);
    add(byModule, r.moduleId, r.reported, reps);
    add(byMonth as Map<string | number, { reported: number; repeats: number }>, r.month, r.reported, reps);
  }
  const counts = (c: { reported: number; repeats: number } | undefined): RepeatCounts => {
    const reported = c?.reported ?? 0;
    const repeats = c?.repeats ?? 0;
    return { reported, repeats, rate: repeatRate(repeats, reported) };
  };

  const depotFigures = depotRows.map((d) => {
    const open = openByDepot.get(d.id) ?? zeroStatuses();
    return {
      code: d.code,
      name: d.name,
      open,
      openTotal: OPEN_STATUSES.reduce((s, k) => s + open[k], 0),
      vehiclesInService: fleetByDepot.get(d.id)?.inService ?? 0,
      offRoad: fleetByDepot.get(d.id)?.offRoad ?? 0,
      ...counts(byDepot.get(d.id)),
    };
  });
  const moduleIds = [...byModule.keys()] as number[];
  const moduleNames = moduleIds.length
    ? db.select({ id: modules.id, code: modules.code, name: modules.name }).from(modules).where(inArray(modules.id, moduleIds)).all()
    : [];
  const moduleFigures = moduleNames
    .map((m) => ({ code: m.code, name: m.name, ...counts(byModule.get(m.id)) }))
    .sort((a, b) => b.reported - a.reported || b.repeats - a.repeats || a.code.localeCompare(b.code));
  // The month that is still running is counted so far; the Overview marks it so it is not read as a whole month.
  const trend = fillMonths(months, byMonth).map(({ month, from, to, toMs, reported, repeats, rate }) => ({ month, from, to, reported, repeats, rate, partial: toMs > now }));
  const windowTotals = counts({ reported: windowRows.reduce((s, r) => s + r.reported, 0), repeats: windowRows.reduce((s, r) => s + (r.repeats ?? 0), 0) });

  return {
    asOf: new Date(now).toISOString(),
    role: user.role,
    allDepots: user.depotIds === null,
    repeatWindowDays: repeatWindowDays(db),
    windowFrom: windowStart.from,
    windowTo: new Date(now).toISOString().slice(0, 10),
    staleDays: OVERVIEW_STALE_DAYS,
    vehiclesInService: depotFigures.reduce((s, d) => s + d.vehiclesInService, 0),
    offRoad: depotFigures.reduce((s, d) => s + d.offRoad, 0),
    openTotal: OPEN_STATUSES.reduce((s, k) => s + openByStatus[k], 0),
    openStale,
    openByStatus,
    window: windowTotals,
    depots: depotFigures,
    modules: moduleFigures,
    trend,
    oldest,
    mine,
    patterns: overviewPatterns(user),
  };
}

/** How many pattern records the Overview lists. */
export const OVERVIEW_PATTERN_ROWS = 4;

/**
 * The open pattern records the caller may see (no report is run here: records are brought up to date when someone
 * opens Patterns, and at seed time), those needing attention first. A supervisor's figures are their depots' own
 * (an indexing pass over their fleet, cached; docs/decisions/013).
 */
function overviewPatterns(user: SessionUser): OverviewPatterns | null {
  if (!can(user.role, 'pattern:read')) return null;
  const { items, lastSync } = listPatternRecords(user, {});
  const open = items.filter((i) => i.status !== 'dismissed' && i.status !== 'resolved');
  const attention = (i: (typeof items)[number]) => (i.status === 'new' && i.significant) || (i.status !== 'new' && i.changes.changed) || (i.campaign?.overdue ?? false);
  const rows = open
    .map((i) => ({ i, needsAttention: attention(i) }))
    .sort((a, b) => Number(b.needsAttention) - Number(a.needsAttention) || Number(b.i.waterIngress) - Number(a.i.waterIngress) || (b.i.rateRatio ?? 0) - (a.i.rateRatio ?? 0));
  return {
    open: open.length,
    needsAttention: rows.filter((r) => r.needsAttention).length,
    waterIngressOpen: open.filter((i) => i.waterIngress).length,
    overdue: open.filter((i) => i.campaign?.overdue).length,
    lastSyncAt: lastSync?.at ?? null,
    items: rows.slice(0, OVERVIEW_PATTERN_ROWS).map(({ i, needsAttention }) => ({
      id: i.id,
      moduleCode: i.moduleCode,
      moduleName: i.moduleName,
      exposureBand: i.exposureBand,
      buildFrom: i.buildFrom,
      buildTo: i.buildTo,
      vehicles: i.vehicles,
      failures: i.failures,
      expected: i.expected,
      rateRatio: i.rateRatio,
      figuresScope: i.figuresScope,
      waterIngress: i.waterIngress,
      significant: i.significant,
      status: i.status,
      changes: i.status === 'new' ? [] : i.changes.summary,
      overdue: i.campaign?.overdue ?? false,
      campaignTargetDate: i.campaign?.inForce ? i.campaign.targetDate : null,
      needsAttention,
    })),
  };
}
