/**
 * The patterns report: fleet baseline per module type, build-range discovery per module type × exposure band
 * (1-D Kulldorff scan with seeded Monte Carlo), exact rate ratio against the rest of the module's fleet,
 * Benjamini–Hochberg across every cohort tested, moisture evidence and the water-ingress verdict, and trend tests.
 * Formulas, thresholds and rules: docs/patterns-method.md.
 */
import { formatMonthIndex } from './calendar';
import { bandName, indexFleet, parseAsOf, type FleetIndex, type ModuleFailures } from './fleet-index';
import { deriveSeed } from './rng';
import { FDR_LEVEL, TREND_ALPHA, WATER_SHARE_ALPHA, WATER_SHARE_MIN } from './rules';
import { createScanLayout, runPoissonScan, type ScanLayout } from './scan';
import { adjustBenjaminiHochberg, compareRatesExact, computeGarwoodInterval, fisherExactGreater } from './stats';
import { computeLaplaceTrend, computeMilHdbkTrend, fitPowerLawNhpp, type TrendSystem } from './trend';
import {
  EXPOSURE_BANDS,
  PatternsInputError,
  type BandSummary,
  type CohortMonth,
  type ModuleBaseline,
  type ModuleTrend,
  type PatternCohort,
  type PatternsInput,
  type PatternsModule,
  type PatternsOptions,
  type PatternsReport,
} from './types';

/** Default Monte Carlo replicates per cohort. */
export const DEFAULT_REPLICATES = 999;
/** Default seed. */
export const DEFAULT_SEED = 1;
export { FDR_LEVEL, TREND_ALPHA, WATER_SHARE_ALPHA, WATER_SHARE_MIN };
/** Default smallest band scanned, in vehicles. */
export const DEFAULT_MIN_BAND_VEHICLES = 20;
/** Default largest window, as a share of the band's vehicles. */
export const DEFAULT_MAX_WINDOW_FRACTION = 0.5;
/**
 * Default smallest window, in vehicles. Failures of one or two vehicles that keep coming back are a repeat-repair
 * history (flagged as such on every defect), not a build range; without a floor, the Poisson scan (which treats
 * failures as independent) calls a single vehicle with two failures in a thinly built month a cohort.
 */
export const DEFAULT_MIN_WINDOW_VEHICLES = 5;

/** Build-month bins of one exposure band. */
interface BandBins {
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
  layout: ScanLayout | null;
}

function buildBandBins(fleet: FleetIndex, band: number, minVehicles: number, maxFraction: number, minWindow: number): BandBins {
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
  const layout = members.length >= minVehicles && months.length >= 2 ? createScanLayout(vy, counts, maxFraction, minWindow) : null;
  return {
    band,
    vehicles: Int32Array.from(members),
    binStart: Int32Array.from(starts),
    months: Int32Array.from(months),
    vehicleYears: Float64Array.from(vy),
    vehicleCounts: Float64Array.from(counts),
    binOfVehicle,
    totalVehicleYears: total,
    layout,
  };
}

function moduleTrend(fleet: FleetIndex, failures: ModuleFailures, observedVehicles: number): ModuleTrend {
  // Time = days in service; an event on day-age a sits at a + 0.5 (within the day), clipped to the end.
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

function count(flags: readonly boolean[]): number {
  let c = 0;
  for (const f of flags) if (f) c++;
  return c;
}

/** Compare cohorts: strongest evidence first (q, then p, then LLR, then id). */
function compareCohorts(a: PatternCohort, b: PatternCohort): number {
  return a.qValue - b.qValue || a.pValue - b.pValue || b.scanLlr - a.scanLlr || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0);
}

/**
 * Compute the patterns report as of a day (see docs/patterns-method.md). Deterministic for a given input,
 * asOf, replicates and seed.
 * @throws PatternsInputError on malformed input or options
 */
export function computePatternsReport(input: PatternsInput, opts: PatternsOptions): PatternsReport {
  const asOfDay = parseAsOf(opts.asOf);
  const replicates = opts.replicates ?? DEFAULT_REPLICATES;
  const seed = opts.seed ?? DEFAULT_SEED;
  const minBandVehicles = opts.minBandVehicles ?? DEFAULT_MIN_BAND_VEHICLES;
  const maxWindowFraction = opts.maxWindowFraction ?? DEFAULT_MAX_WINDOW_FRACTION;
  const minWindowVehicles = opts.minWindowVehicles ?? DEFAULT_MIN_WINDOW_VEHICLES;
  if (!(Number.isInteger(minWindowVehicles) && minWindowVehicles >= 0)) throw new PatternsInputError('minWindowVehicles must be a whole number');
  if (!Number.isInteger(replicates) || replicates < 1) throw new PatternsInputError('replicates must be a positive integer');
  if (!Number.isInteger(seed)) throw new PatternsInputError('seed must be an integer');
  if (!(maxWindowFraction > 0 && maxWindowFraction <= 1)) throw new PatternsInputError('maxWindowFraction must be in (0, 1]');
  if (!(minBandVehicles >= 2)) throw new PatternsInputError('minBandVehicles must be at least 2');

  const fleet = indexFleet(input, asOfDay);
  let totalVehicleYears = 0;
  let observedVehicles = 0;
  for (let i = 0; i < fleet.vehicleYears.length; i++) {
    totalVehicleYears += fleet.vehicleYears[i] as number;
    if ((fleet.observedDays[i] as number) > 0) observedVehicles++;
  }
  const bands = EXPOSURE_BANDS.map((_, b) => buildBandBins(fleet, b, minBandVehicles, maxWindowFraction, minWindowVehicles));

  const modules: ModuleBaseline[] = [];
  const cohorts: PatternCohort[] = [];
  input.modules.forEach((module: PatternsModule, mi) => {
    const failures = fleet.moduleFailures[mi] as ModuleFailures;
    const moduleFailureCount = failures.failureIds.length;
    const fleetRate = totalVehicleYears > 0 ? moduleFailureCount / totalVehicleYears : 0;
    const moduleDiagnosed = count(failures.diagnosed);
    const moduleWet = count(failures.moisture);
    const garwood = computeGarwoodInterval(moduleFailureCount);
    modules.push({
      moduleId: module.id,
      moduleCode: module.code,
      moduleFunction: module.function,
      vehicles: observedVehicles,
      vehicleYears: totalVehicleYears,
      failures: moduleFailureCount,
      ratePerVehicleYear: fleetRate,
      rateCiLow: totalVehicleYears > 0 ? garwood.lower / totalVehicleYears : 0,
      rateCiHigh: totalVehicleYears > 0 ? garwood.upper / totalVehicleYears : 0,
      diagnosedFailures: moduleDiagnosed,
      moistureFailures: moduleWet,
      moistureShare: moduleDiagnosed > 0 ? moduleWet / moduleDiagnosed : null,
      trend: moduleTrend(fleet, failures, observedVehicles),
    });
    if (moduleFailureCount === 0) return;

    for (const bins of bands) {
      const layout = bins.layout;
      if (!layout) continue;
      const binCount = bins.months.length;
      const caseCounts = new Int32Array(binCount);
      let bandFailures = 0;
      for (let k = 0; k < moduleFailureCount; k++) {
        const b = bins.binOfVehicle[failures.vehicleIndex[k] as number] as number;
        if (b >= 0) {
          caseCounts[b] = (caseCounts[b] as number) + 1;
          bandFailures++;
        }
      }
      if (bandFailures === 0) continue;
      const band = bandName(bins.band);
      const key = `${module.code}:${band}`;
      const scan = runPoissonScan(layout, caseCounts, { replicates, seed: deriveSeed(seed, key) });
      const best = scan.best;
      if (!best) continue;

      // Cohort = band vehicles built in bins best.start..best.end (a contiguous slice of the sorted members).
      const firstVehicle = bins.binStart[best.start] as number;
      const lastVehicle = bins.binStart[best.end + 1] as number;
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
      for (let k = 0; k < moduleFailureCount; k++) {
        const vi = failures.vehicleIndex[k] as number;
        const b = bins.binOfVehicle[vi] as number;
        if (b < best.start || b > best.end) continue;
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
      const restVehicleYears = totalVehicleYears - cohortVehicleYears;
      const rates = compareRatesExact(cohortFailures, cohortVehicleYears, restFailures, restVehicleYears);
      const restDiagnosed = moduleDiagnosed - diagnosed;
      const restWet = moduleWet - wet;
      const expected = cohortVehicleYears * fleetRate;

      const byMonth: CohortMonth[] = [];
      for (let b = 0; b < binCount; b++) {
        byMonth.push({
          month: formatMonthIndex(bins.months[b] as number),
          vehicles: bins.vehicleCounts[b] as number,
          vehicleYears: bins.vehicleYears[b] as number,
          failures: caseCounts[b] as number,
          expected: (bins.vehicleYears[b] as number) * fleetRate,
          inCohort: b >= best.start && b <= best.end,
        });
      }
      const buildFrom = formatMonthIndex(bins.months[best.start] as number);
      const buildTo = formatMonthIndex(bins.months[best.end] as number);
      vehicleIds.sort((x, y) => x - y);
      failureIds.sort((x, y) => x - y);
      repeatVehicleIds.sort((x, y) => x - y);
      cohorts.push({
        id: `${key}:${buildFrom}:${buildTo}`,
        key,
        moduleId: module.id,
        moduleCode: module.code,
        moduleFunction: module.function,
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
        pValue: scan.pValue,
        qValue: 1,
        moistureShare: diagnosed > 0 ? wet / diagnosed : 0,
        repeatVehicles: repeatVehicleIds.length,
        significant: false,
        waterIngress: false,
        verdict: 'not_significant',
        ratePerVehicleYear: cohortFailures / cohortVehicleYears,
        fleetRatePerVehicleYear: fleetRate,
        ratioToFleet: expected > 0 ? cohortFailures / expected : null,
        restFailures,
        restVehicleYears,
        rateRatioPValue: rates.pTwoSided,
        scanLlr: best.llr,
        scanExpected: best.expected,
        mcP: scan.mcP,
        gumbelP: scan.gumbelP,
        pValueMethod: scan.pValueMethod,
        replicates: scan.replicates,
        windowsTested: scan.windowsTested,
        bandVehicles: bins.vehicles.length,
        bandVehicleYears: bins.totalVehicleYears,
        bandFailures,
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
        trend: moduleTrend(fleet, cohortFailureList, vehicleIds.length),
      });
    }
  });

  const qValues = adjustBenjaminiHochberg(cohorts.map((c) => c.pValue));
  cohorts.forEach((c, i) => {
    c.qValue = qValues[i] as number;
    c.significant = c.qValue < FDR_LEVEL;
    c.waterIngress = c.significant && isWaterEvidence(c);
    c.verdict = !c.significant ? 'not_significant' : c.waterIngress ? 'water_ingress' : 'significant_dry';
  });
  cohorts.sort(compareCohorts);

  const bandSummaries: BandSummary[] = bands.map((b) => ({
    band: bandName(b.band),
    vehicles: b.vehicles.length,
    vehicleYears: b.totalVehicleYears,
    buildMonths: b.months.length,
  }));
  return {
    asOf: opts.asOf,
    cohorts,
    modules,
    bands: bandSummaries,
    counts: {
      vehicles: input.vehicles.length,
      vehiclesObserved: observedVehicles,
      vehicleYears: totalVehicleYears,
      failuresCounted: fleet.failuresCounted,
      failuresIgnored: fleet.failuresIgnored,
      cohortsTested: cohorts.length,
      cohortsSignificant: cohorts.filter((c) => c.significant).length,
    },
    method: { replicates, seed, fdrLevel: FDR_LEVEL, maxWindowFraction, minBandVehicles, minWindowVehicles },
  };
}

/**
 * Moisture evidence points to water: at least half of the cohort's diagnosed failures show water
 * (WATER_SHARE_MIN) and that share exceeds the rest of the module's by a one-sided Fisher exact test
 * (p < WATER_SHARE_ALPHA). Significance is checked separately.
 */
export function isWaterEvidence(c: Pick<PatternCohort, 'diagnosedFailures' | 'moistureShare' | 'moistureP'>): boolean {
  return c.diagnosedFailures > 0 && c.moistureShare >= WATER_SHARE_MIN && c.moistureP < WATER_SHARE_ALPHA;
}
