/**
 * Request schemas and response shapes of the patterns routes (report, records, status changes, sync, MCF), shared
 * by the API and the Patterns islands. Edit when a status move needs another field or a response gains one.
 */
import { z } from 'zod';
import type { CohortFigures, CohortVerdict, ExposureBand, ModuleBaseline, PatternCohort, PatternsReport } from '@/lib/patterns/types';
import type { PatternChanges } from '@/lib/patterns/records';

/** Campaign kinds: what a fleet manager decides for a cohort. */
export const CAMPAIGN_KIND_VALUES = ['inspect_cohort', 'washing_practice', 'new_membranes', 'reseal_connectors', 'replace_module', 'other'] as const;
export type CampaignKind = (typeof CAMPAIGN_KIND_VALUES)[number];

/** Pattern statuses (see src/lib/patterns/records.ts for the allowed moves). */
export const PATTERN_STATUS_ENUM = ['new', 'acknowledged', 'campaign_planned', 'resolved', 'dismissed'] as const;

/** Longest note or reason kept with a status change. */
export const PATTERN_NOTE_MAX = 2000;

const note = z.string().trim().max(PATTERN_NOTE_MAX, `At most ${PATTERN_NOTE_MAX} characters`);
/** True for a real calendar day written `YYYY-MM-DD`. */
export function isCalendarDate(v: string): boolean {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(v);
  if (!m) return false;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return d.toISOString().slice(0, 10) === v;
}

const calendarDate = z
  .string()
  .trim()
  .refine(isCalendarDate, 'A date YYYY-MM-DD')
  .refine((v) => v >= '2000-01-01' && v <= '2100-12-31', 'A date between 2000 and 2100');

/** The campaign recorded with the "campaign planned" status. */
export const CampaignSchema = z.object({
  kind: z.enum(CAMPAIGN_KIND_VALUES, `kind must be one of ${CAMPAIGN_KIND_VALUES.join(', ')}`),
  note: note.min(3, 'Say what the campaign does (at least 3 characters)'),
  targetDate: calendarDate,
});
export type Campaign = z.infer<typeof CampaignSchema>;

const version = z.number().int().positive().optional();

/** Body of `POST /api/patterns/{id}/status`. `version`, when sent, must match the record's (else 409). */
export const PatternStatusChangeSchema = z.discriminatedUnion(
  'status',
  [
    z.object({ status: z.literal('acknowledged'), note: note.optional(), version }),
    z.object({ status: z.literal('campaign_planned'), campaign: CampaignSchema, note: note.optional(), version }),
    z.object({ status: z.literal('resolved'), note: note.optional(), version }),
    z.object({ status: z.literal('dismissed'), reason: note.min(3, 'Give the reason for dismissing (at least 3 characters)'), version }),
  ],
  'status must be acknowledged, campaign_planned, resolved or dismissed',
);
export type PatternStatusChange = z.infer<typeof PatternStatusChangeSchema>;

const list = (allowed: readonly string[], name: string) =>
  z
    .string()
    .max(200)
    .transform((v) => v.split(',').map((s) => s.trim()).filter(Boolean))
    .refine((vs) => vs.every((v) => allowed.includes(v)), `${name} must be among ${allowed.join(', ')}`);

/** Query of `GET /api/patterns/records`. */
export const PatternRecordsQuerySchema = z.object({
  status: list(PATTERN_STATUS_ENUM, 'status').optional(),
  module: z.string().trim().max(32).optional(),
  water: z.enum(['1', '0', 'true', 'false'], 'water must be 1 or 0').optional(),
  changed: z.enum(['1', '0', 'true', 'false'], 'changed must be 1 or 0').optional(),
});
export type PatternRecordsQuery = z.infer<typeof PatternRecordsQuerySchema>;

// ---------------------------------------------------------------------------------------------------------------
// Response shapes (the server builds them; the islands read them).

/** A pattern status. */
export type PatternStatusValue = (typeof PATTERN_STATUS_ENUM)[number];

/**
 * The record a cohort of `GET /api/patterns` belongs to, among those the caller may see (`overdue`: a campaign in
 * force whose target date has passed). Status and changes are today's, whatever the report's as-of day.
 */
export type CohortRecordRef = { id: number; status: PatternStatusValue; changed: boolean; changes: string[]; overdue: boolean } | null;

/** One cohort of `GET /api/patterns` (the contract's fields and the engine's extras). */
export type PatternsReportCohort = Omit<PatternCohort, 'vehicleIds' | 'failureIds' | 'repeatVehicleIds' | 'byMonth'> & { record: CohortRecordRef };

/** `GET /api/patterns`. */
export type PatternsReportResponse = Omit<PatternsReport, 'cohorts'> & { cohorts: PatternsReportCohort[] };

/**
 * A campaign as recorded: `inForce` while the pattern's status is "campaign planned" (afterwards it is the last
 * campaign), `overdue` when in force and its target date is before today.
 */
export type CampaignRecord = { kind: CampaignKind; note: string; targetDate: string; inForce: boolean; overdue: boolean };

/** Whose data a record's figures are computed from: the whole fleet, or the caller's depots only (docs/decisions/013). */
export type FiguresScope = 'fleet' | 'depots';

/** A pattern record as lists show it. */
export type PatternRecordSummary = {
  id: number;
  key: string;
  moduleCode: string;
  moduleName: string | null;
  exposureBand: ExposureBand;
  cohortId: string;
  buildFrom: string;
  buildTo: string;
  firstBuildFrom: string;
  firstBuildTo: string;
  vehicles: number;
  failures: number;
  expected: number;
  rateRatio: number | null;
  ciLow: number | null;
  ciHigh: number | null;
  /** Null when the figures are the caller's depots' (no search was run over them). */
  qValue: number | null;
  moistureShare: number;
  repeatVehicles: number;
  /** The fleet-wide verdict of the record (part of its identity, whoever reads it). */
  significant: boolean;
  waterIngress: boolean;
  /** Whose data `vehicles` … `repeatVehicles` and `changes.newFailures` count; `depotCodes` names the caller's depots. */
  figuresScope: FiguresScope;
  depotCodes: string[] | null;
  status: PatternStatusValue;
  statusReason: string | null;
  statusAt: string | null;
  campaign: CampaignRecord | null;
  changes: PatternChanges;
  actedAt: string | null;
  snapshotAsOf: string;
  firstSeenAt: string | null;
  lastSeenAt: string | null;
  version: number;
};

/** When the records were last brought up to date. */
export type PatternSyncRef = { id: number; at: string; asOf: string } | null;

/** `GET /api/patterns/records`. */
export type PatternRecordsResponse = { items: PatternRecordSummary[]; total: number; lastSync: PatternSyncRef };

/** A cohort vehicle on the pattern page (caller's depots). */
export type PatternVehicleRow = {
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
  exposureBand: ExposureBand;
  failures: number;
  repeat: boolean;
};

/** A cohort failure on the pattern page (caller's depots), with the verdicts of its stored traces. */
export type PatternDefectRow = {
  id: number;
  ref: string;
  vehicleId: number;
  vin: string;
  fleetNumber: string | null;
  depotCode: string;
  reportedAt: string;
  position: string;
  status: string;
  symptom: string | null;
  dtcs: string[];
  moisture: string | null;
  rootCause: string | null;
  action: string | null;
  closedAt: string | null;
  conditions: { membrane: string | null; seal: string | null; drain: string | null; connector: string | null };
  diagnosed: boolean;
  wet: boolean;
  traces: { id: number; verdict: string; fileName: string | null }[];
};

/**
 * One entry of a record's history: one action (a status move, a campaign revision, a change the report found), with
 * the fields it changed. `action`: found, status, campaign_revised or report; `text` for entries without fields.
 */
export type PatternHistoryRow = {
  id: number;
  at: string;
  who: string;
  action: string;
  text: string | null;
  changes: { field: string; oldValue: string | null; newValue: string | null }[];
};

/** The scan's figures of a report's cohort: how its build range was found and how unlikely it is by chance. */
export type CohortSearch = Pick<PatternCohort, 'pValue' | 'qValue' | 'scanLlr' | 'scanExpected' | 'mcP' | 'gumbelP' | 'pValueMethod' | 'replicates' | 'windowsTested'>;

/**
 * A cohort as the pattern and group pages show it: its figures over the data the caller may see, the verdict, and
 * the scan (`search`), which is null when a record's fleet-wide range is read over the caller's depots.
 */
export type CohortView = Omit<CohortFigures, 'vehicleIds' | 'failureIds' | 'repeatVehicleIds'> & {
  significant: boolean;
  waterIngress: boolean;
  verdict: CohortVerdict;
  search: CohortSearch | null;
};

/** `GET /api/patterns/{id}`. */
export type PatternRecordDetail = PatternRecordSummary & {
  statusBy: { id: number; name: string } | null;
  module: { code: string; name: string | null; function: string | null; partNumber: string | null; supplier: string | null };
  /** The module's baseline over the data the figures come from (the fleet, or the caller's depots). */
  baseline: ModuleBaseline | null;
  cohort: CohortView;
  method: PatternsReport['method'];
  /** Whose depots the vehicle and defect lists cover. */
  scope: 'all' | 'depots';
  /** When the last campaign was resolved (null while in force or never resolved). */
  campaignResolvedAt: string | null;
  /** Groups the fleet-wide report tested (false-discovery control ran across them); null for depot figures. */
  cohortsTested: number | null;
  vehicleList: PatternVehicleRow[];
  defectList: PatternDefectRow[];
  history: PatternHistoryRow[];
  /** Statuses the caller may move the record to (empty for read-only roles). */
  allowedStatuses: PatternStatusValue[];
  lastSync: PatternSyncRef;
};

/** `GET /api/patterns/group`: one module type × band of the report as of a day, read only (no record actions). */
export type PatternGroupDetail = {
  asOf: string;
  today: string;
  module: PatternRecordDetail['module'];
  baseline: ModuleBaseline | null;
  cohort: CohortView;
  method: PatternsReport['method'];
  scope: 'all' | 'depots';
  depotCodes: string[] | null;
  /** How many groups the report tested (false-discovery control runs across all of them). */
  cohortsTested: number;
  vehicleList: PatternVehicleRow[];
  defectList: PatternDefectRow[];
  /** The pattern record this group belongs to (today's status), if any. */
  record: CohortRecordRef;
};

/** Query of `GET /api/patterns/group`. */
export const PatternGroupQuerySchema = z.object({
  module: z.string().trim().min(1, 'module is required').max(32),
  band: z.enum(['low', 'medium', 'high'], 'band must be low, medium or high'),
  asOf: z.string().optional(),
});

/** `POST /api/patterns/sync`. */
export type PatternSyncResponse = { syncId: number; asOf: string; upToDate: boolean; created: number; updated: number; at: string };

/** One point of an MCF curve. */
export type McfPointJson = { ageDays: number; mcf: number; lower: number; upper: number; atRisk: number; events: number; variance: number; varianceNaive: number };

/**
 * `GET /api/patterns/mcf`. With the optional `band`, `buildFrom` and `buildTo`, `compare` adds the curve of the
 * cohort (that band's vehicles built in the range) and of the rest of its band.
 */
export type McfResponse = {
  series: { key: 'all' | ExposureBand; points: McfPointJson[] }[];
  compare?: { band: ExposureBand; buildFrom: string; buildTo: string; series: { key: 'cohort' | 'rest'; points: McfPointJson[] }[] };
};
