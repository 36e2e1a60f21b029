/**
 * Shared preparation of the plain fleet data for the report and the MCF: per-vehicle observation window,
 * exposure band and build month in typed arrays, and the failures that fall inside their vehicle's window,
 * grouped by module type. Edit when a new per-vehicle or per-failure fact is needed by an engine.
 */
import { DAYS_PER_YEAR, toDayNumber, toMonthIndex } from './calendar';
import { EXPOSURE_THRESHOLDS, computeExposureIndex } from './exposure';
import { EXPOSURE_BANDS, PatternsInputError, type ExposureBand, type PatternsInput, type PatternsVehicle } from './types';

/** Moisture findings that count as water. */
const WET_FINDINGS = new Set(['traces', 'corrosion', 'standing_water']);
/** Root cause that counts as water. */
export const WATER_ROOT_CAUSE = 'water_ingress';

/** Failures of one module type inside their vehicles' observation windows. */
export interface ModuleFailures {
  failureIds: number[];
  vehicleIndex: number[];
  /** Days from the vehicle's in-service date. */
  ageDays: number[];
  diagnosed: boolean[];
  /** Diagnosed with moisture found (traces, corrosion, standing water) or root cause water ingress. */
  moisture: boolean[];
}

/** Indexed fleet. */
export interface FleetIndex {
  asOfDay: number;
  vehicleIds: number[];
  /** Observed days (min(retired, asOf) − in service), ≥ 0. */
  observedDays: Float64Array;
  vehicleYears: Float64Array;
  monthIndex: Int32Array;
  /** 0 low, 1 medium, 2 high. */
  bandIndex: Int8Array;
  exposureIndex: Int8Array;
  /** Vehicle ids → array index. */
  vehicleById: Map<number, number>;
  moduleById: Map<number, number>;
  moduleFailures: ModuleFailures[];
  failuresCounted: number;
  failuresIgnored: number;
}

/** Band name of a band index. */
export function bandName(bandIndex: number): ExposureBand {
  return EXPOSURE_BANDS[bandIndex] as ExposureBand;
}

/**
 * Index the fleet as of a day. Failures of unknown vehicles or modules, or outside [in service, end], are ignored
 * (counted in failuresIgnored).
 * @throws PatternsInputError on duplicate ids, a vehicle whose depot is missing, or malformed dates
 */
export function indexFleet(input: PatternsInput, asOfDay: number): FleetIndex {
  const depots = new Map(input.depots.map((d) => [d.id, d]));
  const n = input.vehicles.length;
  const vehicleIds: number[] = new Array<number>(n);
  const observedDays = new Float64Array(n);
  const vehicleYears = new Float64Array(n);
  const monthIndex = new Int32Array(n);
  const bandIndex = new Int8Array(n);
  const exposureIndex = new Int8Array(n);
  const startDay = new Float64Array(n);
  const endDay = new Float64Array(n);
  const vehicleById = new Map<number, number>();
  const vehicles = input.vehicles;
  for (let i = 0; i < n; i++) {
    const v = vehicles[i] as PatternsVehicle;
    if (vehicleById.has(v.id)) throw new PatternsInputError(`duplicate vehicle id ${v.id}`);
    vehicleById.set(v.id, i);
    const depot = depots.get(v.depotId);
    if (!depot) throw new PatternsInputError(`vehicle ${v.id} has unknown depot ${v.depotId}`);
    const start = toDayNumber(v.inServiceDate);
    const end = Math.min(v.retiredDate ? toDayNumber(v.retiredDate) : Number.POSITIVE_INFINITY, asOfDay);
    const days = Math.max(0, end - start);
    const index = computeExposureIndex(depot, v.parking, v.washesPerMonth);
    vehicleIds[i] = v.id;
    observedDays[i] = days;
    vehicleYears[i] = days / DAYS_PER_YEAR;
    startDay[i] = start;
    endDay[i] = end;
    monthIndex[i] = toMonthIndex(v.buildMonth);
    bandIndex[i] = index >= EXPOSURE_THRESHOLDS.bandMinIndex.high ? 2 : index >= EXPOSURE_THRESHOLDS.bandMinIndex.medium ? 1 : 0;
    exposureIndex[i] = index;
  }
  const moduleById = new Map<number, number>();
  input.modules.forEach((m, i) => {
    if (moduleById.has(m.id)) throw new PatternsInputError(`duplicate module id ${m.id}`);
    moduleById.set(m.id, i);
  });
  const moduleFailures: ModuleFailures[] = input.modules.map(() => ({
    failureIds: [], vehicleIndex: [], ageDays: [], diagnosed: [], moisture: [],
  }));
  let counted = 0;
  let ignored = 0;
  for (const f of input.failures) {
    const vi = vehicleById.get(f.vehicleId);
    const mi = moduleById.get(f.moduleId);
    if (vi === undefined || mi === undefined) {
      ignored++;
      continue;
    }
    const day = toDayNumber(f.reportedAt);
    const start = startDay[vi] as number;
    // Inside [in service, end]; a vehicle entering service on asOf still has its day 0.
    if (day < start || day > (endDay[vi] as number)) {
      ignored++;
      continue;
    }
    const diagnosed = f.diagnosed ?? (f.moisture !== null || f.rootCause !== null);
    const wet = diagnosed && ((f.moisture !== null && WET_FINDINGS.has(f.moisture)) || f.rootCause === WATER_ROOT_CAUSE);
    const list = moduleFailures[mi] as ModuleFailures;
    list.failureIds.push(f.id);
    list.vehicleIndex.push(vi);
    list.ageDays.push(day - start);
    list.diagnosed.push(diagnosed);
    list.moisture.push(wet);
    counted++;
  }
  return {
    asOfDay, vehicleIds, observedDays, vehicleYears, monthIndex, bandIndex, exposureIndex, vehicleById, moduleById,
    moduleFailures, failuresCounted: counted, failuresIgnored: ignored,
  };
}

/** Day number of a strict `YYYY-MM-DD` asOf option. */
export function parseAsOf(asOf: string): number {
  if (typeof asOf !== 'string' || asOf.length !== 10) throw new PatternsInputError(`asOf must be YYYY-MM-DD, got ${JSON.stringify(asOf)}`);
  return toDayNumber(asOf);
}
