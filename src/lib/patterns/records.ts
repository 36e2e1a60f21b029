/**
 * Pattern records, the pure part: which stored record a cohort of the latest report belongs to (identity across
 * re-runs), what changed since a person last acted on it, and which status moves are allowed.
 * The service (src/server/patterns-records.ts) loads and writes the rows; docs/decisions/011 explains the design.
 */
import { toMonthIndex } from './calendar';

/** Status of a pattern record. */
export type PatternStatus = 'new' | 'acknowledged' | 'campaign_planned' | 'resolved' | 'dismissed';

/** Every status, in the order a pattern usually moves through them. */
export const PATTERN_STATUS_VALUES: readonly PatternStatus[] = Object.freeze(['new', 'acknowledged', 'campaign_planned', 'resolved', 'dismissed'] as const);

/**
 * Allowed moves. `campaign_planned → campaign_planned` revises the plan; `resolved`/`dismissed → acknowledged`
 * reopens a pattern (for instance when failures keep coming after a campaign). Nothing goes back to `new`, and a
 * pattern is resolved only through a planned campaign.
 */
export const PATTERN_STATUS_TRANSITIONS: Readonly<Record<PatternStatus, readonly PatternStatus[]>> = Object.freeze({
  new: ['acknowledged', 'campaign_planned', 'dismissed'],
  acknowledged: ['campaign_planned', 'dismissed'],
  campaign_planned: ['campaign_planned', 'resolved', 'dismissed'],
  resolved: ['acknowledged'],
  dismissed: ['acknowledged'],
});

/** True when a record in status `from` may move to `to`. */
export function canMovePatternStatus(from: PatternStatus, to: PatternStatus): boolean {
  return PATTERN_STATUS_TRANSITIONS[from].includes(to);
}

/** An inclusive range of build months `YYYY-MM`. */
export interface BuildRange {
  buildFrom: string;
  buildTo: string;
}

/** Months two inclusive ranges share (0 when they do not overlap). */
export function overlapMonths(a: BuildRange, b: BuildRange): number {
  const from = Math.max(toMonthIndex(a.buildFrom), toMonthIndex(b.buildFrom));
  const to = Math.min(toMonthIndex(a.buildTo), toMonthIndex(b.buildTo));
  return Math.max(0, to - from + 1);
}

/** How a range moved: the same, widened (contains the old one), narrowed (inside it) or moved (anything else). */
export type RangeChange = 'same' | 'widened' | 'narrowed' | 'moved';

/** Compare the range a person acted on (`before`) with the latest one (`after`). */
export function describeRangeChange(before: BuildRange, after: BuildRange): RangeChange {
  const bf = toMonthIndex(before.buildFrom);
  const bt = toMonthIndex(before.buildTo);
  const af = toMonthIndex(after.buildFrom);
  const at = toMonthIndex(after.buildTo);
  if (bf === af && bt === at) return 'same';
  if (af <= bf && at >= bt) return 'widened';
  if (af >= bf && at <= bt) return 'narrowed';
  return 'moved';
}

/** What identifies a stored record for matching. */
export interface RecordIdentity extends BuildRange {
  id: number;
  key: string;
  /** Epoch ms the record last matched a report (ties: the more recent wins). */
  lastSeenAt: number;
}

/** What identifies a cohort of a report for matching. */
export interface CohortIdentity extends BuildRange {
  key: string;
}

/**
 * The record a cohort belongs to: same key (module type and exposure band) and an overlapping build range. With
 * several candidates: the largest overlap, then the most recently seen, then the lowest id. Null = a new pattern.
 */
export function matchPatternRecord<R extends RecordIdentity>(cohort: CohortIdentity, records: readonly R[]): R | null {
  let best: R | null = null;
  let bestOverlap = 0;
  for (const r of records) {
    if (r.key !== cohort.key) continue;
    const o = overlapMonths(r, cohort);
    if (o === 0) continue;
    if (
      best === null ||
      o > bestOverlap ||
      (o === bestOverlap && (r.lastSeenAt > best.lastSeenAt || (r.lastSeenAt === best.lastSeenAt && r.id < best.id)))
    ) {
      best = r;
      bestOverlap = o;
    }
  }
  return best;
}

/** A cohort of the report as the sync sees it. */
export interface SyncCohort extends CohortIdentity {
  significant: boolean;
}

/** What a sync does: cohorts to record anew, records to update with a cohort, records the report did not match. */
export interface SyncPlan<C extends SyncCohort, R extends RecordIdentity> {
  create: C[];
  update: { record: R; cohort: C }[];
  unmatched: R[];
}

/**
 * Plan a sync of stored records with the cohorts of a fleet-wide report. A significant cohort without a record
 * becomes a new record; any cohort (significant or not) whose record exists updates it, so that a record can show
 * "no longer significant"; a record claimed by no cohort is left as it was (not in the latest report). One cohort
 * per key exists in a report, so each record is claimed at most once.
 */
export function planPatternSync<C extends SyncCohort, R extends RecordIdentity>(cohorts: readonly C[], records: readonly R[]): SyncPlan<C, R> {
  const create: C[] = [];
  const update: { record: R; cohort: C }[] = [];
  const claimed = new Set<number>();
  for (const c of cohorts) {
    const r = matchPatternRecord(c, records.filter((x) => !claimed.has(x.id)));
    if (r) {
      claimed.add(r.id);
      update.push({ record: r, cohort: c });
    } else if (c.significant) {
      create.push(c);
    }
  }
  return { create, update, unmatched: records.filter((r) => !claimed.has(r.id)) };
}

/** The stored facts "what changed" is computed from. */
export interface ChangeInputs extends BuildRange {
  failures: number;
  significant: boolean;
  actedFailures: number;
  actedBuildFrom: string;
  actedBuildTo: string;
  /** Whether the latest sync matched this record. */
  inLatestReport: boolean;
}

/** What changed since a person last acted on a record (or since it was first recorded). */
export interface PatternChanges {
  changed: boolean;
  range: RangeChange;
  /** Failures in the cohort now minus then (never negative). */
  newFailures: number;
  noLongerSignificant: boolean;
  notInLatestReport: boolean;
  /** The changes in words, one per item. */
  summary: string[];
}

/** A build month `YYYY-MM` in words, "Feb 2023" (the one month format of the Patterns pages and pack). */
export function formatMonth(m: string): string {
  return monthWords(m);
}

/**
 * A calendar day `YYYY-MM-DD`, or the UTC day of an ISO instant, in words: "24 Sep 2023" (the same month names as
 * formatMonth, whatever the browser's locale data calls September). Anything else is returned as it is.
 */
export function formatDay(s: string | null | undefined): string {
  if (!s) return '–';
  const day = /^\d{4}-\d{2}-\d{2}$/.test(s) ? s : /^\d{4}-\d{2}-\d{2}T/.test(s) && !Number.isNaN(Date.parse(s)) ? new Date(s).toISOString().slice(0, 10) : null;
  if (!day) return s;
  return `${day.slice(8, 10)} ${monthWords(day.slice(0, 7))}`;
}

function monthWords(m: string): string {
  const names = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
  const [y, mo] = m.split('-');
  return `${names[Number(mo) - 1] ?? mo} ${y}`;
}

/** Describe a range in words, e.g. "Oct 2022 – Mar 2023". */
export function formatBuildRange(r: BuildRange): string {
  return r.buildFrom === r.buildTo ? monthWords(r.buildFrom) : `${monthWords(r.buildFrom)} – ${monthWords(r.buildTo)}`;
}

/**
 * Changes of a record since a person last acted on it. `failuresWhere` qualifies the new failures in words when
 * they are counted over part of the fleet (e.g. "in your depots").
 */
export function computePatternChanges(x: ChangeInputs, failuresWhere?: string): PatternChanges {
  const before = { buildFrom: x.actedBuildFrom, buildTo: x.actedBuildTo };
  const range = describeRangeChange(before, x);
  const newFailures = Math.max(0, x.failures - x.actedFailures);
  const summary: string[] = [];
  if (range !== 'same') summary.push(`Build range ${range} from ${formatBuildRange(before)} to ${formatBuildRange(x)}`);
  if (newFailures > 0) summary.push(`${newFailures} new ${newFailures === 1 ? 'failure' : 'failures'}${failuresWhere ? ` ${failuresWhere}` : ''}`);
  if (!x.significant) summary.push('No longer significant');
  if (!x.inLatestReport) summary.push('Not found in the latest report');
  return {
    changed: summary.length > 0,
    range,
    newFailures,
    noLongerSignificant: !x.significant,
    notInLatestReport: !x.inLatestReport,
    summary,
  };
}

/**
 * A campaign is overdue when it is in force (status campaign planned) and its target date is before today (both
 * `YYYY-MM-DD`, compared as calendar days). A resolved campaign is never overdue.
 */
export function isCampaignOverdue(status: PatternStatus, targetDate: string | null, today: string): boolean {
  return status === 'campaign_planned' && targetDate !== null && targetDate !== '' && targetDate < today;
}

/** The campaign fields a person sets. */
export interface CampaignFields {
  kind: string;
  note: string;
  targetDate: string;
}

/** The fields of a campaign that a revision changes, in form order (empty when nothing changed). */
export function diffCampaign(before: Partial<CampaignFields> | null, after: CampaignFields): { field: 'campaignKind' | 'campaignNote' | 'campaignTargetDate'; oldValue: string | null; newValue: string }[] {
  const out: { field: 'campaignKind' | 'campaignNote' | 'campaignTargetDate'; oldValue: string | null; newValue: string }[] = [];
  const old = (v: string | undefined | null) => (v === undefined || v === null ? null : v);
  if (old(before?.kind) !== after.kind) out.push({ field: 'campaignKind', oldValue: old(before?.kind), newValue: after.kind });
  if (old(before?.note) !== after.note) out.push({ field: 'campaignNote', oldValue: old(before?.note), newValue: after.note });
  if (old(before?.targetDate) !== after.targetDate) out.push({ field: 'campaignTargetDate', oldValue: old(before?.targetDate), newValue: after.targetDate });
  return out;
}

/** One audit row as the history groups it. */
export interface HistoryAuditRow {
  id: number;
  at: string;
  who: string;
  action: string;
  field: string | null;
  oldValue: string | null;
  newValue: string | null;
}

/** One history entry: one action by one person at one moment, with the fields it changed. */
export interface HistoryEntry {
  id: number;
  at: string;
  who: string;
  action: string;
  text: string | null;
  changes: { field: string; oldValue: string | null; newValue: string | null }[];
}

/**
 * Group audit rows (newest first) into history entries: consecutive rows of the same action, person and moment are
 * one entry — a status move with its note, or a campaign revision with every field it changed. Rows without a field
 * (a pattern found) are entries of their own with their text.
 */
export function groupPatternHistory(rows: readonly HistoryAuditRow[]): HistoryEntry[] {
  const out: HistoryEntry[] = [];
  for (const r of rows) {
    const last = out[out.length - 1];
    if (r.field !== null && last && last.changes.length > 0 && last.at === r.at && last.who === r.who && last.action === r.action) {
      // Rows come newest first; within one action they were written in form order, so put each in front.
      last.changes.unshift({ field: r.field, oldValue: r.oldValue, newValue: r.newValue });
      last.id = Math.min(last.id, r.id);
      continue;
    }
    out.push({
      id: r.id,
      at: r.at,
      who: r.who,
      action: r.action,
      text: r.field === null ? r.newValue : null,
      changes: r.field === null ? [] : [{ field: r.field, oldValue: r.oldValue, newValue: r.newValue }],
    });
  }
  return out;
}
