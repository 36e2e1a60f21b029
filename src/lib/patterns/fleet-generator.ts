/**
 * Seeded synthetic fleet for tests, benchmarks and the demo scenario: depots in varied climates, vehicles with
 * build months, in-service dates, parking and washing, a module catalogue, and failures drawn as Poisson
 * processes over each vehicle's time in service. Cohorts can be planted (a module type × build range × optional
 * band with a rate multiplier and the moisture share of the extra failures), wet or dry. Same options, same fleet.
 * Edit when the demo needs another kind of depot, module or planted pattern.
 */
import { computeVinCheckDigit } from '@/lib/vin/vin';
import { DAYS_PER_YEAR, formatDayNumber, formatMonthIndex, monthIndexToFirstDay, toDayNumber, toMonthIndex } from './calendar';
import { computeExposureScore } from './exposure';
import { createRandom, drawPoisson, type Random } from './rng';
import type {
  ExposureBand,
  MoistureFinding,
  Parking,
  PatternsDepot,
  PatternsFailure,
  PatternsInput,
  PatternsModule,
  PatternsVehicle,
} from './types';

/** Module functions of the catalogue (CONTRACT.md imports). */
export type ModuleFunction = 'window_lifter' | 'lock_actuator' | 'door_control' | 'mirror' | 'harness' | 'switch' | 'other';

/** Door / body positions of a defect (CONTRACT.md imports). */
export type DefectPosition = 'FL' | 'FR' | 'RL' | 'RR' | 'SL' | 'SR' | 'TG';

/** A depot to generate (id assigned in order). */
export interface DepotSpec {
  code: string;
  name: string;
  region: string;
  timezone: string;
  coastal: boolean;
  rainDaysPerYear: number;
  meanRhPct: number;
  washBay: boolean;
  inspectionSlotsPerDay: number;
  /** Relative share of the fleet based here. */
  weight: number;
}

/** A module type to generate (id assigned in order). */
export interface ModuleSpec {
  code: string;
  name: string;
  function: ModuleFunction;
  /** Background failures per vehicle-year. */
  failuresPerVehicleYear: number;
  /** Share of diagnosed background failures with moisture found. */
  moistureShare: number;
  /** Positions a defect of this module can be reported at. */
  positions: readonly DefectPosition[];
}

/** A planted cohort: extra failures of one module type on vehicles built in a range (and band). */
export interface PlantedCohort {
  label: string;
  moduleCode: string;
  /** Inclusive build months `YYYY-MM`. */
  buildFrom: string;
  buildTo: string;
  /** Only vehicles of this band; null or absent = every band. */
  band?: ExposureBand | null;
  /** Cohort rate = multiplier × background rate (extra failures at (multiplier − 1) × rate). */
  rateMultiplier: number;
  /** Share of the extra diagnosed failures with moisture found (e.g. 0.9 wet, 0.05 dry). */
  moistureShare: number;
  /** Root cause of the extra dry diagnosed failures (default 'mechanical'). */
  dryRootCause?: string;
}

/** Options of generateFleet (everything but seed and vehicleCount has a default). */
export interface FleetGeneratorOptions {
  seed: number;
  vehicleCount: number;
  /** `YYYY-MM-DD`, default 2026-06-30; no failure or in-service date is generated after it. */
  asOf?: string;
  /** Build months `YYYY-MM`, default 2019-01 .. 2025-12. */
  buildFrom?: string;
  buildTo?: string;
  depots?: readonly DepotSpec[];
  modules?: readonly ModuleSpec[];
  planted?: readonly PlantedCohort[];
  /** Multiplier on every module's background rate (default 1). */
  rateScale?: number;
  /** Background rate multiplier per exposure band (default 1 each: no exposure effect). */
  bandRateMultiplier?: Partial<Record<ExposureBand, number>>;
  /** Power-law shape of failures over age (default 1: constant rate; E N(T) = rate × T^shape, T in years). */
  ageShape?: number;
  /** Share of failures diagnosed (default 0.85). */
  diagnosedShare?: number;
  /** Share of vehicles retired before asOf (default 0.04). */
  retiredShare?: number;
  /** Days from build to in service, uniform (default [20, 150]). */
  inServiceLagDays?: readonly [number, number];
  /** Shares of parking kinds (default indoor 0.2, mixed 0.3, outdoor 0.5). */
  parkingShares?: Readonly<Record<Parking, number>>;
  /** Washes per month to pick from uniformly (default [0, 1, 2, 2, 4, 4, 4, 6, 8, 8, 12]). */
  washesPerMonthChoices?: readonly number[];
  /** Relative build volume per month varies uniformly in [1 − j, 1 + j] (default 0.6). */
  monthlyVolumeJitter?: number;
  /** First three VIN characters (default 'SLV'). */
  vinPrefix?: string;
}

/** A generated depot. */
export interface GeneratedDepot extends PatternsDepot {
  name: string;
  region: string;
  timezone: string;
  inspectionSlotsPerDay: number;
}

/** A generated module type. */
export interface GeneratedModule extends PatternsModule {
  name: string;
}

/** A generated vehicle. */
export interface GeneratedVehicle extends PatternsVehicle {
  fleetNumber: string;
  body: 'panel_van' | 'minibus' | 'car';
  depotCode: string;
  exposureBand: ExposureBand;
  exposureIndex: number;
}

/** A generated failure. */
export interface GeneratedFailure extends PatternsFailure {
  moduleCode: string;
  position: DefectPosition;
  /** Label of the planted cohort that added this failure, null for background failures. */
  plantedLabel: string | null;
}

/** A generated fleet: a PatternsInput with extra facts for seeding and tests. */
export interface GeneratedFleet extends PatternsInput {
  asOf: string;
  depots: GeneratedDepot[];
  modules: GeneratedModule[];
  vehicles: GeneratedVehicle[];
  failures: GeneratedFailure[];
  planted: PlantedCohort[];
}

const DOOR_POSITIONS: readonly DefectPosition[] = ['FL', 'FR', 'RL', 'RR'];

/** Default depots: coastal and inland, wet and dry, with and without a wash bay. */
export const DEFAULT_DEPOTS: readonly DepotSpec[] = Object.freeze([
  { code: 'HBR', name: 'Harbour Quay', region: 'Coast West', timezone: 'Europe/London', coastal: true, rainDaysPerYear: 175, meanRhPct: 83, washBay: true, inspectionSlotsPerDay: 4, weight: 1.2 },
  { code: 'CLF', name: 'Cliff Road', region: 'Coast West', timezone: 'Europe/London', coastal: true, rainDaysPerYear: 130, meanRhPct: 78, washBay: false, inspectionSlotsPerDay: 3, weight: 1 },
  { code: 'EST', name: 'Estuary Park', region: 'Coast East', timezone: 'Europe/London', coastal: true, rainDaysPerYear: 95, meanRhPct: 75, washBay: true, inspectionSlotsPerDay: 3, weight: 0.9 },
  { code: 'VAL', name: 'Valley Works', region: 'Uplands', timezone: 'Europe/London', coastal: false, rainDaysPerYear: 160, meanRhPct: 80, washBay: true, inspectionSlotsPerDay: 3, weight: 0.9 },
  { code: 'MDW', name: 'Meadow Lane', region: 'Midlands', timezone: 'Europe/London', coastal: false, rainDaysPerYear: 115, meanRhPct: 72, washBay: false, inspectionSlotsPerDay: 2, weight: 1 },
  { code: 'PLN', name: 'Plains Cross', region: 'Midlands', timezone: 'Europe/London', coastal: false, rainDaysPerYear: 85, meanRhPct: 64, washBay: true, inspectionSlotsPerDay: 4, weight: 1.1 },
  { code: 'DRY', name: 'Dry Hill', region: 'Interior', timezone: 'Europe/London', coastal: false, rainDaysPerYear: 60, meanRhPct: 55, washBay: false, inspectionSlotsPerDay: 2, weight: 0.8 },
]);

/** Default module catalogue (body electrics), background rates summing to about 0.19 failures per vehicle-year. */
export const DEFAULT_MODULES: readonly ModuleSpec[] = Object.freeze([
  { code: 'WLR-2', name: 'Front window lifter motor with hall encoder', function: 'window_lifter', failuresPerVehicleYear: 0.055, moistureShare: 0.2, positions: ['FL', 'FR'] },
  { code: 'WLR-4', name: 'Rear window lifter motor with hall encoder', function: 'window_lifter', failuresPerVehicleYear: 0.025, moistureShare: 0.2, positions: ['RL', 'RR'] },
  { code: 'DLA-1', name: 'Door lock actuator', function: 'lock_actuator', failuresPerVehicleYear: 0.035, moistureShare: 0.15, positions: ['FL', 'FR', 'RL', 'RR', 'SL', 'SR', 'TG'] },
  { code: 'DCM-3', name: 'Door control module', function: 'door_control', failuresPerVehicleYear: 0.02, moistureShare: 0.12, positions: ['FL', 'FR'] },
  { code: 'MRM-1', name: 'Exterior mirror motor', function: 'mirror', failuresPerVehicleYear: 0.018, moistureShare: 0.1, positions: ['FL', 'FR'] },
  { code: 'DHC-2', name: 'Door harness and connector', function: 'harness', failuresPerVehicleYear: 0.022, moistureShare: 0.25, positions: DOOR_POSITIONS },
  { code: 'WSW-1', name: 'Window switch pack', function: 'switch', failuresPerVehicleYear: 0.02, moistureShare: 0.1, positions: ['FL', 'FR'] },
]);

const WET_FINDINGS: readonly MoistureFinding[] = ['traces', 'corrosion', 'standing_water'];
const WET_WEIGHTS = [0.45, 0.4, 0.15];
const DRY_CAUSES = ['connector', 'wiring', 'mechanical', 'sensor', 'software', 'unknown'];
const DRY_CAUSE_WEIGHTS = [0.25, 0.15, 0.3, 0.15, 0.05, 0.1];
const MODEL_YEAR_CODES = 'ABCDEFGHJKLMNPRSTVWXY123456789';
const BODIES: readonly GeneratedVehicle['body'][] = ['panel_van', 'panel_van', 'minibus', 'car'];
const VDS_BY_BODY: Record<GeneratedVehicle['body'], string> = { panel_van: 'PV2L1', minibus: 'MB3H2', car: 'CR1S4' };

function pickWeighted<T>(items: readonly T[], weights: readonly number[], random: Random): T {
  let total = 0;
  for (const w of weights) total += w;
  let u = random.nextDouble() * total;
  for (let i = 0; i < items.length; i++) {
    u -= weights[i] as number;
    if (u < 0) return items[i] as T;
  }
  return items[items.length - 1] as T;
}

function pick<T>(items: readonly T[], random: Random): T {
  return items[Math.floor(random.nextDouble() * items.length)] as T;
}

function makeVin(prefix: string, body: GeneratedVehicle['body'], buildYear: number, serial: number): string {
  const yearCode = MODEL_YEAR_CODES.charAt((((buildYear - 1980) % 30) + 30) % 30);
  const draft = `${prefix}${VDS_BY_BODY[body]}0${yearCode}A${String(serial).padStart(6, '0')}`;
  return `${draft.slice(0, 8)}${computeVinCheckDigit(draft)}${draft.slice(9)}`;
}

/** Generate a fleet (deterministic for the same options). */
export function generateFleet(options: FleetGeneratorOptions): GeneratedFleet {
  const random = createRandom(options.seed);
  const asOf = options.asOf ?? '2026-06-30';
  const asOfDay = toDayNumber(asOf);
  const firstMonth = toMonthIndex(options.buildFrom ?? '2019-01');
  const lastMonth = toMonthIndex(options.buildTo ?? '2025-12');
  if (lastMonth < firstMonth) throw new RangeError('buildTo must not be before buildFrom');
  const depotSpecs = options.depots ?? DEFAULT_DEPOTS;
  const moduleSpecs = options.modules ?? DEFAULT_MODULES;
  const planted = [...(options.planted ?? [])];
  const rateScale = options.rateScale ?? 1;
  const bandMult: Record<ExposureBand, number> = { low: 1, medium: 1, high: 1, ...options.bandRateMultiplier };
  const ageShape = options.ageShape ?? 1;
  const diagnosedShare = options.diagnosedShare ?? 0.85;
  const retiredShare = options.retiredShare ?? 0.04;
  const [lagMin, lagMax] = options.inServiceLagDays ?? [20, 150];
  const parkingShares = options.parkingShares ?? { indoor: 0.2, mixed: 0.3, outdoor: 0.5 };
  const washChoices = options.washesPerMonthChoices ?? [0, 1, 2, 2, 4, 4, 4, 6, 8, 8, 12];
  const jitter = options.monthlyVolumeJitter ?? 0.6;
  const vinPrefix = options.vinPrefix ?? 'SLV';

  const depots: GeneratedDepot[] = depotSpecs.map((d, i) => ({
    id: i + 1, code: d.code, name: d.name, region: d.region, timezone: d.timezone, coastal: d.coastal,
    rainDaysPerYear: d.rainDaysPerYear, meanRhPct: d.meanRhPct, washBay: d.washBay, inspectionSlotsPerDay: d.inspectionSlotsPerDay,
  }));
  const modules: GeneratedModule[] = moduleSpecs.map((m, i) => ({ id: i + 1, code: m.code, name: m.name, function: m.function }));
  const moduleIndexByCode = new Map(moduleSpecs.map((m, i) => [m.code, i]));
  const plantedParsed = planted.map((p) => {
    const mi = moduleIndexByCode.get(p.moduleCode);
    if (mi === undefined) throw new RangeError(`planted cohort ${p.label}: unknown module ${p.moduleCode}`);
    return { spec: p, moduleIndex: mi, from: toMonthIndex(p.buildFrom), to: toMonthIndex(p.buildTo) };
  });

  const months: number[] = [];
  const monthWeights: number[] = [];
  for (let m = firstMonth; m <= lastMonth; m++) {
    months.push(m);
    monthWeights.push(1 + jitter * (2 * random.nextDouble() - 1));
  }
  const parkingKinds: Parking[] = ['indoor', 'mixed', 'outdoor'];
  const parkingWeights = parkingKinds.map((k) => parkingShares[k]);
  const depotWeights = depotSpecs.map((d) => d.weight);

  const vehicles: GeneratedVehicle[] = [];
  const draftFailures: Array<Omit<GeneratedFailure, 'id'> & { day: number; minute: number }> = [];
  for (let i = 0; i < options.vehicleCount; i++) {
    const month = pickWeighted(months, monthWeights, random);
    const buildDay = monthIndexToFirstDay(month) + Math.floor(random.nextDouble() * 28);
    const inServiceDay = Math.min(asOfDay, buildDay + lagMin + Math.floor(random.nextDouble() * (lagMax - lagMin + 1)));
    let retiredDay: number | null = null;
    if (random.nextDouble() < retiredShare && asOfDay - inServiceDay > 200) {
      retiredDay = inServiceDay + 180 + Math.floor(random.nextDouble() * (asOfDay - inServiceDay - 180));
    }
    const depotIndex = depotSpecs.indexOf(pickWeighted(depotSpecs, depotWeights, random));
    const depot = depots[depotIndex] as GeneratedDepot;
    const parking = pickWeighted(parkingKinds, parkingWeights, random);
    const washesPerMonth = pick(washChoices, random);
    const body = pick(BODIES, random);
    const score = computeExposureScore(depot, { parking, washesPerMonth });
    const id = i + 1;
    vehicles.push({
      id,
      vin: makeVin(vinPrefix, body, Math.floor(month / 12), id),
      buildMonth: formatMonthIndex(month),
      inServiceDate: formatDayNumber(inServiceDay),
      retiredDate: retiredDay === null ? null : formatDayNumber(retiredDay),
      depotId: depot.id,
      parking,
      washesPerMonth,
      fleetNumber: `F${String(id).padStart(6, '0')}`,
      body,
      depotCode: depot.code,
      exposureBand: score.band,
      exposureIndex: score.index,
    });

    const endDay = retiredDay ?? asOfDay;
    const observedDays = endDay - inServiceDay;
    if (observedDays <= 0) continue;
    const years = observedDays / DAYS_PER_YEAR;
    const exposureFactor = Math.pow(years, ageShape);
    moduleSpecs.forEach((spec, mi) => {
      const baseMean = spec.failuresPerVehicleYear * rateScale * bandMult[score.band] * exposureFactor;
      const addFailures = (mean: number, wetShare: number, label: string | null, dryCause: string | null): void => {
        const count = drawPoisson(mean, random);
        for (let k = 0; k < count; k++) {
          // Power-law times on (0, T]: t = T·U^(1/shape).
          const ageDays = Math.min(observedDays - 1e-9, observedDays * Math.pow(random.nextDouble(), 1 / ageShape));
          const diagnosed = random.nextDouble() < diagnosedShare;
          let moisture: MoistureFinding | null = null;
          let rootCause: string | null = null;
          if (diagnosed) {
            if (random.nextDouble() < wetShare) {
              moisture = pickWeighted(WET_FINDINGS, WET_WEIGHTS, random);
              rootCause = random.nextDouble() < 0.8 ? 'water_ingress' : 'connector';
            } else {
              moisture = random.nextDouble() < 0.9 ? 'none' : null;
              rootCause = dryCause ?? pickWeighted(DRY_CAUSES, DRY_CAUSE_WEIGHTS, random);
            }
          }
          draftFailures.push({
            vehicleId: id,
            moduleId: mi + 1,
            moduleCode: spec.code,
            reportedAt: '',
            moisture,
            rootCause,
            diagnosed,
            position: pick(spec.positions, random),
            plantedLabel: label,
            day: inServiceDay + Math.floor(ageDays),
            minute: 7 * 60 + Math.floor(random.nextDouble() * 11 * 60),
          });
        }
      };
      addFailures(baseMean, spec.moistureShare, null, null);
      for (const p of plantedParsed) {
        if (p.moduleIndex !== mi || month < p.from || month > p.to) continue;
        if (p.spec.band && p.spec.band !== score.band) continue;
        const extra = spec.failuresPerVehicleYear * rateScale * bandMult[score.band] * exposureFactor * (p.spec.rateMultiplier - 1);
        if (extra > 0) addFailures(extra, p.spec.moistureShare, p.spec.label, p.spec.dryRootCause ?? 'mechanical');
      }
    });
  }
  draftFailures.sort((a, b) => a.day - b.day || a.minute - b.minute || a.vehicleId - b.vehicleId || a.moduleId - b.moduleId);
  const failures: GeneratedFailure[] = draftFailures.map((f, index) => {
    const { day, minute, ...rest } = f;
    const hh = String(Math.floor(minute / 60)).padStart(2, '0');
    const mm = String(minute % 60).padStart(2, '0');
    return { ...rest, id: index + 1, reportedAt: `${formatDayNumber(day)}T${hh}:${mm}:00Z` };
  });
  return { asOf, depots, modules, vehicles, failures, planted };
}
