/**
 * Plain-data shapes of the patterns engine: what the service layer passes in (fleet, depots, module catalogue,
 * failures) and the report it gets back. Edit when CONTRACT.md "Patterns" changes or a new field is exposed.
 */

/** Moisture-exposure band of a vehicle (fixed thresholds, see exposure.ts). */
export type ExposureBand = 'low' | 'medium' | 'high';

/** All bands in ascending order of exposure. */
export const EXPOSURE_BANDS: readonly ExposureBand[] = Object.freeze(['low', 'medium', 'high'] as const);

/** Where a vehicle is parked when not in use. */
export type Parking = 'indoor' | 'outdoor' | 'mixed';

/** Moisture finding recorded at diagnosis. */
export type MoistureFinding = 'none' | 'traces' | 'corrosion' | 'standing_water';

/** One vehicle of the visible fleet. */
export interface PatternsVehicle {
  id: number;
  vin: string;
  /** Build month `YYYY-MM`. */
  buildMonth: string;
  /** `YYYY-MM-DD`. */
  inServiceDate: string;
  /** `YYYY-MM-DD` or null while in service. */
  retiredDate: string | null;
  depotId: number;
  parking: Parking;
  washesPerMonth: number;
}

/** One depot with the climate and washing facts the exposure index uses. */
export interface PatternsDepot {
  id: number;
  code: string;
  coastal: boolean;
  rainDaysPerYear: number;
  meanRhPct: number;
  washBay: boolean;
}

/** One module type of the catalogue. Every vehicle is assumed to carry every module type. */
export interface PatternsModule {
  id: number;
  code: string;
  function: string;
}

/** One failure (defect) of a module type on a vehicle. */
export interface PatternsFailure {
  id: number;
  vehicleId: number;
  moduleId: number;
  /** ISO date or date-time; the date written in the first ten characters is the failure day. */
  reportedAt: string;
  moisture: MoistureFinding | null;
  rootCause: string | null;
  /** Whether the failure has been diagnosed; when absent, diagnosed = moisture or root cause recorded. */
  diagnosed?: boolean;
}

/** Everything the report needs, already filtered to the depots the caller may see. */
export interface PatternsInput {
  vehicles: PatternsVehicle[];
  depots: PatternsDepot[];
  modules: PatternsModule[];
  failures: PatternsFailure[];
}

/** Options of computePatternsReport. */
export interface PatternsOptions {
  /** `YYYY-MM-DD`: observation ends here (or at retirement, whichever is first). */
  asOf: string;
  /** Monte Carlo replicates per cohort (default 999). */
  replicates?: number;
  /** Seed of the Monte Carlo generator (default 1); each cohort derives its own stream from seed + key. */
  seed?: number;
  /** Smallest band (module × band) that is scanned, in vehicles (default 20). */
  minBandVehicles?: number;
  /** Largest window as a share of the band's vehicles (default 0.5). */
  maxWindowFraction?: number;
  /** Smallest window, in vehicles (default 5): a handful of vehicles is a repeat history, not a build range. */
  minWindowVehicles?: number;
}

/** One build month of a cohort's band, for the rate chart. */
export interface CohortMonth {
  /** `YYYY-MM`. */
  month: string;
  vehicles: number;
  vehicleYears: number;
  failures: number;
  /** Failures at the module's fleet rate: vehicleYears × fleet rate. */
  expected: number;
  inCohort: boolean;
}

/** Verdict of a cohort: not significant, significant with water evidence, or significant but dry. */
export type CohortVerdict = 'not_significant' | 'water_ingress' | 'significant_dry';

/**
 * The figures of a fixed build range of one module type × exposure band over the fleet given: what the cohort of a
 * report carries apart from the scan that found the range. A report's cohort adds the scan (PatternCohort); a
 * pattern record read over one person's depots carries these figures only (src/lib/patterns/cohort-figures.ts).
 */
export interface CohortFigures {
  /** Stable identity of this finding: `${moduleCode}:${band}:${buildFrom}:${buildTo}`. */
  id: string;
  /** Stable identity of the place searched: `${moduleCode}:${band}` (one cohort per key and report). */
  key: string;
  moduleId: number;
  moduleCode: string;
  moduleFunction: string;
  /** Inclusive build months `YYYY-MM`. */
  buildFrom: string;
  buildTo: string;
  exposureBand: ExposureBand;
  vehicles: number;
  vehicleYears: number;
  failures: number;
  /** vehicleYears × the module's failures per vehicle-year over the whole visible fleet. */
  expected: number;
  /** Cohort rate / rate of the rest of the module's fleet; null when the rest has no failures (unbounded). */
  rateRatio: number | null;
  /** Exact conditional 95% limits of rateRatio (Clopper–Pearson mapped); ciHigh null = unbounded. */
  ciLow: number;
  ciHigh: number | null;
  /** Share of the cohort's diagnosed failures with moisture found or root cause water ingress (0 when none diagnosed). */
  moistureShare: number;
  /** Cohort vehicles with two or more failures of this module type. */
  repeatVehicles: number;
  /** failures / vehicleYears. */
  ratePerVehicleYear: number;
  /** The module's failures per vehicle-year over the whole visible fleet. */
  fleetRatePerVehicleYear: number;
  /** failures / expected (rate relative to the whole fleet incl. the cohort); null when expected is 0. */
  ratioToFleet: number | null;
  restFailures: number;
  restVehicleYears: number;
  /** Exact conditional two-sided p of rateRatio = 1 (R binom.test rule), not adjusted for the window search. */
  rateRatioPValue: number;
  bandVehicles: number;
  bandVehicleYears: number;
  bandFailures: number;
  diagnosedFailures: number;
  moistureFailures: number;
  restDiagnosedFailures: number;
  restMoistureFailures: number;
  /** Same share for the module's failures outside the cohort; null when none of them is diagnosed. */
  moistureShareRest: number | null;
  /** One-sided Fisher exact p that the cohort's moisture share exceeds the rest's. */
  moistureP: number;
  vehicleIds: number[];
  failureIds: number[];
  repeatVehicleIds: number[];
  /** Every build month of the band (cohort months flagged). */
  byMonth: CohortMonth[];
  /** Trend tests over the cohort's own vehicles and failures (same method as the module's trend). */
  trend: ModuleTrend;
}

/** One tested cohort (module type × exposure band × discovered build range): its figures and the scan's. */
export interface PatternCohort extends CohortFigures {
  /** Scan p-value that pays for the window search (Monte Carlo; Gumbel tail when no replicate reached it). */
  pValue: number;
  /** Benjamini–Hochberg adjusted pValue across every cohort of the report. */
  qValue: number;
  significant: boolean;
  waterIngress: boolean;
  verdict: CohortVerdict;
  /** Kulldorff log-likelihood ratio of the window. */
  scanLlr: number;
  /** Failures the window would have at its band's own rate (the scan's expectation). */
  scanExpected: number;
  /** Monte Carlo p = (1 + #replicates ≥ observed) / (R + 1). */
  mcP: number;
  /** Gumbel-tail p from the replicate maxima (method of moments); null when the maxima have no spread. */
  gumbelP: number | null;
  pValueMethod: 'monte_carlo' | 'gumbel';
  replicates: number;
  windowsTested: number;
}

/** Trend tests of one module type's failures over each vehicle's days in service. */
export interface ModuleTrend {
  /** Vehicles observed (systems). */
  systems: number;
  events: number;
  laplaceU: number | null;
  laplacePTwoSided: number | null;
  milHdbkChiSquare: number | null;
  milHdbkDf: number;
  milHdbkPTwoSided: number | null;
  /** Power-law (Crow–AMSAA) shape MLE; > 1 means failures come faster with age. */
  beta: number | null;
  /** 'increasing' when both tests reject a constant rate at 5% two-sided towards more failures with age. */
  direction: 'increasing' | 'decreasing' | 'none';
  accelerating: boolean;
}

/** Fleet baseline of one module type. */
export interface ModuleBaseline {
  moduleId: number;
  moduleCode: string;
  moduleFunction: string;
  vehicles: number;
  vehicleYears: number;
  failures: number;
  ratePerVehicleYear: number;
  /** Garwood exact 95% limits of the rate. */
  rateCiLow: number;
  rateCiHigh: number;
  diagnosedFailures: number;
  moistureFailures: number;
  moistureShare: number | null;
  trend: ModuleTrend;
}

/** Vehicles and exposure of one band. */
export interface BandSummary {
  band: ExposureBand;
  vehicles: number;
  vehicleYears: number;
  buildMonths: number;
}

/** The whole patterns report. */
export interface PatternsReport {
  asOf: string;
  /** Every cohort tested, strongest evidence first. */
  cohorts: PatternCohort[];
  modules: ModuleBaseline[];
  bands: BandSummary[];
  counts: {
    vehicles: number;
    /** Vehicles with positive observed time. */
    vehiclesObserved: number;
    vehicleYears: number;
    failuresCounted: number;
    /** Failures outside their vehicle's observation window, or of an unknown vehicle / module. */
    failuresIgnored: number;
    cohortsTested: number;
    cohortsSignificant: number;
  };
  method: {
    replicates: number;
    seed: number;
    fdrLevel: number;
    maxWindowFraction: number;
    minBandVehicles: number;
    minWindowVehicles: number;
  };
}

/** Thrown for malformed input (bad dates, unknown depot of a vehicle, bad options). */
export class PatternsInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PatternsInputError';
  }
}
