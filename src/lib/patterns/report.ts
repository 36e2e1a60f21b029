/**
 * The patterns report: fleet baseline per module type, build-range discovery per module type × exposure band
 * (1-D Kulldorff scan with seeded Monte Carlo), exact rate ratio against the rest of the module's fleet,
 * Benjamini–Hochberg across every cohort tested, moisture evidence and the water-ingress verdict, and trend tests.
 * Formulas, thresholds and rules: docs/patterns-method.md.
 */
import { buildBandBins, computeModuleBaseline, computeWindowFigures, countBandFailures, fleetExposure, type BandBins } from './cohort-figures';
import { bandName, indexFleet, parseAsOf, type FleetIndex, type ModuleFailures } from './fleet-index';
import { deriveSeed } from './rng';
import { FDR_LEVEL, TREND_ALPHA, WATER_SHARE_ALPHA, WATER_SHARE_MIN } from './rules';
import { createScanLayout, runPoissonScan, type ScanLayout } from './scan';
import { adjustBenjaminiHochberg } from './stats';
import {
  EXPOSURE_BANDS,
  PatternsInputError,
  type BandSummary,
  type ModuleBaseline,
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

type ScannedBand = { bins: BandBins; layout: ScanLayout | null };

function scannedBand(fleet: FleetIndex, band: number, minVehicles: number, maxFraction: number, minWindow: number): ScannedBand {
  const bins = buildBandBins(fleet, band);
  const layout =
    bins.vehicles.length >= minVehicles && bins.months.length >= 2 ? createScanLayout(bins.vehicleYears, bins.vehicleCounts, maxFraction, minWindow) : null;
  return { bins, layout };
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
  const { vehicleYears: totalVehicleYears, observedVehicles } = fleetExposure(fleet);
  const bands = EXPOSURE_BANDS.map((_, b) => scannedBand(fleet, b, minBandVehicles, maxWindowFraction, minWindowVehicles));

  const modules: ModuleBaseline[] = [];
  const cohorts: PatternCohort[] = [];
  input.modules.forEach((module: PatternsModule, mi) => {
    const failures = fleet.moduleFailures[mi] as ModuleFailures;
    const moduleFailureCount = failures.failureIds.length;
    const baseline = computeModuleBaseline(fleet, module, failures, { vehicleYears: totalVehicleYears, observedVehicles });
    const fleetRate = baseline.ratePerVehicleYear;
    const moduleDiagnosed = baseline.diagnosedFailures;
    const moduleWet = baseline.moistureFailures;
    modules.push(baseline);
    if (moduleFailureCount === 0) return;

    for (const { bins, layout } of bands) {
      if (!layout) continue;
      const { caseCounts, bandFailures } = countBandFailures(bins, failures);
      if (bandFailures === 0) continue;
      const key = `${module.code}:${bandName(bins.band)}`;
      const scan = runPoissonScan(layout, caseCounts, { replicates, seed: deriveSeed(seed, key) });
      const best = scan.best;
      if (!best) continue;
      // Cohort = band vehicles built in bins best.start..best.end (a contiguous slice of the sorted members).
      const figures = computeWindowFigures(
        { fleet, module, failures, bins, caseCounts, bandFailures, totalVehicleYears, fleetRate, moduleDiagnosed, moduleWet },
        best.start,
        best.end,
      );
      cohorts.push({
        ...figures,
        pValue: scan.pValue,
        qValue: 1,
        significant: false,
        waterIngress: false,
        verdict: 'not_significant',
        scanLlr: best.llr,
        scanExpected: best.expected,
        mcP: scan.mcP,
        gumbelP: scan.gumbelP,
        pValueMethod: scan.pValueMethod,
        replicates: scan.replicates,
        windowsTested: scan.windowsTested,
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

  const bandSummaries: BandSummary[] = bands.map(({ bins: b }) => ({
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
