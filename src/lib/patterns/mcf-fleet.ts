/**
 * MCF of one module type over the plain fleet data (CONTRACT.md "Mean cumulative function"): unit = vehicle,
 * age = days from its in-service date, end age = days to min(retired, asOf), events = failures of that module type
 * (any position) reported up to the end age; optionally one series per exposure band.
 */
import { toMonthIndex } from './calendar';
import { bandName, indexFleet, parseAsOf, type FleetIndex, type ModuleFailures } from './fleet-index';
import { computeMcf, type McfOptions, type McfPoint, type McfUnit } from './mcf';
import { EXPOSURE_BANDS, PatternsInputError, type ExposureBand, type PatternsInput } from './types';

/** Thrown when the requested module code is not in the catalogue. */
export class UnknownModuleError extends PatternsInputError {
  constructor(moduleCode: string) {
    super(`unknown module code ${JSON.stringify(moduleCode)}`);
    this.name = 'UnknownModuleError';
  }
}

function moduleIndexOf(input: PatternsInput, moduleCode: string): number {
  const index = input.modules.findIndex((m) => m.code === moduleCode);
  if (index < 0) throw new UnknownModuleError(moduleCode);
  return index;
}

function unitsFromFleet(input: PatternsInput, fleet: FleetIndex, moduleIndex: number, asOf: string, bandIndex: number, keep?: (i: number) => boolean): McfUnit[] {
  const units: McfUnit[] = [];
  const unitOfVehicle = new Int32Array(fleet.vehicleIds.length).fill(-1);
  input.vehicles.forEach((v, i) => {
    if (bandIndex >= 0 && fleet.bandIndex[i] !== bandIndex) return;
    if (keep && !keep(i)) return;
    // observedDays is 0 both for "in service on asOf" and for "not yet in service / retired before it"; only the
    // first is a unit (end age 0).
    if ((fleet.observedDays[i] as number) === 0 && (v.inServiceDate !== asOf || (v.retiredDate !== null && v.retiredDate < asOf))) return;
    unitOfVehicle[i] = units.length;
    units.push({ id: v.id, endAgeDays: fleet.observedDays[i] as number, eventAgesDays: [] });
  });
  const failures = fleet.moduleFailures[moduleIndex] as ModuleFailures;
  for (let k = 0; k < failures.vehicleIndex.length; k++) {
    const u = unitOfVehicle[failures.vehicleIndex[k] as number] as number;
    if (u >= 0) (units[u] as McfUnit).eventAgesDays.push(failures.ageDays[k] as number);
  }
  return units;
}

/**
 * MCF units (vehicles) for a module type as of a day, optionally only the vehicles of one exposure band.
 * Vehicles not yet in service on asOf are left out; a vehicle entering service on asOf has end age 0.
 * @throws UnknownModuleError when moduleCode is not in input.modules
 */
export function buildMcfUnits(input: PatternsInput, moduleCode: string, asOf: string, band?: ExposureBand): McfUnit[] {
  const moduleIndex = moduleIndexOf(input, moduleCode);
  const fleet = indexFleet(input, parseAsOf(asOf));
  return unitsFromFleet(input, fleet, moduleIndex, asOf, band === undefined ? -1 : EXPOSURE_BANDS.indexOf(band));
}

/** One MCF curve of the response. */
export interface McfSeries {
  key: 'all' | ExposureBand;
  points: McfPoint[];
}

/**
 * The `GET /api/patterns/mcf` body: one series "all", or one per exposure band that has vehicles.
 * @throws UnknownModuleError when moduleCode is not in input.modules
 */
export function computeMcfSeries(
  input: PatternsInput,
  query: { moduleCode: string; asOf: string; byExposureBand?: boolean },
  options: McfOptions = {},
): { series: McfSeries[] } {
  const moduleIndex = moduleIndexOf(input, query.moduleCode);
  const fleet = indexFleet(input, parseAsOf(query.asOf));
  if (!query.byExposureBand) {
    const units = unitsFromFleet(input, fleet, moduleIndex, query.asOf, -1);
    return { series: [{ key: 'all', points: computeMcf({ units }, options) }] };
  }
  const series: McfSeries[] = [];
  EXPOSURE_BANDS.forEach((_, b) => {
    const units = unitsFromFleet(input, fleet, moduleIndex, query.asOf, b);
    if (units.length > 0) series.push({ key: bandName(b), points: computeMcf({ units }, options) });
  });
  return { series };
}

/** One curve of the cohort comparison. */
export interface McfCompareSeries {
  key: 'cohort' | 'rest';
  points: McfPoint[];
}

/**
 * The MCF of a cohort against the rest of its band: the band's vehicles built in buildFrom..buildTo (inclusive
 * months) and the band's other vehicles, each a curve of the module's failures (same units and events as
 * computeMcfSeries). A curve without vehicles is left out.
 * @throws UnknownModuleError when moduleCode is not in input.modules; PatternsInputError on a bad band or range
 */
export function computeMcfCompare(
  input: PatternsInput,
  query: { moduleCode: string; asOf: string; band: ExposureBand; buildFrom: string; buildTo: string },
  options: McfOptions = {},
): McfCompareSeries[] {
  const moduleIndex = moduleIndexOf(input, query.moduleCode);
  const band = EXPOSURE_BANDS.indexOf(query.band);
  if (band < 0) throw new PatternsInputError(`unknown band ${JSON.stringify(query.band)}`);
  const from = toMonthIndex(query.buildFrom);
  const to = toMonthIndex(query.buildTo);
  if (to < from) throw new PatternsInputError(`build range ${query.buildFrom}..${query.buildTo} ends before it starts`);
  const fleet = indexFleet(input, parseAsOf(query.asOf));
  const inRange = (i: number) => (fleet.monthIndex[i] as number) >= from && (fleet.monthIndex[i] as number) <= to;
  const out: McfCompareSeries[] = [];
  const cohort = unitsFromFleet(input, fleet, moduleIndex, query.asOf, band, inRange);
  if (cohort.length > 0) out.push({ key: 'cohort', points: computeMcf({ units: cohort }, options) });
  const rest = unitsFromFleet(input, fleet, moduleIndex, query.asOf, band, (i) => !inRange(i));
  if (rest.length > 0) out.push({ key: 'rest', points: computeMcf({ units: rest }, options) });
  return out;
}
