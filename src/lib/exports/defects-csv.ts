/**
 * The defect list as CSV in the defects import format of CONTRACT.md, so that a downloaded file re-imports
 * cleanly (same columns, ISO instants with their zone, fault codes space-separated, empty cell = no value).
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
};

/**
 * CSV text (CRLF line ends, RFC 4180 quoting, leading byte-order mark for spreadsheets). A free-text cell that a
 * spreadsheet would run as a formula (=, +, -, @, tab, CR first) gets a leading apostrophe; the import drops it.
 */
export function buildDefectsCsv(rows: DefectCsvSource[]): string {
  const data = rows.map((d) => [
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
  ]);
  return '\uFEFF' + Papa.unparse({ fields: [...DEFECT_CSV_COLUMNS], data }, { newline: '\r\n', quotes: false, escapeFormulae: true });
}

/** File name of a download made on a given day, e.g. `seepline-defects-2026-12-02.csv`. */
export function defectsCsvFileName(now: Date): string {
  return `seepline-defects-${now.toISOString().slice(0, 10)}.csv`;
}
