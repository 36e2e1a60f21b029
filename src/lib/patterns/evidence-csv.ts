/**
 * The CSV of a pattern's warranty evidence pack: one row per failure of the module on a cohort vehicle, and one
 * row (defect columns empty) for each cohort vehicle without a failure, so that the file carries the whole cohort.
 * Columns are documented in EVIDENCE_CSV_COLUMNS (and README "Patterns"); edit both together.
 */
import Papa from 'papaparse';

/** Columns, in order, with what each holds. */
export const EVIDENCE_CSV_COLUMNS = [
  ['pattern_id', 'Seepline pattern record number'],
  ['module_code', 'Module type of the pattern'],
  ['exposure_band', 'Moisture-exposure band of the cohort (low, medium, high)'],
  ['build_from', 'First build month of the cohort (YYYY-MM)'],
  ['build_to', 'Last build month of the cohort (YYYY-MM)'],
  ['as_of', 'Day the figures were computed for (YYYY-MM-DD)'],
  ['vin', 'Vehicle identification number'],
  ['fleet_number', "Operator's fleet number"],
  ['registration', 'Registration number'],
  ['make', 'Make'],
  ['model', 'Model'],
  ['build_month', 'Build month of the vehicle (YYYY-MM)'],
  ['in_service_date', 'Date the vehicle entered service'],
  ['retired_date', 'Date the vehicle left service (empty while in service)'],
  ['depot_code', "Vehicle's depot"],
  ['parking', 'indoor, outdoor or mixed'],
  ['washes_per_month', 'Washes per month'],
  ['exposure_index', 'Moisture-exposure index, 0-10 points (docs/patterns-method.md section 1)'],
  ['vehicle_failures', 'Failures of this module type on the vehicle inside the observation window'],
  ['repeat_vehicle', 'yes when the vehicle has two or more failures of the module type'],
  ['defect_ref', 'Defect reference (empty on a vehicle row without a failure)'],
  ['reported_at', 'When the defect was reported (ISO 8601, UTC)'],
  ['position', 'Door or body position (FL, FR, RL, RR, SL, SR, TG)'],
  ['defect_status', 'Defect status'],
  ['symptom', 'Reported symptom'],
  ['dtcs', 'Fault codes, space-separated (SAE J2012 form)'],
  ['moisture', 'Moisture found: none, traces, corrosion, standing_water (empty = not recorded)'],
  ['root_cause', 'Root cause recorded'],
  ['water_evidence', 'yes = moisture found or root cause water_ingress; no = diagnosed dry; not_diagnosed'],
  ['membrane_condition', 'Door membrane as found'],
  ['seal_condition', 'Door seal as found'],
  ['drain_condition', 'Drain holes as found'],
  ['connector_condition', 'Connector as found'],
  ['action', 'Repair action'],
  ['closed_at', 'When the defect was closed (ISO 8601, UTC)'],
  ['trace_verdicts', 'Verdicts of the hall-sensor traces stored with the defect, separated by "; "'],
] as const;

/** A cohort vehicle as the CSV needs it. */
export interface EvidenceVehicle {
  id: number;
  vin: string;
  fleetNumber: string | null;
  registration: string | null;
  make: string | null;
  model: string | null;
  buildMonth: string;
  inServiceDate: string;
  retiredDate: string | null;
  depotCode: string;
  parking: string;
  washesPerMonth: number;
  exposureIndex: number;
  failures: number;
  repeat: boolean;
}

/** A cohort failure as the CSV needs it. */
export interface EvidenceDefect {
  ref: string;
  vehicleId: number;
  reportedAt: string;
  position: string;
  status: string;
  symptom: string | null;
  dtcs: string[];
  moisture: string | null;
  rootCause: string | null;
  diagnosed: boolean;
  wet: boolean;
  conditions: { membrane: string | null; seal: string | null; drain: string | null; connector: string | null };
  action: string | null;
  closedAt: string | null;
  traces: { verdict: string }[];
}

/** The pattern the file is about. */
export interface EvidencePattern {
  id: number;
  moduleCode: string;
  exposureBand: string;
  buildFrom: string;
  buildTo: string;
  asOf: string;
}

/**
 * CSV text: header row of EVIDENCE_CSV_COLUMNS, CRLF line ends, RFC 4180 quoting, a leading byte-order mark so
 * that spreadsheets read UTF-8, and cells that start with = + - @ prefixed with ' so that no spreadsheet runs them
 * as formulas. Rows: each vehicle's failures in the order given, vehicles in the order given.
 */
export function buildEvidenceCsv(pattern: EvidencePattern, vehicles: readonly EvidenceVehicle[], defects: readonly EvidenceDefect[]): string {
  const byVehicle = new Map<number, EvidenceDefect[]>();
  for (const d of defects) {
    const list = byVehicle.get(d.vehicleId) ?? [];
    list.push(d);
    byVehicle.set(d.vehicleId, list);
  }
  const data: string[][] = [];
  for (const v of vehicles) {
    const head = [
      String(pattern.id), pattern.moduleCode, pattern.exposureBand, pattern.buildFrom, pattern.buildTo, pattern.asOf,
      v.vin, v.fleetNumber ?? '', v.registration ?? '', v.make ?? '', v.model ?? '', v.buildMonth, v.inServiceDate,
      v.retiredDate ?? '', v.depotCode, v.parking, String(v.washesPerMonth), String(v.exposureIndex), String(v.failures),
      v.repeat ? 'yes' : 'no',
    ];
    const list = byVehicle.get(v.id) ?? [];
    if (list.length === 0) {
      data.push([...head, ...new Array<string>(EVIDENCE_CSV_COLUMNS.length - head.length).fill('')]);
      continue;
    }
    for (const d of list) {
      data.push([
        ...head,
        d.ref, d.reportedAt, d.position, d.status, d.symptom ?? '', d.dtcs.join(' '), d.moisture ?? '', d.rootCause ?? '',
        !d.diagnosed ? 'not_diagnosed' : d.wet ? 'yes' : 'no',
        d.conditions.membrane ?? '', d.conditions.seal ?? '', d.conditions.drain ?? '', d.conditions.connector ?? '',
        d.action ?? '', d.closedAt ?? '', d.traces.map((t) => t.verdict).join('; '),
      ]);
    }
  }
  return '\uFEFF' + Papa.unparse({ fields: EVIDENCE_CSV_COLUMNS.map((c) => c[0]), data }, { newline: '\r\n', escapeFormulae: true });
}

/** File name of a pattern's evidence CSV, e.g. `seepline-pattern-12-WLR-2-high-2022-10-2023-03.csv`. */
export function evidenceCsvFileName(p: EvidencePattern): string {
  const safe = (s: string) => s.replace(/[^A-Za-z0-9-]+/g, '_');
  return `seepline-pattern-${p.id}-${safe(p.moduleCode)}-${p.exposureBand}-${p.buildFrom}-${p.buildTo}.csv`;
}
