/**
 * The defect list as CSV: first the columns of the defects import of CONTRACT.md in the contract's order, so a
 * downloaded file re-imports cleanly (extra columns are ignored by the import), then the columns a supervisor's
 * report needs: status, depot, vehicle, repeat link, door findings, parts, labour and cost with its currency.
 * ISO instants with their zone, fault codes space-separated, empty cell = no value; money in major units with two
 * decimals (a `currency` column names the ISO 4217 code). README "Defects list, Overview and Settings" lists them.
 */
import Papa from 'papaparse';

/** Columns of the defects import, in the contract's order. */
export const DEFECT_CSV_COLUMNS = [
  'ref',
  'vin',
  'reported_at',
  'position',
  'module_code',
  'symptom',
  'dtcs',
  'moisture',
  'root_cause',
  'action',
  'odometer_km',
  'closed_at',
] as const;

/** Report columns after the import columns (the import ignores them). */
export const DEFECT_CSV_REPORT_COLUMNS = [
  'status',
  'depot_code',
  'fleet_number',
  'registration',
  'repeat_of',
  'membrane_condition',
  'seal_condition',
  'drain_condition',
  'connector_condition',
  'parts',
  'parts_cost',
  'labour_minutes',
  'cost',
  'currency',
] as const;

/** One part line of a defect. */
export type DefectCsvPart = { partNumber: string; description: string | null; quantity: number; unitCostMinor: number | null };

/** The fields of a defect the export reads. */
export type DefectCsvSource = {
  ref: string;
  vin: string;
  reportedAt: string;
  position: string;
  moduleCode: string;
  symptom: string | null;
  dtcs: string[];
  moisture: string | null;
  rootCause: string | null;
  action: string | null;
  odometerKm: number | null;
  closedAt: string | null;
  /** The report columns (absent: those cells stay empty). */
  status?: string;
  depotCode?: string;
  fleetNumber?: string | null;
  registration?: string | null;
  repeatOfRef?: string | null;
  membraneCondition?: string | null;
  sealCondition?: string | null;
  drainCondition?: string | null;
  connectorCondition?: string | null;
  parts?: DefectCsvPart[];
  labourMinutes?: number | null;
  costMinor?: number | null;
};

/** Minor units as a plain decimal amount ("296.80"); empty for none. */
export function minorToAmount(minor: number | null | undefined): string {
  if (minor === null || minor === undefined) return '';
  const sign = minor < 0 ? '-' : '';
  const abs = Math.abs(minor);
  return `${sign}${Math.floor(abs / 100)}.${String(abs % 100).padStart(2, '0')}`;
}

/** Part lines as one cell: "WL-2034 ×2 (Window lifter motor); SEAL-7 ×1". */
export function partsCell(parts: DefectCsvPart[] | undefined): string {
  return (parts ?? []).map((p) => `${p.partNumber} ×${p.quantity}${p.description ? ` (${p.description})` : ''}`).join('; ');
}

/** Parts cost (quantity × unit cost), or null when no part has a cost. */
export function partsCostMinor(parts: DefectCsvPart[] | undefined): number | null {
  const costed = (parts ?? []).filter((p) => p.unitCostMinor !== null);
  return costed.length ? costed.reduce((s, p) => s + p.quantity * p.unitCostMinor!, 0) : null;
}

/**
 * CSV text (CRLF line ends, RFC 4180 quoting, leading byte-order mark for spreadsheets). A free-text cell that a
 * spreadsheet would run as a formula (=, +, -, @, tab, CR first) gets a leading apostrophe; the import drops it.
 * `currency` is the ISO 4217 code of the money columns (the setting in force).
 */
export function buildDefectsCsv(rows: DefectCsvSource[], currency = ''): string {
  const data = rows.map((d) => {
    const partsCost = partsCostMinor(d.parts);
    const hasMoney = partsCost !== null || (d.costMinor ?? null) !== null;
    return [
      d.ref,
      d.vin,
      d.reportedAt,
      d.position,
      d.moduleCode,
      d.symptom ?? '',
      d.dtcs.join(' '),
      d.moisture ?? '',
      d.rootCause ?? '',
      d.action ?? '',
      d.odometerKm === null ? '' : String(d.odometerKm),
      d.closedAt ?? '',
      d.status ?? '',
      d.depotCode ?? '',
      d.fleetNumber ?? '',
      d.registration ?? '',
      d.repeatOfRef ?? '',
      d.membraneCondition ?? '',
      d.sealCondition ?? '',
      d.drainCondition ?? '',
      d.connectorCondition ?? '',
      partsCell(d.parts),
      minorToAmount(partsCost),
      d.labourMinutes === null || d.labourMinutes === undefined ? '' : String(d.labourMinutes),
      minorToAmount(d.costMinor),
      hasMoney ? currency : '',
    ];
  });
  return (
    '\uFEFF' +
    Papa.unparse({ fields: [...DEFECT_CSV_COLUMNS, ...DEFECT_CSV_REPORT_COLUMNS], data }, { newline: '\r\n', quotes: false, escapeFormulae: true })
  );
}

/** File name of a download made on a given day, e.g. `seepline-defects-2026-12-02.csv`. */
export function defectsCsvFileName(now: Date): string {
  return `seepline-defects-${now.toISOString().slice(0, 10)}.csv`;
}
