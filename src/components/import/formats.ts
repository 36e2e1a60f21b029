/**
 * The four import files as CONTRACT.md "Imports" defines them: columns (required ones flagged), what each
 * holds, how rows are matched, and a template CSV (header + one invented example row) built in the browser.
 * Edit alongside src/lib/imports/rows.ts when a column is added.
 */
export const IMPORT_KINDS = ['depots', 'modules', 'vehicles', 'defects'] as const;
export type ImportKind = (typeof IMPORT_KINDS)[number];

export type ColumnDoc = { name: string; required: boolean; text: string; example: string };

export type ImportFormat = {
  label: string;
  /** One line about what the file holds. */
  summary: string;
  /** How rows are matched to records already stored. */
  matchedBy: string;
  /** The same, in a few words. */
  matchedShort: string;
  /** What must exist before this file can be imported. */
  needs: string | null;
  columns: ColumnDoc[];
};

const req = (name: string, text: string, example: string): ColumnDoc => ({ name, required: true, text, example });
const opt = (name: string, text: string, example: string): ColumnDoc => ({ name, required: false, text, example });

// The examples are invented and fit together: the vehicle sits at the example depot, and the defect is on
// that vehicle and the example module type, so the four templates import in order without errors.
const EXAMPLE_VIN = 'SX8BV2DK0RA104257';

export const IMPORT_FORMATS: Record<ImportKind, ImportFormat> = {
  depots: {
    label: 'Depots',
    summary: 'Sites, their climate and washing, and how many seal-inspection bay slots they have a day.',
    matchedBy: 'code',
    matchedShort: 'by code',
    needs: null,
    columns: [
      req('code', 'Short unique code: letters, digits, “-”, “_” (up to 16).', 'BRK'),
      req('name', 'Depot name.', 'Brackwater Yard'),
      opt('region', 'Region or area.', 'South Shore'),
      req('coastal', 'yes or no.', 'yes'),
      req('rain_days_per_year', 'Whole number, 0–366.', '174'),
      req('mean_rh_pct', 'Mean relative humidity, 0–100.', '83'),
      req('wash_bay', 'Pressure washing on site: yes or no.', 'yes'),
      opt('inspection_slots_per_day', 'Seal-inspection bay slots per day, a whole number (recorded for reference).', '2'),
      opt('timezone', 'IANA time zone, e.g. Europe/London.', 'Europe/London'),
    ],
  },
  modules: {
    label: 'Modules',
    summary: 'The module catalogue: window lifters, lock actuators, door modules, mirrors, harnesses, switches.',
    matchedBy: 'code',
    matchedShort: 'by code',
    needs: null,
    columns: [
      req('code', 'Short unique code: letters, digits, “.”, “-”, “_” (up to 32).', 'WLR-9'),
      req('name', 'What it is.', 'Window lifter motor, front doors'),
      req('function', 'window_lifter, lock_actuator, door_control, mirror, harness, switch or other.', 'window_lifter'),
      opt('part_number', 'Supplier part number.', 'HW-WL-0090'),
      opt('supplier', 'Who supplies it (named on warranty claims).', 'Halwick Drives'),
    ],
  },
  vehicles: {
    label: 'Vehicles',
    summary: 'The fleet: VIN, dates, depot, parking and washing.',
    matchedBy: 'VIN',
    matchedShort: 'by VIN',
    needs: 'Its depot must exist (import depots first).',
    columns: [
      req('vin', '17 characters, A–Z and 0–9 without I, O, Q. North American VINs (first character 1–5) must have a valid check digit.', EXAMPLE_VIN),
      opt('fleet_number', 'Your own number for the vehicle.', 'V-0901'),
      opt('registration', 'Number plate.', 'BR24 KWD'),
      opt('make', 'Make.', 'Halvenn'),
      opt('model', 'Model.', 'Carrio'),
      opt('body', 'Body style.', 'panel van'),
      req('build_date', 'YYYY-MM or YYYY-MM-DD.', '2023-11'),
      req('in_service_date', 'YYYY-MM-DD, not before the build month.', '2024-02-05'),
      opt('retired_date', 'YYYY-MM-DD when it left the fleet.', ''),
      req('depot_code', 'Code of an existing depot.', 'BRK'),
      req('parking', 'indoor, outdoor or mixed.', 'outdoor'),
      req('washes_per_month', 'Number, 0–60.', '4'),
    ],
  },
  defects: {
    label: 'Defects',
    summary: 'Defect history: door position, module, symptom, fault codes, moisture found, root cause, closing.',
    matchedBy: 'ref when given, else VIN + reported_at + position + module_code',
    matchedShort: 'by ref, or VIN + time + door',
    needs: 'The vehicle and the module type must exist (import them first).',
    columns: [
      opt('ref', 'Your defect reference; without one, Seepline numbers it.', 'DF-EX-0001'),
      req('vin', 'VIN of an existing vehicle.', EXAMPLE_VIN),
      req('reported_at', 'Date (YYYY-MM-DD) or date-time (YYYY-MM-DDTHH:MM), in the depot’s time zone.', '2025-03-14T08:30'),
      req('position', 'Door: FL, FR, RL, RR, SL, SR or TG (tailgate / rear doors).', 'FL'),
      req('module_code', 'Code of a module type in the catalogue.', 'WLR-9'),
      opt('symptom', 'What was reported.', 'Window stops half way in automatic mode'),
      opt('dtcs', 'Fault codes, space-separated, e.g. B1234 or B1234-13.', 'B1234-13 B2201'),
      opt('moisture', 'none, traces, corrosion or standing_water.', 'corrosion'),
      opt('root_cause', 'water_ingress, connector, wiring, mechanical, sensor, software or unknown.', 'water_ingress'),
      opt('action', 'What was done.', 'Replaced motor, re-initialised window, auto-reverse verified'),
      opt('odometer_km', 'Whole number of kilometres.', '48210'),
      opt('closed_at', 'Date or date-time it was closed; not before reported_at.', '2025-03-15'),
    ],
  },
};

/** One CSV field, quoted when it holds a comma, quote or line break (RFC 4180). */
export function csvField(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/** Rows as CSV text with CRLF line ends. */
export function toCsv(rows: string[][]): string {
  return rows.map((r) => r.map(csvField).join(',')).join('\r\n') + '\r\n';
}

/** The template of a kind: header row and one example row. */
export function templateCsv(kind: ImportKind): string {
  const cols = IMPORT_FORMATS[kind].columns;
  return toCsv([cols.map((c) => c.name), cols.map((c) => c.example)]);
}

/** Offer text as a CSV download (UTF-8 with a byte-order mark, so spreadsheets read accents right). */
export function downloadCsv(fileName: string, text: string): void {
  const blob = new Blob(['\uFEFF', text], { type: 'text/csv;charset=utf-8' });
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
