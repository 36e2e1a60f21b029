/**
 * The seeded generator of the demo scenario: plain data in (demo-data.ts, a seed and a "today"), plain rows out,
 * with explicit ids so that the rows can be inserted as they are. No I/O and no clock: the same seed and today
 * always give the same rows (password hashes are made later, in demo.ts). Edit when the scenario's shape
 * changes; edit demo-data.ts to change its numbers or wording.
 */
import type * as schema from '../src/db/schema';
import { computeRepeats } from '../src/lib/defects/repeat';
import { vehicleSearchKey } from '../src/lib/vehicles/search-key';
import {
  ACTIONS,
  CAUSE_MIX,
  DEMO_DEPOTS,
  DEMO_MODULES,
  DEMO_PASSWORD,
  DEMO_SIGN_INS,
  DEMO_STAFF,
  DEMO_VEHICLE_MODELS,
  DTCS,
  EXTRA_PARTS,
  LABOUR_MINUTES,
  LABOUR_RATE_MINOR_PER_HOUR,
  MIRROR_BATCH_SYMPTOMS,
  PLANTED,
  SYMPTOMS,
  WATER_DTCS,
  WATER_SYMPTOMS,
  type DemoDepot,
  type DemoModule,
  type DemoVehicleModel,
  type Parking,
  type Position,
  type Role,
  type RootCause,
} from './demo-data';

type DepotRow = typeof schema.depots.$inferInsert;
type ModuleRow = typeof schema.modules.$inferInsert;
type UserRow = typeof schema.users.$inferInsert;
type UserDepotRow = typeof schema.userDepots.$inferInsert;
type VehicleRow = typeof schema.vehicles.$inferInsert;
type DefectRow = typeof schema.defects.$inferInsert;
type DefectCodeRow = typeof schema.defectCodes.$inferInsert;
type DefectPartRow = typeof schema.defectParts.$inferInsert;
type AuditRow = typeof schema.auditLog.$inferInsert;
type TransitionRow = typeof schema.defectTransitions.$inferInsert;
type Moisture = (typeof schema.MOISTURE)[number];
type Status = (typeof schema.DEFECT_STATUSES)[number];

/** Default seed of the demo (picked so that the patterns engine shows the two planted stories and no chance finding). */
export const DEFAULT_SEED = 40;
/** Default "today" of the demo: the last day with data. */
export const DEFAULT_TODAY = '2026-11-30';
/** Number of vehicles in the demo fleet. */
export const DEMO_VEHICLE_COUNT = 600;

const DAY_MS = 86_400_000;
const MINUTE_MS = 60_000;

// ---------------------------------------------------------------------------------------------------------------
// Random numbers

/** A small seeded PRNG (mulberry32) with the helpers the generator needs. */
export interface Rng {
  /** Uniform in [0, 1). */
  next(): number;
  /** Integer in [lo, hi], both inclusive. */
  int(lo: number, hi: number): number;
  /** Uniform real in [lo, hi). */
  between(lo: number, hi: number): number;
  chance(p: number): boolean;
  pick<T>(items: readonly T[]): T;
  /** One key of a weight map (weights need not sum to 1). */
  weighted<K extends string>(weights: Partial<Record<K, number>>): K;
  /** One item of [item, weight] pairs. */
  weightedPairs<T>(pairs: ReadonlyArray<readonly [T, number]>): T;
  /** Exponential waiting time for a rate per unit. */
  exponential(rate: number): number;
}

/** Create the generator's PRNG from a 32-bit seed. */
export function createRng(seed: number): Rng {
  let state = seed >>> 0;
  const next = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const weightedPairs = <T>(pairs: ReadonlyArray<readonly [T, number]>): T => {
    const total = pairs.reduce((s, [, w]) => s + w, 0);
    let r = next() * total;
    for (const [item, w] of pairs) {
      r -= w;
      if (r < 0) return item;
    }
    const last = pairs[pairs.length - 1];
    if (!last) throw new Error('weightedPairs: empty list');
    return last[0];
  };
  return {
    next,
    int: (lo, hi) => lo + Math.floor(next() * (hi - lo + 1)),
    between: (lo, hi) => lo + next() * (hi - lo),
    chance: (p) => next() < p,
    pick: <T>(items: readonly T[]): T => {
      const item = items[Math.floor(next() * items.length)];
      if (item === undefined) throw new Error('pick: empty list');
      return item;
    },
    weighted: <K extends string>(weights: Partial<Record<K, number>>): K =>
      weightedPairs(Object.entries(weights).filter(([, w]) => typeof w === 'number' && w > 0) as Array<[K, number]>),
    weightedPairs,
    exponential: (rate) => -Math.log(1 - next()) / rate,
  };
}

// ---------------------------------------------------------------------------------------------------------------
// VINs

const VIN_VALUES: Record<string, number> = {
  A: 1, B: 2, C: 3, D: 4, E: 5, F: 6, G: 7, H: 8, J: 1, K: 2, L: 3, M: 4, N: 5, P: 7, R: 9,
  S: 2, T: 3, U: 4, V: 5, W: 6, X: 7, Y: 8, Z: 9,
};
const VIN_WEIGHTS = [8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2];
/** Model-year codes (VIN position 10) for 2010 .. 2039. */
export const MODEL_YEAR_CODES = 'ABCDEFGHJKLMNPRSTVWXY123456789';

/** The check digit (position 9) of a 17-character VIN, the 49 CFR Part 565 rule; the 9th character is ignored. */
export function vinCheckDigit(vin: string): string {
  if (vin.length !== 17) throw new Error(`VIN must have 17 characters: ${vin}`);
  let sum = 0;
  for (let i = 0; i < 17; i++) {
    const ch = vin.charAt(i);
    const value = /[0-9]/.test(ch) ? Number(ch) : VIN_VALUES[ch];
    if (value === undefined) throw new Error(`VIN has an invalid character ${ch}: ${vin}`);
    sum += value * (VIN_WEIGHTS[i] ?? 0);
  }
  const r = sum % 11;
  return r === 10 ? 'X' : String(r);
}

/** The model-year code for a year 2010-2039. */
export function modelYearCode(year: number): string {
  const code = MODEL_YEAR_CODES.charAt(year - 2010);
  if (!code) throw new Error(`model year out of the 2010-2039 cycle: ${year}`);
  return code;
}

function buildVin(model: DemoVehicleModel, body: string, restraint: string, drive: string, year: number, serial: number): string {
  const draft = `${model.wmi}${model.vdsModel}${body}${restraint}${drive}0${modelYearCode(year)}${model.plant}${String(serial).padStart(6, '0')}`;
  return draft.slice(0, 8) + vinCheckDigit(draft) + draft.slice(9);
}

// ---------------------------------------------------------------------------------------------------------------
// Dates

function pad(n: number, width = 2): string {
  return String(n).padStart(width, '0');
}
function parseDay(text: string): number {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
  if (!m) throw new Error(`today must be YYYY-MM-DD, got ${text}`);
  const ms = Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]));
  if (Number.isNaN(ms) || new Date(ms).toISOString().slice(0, 10) !== text) throw new Error(`not a calendar date: ${text}`);
  return ms;
}
function isoDay(ms: number): string {
  return new Date(ms).toISOString().slice(0, 10);
}
/** Months since year 0 (January = 0). */
function monthIndexOf(ms: number): number {
  const d = new Date(ms);
  return d.getUTCFullYear() * 12 + d.getUTCMonth();
}
/** `YYYY-MM` of a month index. */
export function monthText(index: number): string {
  return `${Math.floor(index / 12)}-${pad((index % 12) + 1)}`;
}
function isWetSeason(ms: number): boolean {
  const m = new Date(ms).getUTCMonth();
  return m >= 9 || m <= 2; // October .. March
}

// ---------------------------------------------------------------------------------------------------------------
// Output

/** A person to insert; the password is hashed by the caller. */
export type DemoUserRow = Omit<UserRow, 'passwordHash'> & { id: number; password: string };

/** The planted stories as they came out for this today (month texts inclusive). */
export interface PlantedSummary {
  buildFrom: string;
  buildTo: string;
  water: { moduleCode: string; buildFrom: string; buildTo: string; depots: string[]; parking: Parking };
  mirror: { moduleCode: string; buildFrom: string; buildTo: string };
  /** Module code -> make/model pairs it is fitted to (the schema holds no fitment, so the seed says it here). */
  fitment: Record<string, string[]>;
}

/** Every row of the demo scenario, ids assigned. */
export interface DemoDataset {
  today: string;
  seed: number;
  depots: Array<DepotRow & { id: number }>;
  modules: Array<ModuleRow & { id: number }>;
  users: DemoUserRow[];
  userDepots: UserDepotRow[];
  vehicles: Array<VehicleRow & { id: number }>;
  defects: Array<DefectRow & { id: number }>;
  defectCodes: DefectCodeRow[];
  defectParts: DefectPartRow[];
  /** The status changes behind each defect's status (its timeline), from the same milestones. */
  defectTransitions: TransitionRow[];
  auditLog: AuditRow[];
  /** Settings rows (the labour rate that the seeded costs use). */
  settings: Array<{ key: string; value: string }>;
  /** The current off-road period of each vehicle that is off road: since when, why and who took it off. */
  offRoadPeriods: Array<{ vehicleId: number; fromAt: number; reason: string; startedById: number }>;
  planted: PlantedSummary;
}

interface GenVehicle {
  id: number;
  model: DemoVehicleModel;
  depot: DemoDepot;
  depotId: number;
  buildMs: number;
  buildIndex: number;
  inServiceMs: number;
  retiredMs: number | null;
  parking: Parking;
  washesPerMonth: number;
  annualKm: number;
  startKm: number;
  vin: string;
  fleetNumber: string;
  registration: string;
}

type EventKind = 'ordinary' | 'water' | 'mirror_batch';
interface GenEvent {
  vehicle: GenVehicle;
  module: DemoModule;
  moduleId: number;
  atMs: number;
  position: Position;
  kind: EventKind;
}

const WATER_NOTES: Partial<Record<Moisture, string>> = {
  traces: 'Water marks inside the door; encoder board damp',
  corrosion: 'Water found inside the door; encoder board and connector corroded',
  standing_water: 'Standing water in the door bottom; drain holes blocked',
};

const POSITION_WEIGHT: Record<Position, number> = { FL: 4, FR: 3, RL: 1.5, RR: 1.5, SL: 2, SR: 2, TG: 1.5 };

/** Parse "B1A21-29 B1A22" into defect_codes parts. */
export function splitDtcs(dtcs: string): Array<{ code: string; failureType: string | null }> {
  return dtcs
    .split(/\s+/)
    .filter(Boolean)
    .map((token) => {
      const [code = '', failureType] = token.split('-');
      return { code, failureType: failureType ?? null };
    });
}

/** Generate the whole demo scenario. */
export function generateDemoData(opts: { seed?: number; today?: string } = {}): DemoDataset {
  const seed = opts.seed ?? DEFAULT_SEED;
  const today = opts.today ?? DEFAULT_TODAY;
  const rng = createRng(seed);
  const todayMs = parseDay(today);
  /** Work stops at 18:00 UTC on today; nothing happens after that. */
  const nowMs = todayMs + 18 * 60 * MINUTE_MS;
  const todayIndex = monthIndexOf(todayMs);

  // Planted windows (month indices, inclusive).
  const buildFromIndex = todayIndex - PLANTED.buildMonthsBack.from;
  const buildToIndex = todayIndex - PLANTED.buildMonthsBack.to;
  const latest = todayIndex - PLANTED.water.minMonthsBack;
  const waterFrom = latest - ((latest % 12) - 9 + 12) % 12;
  const waterTo = waterFrom + PLANTED.water.months - 1;
  const mirrorFrom = waterTo + PLANTED.mirror.monthsAfterWater;
  const mirrorTo = mirrorFrom + PLANTED.mirror.months - 1;
  if (waterFrom < buildFromIndex || mirrorTo > buildToIndex) throw new Error('planted build ranges fall outside the fleet');
  const inWater = (v: GenVehicle): boolean =>
    v.buildIndex >= waterFrom && v.buildIndex <= waterTo && PLANTED.water.depots.some((c) => c === v.depot.code);
  const inMirror = (v: GenVehicle): boolean => v.buildIndex >= mirrorFrom && v.buildIndex <= mirrorTo;

  // Depots, modules.
  const depots = DEMO_DEPOTS.map((d, i) => ({
    id: i + 1,
    code: d.code,
    name: d.name,
    region: d.region,
    coastal: d.coastal,
    rainDaysPerYear: d.rainDaysPerYear,
    meanRhPct: d.meanRhPct,
    washBay: d.washBay,
    inspectionSlotsPerDay: d.inspectionSlotsPerDay,
    timezone: d.timezone,
    createdAt: Date.UTC(Math.floor(buildFromIndex / 12), buildFromIndex % 12, 1),
    updatedAt: Date.UTC(Math.floor(buildFromIndex / 12), buildFromIndex % 12, 1),
  }));
  const depotIdByCode = new Map(depots.map((d) => [d.code, d.id]));
  const modules = DEMO_MODULES.map((m, i) => ({
    id: i + 1,
    code: m.code,
    name: m.name,
    function: m.function,
    partNumber: m.partNumber,
    supplier: m.supplier,
    createdAt: depots[0]?.createdAt,
    updatedAt: depots[0]?.createdAt,
  }));
  const moduleIdByCode = new Map(modules.map((m) => [m.code, m.id]));

  // People.
  const createdAt = depots[0]?.createdAt ?? todayMs;
  const people = [...DEMO_SIGN_INS.map((p) => ({ ...p })), ...DEMO_STAFF.map((p) => ({ ...p, password: DEMO_PASSWORD }))];
  const users: DemoUserRow[] = people.map((p, i) => ({
    id: i + 1,
    email: p.email,
    name: p.name,
    role: p.role,
    password: p.password,
    allDepots: p.allDepots,
    active: true,
    createdAt,
    updatedAt: createdAt,
  }));
  const userDepots: UserDepotRow[] = [];
  people.forEach((p, i) => {
    if (p.allDepots) return;
    for (const code of p.depots) {
      const depotId = depotIdByCode.get(code);
      if (!depotId) throw new Error(`person ${p.email}: unknown depot ${code}`);
      userDepots.push({ userId: i + 1, depotId });
    }
  });
  const staffAt = (code: string, role: Role): number[] =>
    people.flatMap((p, i) => (p.role === role && p.depots.includes(code) ? [i + 1] : []));
  const crew = new Map(
    DEMO_DEPOTS.map((d) => {
      const technicians = staffAt(d.code, 'technician');
      const supervisors = staffAt(d.code, 'supervisor');
      if (technicians.length === 0) throw new Error(`depot ${d.code} has no technician`);
      return [d.code, { technicians, supervisors: supervisors.length ? supervisors : technicians }];
    }),
  );

  // Vehicles.
  const monthWeights: Array<readonly [number, number]> = [];
  for (let m = buildFromIndex; m <= buildToIndex; m++) {
    monthWeights.push([m, m >= waterFrom && m <= waterTo ? PLANTED.water.buildWeight : 1]);
  }
  const modelPairs = DEMO_VEHICLE_MODELS.map((m) => [m, m.share] as const);
  const depotPairs = DEMO_DEPOTS.map((d) => [d, d.fleetShare] as const);
  const drafts = Array.from({ length: DEMO_VEHICLE_COUNT }, (_, order) => {
    const model = rng.weightedPairs(modelPairs);
    const depot = rng.weightedPairs(depotPairs);
    const buildIndex = rng.weightedPairs(monthWeights);
    const buildMs = Date.UTC(Math.floor(buildIndex / 12), buildIndex % 12, rng.int(1, 28));
    const inServiceMs = buildMs + rng.int(30, 90) * DAY_MS;
    const parking = rng.weighted<Parking>(depot.parking);
    const washesPerMonth = depot.washBay
      ? Math.max(2, Math.round(rng.between(5, 12) * model.washFactor))
      : rng.int(1, 3);
    let retiredMs: number | null = null;
    if (todayMs - inServiceMs > 2 * 365 * DAY_MS && rng.chance(PLANTED.retiredShare / 0.7)) {
      retiredMs = Math.floor(rng.between(inServiceMs + 365 * DAY_MS, todayMs - 30 * DAY_MS) / DAY_MS) * DAY_MS;
    }
    const annualKm = rng.int(model.annualKmRange[0], model.annualKmRange[1]);
    const startKm = rng.int(20, 400);
    const vinParts = { body: rng.pick(model.vdsBody), restraint: rng.pick(model.vdsRestraint), drive: rng.pick(model.vdsDrive) };
    return { order, model, depot, buildIndex, buildMs, inServiceMs, parking, washesPerMonth, retiredMs, annualKm, startKm, vinParts };
  }).sort((a, b) => a.buildMs - b.buildMs || a.order - b.order);

  const serials = new Map<string, number>();
  const registrations = new Set<string>();
  const gen: GenVehicle[] = drafts.map((d, i) => {
    const serial = serials.get(d.model.wmi) ?? d.model.serialStart;
    serials.set(d.model.wmi, serial + 1);
    const year = new Date(d.buildMs).getUTCFullYear();
    let registration = '';
    do {
      registration = `${d.depot.code}-${rng.int(1000, 9999)}-${rng.pick('ABCDEFGHJKLMNPRSTUVWXYZ'.split(''))}`;
    } while (registrations.has(registration));
    registrations.add(registration);
    return {
      id: i + 1,
      model: d.model,
      depot: d.depot,
      depotId: depotIdByCode.get(d.depot.code) ?? 0,
      buildMs: d.buildMs,
      buildIndex: d.buildIndex,
      inServiceMs: d.inServiceMs,
      retiredMs: d.retiredMs,
      parking: d.parking,
      washesPerMonth: d.washesPerMonth,
      annualKm: d.annualKm,
      startKm: d.startKm,
      vin: buildVin(d.model, d.vinParts.body, d.vinParts.restraint, d.vinParts.drive, year, serial),
      fleetNumber: `LV${1001 + i}`,
      registration,
    };
  });

  // Failure events.
  const events: GenEvent[] = [];
  const pickPosition = (positions: readonly Position[]): Position =>
    rng.weightedPairs(positions.map((p) => [p, POSITION_WEIGHT[p]] as const));
  const addRepeat = (from: GenEvent, chance: number, endMs: number, samePositionShare: number, fitted: readonly Position[]): GenEvent | null => {
    if (!rng.chance(chance)) return null;
    const atMs = from.atMs + rng.between(7, 85) * DAY_MS;
    if (atMs > endMs) return null;
    const position = rng.chance(samePositionShare) ? from.position : pickPosition(fitted);
    const ev: GenEvent = { ...from, atMs, position };
    events.push(ev);
    return ev;
  };
  const meanKeep = (6 + 6 * PLANTED.water.summerKeep) / 12;
  for (const v of gen) {
    const endMs = Math.min(v.retiredMs ?? nowMs, nowMs);
    for (const module of DEMO_MODULES) {
      const fitted = v.model.fitted[module.code];
      if (!fitted || fitted.length === 0) continue;
      const moduleId = moduleIdByCode.get(module.code) ?? 0;
      const run = (ratePerYear: number, kind: EventKind, keep: (ms: number) => boolean): GenEvent[] => {
        const out: GenEvent[] = [];
        if (ratePerYear <= 0) return out;
        let t = v.inServiceMs + DAY_MS;
        for (;;) {
          t += rng.exponential(ratePerYear) * 365.25 * DAY_MS;
          if (t > endMs) break;
          if (!keep(t)) continue;
          const ev: GenEvent = { vehicle: v, module, moduleId, atMs: t, position: pickPosition(fitted), kind };
          events.push(ev);
          out.push(ev);
        }
        return out;
      };
      for (const ev of run(module.baseRatePerYear, 'ordinary', () => true)) {
        addRepeat(ev, PLANTED.baseRepeatChance, endMs, 0.9, fitted);
      }
      if (module.code === PLANTED.water.moduleCode && inWater(v)) {
        const extra = module.baseRatePerYear * (PLANTED.water.extraRateMultiple[v.parking] ?? 0);
        const kept = run(extra / meanKeep, 'water', (ms) => isWetSeason(ms) || rng.chance(PLANTED.water.summerKeep));
        for (const ev of kept) {
          const again = addRepeat(ev, PLANTED.water.repeatChance, endMs, 0.85, fitted);
          if (again) addRepeat(again, PLANTED.water.secondRepeatChance, endMs, 0.85, fitted);
        }
      }
      if (module.code === PLANTED.mirror.moduleCode && inMirror(v)) {
        const extra = module.baseRatePerYear * PLANTED.mirror.extraRateMultiple;
        for (const ev of run(extra, 'mirror_batch', () => true)) addRepeat(ev, 0.05, endMs, 0.5, fitted);
      }
    }
  }

  // Working-hours timestamps, unique natural keys, chronological ids.
  for (const ev of events) {
    const day = Math.floor(ev.atMs / DAY_MS) * DAY_MS;
    ev.atMs = day + (7 * 60 + rng.int(0, 10 * 60 - 1)) * MINUTE_MS;
  }
  events.sort((a, b) => a.atMs - b.atMs || a.vehicle.id - b.vehicle.id || a.moduleId - b.moduleId);
  const naturalKeys = new Set<string>();
  for (const ev of events) {
    while (naturalKeys.has(`${ev.vehicle.id}:${ev.atMs}:${ev.position}:${ev.moduleId}`)) ev.atMs += MINUTE_MS;
    naturalKeys.add(`${ev.vehicle.id}:${ev.atMs}:${ev.position}:${ev.moduleId}`);
  }
  events.sort((a, b) => a.atMs - b.atMs || a.vehicle.id - b.vehicle.id || a.moduleId - b.moduleId);

  const defects: DemoDataset['defects'] = [];
  const defectCodes: DefectCodeRow[] = [];
  const defectParts: DefectPartRow[] = [];
  const auditLog: AuditRow[] = [];
  const defectTransitions: TransitionRow[] = [];
  const refCounters = new Map<number, number>();
  const offRoad = new Map<number, number>();
  const offRoadWhy = new Map<number, { reason: string; by: number }>();

  events.forEach((ev, i) => {
    const id = i + 1;
    const v = ev.vehicle;
    const fn = ev.module.function;
    const year = new Date(ev.atMs).getUTCFullYear();
    const seq = (refCounters.get(year) ?? 0) + 1;
    refCounters.set(year, seq);
    const ref = `DF-${String(year).slice(2)}-${pad(seq, 5)}`;
    const team = crew.get(v.depot.code) ?? { technicians: [1], supervisors: [1] };
    const technician = rng.pick(team.technicians);

    // Cause and evidence (decided up front; shown only once the work has reached that step).
    const wetDepot = v.depot.coastal || v.depot.rainDaysPerYear >= 140;
    let cause: RootCause;
    if (ev.kind === 'water') cause = rng.chance(0.88) ? 'water_ingress' : 'connector';
    else if (ev.kind === 'mirror_batch') cause = 'mechanical';
    else {
      const waterShare = !ev.module.inDoor || !ACTIONS[fn].water_ingress ? 0 : v.depot.coastal ? 0.05 : wetDepot ? 0.02 : 0.005;
      cause = rng.chance(waterShare) ? 'water_ingress' : rng.weighted<RootCause>(CAUSE_MIX[fn]);
    }
    let moisture: Moisture;
    if (ev.kind === 'water') moisture = cause === 'connector' ? 'corrosion' : rng.weighted<Moisture>({ corrosion: 55, traces: 35, standing_water: 10 });
    else if (cause === 'water_ingress') moisture = rng.weighted<Moisture>({ traces: 50, corrosion: 40, standing_water: 10 });
    else if (ev.kind === 'mirror_batch') moisture = 'none';
    else if (ev.module.inDoor) {
      moisture = v.depot.coastal
        ? rng.weighted<Moisture>({ none: 87, traces: 10, corrosion: 3 })
        : rng.weighted<Moisture>({ none: 95, traces: 4, corrosion: 1 });
    } else moisture = rng.chance(0.03) ? 'traces' : 'none';

    let dtcs: string | null;
    if (ev.kind === 'water' && cause === 'water_ingress') dtcs = rng.weightedPairs(WATER_DTCS) || null;
    else {
      const options = DTCS[fn][cause];
      dtcs = options && rng.chance(0.85) ? rng.pick(options) : null;
    }
    const symptom =
      ev.kind === 'water' ? rng.pick(WATER_SYMPTOMS) : ev.kind === 'mirror_batch' ? rng.pick(MIRROR_BATCH_SYMPTOMS) : rng.pick(SYMPTOMS[fn]);

    const water = cause === 'water_ingress';
    const conditions = (() => {
      if (!ev.module.inDoor) return null;
      if (water || ev.kind === 'water') {
        return {
          membrane: rng.weighted({ damaged: 45, missing: 20, ok: 35 }),
          seal: rng.weighted({ damaged: 30, ok: 70 }),
          drain: rng.weighted({ blocked: 55, ok: 45 }),
          connector: rng.weighted({ corroded: 65, ok: 35 }),
        };
      }
      if (!rng.chance(0.6)) return null;
      return {
        membrane: rng.weighted({ ok: 95, damaged: 5 }),
        seal: rng.weighted({ ok: 97, damaged: 3 }),
        drain: rng.weighted(v.depot.coastal ? { ok: 88, blocked: 12 } : { ok: 93, blocked: 7 }),
        connector: cause === 'connector' ? rng.weighted({ corroded: 40, damaged: 60 }) : rng.weighted({ ok: 95, corroded: 5 }),
      };
    })();

    const actionTemplate = ACTIONS[fn][cause] ?? ACTIONS[fn].unknown ?? 'Checked and repaired';
    const replacesModule = actionTemplate.includes('{part}');
    const action = actionTemplate.replace('{part}', ev.module.code);
    const parts: Array<{ partNumber: string; description: string; unitCostMinor: number }> = [];
    if (replacesModule) parts.push({ partNumber: ev.module.partNumber, description: ev.module.name, unitCostMinor: DEMO_MODULES.find((m) => m.code === ev.module.code)?.unitCostMinor ?? 0 });
    if (water && ev.module.inDoor) parts.push({ ...EXTRA_PARTS.membrane });
    if (water && conditions?.seal === 'damaged') parts.push({ ...EXTRA_PARTS.doorSeal });
    if (cause === 'connector') parts.push({ ...EXTRA_PARTS.connectorKit });
    const [lo, hi] = LABOUR_MINUTES[fn];
    let labourMinutes = rng.int(lo, hi);
    if (water) labourMinutes += rng.int(20, 40);
    if (!replacesModule && !water) labourMinutes = Math.max(15, Math.round(labourMinutes * 0.5));
    const costMinor = parts.reduce((s, p) => s + p.unitCostMinor, 0) + Math.round((labourMinutes / 60) * LABOUR_RATE_MINOR_PER_HOUR);

    // Status: history is closed (or, rarely, cancelled); the last weeks hold a mix of open work, more of it the
    // newer the report. The timeline of the steps reached is then fitted before now.
    const partsNeeded = parts.length > 0;
    const ageDays = (nowMs - ev.atMs) / DAY_MS;
    let status: Status;
    if (ageDays > PLANTED.openWindowDays) status = ev.kind === 'ordinary' && rng.chance(0.015) ? 'cancelled' : 'closed';
    else if (ageDays < 2) status = rng.weighted<Status>({ reported: 65, diagnosing: 30, awaiting_parts: 5 });
    else if (ageDays < 7) status = rng.weighted<Status>({ reported: 25, diagnosing: 20, awaiting_parts: 30, repaired: 10, verified: 10, closed: 5 });
    else if (ageDays < 21) status = rng.weighted<Status>({ reported: 8, diagnosing: 10, awaiting_parts: 20, repaired: 12, verified: 15, closed: 35 });
    else status = rng.weighted<Status>({ awaiting_parts: 8, repaired: 5, verified: 10, closed: 77 });
    if (status === 'awaiting_parts' && !partsNeeded) status = 'diagnosing';

    const lags = [
      rng.chance(0.8) ? rng.between(0.05, 1.5) : rng.between(1.5, 5), // to diagnosis start
      rng.between(0.02, 0.3), // diagnosis
      partsNeeded ? (rng.chance(0.65) ? rng.between(0.5, 4) : rng.between(4, 12)) : 0, // parts
      rng.between(0.05, 1), // repair
      rng.chance(0.6) ? rng.between(0.01, 0.05) : rng.between(0.5, 3), // to verification (road test)
      rng.chance(0.7) ? rng.between(0.05, 1.5) : rng.between(1.5, 6), // to closing (paperwork)
    ];
    const lastReached: Record<Status, number> = { reported: -1, cancelled: 0, diagnosing: 0, awaiting_parts: 1, repaired: 3, verified: 4, closed: 5 };
    const upTo = lastReached[status];
    const spent = lags.slice(0, upTo + 1).reduce((sum, x) => sum + x, 0);
    const room = ageDays * 0.9;
    const scale = spent > room ? room / spent : 1;
    const milestones: number[] = [];
    let t = ev.atMs;
    lags.forEach((lag, k) => {
      t += (k <= upTo ? lag * scale : lag) * DAY_MS;
      milestones.push(Math.round(t));
    });
    const [diagStartAt = 0, , , repairedAt = 0, verifiedAt = 0, closedAt = 0] = milestones;

    const order: Status[] = ['reported', 'diagnosing', 'awaiting_parts', 'repaired', 'verified', 'closed'];
    const reached = (s: Status): boolean => status !== 'cancelled' && order.indexOf(status) >= order.indexOf(s);
    const diagnosed = reached('awaiting_parts');
    const repaired = reached('repaired');
    const verified = reached('verified');
    // The app's release-verification rule (src/lib/defects/transitions.ts): window lifters, door modules, door harnesses.
    const needsVerification = fn === 'window_lifter' || fn === 'door_control' || fn === 'harness';
    const reporterRoll = rng.next();
    const reportedById = reporterRoll < 0.1 ? null : reporterRoll < 0.55 ? rng.pick(team.supervisors) : technician;
    const days = (ev.atMs - v.inServiceMs) / DAY_MS;
    const odometerKm = Math.round(v.startKm + (days * v.annualKm) / 365.25 * rng.between(0.97, 1.03));

    let notes: string | null = null;
    if (status === 'cancelled') notes = 'Duplicate report; cancelled';
    else if (status === 'awaiting_parts') notes = `Parts ordered: ${parts.map((p) => p.partNumber).join(', ')}`;
    else if (diagnosed && water) notes = WATER_NOTES[moisture] ?? null;

    const lastTouch = status === 'closed' ? closedAt : status === 'verified' ? verifiedAt : status === 'repaired' ? repairedAt : status === 'reported' ? ev.atMs : Math.min(nowMs, diagStartAt);

    defects.push({
      id,
      ref,
      vehicleId: v.id,
      depotId: v.depotId,
      moduleId: ev.moduleId,
      position: ev.position,
      status,
      reportedAt: ev.atMs,
      reportedAtText: null,
      symptom,
      dtcs: status === 'reported' && !rng.chance(0.5) ? null : dtcs,
      moisture: diagnosed || (status === 'diagnosing' && rng.chance(0.5)) ? moisture : null,
      rootCause: diagnosed ? cause : null,
      action: repaired ? action : null,
      odometerKm,
      membraneCondition: diagnosed ? (conditions?.membrane ?? null) : null,
      sealCondition: diagnosed ? (conditions?.seal ?? null) : null,
      drainCondition: diagnosed ? (conditions?.drain ?? null) : null,
      connectorCondition: diagnosed ? (conditions?.connector ?? null) : null,
      labourMinutes: repaired ? labourMinutes : null,
      costMinor: repaired ? costMinor : null,
      notes,
      reporterName: reportedById === null ? 'Driver' : null,
      reportedById,
      assignedToId: status === 'reported' || status === 'cancelled' ? null : technician,
      verifiedReinit: verified && needsVerification ? true : null,
      verifiedReversal: verified && needsVerification ? true : null,
      verifiedById: verified && needsVerification ? technician : null,
      verifiedAt: verified && needsVerification ? verifiedAt : null,
      verificationNote: verified && needsVerification ? 'Test rod at the top of travel: window reversed' : null,
      repeatOfId: null,
      closedAt: status === 'closed' ? closedAt : null,
      closedAtText: null,
      createdAt: ev.atMs,
      updatedAt: lastTouch,
    });
    const storedDtcs = defects[defects.length - 1]?.dtcs;
    if (storedDtcs) splitDtcs(storedDtcs).forEach((c, k) => defectCodes.push({ defectId: id, seq: k + 1, code: c.code, failureType: c.failureType }));
    if (repaired) for (const p of parts) defectParts.push({ defectId: id, partNumber: p.partNumber, description: p.description, quantity: 1, unitCostMinor: p.unitCostMinor });
    auditLog.push({ at: ev.atMs, userId: null, actor: 'seed', entity: 'defect', entityId: String(id), action: 'create', field: null, oldValue: null, newValue: ref });

    // The timeline: the steps that led to this status, at the milestone times above (no random draws here).
    const step = (fromStatus: Status, toStatus: Status, at: number, userId: number, reason: string | null = null) =>
      defectTransitions.push({ defectId: id, fromStatus, toStatus, at, userId, actor: null, reason });
    if (status === 'cancelled') step('reported', 'cancelled', diagStartAt, team.supervisors[0] ?? technician, 'Duplicate report');
    else if (reached('diagnosing')) {
      step('reported', 'diagnosing', diagStartAt, technician);
      const viaParts = partsNeeded && reached('awaiting_parts');
      if (viaParts) step('diagnosing', 'awaiting_parts', milestones[1] ?? diagStartAt, technician);
      if (repaired) step(viaParts ? 'awaiting_parts' : 'diagnosing', 'repaired', repairedAt, technician);
      if (verified) step('repaired', 'verified', verifiedAt, technician);
      if (status === 'closed') step('verified', 'closed', closedAt, technician);
    }

    const open = status === 'reported' || status === 'diagnosing' || status === 'awaiting_parts';
    const keepsOffRoad = fn === 'window_lifter' || fn === 'door_control' || fn === 'lock_actuator';
    if (open && keepsOffRoad && v.retiredMs === null && rng.chance(0.5)) {
      const since = status === 'reported' ? ev.atMs : Math.min(nowMs, diagStartAt);
      if (since < (offRoad.get(v.id) ?? Infinity)) {
        // The earliest open defect that keeps it off road is the reason a supervisor wrote down (no random draws here).
        offRoadWhy.set(v.id, { reason: `${ev.position} door: ${symptom}`, by: team.supervisors[0] ?? technician });
      }
      offRoad.set(v.id, Math.min(offRoad.get(v.id) ?? since, since));
    }
  });

  // Repeat links by the app's own rule (same vehicle, position and module function, within the window after
  // the earlier defect was closed), so that the seeded links match what the app would compute.
  const functionById = new Map(modules.map((m) => [m.id, m.function]));
  const links = computeRepeats(
    defects.map((f) => ({
      id: f.id,
      vehicleId: f.vehicleId,
      position: f.position,
      moduleFunction: functionById.get(f.moduleId) ?? 'other',
      reportedAt: f.reportedAt,
      closedAt: f.closedAt ?? null,
      cancelled: f.status === 'cancelled',
    })),
    PLANTED.repeatWindowDays,
  );
  for (const f of defects) f.repeatOfId = links.get(f.id) ?? null;

  const vehicles: DemoDataset['vehicles'] = gen.map((v) => {
    const buildDate = isoDay(v.buildMs);
    return {
      id: v.id,
      vin: v.vin,
      fleetNumber: v.fleetNumber,
      registration: v.registration,
      make: v.model.make,
      model: v.model.model,
      body: v.model.body,
      buildDate,
      buildMonth: buildDate.slice(0, 7),
      inServiceDate: isoDay(v.inServiceMs),
      retiredDate: v.retiredMs === null ? null : isoDay(v.retiredMs),
      depotId: v.depotId,
      parking: v.parking,
      washesPerMonth: v.washesPerMonth,
      modelYear: new Date(v.buildMs).getUTCFullYear(),
      offRoadSinceAt: offRoad.get(v.id) ?? null,
      searchKey: vehicleSearchKey(v.registration, v.fleetNumber),
      createdAt: v.inServiceMs,
      updatedAt: v.retiredMs ?? v.inServiceMs,
    };
  });

  const fitment: Record<string, string[]> = {};
  for (const m of DEMO_MODULES) {
    fitment[m.code] = DEMO_VEHICLE_MODELS.filter((vm) => vm.fitted[m.code]).map((vm) => `${vm.make} ${vm.model}`);
  }

  return {
    today,
    seed,
    depots,
    modules,
    users,
    userDepots,
    vehicles,
    defects,
    defectCodes,
    defectParts,
    defectTransitions,
    auditLog,
    settings: [{ key: 'labour_rate_minor_per_hour', value: String(LABOUR_RATE_MINOR_PER_HOUR) }],
    offRoadPeriods: [...offRoad.entries()].map(([vehicleId, fromAt]) => ({
      vehicleId,
      fromAt,
      reason: offRoadWhy.get(vehicleId)?.reason ?? 'Open door defect',
      startedById: offRoadWhy.get(vehicleId)?.by ?? 1,
    })),
    planted: {
      buildFrom: monthText(buildFromIndex),
      buildTo: monthText(buildToIndex),
      water: {
        moduleCode: PLANTED.water.moduleCode,
        buildFrom: monthText(waterFrom),
        buildTo: monthText(waterTo),
        depots: [...PLANTED.water.depots],
        parking: 'outdoor',
      },
      mirror: { moduleCode: PLANTED.mirror.moduleCode, buildFrom: monthText(mirrorFrom), buildTo: monthText(mirrorTo) },
      fitment,
    },
  };
}
