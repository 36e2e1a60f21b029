/**
 * Patterns: loads the fleet the caller may see into the recurrence engine's plain input, runs the report or
 * the mean cumulative function, and caches results until the underlying data changes.
 */
import { and, eq, inArray, ne, sql } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { defects, depots, modules, vehicles } from '@/db/schema';
import { computePatternsReport } from '@/lib/patterns/report';
import { computeMcfCompare, computeMcfSeries, type McfCompareSeries, type McfSeries } from '@/lib/patterns/mcf-fleet';
import { createCohortFigures, type CohortFiguresCalculator, type CohortQuery } from '@/lib/patterns/cohort-figures';
import type { CohortFigures, ExposureBand, ModuleBaseline, PatternsInput, PatternsReport } from '@/lib/patterns/types';
import { parseIsoDate } from '@/lib/dates/dates';
import type { SessionUser } from './auth';
import { depotScope } from './list-helpers';
import { invalid, notFound } from './http';
import { recordMatcher } from './patterns-records';
import type { PatternsReportResponse } from '@/lib/contracts/patterns';

/** Replicates and seed of the report's Monte Carlo (fixed so that a report is reproducible). */
export const REPORT_REPLICATES = 999;
export const REPORT_SEED = 20261202;

type Cached = { version: string; value: unknown };
const cache = new Map<string, Cached>();
const CACHE_MAX = 32;

/** A fingerprint of the data the engine reads; changes whenever a vehicle, defect, depot or module changes. */
export function dataVersion(): string {
  const db = getDb();
  const row = db.get<{ v: string }>(sql`select
    (select count(*) || ':' || coalesce(max(updated_at), 0) from defects) || '|' ||
    (select count(*) || ':' || coalesce(max(updated_at), 0) from vehicles) || '|' ||
    (select count(*) || ':' || coalesce(max(updated_at), 0) from depots) || '|' ||
    (select count(*) || ':' || coalesce(max(updated_at), 0) from modules) as v`);
  return row.v;
}

function cached<T>(key: string, compute: () => T): T {
  const version = dataVersion();
  const hit = cache.get(key);
  if (hit && hit.version === version) return hit.value as T;
  const value = compute();
  cache.set(key, { version, value });
  while (cache.size > CACHE_MAX) cache.delete(cache.keys().next().value as string);
  return value;
}

/** Today's date (UTC) as `YYYY-MM-DD`. */
export function todayIso(now = Date.now()): string {
  return new Date(now).toISOString().slice(0, 10);
}

/** Validate an `asOf` query value (default today). */
export function parseAsOfParam(v: string | null | undefined): string {
  if (v === null || v === undefined || v === '') return todayIso();
  const d = parseIsoDate(v);
  if (!d) throw invalid('asOf must be a date YYYY-MM-DD.', [{ path: 'asOf', message: `Not a date: ${v}` }]);
  return d;
}

const dayFormats = new Map<string, Intl.DateTimeFormat>();

/**
 * The calendar day of a failure, `YYYY-MM-DD`: the day as written when the report came with its own text (an
 * import or a form: `2023-07-20` or `2023-07-20T23:30+01:00` is the 20th, whatever the zone), else the instant's
 * day at the depot (its time zone; UTC when it has none). NOTE: the instant alone is not enough — a date-only
 * report in British summer time is stored as 23:00 UTC on the day before, and the engine counts ages in days.
 */
export function failureDay(reportedAtMs: number, reportedAtText: string | null, timezone: string | null): string {
  const written = reportedAtText?.trim().slice(0, 10);
  if (written && parseIsoDate(written)) return written;
  const tz = timezone || 'UTC';
  let f = dayFormats.get(tz);
  if (!f) {
    try {
      f = new Intl.DateTimeFormat('en-CA', { timeZone: tz, year: 'numeric', month: '2-digit', day: '2-digit' });
    } catch {
      f = new Intl.DateTimeFormat('en-CA', { timeZone: 'UTC', year: 'numeric', month: '2-digit', day: '2-digit' });
    }
    dayFormats.set(tz, f);
  }
  return f.format(new Date(reportedAtMs));
}

/**
 * The engine's input for the caller's depots: the vehicles now at those depots and the defects reported at them
 * (cancelled defects left out). A defect of another depot on a vehicle that moved here is not the caller's.
 */
export function loadPatternsInput(user: SessionUser): PatternsInput {
  const db = getDb();
  const vScope = depotScope(user, vehicles.depotId);
  const dScope = depotScope(user, depots.id);
  const vs = db
    .select({
      id: vehicles.id,
      vin: vehicles.vin,
      buildMonth: vehicles.buildMonth,
      inServiceDate: vehicles.inServiceDate,
      retiredDate: vehicles.retiredDate,
      depotId: vehicles.depotId,
      parking: vehicles.parking,
      washesPerMonth: vehicles.washesPerMonth,
    })
    .from(vehicles)
    .where(vScope)
    .all();
  const ds = db
    .select({ id: depots.id, code: depots.code, coastal: depots.coastal, rainDaysPerYear: depots.rainDaysPerYear, meanRhPct: depots.meanRhPct, washBay: depots.washBay })
    .from(depots)
    .where(dScope)
    .all();
  const ms = db.select({ id: modules.id, code: modules.code, function: modules.function }).from(modules).all();
  const fs = db
    .select({
      id: defects.id,
      vehicleId: defects.vehicleId,
      moduleId: defects.moduleId,
      reportedAt: defects.reportedAt,
      reportedAtText: defects.reportedAtText,
      timezone: depots.timezone,
      moisture: defects.moisture,
      rootCause: defects.rootCause,
    })
    .from(defects)
    .innerJoin(vehicles, eq(vehicles.id, defects.vehicleId))
    .innerJoin(depots, eq(depots.id, defects.depotId))
    // A defect belongs to the depot it was reported at (defects.depot_id), whatever its vehicle's depot is now: only
    // defects of the caller's depots, on vehicles the caller sees, are counted (docs/decisions/013).
    .where(and(vScope, depotScope(user, defects.depotId), ne(defects.status, 'cancelled')))
    .all()
    .map(({ reportedAtText, timezone, ...f }) => ({
      ...f,
      reportedAt: failureDay(f.reportedAt, reportedAtText, timezone),
      diagnosed: f.moisture !== null || f.rootCause !== null,
    }));
  return { vehicles: vs, depots: ds, modules: ms, failures: fs };
}

function scopeKey(user: SessionUser): string {
  return user.depotIds === null ? 'all' : user.depotIds.slice().sort((a, b) => a - b).join(',');
}

/** The full engine report (with every extra field) for the caller's depots. */
export function getPatternsReport(user: SessionUser, asOf: string): PatternsReport {
  return cached(`report|${scopeKey(user)}|${asOf}`, () =>
    computePatternsReport(loadPatternsInput(user), { asOf, replicates: REPORT_REPLICATES, seed: REPORT_SEED }),
  );
}

/** Everyone's scope: the fleet-wide report that pattern records are kept from (and the CLI's view). */
export const FLEET_WIDE: SessionUser = { id: 0, email: 'system', name: 'Seepline', role: 'admin', depotIds: null, via: 'token' };

/**
 * The CONTRACT.md shape of `GET /api/patterns` (cohort fields of the contract plus the engine's extras), with the
 * pattern record each cohort belongs to (`record`, null when none) among the records the caller may see.
 */
export function patternsResponse(report: PatternsReport, user: SessionUser = FLEET_WIDE): PatternsReportResponse {
  const recordOf = recordMatcher(user, report.asOf);
  return {
    ...report,
    asOf: report.asOf,
    cohorts: report.cohorts.map(({ vehicleIds: _v, failureIds: _f, repeatVehicleIds: _r, byMonth: _m, ...c }) => ({ ...c, record: recordOf(c) })),
  };
}

/** Codes of the given depots, sorted (for saying whose figures a depot-scoped page shows). */
export function listDepotCodes(depotIds: number[]): string[] {
  if (depotIds.length === 0) return [];
  return getDb().select({ code: depots.code }).from(depots).where(inArray(depots.id, depotIds)).all().map((d) => d.code).sort();
}

/** A cohort to compare with the rest of its band on the MCF chart. */
export type McfCompareQuery = { band: ExposureBand; buildFrom: string; buildTo: string };

/**
 * Mean cumulative function series for a module type over the caller's depots; with `compare`, also the curves of
 * that band's vehicles built in the range and of the rest of the band (an addition to the CONTRACT.md body).
 */
export function getMcf(
  user: SessionUser,
  moduleCode: string,
  asOf: string,
  byBand: boolean,
  compare?: McfCompareQuery,
): { series: McfSeries[]; compare?: McfCompareQuery & { series: McfCompareSeries[] } } {
  const code = moduleCode.trim().toUpperCase();
  if (!getDb().select({ id: modules.id }).from(modules).where(eq(modules.code, code)).get()) throw notFound('Module type');
  const base = cached(`mcf|${scopeKey(user)}|${asOf}|${code}|${byBand}`, () =>
    computeMcfSeries(loadPatternsInput(user), { moduleCode: code, asOf, byExposureBand: byBand }),
  );
  if (!compare) return base;
  const extra = cached(`mcfc|${scopeKey(user)}|${asOf}|${code}|${compare.band}|${compare.buildFrom}|${compare.buildTo}`, () =>
    computeMcfCompare(loadPatternsInput(user), { moduleCode: code, asOf, ...compare }),
  );
  return { ...base, compare: { ...compare, series: extra } };
}

/** Figures of build ranges and module baselines over the caller's depots as of a day (fleet indexed once, cached). */
export function cohortFiguresFor(user: SessionUser, asOf: string): { figures: (q: CohortQuery) => CohortFigures | null; baseline: (code: string) => ModuleBaseline | null } {
  return cached(`figures|${scopeKey(user)}|${asOf}`, () => {
    const calc: CohortFiguresCalculator = createCohortFigures(loadPatternsInput(user), asOf);
    const memo = new Map<string, CohortFigures | null>();
    return {
      figures: (q: CohortQuery) => {
        const k = `${q.moduleCode}|${q.band}|${q.buildFrom}|${q.buildTo}`;
        if (!memo.has(k)) memo.set(k, calc.figures(q));
        return memo.get(k) ?? null;
      },
      baseline: (code: string) => calc.baseline(code),
    };
  });
}

export type { ExposureBand };
