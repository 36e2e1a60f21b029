/**
 * Row validation for the four import files of CONTRACT.md. Pure: turns trimmed CSV cells into typed records
 * and row-level errors. References to other records (depot codes, VINs, module codes) are checked by the
 * server, which knows the database.
 */
import { parseVin } from '../vin/vin';
import { parseDtcList } from '../dtc/dtc';
import { parseBuildDate, parseInstant, parseIsoDate, isTimeZone } from '../dates/dates';
import type { CsvTable } from './csv-read';

export const IMPORT_KINDS = ['depots', 'modules', 'vehicles', 'defects'] as const;
export type ImportKind = (typeof IMPORT_KINDS)[number];

export type RowIssue = { row: number; column: string; message: string };

export const MODULE_FUNCTIONS = ['window_lifter', 'lock_actuator', 'door_control', 'mirror', 'harness', 'switch', 'other'] as const;
export const PARKING_VALUES = ['indoor', 'outdoor', 'mixed'] as const;
export const POSITION_VALUES = ['FL', 'FR', 'RL', 'RR', 'SL', 'SR', 'TG'] as const;
export const MOISTURE_VALUES = ['none', 'traces', 'corrosion', 'standing_water'] as const;
export const ROOT_CAUSE_VALUES = ['water_ingress', 'connector', 'wiring', 'mechanical', 'sensor', 'software', 'unknown'] as const;

/** Columns of each file; required ones first. */
export const IMPORT_COLUMNS: Record<ImportKind, { required: string[]; optional: string[] }> = {
  depots: {
    required: ['code', 'name', 'coastal', 'rain_days_per_year', 'mean_rh_pct', 'wash_bay'],
    optional: ['region', 'inspection_slots_per_day', 'timezone'],
  },
  modules: { required: ['code', 'name', 'function'], optional: ['part_number', 'supplier'] },
  vehicles: {
    required: ['vin', 'build_date', 'in_service_date', 'depot_code', 'parking', 'washes_per_month'],
    optional: ['fleet_number', 'registration', 'make', 'model', 'body', 'retired_date'],
  },
  defects: {
    required: ['vin', 'reported_at', 'position', 'module_code'],
    optional: ['ref', 'symptom', 'dtcs', 'moisture', 'root_cause', 'action', 'odometer_km', 'closed_at'],
  },
};

export type DepotRow = {
  code: string;
  name: string;
  region: string | null;
  coastal: boolean;
  rainDaysPerYear: number;
  meanRhPct: number;
  washBay: boolean;
  inspectionSlotsPerDay: number | null;
  timezone: string | null;
};
export type ModuleRow = {
  code: string;
  name: string;
  function: (typeof MODULE_FUNCTIONS)[number];
  partNumber: string | null;
  supplier: string | null;
};
export type VehicleRow = {
  vin: string;
  fleetNumber: string | null;
  registration: string | null;
  make: string | null;
  model: string | null;
  body: string | null;
  buildDate: string;
  buildMonth: string;
  inServiceDate: string;
  retiredDate: string | null;
  depotCode: string;
  parking: (typeof PARKING_VALUES)[number];
  washesPerMonth: number;
  modelYear: number | null;
};
export type DefectRow = {
  ref: string | null;
  vin: string;
  reportedAtText: string;
  position: (typeof POSITION_VALUES)[number];
  moduleCode: string;
  symptom: string | null;
  dtcs: Array<{ code: string; failureType: string | null; display: string }>;
  moisture: (typeof MOISTURE_VALUES)[number] | null;
  rootCause: (typeof ROOT_CAUSE_VALUES)[number] | null;
  action: string | null;
  odometerKm: number | null;
  closedAtText: string | null;
};

export type RowOf<K extends ImportKind> = K extends 'depots'
  ? DepotRow
  : K extends 'modules'
    ? ModuleRow
    : K extends 'vehicles'
      ? VehicleRow
      : DefectRow;

export type ValidatedRows<K extends ImportKind> = {
  rows: Array<{ row: number; value: RowOf<K> }>;
  errors: RowIssue[];
  warnings: RowIssue[];
};

/** Reads cells of one record and collects issues against their column. */
class Cells {
  constructor(
    private readonly cells: Record<string, string>,
    readonly row: number,
    readonly errors: RowIssue[],
    readonly warnings: RowIssue[],
  ) {}
  err(column: string, message: string): void {
    this.errors.push({ row: this.row, column, message });
  }
  warn(column: string, message: string): void {
    this.warnings.push({ row: this.row, column, message });
  }
  opt(column: string): string | null {
    const v = this.cells[column];
    return v === undefined || v === '' ? null : v;
  }
  req(column: string): string | null {
    const v = this.opt(column);
    if (v === null) this.err(column, `${column} is required.`);
    return v;
  }
  text(column: string, required: boolean, max = 200): string | null {
    const v = required ? this.req(column) : this.opt(column);
    if (v !== null && v.length > max) {
      this.err(column, `${column} is longer than ${max} characters.`);
      return null;
    }
    return v;
  }
  bool(column: string): boolean | null {
    const v = this.req(column);
    if (v === null) return null;
    const l = v.toLowerCase();
    if (['yes', 'y', 'true', '1'].includes(l)) return true;
    if (['no', 'n', 'false', '0'].includes(l)) return false;
    this.err(column, `${column} must be yes or no, not "${v}".`);
    return null;
  }
  num(column: string, required: boolean, min: number, max: number, integer: boolean): number | null {
    const v = required ? this.req(column) : this.opt(column);
    if (v === null) return null;
    const normal = /^-?\d+,\d+$/.test(v) ? v.replace(',', '.') : v;
    const n = /^-?(\d+\.?\d*|\.\d+)$/.test(normal) ? Number(normal) : NaN;
    if (!Number.isFinite(n)) {
      this.err(column, `${column} must be a number, not "${v}".`);
      return null;
    }
    if (integer && !Number.isInteger(n)) {
      this.err(column, `${column} must be a whole number, not "${v}".`);
      return null;
    }
    if (n < min || n > max) {
      this.err(column, `${column} must be between ${min} and ${max}; got ${v}.`);
      return null;
    }
    return n;
  }
  oneOf<T extends string>(column: string, required: boolean, values: readonly T[], upper = false): T | null {
    const v = required ? this.req(column) : this.opt(column);
    if (v === null) return null;
    const norm = upper ? v.toUpperCase() : v.toLowerCase();
    if ((values as readonly string[]).includes(norm)) return norm as T;
    this.err(column, `${column} must be one of ${values.join(', ')}; got "${v}".`);
    return null;
  }
}

function validateDepot(c: Cells): DepotRow | null {
  const code = c.text('code', true, 16);
  if (code && !/^[A-Za-z0-9_-]+$/.test(code)) c.err('code', 'code may hold letters, digits, "-" and "_" only.');
  const name = c.text('name', true);
  const region = c.text('region', false);
  const coastal = c.bool('coastal');
  const rainDaysPerYear = c.num('rain_days_per_year', true, 0, 366, true);
  const meanRhPct = c.num('mean_rh_pct', true, 0, 100, false);
  const washBay = c.bool('wash_bay');
  const inspectionSlotsPerDay = c.num('inspection_slots_per_day', false, 0, 100, true);
  const timezone = c.text('timezone', false, 64);
  if (timezone && !isTimeZone(timezone)) c.err('timezone', `"${timezone}" is not an IANA time zone (e.g. Europe/London).`);
  if (c.errors.some((e) => e.row === c.row)) return null;
  return {
    code: code!.toUpperCase(),
    name: name!,
    region,
    coastal: coastal!,
    rainDaysPerYear: rainDaysPerYear!,
    meanRhPct: meanRhPct!,
    washBay: washBay!,
    inspectionSlotsPerDay,
    timezone,
  };
}

function validateModule(c: Cells): ModuleRow | null {
  const code = c.text('code', true, 32);
  if (code && !/^[A-Za-z0-9_.-]+$/.test(code)) c.err('code', 'code may hold letters, digits, ".", "-" and "_" only.');
  const name = c.text('name', true);
  const fn = c.oneOf('function', true, MODULE_FUNCTIONS);
  const partNumber = c.text('part_number', false, 64);
  const supplier = c.text('supplier', false);
  if (c.errors.some((e) => e.row === c.row)) return null;
  return { code: code!.toUpperCase(), name: name!, function: fn!, partNumber, supplier };
}

function vinCell(c: Cells, column: string): string | null {
  const raw = c.req(column);
  if (raw === null) return null;
  const r = parseVin(raw);
  if (!r.ok) {
    c.err(column, r.message);
    return null;
  }
  for (const w of r.warnings) c.warn(column, w);
  return r.vin;
}

function validateVehicle(c: Cells): VehicleRow | null {
  const vin = vinCell(c, 'vin');
  const buildRaw = c.req('build_date');
  const build = buildRaw === null ? null : parseBuildDate(buildRaw);
  if (buildRaw !== null && !build) c.err('build_date', `build_date must be YYYY-MM or YYYY-MM-DD, not "${buildRaw}".`);
  const isRaw = c.req('in_service_date');
  const inService = isRaw === null ? null : parseIsoDate(isRaw);
  if (isRaw !== null && !inService) c.err('in_service_date', `in_service_date must be a date YYYY-MM-DD, not "${isRaw}".`);
  const retRaw = c.opt('retired_date');
  const retired = retRaw === null ? null : parseIsoDate(retRaw);
  if (retRaw !== null && !retired) c.err('retired_date', `retired_date must be a date YYYY-MM-DD, not "${retRaw}".`);
  if (build && inService && inService.slice(0, 7) < build.month) {
    c.err('in_service_date', `in_service_date ${inService} is before the build date ${build.date}.`);
  }
  if (inService && retired && retired < inService) {
    c.err('retired_date', `retired_date ${retired} is before in_service_date ${inService}.`);
  }
  const depotCode = c.text('depot_code', true, 16);
  const parking = c.oneOf('parking', true, PARKING_VALUES);
  const washes = c.num('washes_per_month', true, 0, 60, false);
  const fleetNumber = c.text('fleet_number', false, 32);
  const registration = c.text('registration', false, 32);
  const make = c.text('make', false, 64);
  const model = c.text('model', false, 64);
  const body = c.text('body', false, 64);
  if (c.errors.some((e) => e.row === c.row)) return null;
  const year = Number(build!.month.slice(0, 4));
  const decoded = parseVin(vin!, { referenceYear: year + 1 });
  return {
    vin: vin!,
    fleetNumber,
    registration: registration ? registration.toUpperCase() : null,
    make,
    model,
    body,
    buildDate: build!.date,
    buildMonth: build!.month,
    inServiceDate: inService!,
    retiredDate: retired,
    depotCode: depotCode!.toUpperCase(),
    parking: parking!,
    washesPerMonth: washes!,
    modelYear: decoded.ok ? decoded.modelYear : null,
  };
}

function validateDefect(c: Cells): DefectRow | null {
  const ref = c.text('ref', false, 40);
  const vinRaw = c.req('vin');
  let vin: string | null = null;
  if (vinRaw !== null) {
    // The vehicle must exist already; its VIN was checked when it was imported, so only the form matters here.
    const r = parseVin(vinRaw);
    if (!r.ok && r.code !== 'check_digit') c.err('vin', r.message);
    else vin = vinRaw.trim().toUpperCase();
  }
  const reportedRaw = c.req('reported_at');
  if (reportedRaw !== null && parseInstant(reportedRaw) === null) {
    c.err('reported_at', `reported_at must be a date (YYYY-MM-DD) or date-time (YYYY-MM-DDTHH:MM), not "${reportedRaw}".`);
  }
  const position = c.oneOf('position', true, POSITION_VALUES, true);
  const moduleCode = c.text('module_code', true, 32);
  const symptom = c.text('symptom', false, 500);
  const dtcText = c.opt('dtcs');
  let dtcs: DefectRow['dtcs'] = [];
  if (dtcText !== null) {
    const r = parseDtcList(dtcText);
    if (r.ok) dtcs = r.codes.map((d) => ({ code: d.code, failureType: d.failureType, display: d.display }));
    else c.err('dtcs', r.message);
  }
  const moisture = c.oneOf('moisture', false, MOISTURE_VALUES);
  const rootCause = c.oneOf('root_cause', false, ROOT_CAUSE_VALUES);
  const action = c.text('action', false, 500);
  const odometerKm = c.num('odometer_km', false, 0, 5_000_000, true);
  const closedRaw = c.opt('closed_at');
  if (closedRaw !== null && parseInstant(closedRaw) === null) {
    c.err('closed_at', `closed_at must be a date or date-time, not "${closedRaw}".`);
  }
  if (reportedRaw && closedRaw) {
    const a = parseInstant(reportedRaw);
    const b = parseInstant(closedRaw);
    if (a !== null && b !== null && b < a) c.err('closed_at', `closed_at ${closedRaw} is before reported_at ${reportedRaw}.`);
  }
  if (c.errors.some((e) => e.row === c.row)) return null;
  return {
    ref: ref ? ref.toUpperCase() : null,
    vin: vin!,
    reportedAtText: reportedRaw!,
    position: position!,
    moduleCode: moduleCode!.toUpperCase(),
    symptom,
    dtcs,
    moisture,
    rootCause,
    action,
    odometerKm,
    closedAtText: closedRaw,
  };
}

const VALIDATORS: { [K in ImportKind]: (c: Cells) => RowOf<K> | null } = {
  depots: validateDepot,
  modules: validateModule,
  vehicles: validateVehicle,
  defects: validateDefect,
};

/** Header-level problems: missing required columns (row 0 = the header). */
export function checkHeaders(kind: ImportKind, headers: string[]): RowIssue[] {
  return IMPORT_COLUMNS[kind].required
    .filter((col) => !headers.includes(col))
    .map((col) => ({ row: 0, column: col, message: `The header has no "${col}" column (required for ${kind}).` }));
}

/** Key that identifies a row within the file, to catch the same record twice. */
function fileKey(kind: ImportKind, v: DepotRow | ModuleRow | VehicleRow | DefectRow): string | null {
  switch (kind) {
    case 'depots':
    case 'modules':
      return (v as DepotRow | ModuleRow).code;
    case 'vehicles':
      return (v as VehicleRow).vin;
    case 'defects': {
      const d = v as DefectRow;
      return d.ref ? `ref:${d.ref}` : `key:${d.vin}|${d.reportedAtText}|${d.position}|${d.moduleCode}`;
    }
  }
}

/** Validate every record of a table for an import kind. */
export function validateRows<K extends ImportKind>(kind: K, table: CsvTable): ValidatedRows<K> {
  const errors: RowIssue[] = checkHeaders(kind, table.headers);
  const warnings: RowIssue[] = [];
  const rows: Array<{ row: number; value: RowOf<K> }> = [];
  if (errors.length > 0) return { rows, errors, warnings };
  const seen = new Map<string, number>();
  const validate = VALIDATORS[kind] as (c: Cells) => RowOf<K> | null;
  for (const rec of table.records) {
    const cells = new Cells(rec.cells, rec.row, errors, warnings);
    const value = validate(cells);
    if (!value) continue;
    const key = fileKey(kind, value);
    if (key !== null) {
      const first = seen.get(key);
      if (first !== undefined) {
        const col = kind === 'vehicles' ? 'vin' : kind === 'defects' ? (key.startsWith('ref:') ? 'ref' : 'reported_at') : 'code';
        errors.push({ row: rec.row, column: col, message: `The same record is already in row ${first} of this file.` });
        continue;
      }
      seen.set(key, rec.row);
    }
    rows.push({ row: rec.row, value });
  }
  return { rows, errors, warnings };
}

/**
 * How a person finds a record of the file in their sheet: its code (depots, modules), VIN (vehicles), or ref, else
 * VIN (defects), as written in the file; null when the cell is empty.
 */
export function recordLabel(kind: ImportKind, cells: Record<string, string>): string | null {
  const v = (c: string) => (cells[c] ?? '').trim() || null;
  switch (kind) {
    case 'depots':
    case 'modules':
      return v('code') ? `code ${v('code')}` : null;
    case 'vehicles':
      return v('vin') ? `VIN ${v('vin')}` : null;
    case 'defects':
      return v('ref') ? `ref ${v('ref')}` : v('vin') ? `VIN ${v('vin')}` : null;
  }
}

/** A reference from a record to another record (a depot code, a VIN, a module code), checked against the database. */
export type RecordReference = { row: number; column: 'depot_code' | 'vin' | 'module_code'; value: string };

/**
 * The references of every record of a file, valid or not, in the form the database keys them (upper case), so that
 * an unknown one is reported in the same pass as the field problems. A reference whose cell is empty or malformed
 * is left out: its own field problem already says so.
 */
export function recordReferences(kind: ImportKind, table: CsvTable): RecordReference[] {
  const out: RecordReference[] = [];
  for (const rec of table.records) {
    const cell = (c: string) => (rec.cells[c] ?? '').trim();
    if (kind === 'vehicles') {
      const code = cell('depot_code');
      if (code && code.length <= 16) out.push({ row: rec.row, column: 'depot_code', value: code.toUpperCase() });
    }
    if (kind === 'defects') {
      const vin = cell('vin');
      if (vin) {
        const r = parseVin(vin);
        if (r.ok || r.code === 'check_digit') out.push({ row: rec.row, column: 'vin', value: vin.toUpperCase() });
      }
      const code = cell('module_code');
      if (code && code.length <= 32) out.push({ row: rec.row, column: 'module_code', value: code.toUpperCase() });
    }
  }
  return out;
}

/** camelCase → snake_case (CSV column names). */
export function toColumnName(key: string): string {
  return key.replace(/[A-Z]/g, (c) => '_' + c.toLowerCase());
}

/** Turn a JSON object (camelCase or snake_case keys) into import cells of the given kind's columns. */
export function cellsFromObject(kind: ImportKind, obj: Record<string, unknown>): Record<string, string> {
  const allowed = new Set([...IMPORT_COLUMNS[kind].required, ...IMPORT_COLUMNS[kind].optional]);
  const cells: Record<string, string> = {};
  for (const [k, v] of Object.entries(obj)) {
    const col = toColumnName(k.trim());
    if (!allowed.has(col)) continue;
    if (v === null || v === undefined) cells[col] = '';
    else if (typeof v === 'boolean') cells[col] = v ? 'yes' : 'no';
    else if (Array.isArray(v)) cells[col] = v.map(String).join(' ');
    else cells[col] = String(v).trim();
  }
  return cells;
}

/** Validate one record given as cells (create/update through the API); row number 1. */
export function validateRecord<K extends ImportKind>(kind: K, cells: Record<string, string>): { value: RowOf<K> | null; errors: RowIssue[]; warnings: RowIssue[] } {
  const errors: RowIssue[] = [];
  const warnings: RowIssue[] = [];
  const value = (VALIDATORS[kind] as (c: Cells) => RowOf<K> | null)(new Cells(cells, 1, errors, warnings));
  return { value, errors, warnings };
}
