/**
 * The small fixed data of the demo scenario: the operator, its depots, the module catalogue, the vehicle
 * models, the people and the wording used for defects. Everything here is invented. Edit this file to change
 * what the demo looks like; the numbers that make the planted patterns live in PLANTED below, the generator
 * that turns all of this into rows lives in generate.ts.
 */
import type { MODULE_FUNCTIONS, PARKING, POSITIONS, ROLES, ROOT_CAUSES } from '../src/db/schema';

export type Role = (typeof ROLES)[number];
export type ModuleFunction = (typeof MODULE_FUNCTIONS)[number];
export type Parking = (typeof PARKING)[number];
export type Position = (typeof POSITIONS)[number];
export type RootCause = (typeof ROOT_CAUSES)[number];

/** The invented operator the demo is about. */
export const DEMO_COMPANY = {
  name: 'Larkvale Parcel & Care',
  domain: 'larkvale.example',
  currency: 'GBP',
} as const;

/** The one password every demo person signs in with. */
export const DEMO_PASSWORD = 'seepline-demo';

export interface DemoDepot {
  code: string;
  name: string;
  region: string;
  coastal: boolean;
  rainDaysPerYear: number;
  meanRhPct: number;
  washBay: boolean;
  inspectionSlotsPerDay: number;
  timezone: string;
  /** Share of the fleet based here (weights, need not sum to 1). */
  fleetShare: number;
  /** Parking mix of the vehicles based here. */
  parking: Record<Parking, number>;
  /** Climate class, used only by the generator and the README. */
  climate: 'coastal_wet' | 'inland_temperate' | 'inland_dry' | 'mountain_cold';
}

/** Six depots in four climates. */
export const DEMO_DEPOTS: readonly DemoDepot[] = [
  {
    code: 'GHQ',
    name: 'Gullhaven Quay',
    region: 'North Coast',
    coastal: true,
    rainDaysPerYear: 212,
    meanRhPct: 86,
    washBay: true,
    inspectionSlotsPerDay: 3,
    timezone: 'Europe/London',
    fleetShare: 0.21,
    parking: { outdoor: 0.75, mixed: 0.15, indoor: 0.1 },
    climate: 'coastal_wet',
  },
  {
    code: 'SMP',
    name: 'Saltmere Point',
    region: 'West Coast',
    coastal: true,
    rainDaysPerYear: 194,
    meanRhPct: 83,
    washBay: true,
    inspectionSlotsPerDay: 2,
    timezone: 'Europe/London',
    fleetShare: 0.19,
    parking: { outdoor: 0.75, mixed: 0.15, indoor: 0.1 },
    climate: 'coastal_wet',
  },
  {
    code: 'ELD',
    name: 'Elderford',
    region: 'Central Vale',
    coastal: false,
    rainDaysPerYear: 148,
    meanRhPct: 78,
    washBay: true,
    inspectionSlotsPerDay: 2,
    timezone: 'Europe/London',
    fleetShare: 0.18,
    parking: { outdoor: 0.5, mixed: 0.25, indoor: 0.25 },
    climate: 'inland_temperate',
  },
  {
    code: 'FNC',
    name: 'Fennick Cross',
    region: 'Central Vale',
    coastal: false,
    rainDaysPerYear: 131,
    meanRhPct: 76,
    washBay: false,
    inspectionSlotsPerDay: 1,
    timezone: 'Europe/London',
    fleetShare: 0.15,
    parking: { outdoor: 0.5, mixed: 0.25, indoor: 0.25 },
    climate: 'inland_temperate',
  },
  {
    code: 'DMF',
    name: 'Dunmarrow Flats',
    region: 'Eastern Plain',
    coastal: false,
    rainDaysPerYear: 68,
    meanRhPct: 55,
    washBay: false,
    inspectionSlotsPerDay: 1,
    timezone: 'Europe/London',
    fleetShare: 0.13,
    parking: { outdoor: 0.6, mixed: 0.2, indoor: 0.2 },
    climate: 'inland_dry',
  },
  {
    code: 'HCP',
    name: 'Highcairn Pass',
    region: 'Upland',
    coastal: false,
    rainDaysPerYear: 166,
    meanRhPct: 80,
    washBay: false,
    inspectionSlotsPerDay: 2,
    timezone: 'Europe/London',
    fleetShare: 0.14,
    parking: { outdoor: 0.35, mixed: 0.2, indoor: 0.45 },
    climate: 'mountain_cold',
  },
];

export interface DemoModule {
  code: string;
  name: string;
  function: ModuleFunction;
  partNumber: string;
  supplier: string;
  /** Ordinary failures per fitted vehicle-year (all positions together). */
  baseRatePerYear: number;
  /** Price of one replacement unit, minor currency units. */
  unitCostMinor: number;
  /** Where the module sits in a door, so membrane/seal/drain findings apply. */
  inDoor: boolean;
}

/** The module catalogue: ten types from five invented suppliers. */
export const DEMO_MODULES: readonly DemoModule[] = [
  {
    code: 'WLR-2',
    name: 'Window lifter motor with hall encoder, gen 2',
    function: 'window_lifter',
    partNumber: 'CM-WL2-4471',
    supplier: 'Corvane Motion',
    baseRatePerYear: 0.12,
    unitCostMinor: 11850,
    inDoor: true,
  },
  {
    code: 'WLR-3',
    name: 'Window lifter motor with hall encoder, gen 3',
    function: 'window_lifter',
    partNumber: 'CM-WL3-5820',
    supplier: 'Corvane Motion',
    baseRatePerYear: 0.09,
    unitCostMinor: 13400,
    inDoor: true,
  },
  {
    code: 'DLA-1',
    name: 'Door lock actuator, hinged doors',
    function: 'lock_actuator',
    partNumber: 'BL-LA-2210',
    supplier: 'Brightlatch Components',
    baseRatePerYear: 0.1,
    unitCostMinor: 6400,
    inDoor: true,
  },
  {
    code: 'SLA-1',
    name: 'Sliding door latch actuator',
    function: 'lock_actuator',
    partNumber: 'BL-SL-2290',
    supplier: 'Brightlatch Components',
    baseRatePerYear: 0.08,
    unitCostMinor: 8900,
    inDoor: true,
  },
  {
    code: 'DCM-A',
    name: 'Door control module, driver door',
    function: 'door_control',
    partNumber: 'TE-DC-A310',
    supplier: 'Tarrow Electronic Systems',
    baseRatePerYear: 0.06,
    unitCostMinor: 21500,
    inDoor: true,
  },
  {
    code: 'DCM-B',
    name: 'Door control module, passenger door',
    function: 'door_control',
    partNumber: 'TE-DC-B310',
    supplier: 'Tarrow Electronic Systems',
    baseRatePerYear: 0.05,
    unitCostMinor: 19800,
    inDoor: true,
  },
  {
    code: 'MRM-4',
    name: 'Exterior mirror motor, adjust and fold',
    function: 'mirror',
    partNumber: 'VO-MM-0904',
    supplier: 'Veyra Optic Parts',
    baseRatePerYear: 0.08,
    unitCostMinor: 7600,
    inDoor: false,
  },
  {
    code: 'DHN-F',
    name: 'Front door harness and connector',
    function: 'harness',
    partNumber: 'LW-DH-F118',
    supplier: 'Linwick Cable Works',
    baseRatePerYear: 0.05,
    unitCostMinor: 15400,
    inDoor: true,
  },
  {
    code: 'DHN-S',
    name: 'Sliding door harness and contact plate',
    function: 'harness',
    partNumber: 'LW-DH-S126',
    supplier: 'Linwick Cable Works',
    baseRatePerYear: 0.07,
    unitCostMinor: 17200,
    inDoor: true,
  },
  {
    code: 'WSP-1',
    name: 'Driver door window switch pack',
    function: 'switch',
    partNumber: 'TE-SW-1044',
    supplier: 'Tarrow Electronic Systems',
    baseRatePerYear: 0.06,
    unitCostMinor: 5200,
    inDoor: true,
  },
];

/** Parts that are not catalogue modules but go on repair orders. */
export const EXTRA_PARTS = {
  membrane: { partNumber: 'LV-MBK-210', description: 'Door membrane kit with butyl strip', unitCostMinor: 2450 },
  connectorKit: { partNumber: 'LW-CRK-05', description: 'Connector repair kit (pins, seals)', unitCostMinor: 1350 },
  doorSeal: { partNumber: 'LV-DSL-330', description: 'Door aperture seal', unitCostMinor: 4200 },
} as const;

/** Workshop labour rate, minor units per hour. */
export const LABOUR_RATE_MINOR_PER_HOUR = 7800;

export interface DemoVehicleModel {
  make: string;
  model: string;
  body: string;
  /** Share of the fleet (weights); the mix is the same at every depot and in every build month. */
  share: number;
  /** Invented world manufacturer identifier (VIN positions 1-3). */
  wmi: string;
  /** VIN positions 4-5. */
  vdsModel: string;
  /** VIN position 6 choices (body variant). */
  vdsBody: readonly string[];
  /** VIN position 7 choices: letters, which place position 10 in the 2010-2039 cycle. */
  vdsRestraint: readonly string[];
  /** VIN position 8 choices (drive). */
  vdsDrive: readonly string[];
  /** VIN position 11 (assembly plant). */
  plant: string;
  /** First serial number (VIN positions 12-17). */
  serialStart: number;
  annualKmRange: readonly [number, number];
  washFactor: number;
  /** Module code -> positions it is fitted at. */
  fitted: Readonly<Record<string, readonly Position[]>>;
}

const VAN_COMMON = {
  'DLA-1': ['FL', 'FR', 'TG'],
  'DCM-A': ['FL'],
  'DCM-B': ['FR'],
  'MRM-4': ['FL', 'FR'],
  'DHN-F': ['FL', 'FR'],
  'WSP-1': ['FL'],
} as const satisfies Record<string, readonly Position[]>;

/** Four invented makes and models: two vans, a minibus and an estate car. */
export const DEMO_VEHICLE_MODELS: readonly DemoVehicleModel[] = [
  {
    make: 'Halvenn',
    model: 'Carrio',
    body: 'panel van',
    share: 0.4,
    wmi: 'SH9',
    vdsModel: 'CA',
    vdsBody: ['2', '3'],
    vdsRestraint: ['A', 'B'],
    vdsDrive: ['D', 'E'],
    plant: 'K',
    serialStart: 214001,
    annualKmRange: [32000, 46000],
    washFactor: 1,
    fitted: { 'WLR-2': ['FL', 'FR'], ...VAN_COMMON, 'SLA-1': ['SL'], 'DHN-S': ['SL'] },
  },
  {
    make: 'Brennic',
    model: 'Loadstar',
    body: 'high-roof van',
    share: 0.18,
    wmi: 'SB7',
    vdsModel: 'LS',
    vdsBody: ['4'],
    vdsRestraint: ['C', 'D'],
    vdsDrive: ['D', 'E'],
    plant: 'D',
    serialStart: 530101,
    annualKmRange: [28000, 42000],
    washFactor: 1,
    fitted: { 'WLR-2': ['FL', 'FR'], ...VAN_COMMON, 'SLA-1': ['SL', 'SR'], 'DHN-S': ['SL', 'SR'] },
  },
  {
    make: 'Morrage',
    model: 'Shuttle 16',
    body: 'minibus',
    share: 0.17,
    wmi: 'SM4',
    vdsModel: 'SH',
    vdsBody: ['6'],
    vdsRestraint: ['F'],
    vdsDrive: ['D', 'E'],
    plant: 'R',
    serialStart: 102201,
    annualKmRange: [24000, 38000],
    washFactor: 1.2,
    fitted: { 'WLR-2': ['FL', 'FR'], ...VAN_COMMON, 'SLA-1': ['SL'], 'DHN-S': ['SL'] },
  },
  {
    make: 'Ilsby',
    model: 'Tessa',
    body: 'estate car',
    share: 0.25,
    wmi: 'SL6',
    vdsModel: 'TS',
    vdsBody: ['5'],
    vdsRestraint: ['H', 'J'],
    vdsDrive: ['H', 'E'],
    plant: 'W',
    serialStart: 660501,
    annualKmRange: [15000, 26000],
    washFactor: 0.8,
    fitted: {
      'WLR-3': ['FL', 'FR', 'RL', 'RR'],
      'DLA-1': ['FL', 'FR', 'RL', 'RR', 'TG'],
      'DCM-A': ['FL'],
      'DCM-B': ['FR'],
      'MRM-4': ['FL', 'FR'],
      'DHN-F': ['FL', 'FR'],
      'WSP-1': ['FL'],
    },
  },
];

/**
 * The planted stories, as offsets from the month of `today` so that they move with it.
 * With the default today (2026-11-30) the fleet is built 2021-11 .. 2025-11, the water story covers builds
 * 2022-10 .. 2023-03 and the mirror batch builds 2024-02 .. 2024-07.
 */
export const PLANTED = {
  /** Fleet build months: from today's month minus 60 to minus 12. */
  buildMonthsBack: { from: 60, to: 12 },
  water: {
    moduleCode: 'WLR-2',
    /** The winter: October of the latest year that is at least 48 months before today's month, for 6 months. */
    minMonthsBack: 48,
    months: 6,
    depots: ['GHQ', 'SMP'],
    /**
     * Extra water-ingress failures on top of the ordinary ones, as a multiple of the module's base rate, by
     * parking, for the cohort at the wet coastal depots. With the repeats this gives about 4x for outdoor.
     */
    extraRateMultiple: { outdoor: 2.0, mixed: 1.0, indoor: 0.3 } as Record<Parking, number>,
    /** Chance that a cohort failure comes back on the same vehicle within 90 days (and again). */
    repeatChance: 0.4,
    secondRepeatChance: 0.25,
    /** Cohort builds are twice as frequent (a fleet intake that winter). */
    buildWeight: 2,
    /** Water failures show up in the wet half of the year; summer events are kept with this chance. */
    summerKeep: 0.4,
  },
  mirror: {
    moduleCode: 'MRM-4',
    /** Starts 11 months after the water winter ends, lasts 6 build months. */
    monthsAfterWater: 11,
    months: 6,
    /** Extra mechanical failures everywhere, as a multiple of the base rate (about 3.4x in all). */
    extraRateMultiple: 2.4,
  },
  /** Ordinary repeat chance for any defect. */
  baseRepeatChance: 0.04,
  /** Repeat window used to set repeat_of_id, days (the app's default, setting `repeat_window_days`). */
  repeatWindowDays: 90,
  /** Share of vehicles retired (only those in service for more than two years). */
  retiredShare: 0.06,
  /** Last weeks with open work. */
  openWindowDays: 42,
} as const;

export interface DemoPerson {
  role: Role;
  name: string;
  email: string;
  /** Depot codes; empty with allDepots. */
  depots: readonly string[];
  allDepots: boolean;
}

const d = DEMO_COMPANY.domain;

/** The five demo sign-ins, one per role. */
export const DEMO_SIGN_INS: Array<{
  role: Role;
  name: string;
  email: string;
  password: string;
  depots: string[];
  allDepots: boolean;
}> = [
  { role: 'admin', name: 'Tamsin Arkwell', email: `admin@${d}`, password: DEMO_PASSWORD, depots: [], allDepots: true },
  { role: 'manager', name: 'Idris Fenwold', email: `manager@${d}`, password: DEMO_PASSWORD, depots: [], allDepots: true },
  { role: 'supervisor', name: 'Marta Sealby', email: `supervisor@${d}`, password: DEMO_PASSWORD, depots: ['GHQ'], allDepots: false },
  { role: 'technician', name: 'Oskar Lindvale', email: `technician@${d}`, password: DEMO_PASSWORD, depots: ['GHQ'], allDepots: false },
  { role: 'viewer', name: 'Priya Wendel', email: `viewer@${d}`, password: DEMO_PASSWORD, depots: ['SMP', 'ELD'], allDepots: false },
];

/** More staff at the other depots, so every depot has someone to report and verify work. */
export const DEMO_STAFF: readonly DemoPerson[] = [
  { role: 'supervisor', name: 'Wren Hallorane', email: `wren.hallorane@${d}`, depots: ['SMP'], allDepots: false },
  { role: 'technician', name: 'Kofi Ambermill', email: `kofi.ambermill@${d}`, depots: ['SMP'], allDepots: false },
  { role: 'technician', name: 'Lena Marsk', email: `lena.marsk@${d}`, depots: ['ELD', 'FNC'], allDepots: false },
  { role: 'supervisor', name: 'Bram Oduya', email: `bram.oduya@${d}`, depots: ['DMF', 'HCP'], allDepots: false },
  { role: 'technician', name: 'Ines Corrow', email: `ines.corrow@${d}`, depots: ['HCP', 'DMF'], allDepots: false },
];

/** Symptom wording by module function (as a driver or the depot would report it). */
export const SYMPTOMS: Record<ModuleFunction, readonly string[]> = {
  window_lifter: [
    'window will not run in auto mode',
    'window reverses when closing',
    'window stops half way',
    'window slow to close',
    'window will not move',
  ],
  lock_actuator: [
    'lock does not engage',
    'door will not unlock from key fob',
    'lock clicks but door stays locked',
    'central locking intermittent on this door',
  ],
  door_control: [
    'door module resets',
    'window and mirror switches dead on this door',
    'door module loses window settings',
    'no communication with door module',
  ],
  mirror: ['mirror will not fold', 'mirror glass will not adjust', 'mirror folds on its own', 'mirror motor noisy'],
  harness: [
    'intermittent window and lock faults on this door',
    'door functions dead after closing door hard',
    'door open warning stays on',
  ],
  switch: ['window switch does nothing', 'window runs without switch pressed', 'switch illumination out'],
  other: ['fault reported by driver'],
};

/** Planted water-story symptoms (window lifter with a wet encoder board). */
export const WATER_SYMPTOMS = [
  'window will not run in auto mode',
  'window reverses when closing',
  'window stops half way',
  'window will not run in auto mode',
] as const;

/** Planted water-story fault codes with weights: both hall channels invalid is the signature. */
export const WATER_DTCS: ReadonlyArray<readonly [string, number]> = [
  ['B1A21-29 B1A22-29', 66],
  ['B1A21-29', 14],
  ['B1A22-29', 5],
  ['B1A21-29 B1A22-29 B1A20-54', 10],
  ['', 5],
];

/** Planted mirror-batch symptoms. */
export const MIRROR_BATCH_SYMPTOMS = [
  'mirror will not fold',
  'mirror will not fold',
  'mirror folds with a grinding noise',
  'mirror will not unfold',
] as const;

/**
 * Fault codes (SAE J2012 form, manufacturer-specific B1xxx / U1xxx, invented meanings) by function and cause,
 * with the failure-type byte after the dash. A missing entry means no code is stored for that cause.
 */
export const DTCS: Record<ModuleFunction, Partial<Record<RootCause, readonly string[]>>> = {
  window_lifter: {
    water_ingress: ['B1A21-29 B1A22-29', 'B1A21-29', 'B1A21-29 B1A22-29 B1A20-54'],
    sensor: ['B1A21-29', 'B1A22-29', 'B1A21-29 B1A22-29'],
    connector: ['B1A21-13', 'B1A21-13 B1A22-13'],
    software: ['B1A20-54'],
    mechanical: ['B1A24-71', 'B1A25-4B', 'B1A24-71 B1A20-54'],
    wiring: ['B1A26-11', 'B1A21-13'],
  },
  lock_actuator: {
    water_ingress: ['B1B40-13'],
    mechanical: ['B1B41-71'],
    connector: ['B1B40-13'],
    wiring: ['B1B40-11'],
  },
  door_control: {
    water_ingress: ['B1C00-96 U1E10-87'],
    software: ['B1C02-55', 'U1E10-87'],
    connector: ['U1E10-87'],
    wiring: ['U1E10-87', 'B1C05-1F'],
    sensor: ['B1C00-96'],
  },
  mirror: {
    mechanical: ['B1D30-71'],
    wiring: ['B1D31-13'],
    connector: ['B1D31-13'],
  },
  harness: {
    water_ingress: ['B1E50-11'],
    wiring: ['B1E50-11', 'B1E51-13'],
    connector: ['B1E51-13'],
  },
  switch: {
    mechanical: ['B1F10-23', 'B1F11-24'],
    connector: ['B1F10-23'],
    water_ingress: ['B1F11-24'],
  },
  other: {},
};

/** Ordinary root-cause mix by module function (weights). */
export const CAUSE_MIX: Record<ModuleFunction, Partial<Record<RootCause, number>>> = {
  window_lifter: { mechanical: 35, sensor: 20, connector: 15, software: 10, wiring: 10, unknown: 10 },
  lock_actuator: { mechanical: 50, connector: 20, wiring: 10, unknown: 20 },
  door_control: { software: 40, connector: 20, wiring: 15, sensor: 10, unknown: 15 },
  mirror: { mechanical: 60, wiring: 15, connector: 10, unknown: 15 },
  harness: { wiring: 60, connector: 30, unknown: 10 },
  switch: { mechanical: 40, connector: 20, unknown: 40 },
  other: { unknown: 1 },
};

/** Action wording by function and cause ({part} is replaced by the module code). */
export const ACTIONS: Record<ModuleFunction, Partial<Record<RootCause, string>>> = {
  window_lifter: {
    water_ingress:
      'Replaced window lifter motor ({part}), fitted new door membrane, cleared drain holes, re-initialised window and checked auto-reverse',
    sensor: 'Replaced window lifter motor ({part}) for encoder fault, re-initialised window and checked auto-reverse',
    connector: 'Cleaned and re-terminated motor connector, re-initialised window and checked auto-reverse',
    software: 'Re-initialised window travel limits and checked auto-reverse',
    mechanical: 'Replaced window lifter motor ({part}) and regulator cable, re-initialised window and checked auto-reverse',
    wiring: 'Repaired motor feed at door hinge grommet, re-initialised window and checked auto-reverse',
    unknown: 'No fault found on test; codes cleared, window re-initialised and auto-reverse checked',
  },
  lock_actuator: {
    water_ingress: 'Replaced lock actuator ({part}) and door membrane',
    mechanical: 'Replaced lock actuator ({part})',
    connector: 'Cleaned actuator connector, applied contact grease',
    wiring: 'Repaired actuator feed at hinge',
    unknown: 'Fault not reproduced; actuator operated 20 cycles without fault',
  },
  door_control: {
    water_ingress: 'Replaced door control module ({part}), sealed membrane, re-coded and re-initialised window',
    software: 'Updated door module software and re-coded, re-initialised window and checked auto-reverse',
    connector: 'Cleaned module connector, re-initialised window and checked auto-reverse',
    wiring: 'Repaired network wiring at hinge, re-initialised window',
    sensor: 'Replaced door control module ({part}), re-coded and re-initialised window',
    unknown: 'No fault found; module re-coded and window re-initialised',
  },
  mirror: {
    mechanical: 'Replaced mirror motor ({part})',
    wiring: 'Repaired mirror feed in door',
    connector: 'Cleaned mirror connector',
    unknown: 'Fault not reproduced; mirror cycled without fault',
  },
  harness: {
    water_ingress: 'Replaced door harness ({part}), fitted new membrane and cleared drains',
    wiring: 'Repaired broken conductors at hinge boot',
    connector: 'Re-pinned harness connector',
    unknown: 'Harness checked end to end, no fault found',
  },
  switch: {
    water_ingress: 'Replaced window switch pack ({part}), sealed door card',
    mechanical: 'Replaced window switch pack ({part})',
    connector: 'Cleaned switch connector',
    unknown: 'Switch tested, no fault found',
  },
  other: { unknown: 'Checked, no fault found' },
};

/** Labour minutes range by function. */
export const LABOUR_MINUTES: Record<ModuleFunction, readonly [number, number]> = {
  window_lifter: [60, 110],
  lock_actuator: [45, 80],
  door_control: [30, 70],
  mirror: [40, 70],
  harness: [90, 180],
  switch: [15, 35],
  other: [20, 40],
};
