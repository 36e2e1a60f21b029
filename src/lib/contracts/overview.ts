/**
 * Response of GET /api/overview (and the Overview page's props): the caller's open work and where faults come
 * back, aggregated on the server over the depots they may see. Windows are UTC calendar days so that each
 * figure equals the count of the Defects list filtered by its link (src/lib/overview/links.ts).
 */

/** The open statuses, in workflow order. */
export const OPEN_STATUSES = ['reported', 'diagnosing', 'awaiting_parts', 'repaired', 'verified'] as const;
/** One open status. */
export type OpenStatus = (typeof OPEN_STATUSES)[number];

/** Reported and repeat counts over a window. */
export type RepeatCounts = { reported: number; repeats: number; rate: number | null };

/** One depot in the caller's scope. */
export type OverviewDepot = RepeatCounts & {
  code: string;
  name: string;
  /** Open defects by status (every open status present, zeros included). */
  open: Record<OpenStatus, number>;
  openTotal: number;
  vehiclesInService: number;
  offRoad: number;
};

/** One module type with defects reported in the window. */
export type OverviewModule = RepeatCounts & { code: string; name: string };

/** One month of the repeat-rate trend; `partial` for the month still running (counted so far, not a whole month). */
export type OverviewMonth = RepeatCounts & { month: string; from: string; to: string; partial: boolean };

/** One open defect in the short lists (oldest first). */
export type OverviewDefect = {
  id: number;
  ref: string;
  status: string;
  reportedAt: string;
  ageDays: number;
  position: string;
  vin: string;
  fleetNumber: string | null;
  depotCode: string;
  /** The depot's IANA time zone (the reported day is shown in it). */
  depotTimeZone: string | null;
  moduleCode: string;
  symptom: string | null;
  repeatOfId: number | null;
  repeatOfRef: string | null;
};

/** One pattern record on the Overview (the fleet-wide records a person may see, acted on in Patterns). */
export type OverviewPattern = {
  id: number;
  moduleCode: string;
  moduleName: string | null;
  exposureBand: string;
  buildFrom: string;
  buildTo: string;
  /** Cohort vehicles and failures, over the fleet or, for a depot-scoped reader, their depots only (`figuresScope`). */
  vehicles: number;
  failures: number;
  expected: number;
  rateRatio: number | null;
  figuresScope: 'fleet' | 'depots';
  waterIngress: boolean;
  significant: boolean;
  status: string;
  /** The changes since a person last acted on it, in words (empty when none). */
  changes: string[];
  /** The campaign in force is past its target date (`YYYY-MM-DD`, null without a campaign in force). */
  overdue: boolean;
  campaignTargetDate: string | null;
  /** New and significant, changed since someone last acted on it, or a campaign past its target date. */
  needsAttention: boolean;
};

/** Patterns for roles that read them: counts and the records that most need a look. */
export type OverviewPatterns = {
  /** Records that are not resolved or dismissed. */
  open: number;
  needsAttention: number;
  waterIngressOpen: number;
  /** Campaigns in force past their target date. */
  overdue: number;
  /** When the records were last brought up to date with the report (null: never). */
  lastSyncAt: string | null;
  /** Up to OVERVIEW_PATTERN_ROWS open records, those needing attention first, then water ingress, then rate ratio. */
  items: OverviewPattern[];
};

/** Body of GET /api/overview. */
export type OverviewResponse = {
  asOf: string;
  /** What the caller sees: their role, whether every depot, and the repeat window in force. */
  role: string;
  allDepots: boolean;
  repeatWindowDays: number;
  /** First day (UTC) of the twelve-month window of the repeat and module figures. */
  windowFrom: string;
  /** Last day (UTC) the window covers so far: today, inside the month still running. */
  windowTo: string;
  /** Age (days) of the "open for long" figure. */
  staleDays: number;
  vehiclesInService: number;
  offRoad: number;
  openTotal: number;
  openStale: number;
  openByStatus: Record<OpenStatus, number>;
  window: RepeatCounts;
  depots: OverviewDepot[];
  modules: OverviewModule[];
  trend: OverviewMonth[];
  oldest: OverviewDefect[];
  /** The caller's own open defects (assigned to or reported by them); null for roles that do not work defects. */
  mine: { total: number; items: OverviewDefect[] } | null;
  /** Pattern records for roles that read patterns (managers, admins, supervisors); null for the others. */
  patterns: OverviewPatterns | null;
};
