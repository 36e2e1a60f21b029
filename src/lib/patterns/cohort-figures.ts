/**
 * The figures of a build range of one module type × exposure band: vehicles, exposure, failures against the
 * fleet's rate, the exact rate ratio against the rest of the module's fleet, moisture evidence, repeat vehicles, the
 * build months of the band and the trend tests. The report (report.ts) computes them for the range its scan finds;
 * `computeCohortFigures` computes them for a range given from outside — a pattern record's range read over one
 * person's depots, so that nobody gets figures from depots they may not see (docs/decisions/013).
 */
import { formatMonthIndex, toMonthIndex } from './calendar';
import { bandName, indexFleet, parseAsOf, type FleetIndex, type ModuleFailures } from './fleet-index';
import { TREND_ALPHA } from './rules';
import { compareRatesExact, computeGarwoodInterval, fisherExactGreater } from './stats';
import { computeLaplaceTrend, computeMilHdbkTrend, fitPowerLawNhpp, type TrendSystem } from './trend';
import { EXPOSURE_BANDS, PatternsInputError, type CohortFigures, type CohortMonth, type ExposureBand, type ModuleBaseline, type ModuleTrend, type PatternsInput, type PatternsModule } from './types';

/** Build-month bins of one exposure band (observed vehicles only). */
export interface BandBins {
  band: number;
  /** Band vehicles (array indices) sorted by build month then id; bin b holds vehicles[binStart[b] .. binStart[b+1]). */
  vehicles: Int32Array;
  binStart: Int32Array;
  months: Int32Array;
  vehicleYears: Float64Array;
  vehicleCounts: Float64Array;
  /** Bin of each fleet vehicle in this band, −1 otherwise. */
  binOfVehicle: Int32Array;
  totalVehicleYears: number;
}

/** Group the band's observed vehicles by build month (months without vehicles have no bin). */
export function buildBandBins(fleet: FleetIndex, band: number): BandBins {
  const n = fleet.vehicleIds.length;
  const members: number[] = [];
  for (let i = 0; i < n; i++) if (fleet.bandIndex[i] === band && (fleet.observedDays[i] as number) > 0) members.push(i);
  members.sort((a, b) => (fleet.monthIndex[a] as number) - (fleet.monthIndex[b] as number) || (fleet.vehicleIds[a] as number) - (fleet.vehicleIds[b] as number));
  const binOfVehicle = new Int32Array(n).fill(-1);
  const months: number[] = [];
  const starts: number[] = [];
  const vy: number[] = [];
  const counts: number[] = [];
  let total = 0;
  members.forEach((vi, pos) => {
    const month = fleet.monthIndex[vi] as number;
    if (months.length === 0 || months[months.length - 1] !== month) {
      months.push(month);
      starts.push(pos);
      vy.push(0);
      counts.push(0);
    }
    const b = months.length - 1;
    binOfVehicle[vi] = b;
    vy[b] = (vy[b] as number) + (fleet.vehicleYears[vi] as number);
    counts[b] = (counts[b] as number) + 1;
    total += fleet.vehicleYears[vi] as number;
  });
  starts.push(members.length);
  return {
    band,
    vehicles: Int32Array.from(members),
    binStart: Int32Array.from(starts),
    months: Int32Array.from(months),
    vehicleYears: Float64Array.from(vy),
    vehicleCounts: Float64Array.from(counts),
    binOfVehicle,
    totalVehicleYears: total,
  };
}

/** Failures of the module per bin of the band, and their total. */
export function countBandFailures(bins: BandBins, failures: ModuleFailures): { caseCounts: Int32Array; bandFailures: number } {
  const caseCounts = new Int32Array(bins.months.length);
  let bandFailures = 0;
  for (let k = 0; k < failures.vehicleIndex.length; k++) {
    const b = bins.binOfVehicle[failures.vehicleIndex[k] as number] as number;
    if (b >= 0) {
      caseCounts[b] = (caseCounts[b] as number) + 1;
      bandFailures++;
    }
  }
  return { caseCounts, bandFailures };
}

/**
 * Trend tests over the given failures (docs/patterns-method.md section 7): each vehicle with a failure is a system
 * observed over its days in service; an event on day-age a sits at a + 0.5, clipped to the end.
 */
export function computeModuleTrend(fleet: FleetIndex, failures: ModuleFailures, observedVehicles: number): ModuleTrend {
  const byVehicle = new Map<number, number[]>();
  for (let k = 0; k < failures.vehicleIndex.length; k++) {
    const vi = failures.vehicleIndex[k] as number;
    const end = fleet.observedDays[vi] as number;
    const t = Math.min((failures.ageDays[k] as number) + 0.5, end);
    const list = byVehicle.get(vi);
    if (list) list.push(t);
    else byVehicle.set(vi, [t]);
  }
  // Systems without events add nothing to either statistic or to β̂.
  const systems: TrendSystem[] = [];
  for (const [vi, times] of byVehicle) systems.push({ endTime: fleet.observedDays[vi] as number, eventTimes: times });
  const laplace = computeLaplaceTrend(systems);
  const mil = computeMilHdbkTrend(systems);
  const fit = fitPowerLawNhpp(systems);
  let direction: ModuleTrend['direction'] = 'none';
  if (laplace && mil && laplace.pTwoSided < TREND_ALPHA) {
    if (laplace.u > 0 && mil.pIncreasing < TREND_ALPHA / 2) direction = 'increasing';
    else if (laplace.u < 0 && mil.pDecreasing < TREND_ALPHA / 2) direction = 'decreasing';
  }
  return {
    systems: observedVehicles,
    events: failures.failureIds.length,
    laplaceU: laplace?.u ?? null,
    laplacePTwoSided: laplace?.pTwoSided ?? null,
    milHdbkChiSquare: mil?.chiSquare ?? null,
    milHdbkDf: mil?.df ?? 0,
    milHdbkPTwoSided: mil?.pTwoSided ?? null,
    beta: fit?.beta ?? null,
    direction,
    accelerating: direction === 'increasing',
  };
}

/** What computeWindowFigures needs besides the window. */
export interface WindowContext {
  fleet: FleetIndex;
  module: { id: number; code: string; function: string };
  failures: ModuleFailures;
  bins: BandBins;
  caseCounts: Int32Array;
  bandFailures: number;
  totalVehicleYears: number;
  /** The module's failures per vehicle-year over the whole fleet given. */
  fleetRate: number;
  /** Diagnosed and wet failures of the module over the whole fleet given. */
  moduleDiagnosed: number;
  moduleWet: number;
}

/**
 * The figures of the cohort made of bins start..end (inclusive) of the band; `buildFrom`/`buildTo` name the range
 * (the bins' own months when absent). An empty window (start > end) has no vehicles and no failures.
 */
export function computeWindowFigures(ctx: WindowContext, start: number, end: number, range?: { buildFrom: string; buildTo: string }): CohortFigures {
  const { fleet, bins, failures, caseCounts, fleetRate } = ctx;
  const firstVehicle = start <= end ? (bins.binStart[start] as number) : 0;
  const lastVehicle = start <= end ? (bins.binStart[end + 1] as number) : 0;
  const vehicleIds: number[] = [];
  let cohortVehicleYears = 0;
  for (let p = firstVehicle; p < lastVehicle; p++) {
    const vi = bins.vehicles[p] as number;
    vehicleIds.push(fleet.vehicleIds[vi] as number);
    cohortVehicleYears += fleet.vehicleYears[vi] as number;
  }
  const failureIds: number[] = [];
  const perVehicle = new Map<number, number>();
  const cohortFailureList: ModuleFailures = { failureIds: [], vehicleIndex: [], ageDays: [], diagnosed: [], moisture: [] };
  let diagnosed = 0;
  let wet = 0;
  const moduleFailureCount = failures.failureIds.length;
  for (let k = 0; k < moduleFailureCount; k++) {
    const vi = failures.vehicleIndex[k] as number;
    const b = bins.binOfVehicle[vi] as number;
    if (b < 0 || b < start || b > end) continue;
    failureIds.push(failures.failureIds[k] as number);
    cohortFailureList.failureIds.push(failures.failureIds[k] as number);
    cohortFailureList.vehicleIndex.push(vi);
    cohortFailureList.ageDays.push(failures.ageDays[k] as number);
    perVehicle.set(vi, (perVehicle.get(vi) ?? 0) + 1);
    if (failures.diagnosed[k]) diagnosed++;
    if (failures.moisture[k]) wet++;
  }
  const cohortFailures = failureIds.length;
  const repeatVehicleIds: number[] = [];
  for (const [vi, c] of perVehicle) if (c >= 2) repeatVehicleIds.push(fleet.vehicleIds[vi] as number);
  const restFailures = moduleFailureCount - cohortFailures;
  const restVehicleYears = ctx.totalVehicleYears - cohortVehicleYears;
  // A range read over a few depots can hold all of the fleet's exposure, or none: then there is nothing to compare.
  const rates =
    cohortVehicleYears > 0 && restVehicleYears > 0
      ? compareRatesExact(cohortFailures, cohortVehicleYears, restFailures, restVehicleYears)
      : { rateRatio: null, ciLow: 0, ciHigh: null, pTwoSided: 1 };
  const restDiagnosed = ctx.moduleDiagnosed - diagnosed;
  const restWet = ctx.moduleWet - wet;
  const expected = cohortVehicleYears * fleetRate;
  const byMonth: CohortMonth[] = [];
  for (let b = 0; b < bins.months.length; b++) {
    byMonth.push({
      month: formatMonthIndex(bins.months[b] as number),
      vehicles: bins.vehicleCounts[b] as number,
      vehicleYears: bins.vehicleYears[b] as number,
      failures: caseCounts[b] as number,
      expected: (bins.vehicleYears[b] as number) * fleetRate,
      inCohort: b >= start && b <= end,
    });
  }
  const buildFrom = range?.buildFrom ?? formatMonthIndex(bins.months[start] as number);
  const buildTo = range?.buildTo ?? formatMonthIndex(bins.months[end] as number);
  const band = bandName(bins.band);
  const key = `${ctx.module.code}:${band}`;
  vehicleIds.sort((x, y) => x - y);
  failureIds.sort((x, y) => x - y);
  repeatVehicleIds.sort((x, y) => x - y);
  return {
    id: `${key}:${buildFrom}:${buildTo}`,
    key,
    moduleId: ctx.module.id,
    moduleCode: ctx.module.code,
    moduleFunction: ctx.module.function,
    buildFrom,
    buildTo,
    exposureBand: band,
    vehicles: vehicleIds.length,
    vehicleYears: cohortVehicleYears,
    failures: cohortFailures,
    expected,
    rateRatio: rates.rateRatio,
    ciLow: rates.ciLow,
    ciHigh: rates.ciHigh,
    moistureShare: diagnosed > 0 ? wet / diagnosed : 0,
    repeatVehicles: repeatVehicleIds.length,
    ratePerVehicleYear: cohortVehicleYears > 0 ? cohortFailures / cohortVehicleYears : 0,
    fleetRatePerVehicleYear: fleetRate,
    ratioToFleet: expected > 0 ? cohortFailures / expected : null,
    restFailures,
    restVehicleYears,
    rateRatioPValue: rates.pTwoSided,
    bandVehicles: bins.vehicles.length,
    bandVehicleYears: bins.totalVehicleYears,
    bandFailures: ctx.bandFailures,
    diagnosedFailures: diagnosed,
    moistureFailures: wet,
    restDiagnosedFailures: restDiagnosed,
    restMoistureFailures: restWet,
    moistureShareRest: restDiagnosed > 0 ? restWet / restDiagnosed : null,
    moistureP: fisherExactGreater(wet, diagnosed - wet, restWet, restDiagnosed - restWet),
    vehicleIds,
    failureIds,
    repeatVehicleIds,
    byMonth,
    trend: computeModuleTrend(fleet, cohortFailureList, vehicleIds.length),
  };
}

/** Total vehicle-years of the fleet and its count of observed vehicles. */
export function fleetExposure(fleet: FleetIndex): { vehicleYears: number; observedVehicles: number } {
  let vehicleYears = 0;
  let observedVehicles = 0;
  for (let i = 0; i < fleet.vehicleYears.length; i++) {
    vehicleYears += fleet.vehicleYears[i] as number;
    if ((fleet.observedDays[i] as number) > 0) observedVehicles++;
  }
  return { vehicleYears, observedVehicles };
}

/** Diagnosed and wet counts of a module's failures. */
export function countDiagnosed(failures: ModuleFailures): { diagnosed: number; wet: number } {
  let diagnosed = 0;
  let wet = 0;
  for (let k = 0; k < failures.failureIds.length; k++) {
    if (failures.diagnosed[k]) diagnosed++;
    if (failures.moisture[k]) wet++;
  }
  return { diagnosed, wet };
}

/** The baseline of one module type over the whole fleet given: rate per vehicle-year with Garwood limits, moisture, trend. */
export function computeModuleBaseline(fleet: FleetIndex, module: PatternsModule, failures: ModuleFailures, totals: { vehicleYears: number; observedVehicles: number }): ModuleBaseline {
  const count = failures.failureIds.length;
  const { diagnosed, wet } = countDiagnosed(failures);
  const garwood = computeGarwoodInterval(count);
  const t = totals.vehicleYears;
  return {
    moduleId: module.id,
    moduleCode: module.code,
    moduleFunction: module.function,
    vehicles: totals.observedVehicles,
    vehicleYears: t,
    failures: count,
    ratePerVehicleYear: t > 0 ? count / t : 0,
    rateCiLow: t > 0 ? garwood.lower / t : 0,
    rateCiHigh: t > 0 ? garwood.upper / t : 0,
    diagnosedFailures: diagnosed,
    moistureFailures: wet,
    moistureShare: diagnosed > 0 ? wet / diagnosed : null,
    trend: computeModuleTrend(fleet, failures, totals.observedVehicles),
  };
}

/** A build range of one module type × band to read over a fleet. */
export interface CohortQuery {
  moduleCode: string;
  band: ExposureBand;
  /** Inclusive build months `YYYY-MM`. */
  buildFrom: string;
  buildTo: string;
}

/** Figures of build ranges, and module baselines, over one indexed fleet. */
export interface CohortFiguresCalculator {
  /** The figures of a range; null when the module type is not in the catalogue. */
  figures(q: CohortQuery): CohortFigures | null;
  /** The module's baseline over this fleet; null when the module type is not in the catalogue. */
  baseline(moduleCode: string): ModuleBaseline | null;
}

/**
 * A calculator of cohort figures over one fleet as of a day (the fleet is indexed once). For each query: the
 * figures of the band's observed vehicles built in the range, with the expectation at this fleet's rate for the
 * module and the rate ratio against the rest of this fleet. Nothing is searched: the range is taken as given, so
 * there is no scan p-value and no q-value.
 * @throws PatternsInputError on malformed input or asOf; `figures` on a malformed range or band
 */
export function createCohortFigures(input: PatternsInput, asOf: string): CohortFiguresCalculator {
  const fleet = indexFleet(input, parseAsOf(asOf));
  const totals = fleetExposure(fleet);
  const totalVehicleYears = totals.vehicleYears;
  const bins = EXPOSURE_BANDS.map((_, b) => buildBandBins(fleet, b));
  const moduleIndex = (code: string) => input.modules.findIndex((m) => m.code === code);
  return {
    baseline(code) {
      const mi = moduleIndex(code);
      return mi < 0 ? null : computeModuleBaseline(fleet, input.modules[mi]!, fleet.moduleFailures[mi] as ModuleFailures, totals);
    },
    figures(q) {
      const mi = moduleIndex(q.moduleCode);
      if (mi < 0) return null;
      const band = EXPOSURE_BANDS.indexOf(q.band);
      if (band < 0) throw new PatternsInputError(`unknown band ${JSON.stringify(q.band)}`);
      const from = toMonthIndex(q.buildFrom);
      const to = toMonthIndex(q.buildTo);
      if (to < from) throw new PatternsInputError(`build range ${q.buildFrom}..${q.buildTo} ends before it starts`);
      const module = input.modules[mi]!;
      const failures = fleet.moduleFailures[mi] as ModuleFailures;
      const b = bins[band] as BandBins;
      const { caseCounts, bandFailures } = countBandFailures(b, failures);
      const { diagnosed, wet } = countDiagnosed(failures);
      let start = 0;
      while (start < b.months.length && (b.months[start] as number) < from) start++;
      let end = b.months.length - 1;
      while (end >= 0 && (b.months[end] as number) > to) end--;
      return computeWindowFigures(
        {
          fleet,
          module,
          failures,
          bins: b,
          caseCounts,
          bandFailures,
          totalVehicleYears,
          fleetRate: totalVehicleYears > 0 ? failures.failureIds.length / totalVehicleYears : 0,
          moduleDiagnosed: diagnosed,
          moduleWet: wet,
        },
        start,
        end,
        { buildFrom: q.buildFrom, buildTo: q.buildTo },
      );
    },
  };
}
