/**
 * What a cohort's "failures of the module" were. The engine counts every defect of the module type on a cohort
 * vehicle as a failure (CONTRACT.md), whatever its root cause turned out to be; a quality engineer reading a
 * warranty claim needs to see at once how many were faults of the part itself (sensor, mechanical) and how many
 * had another cause (water, connector, wiring, software). Counts and shares by root cause and by moisture finding.
 */

/** Root causes that are faults of the module itself (what a supplier answers for directly). */
export const PART_FAULT_CAUSES: readonly string[] = Object.freeze(['sensor', 'mechanical']);

/** Order of root causes in the breakdown: part faults first, then the other causes, then the unknowns. */
const CAUSE_ORDER = ['sensor', 'mechanical', 'water_ingress', 'connector', 'wiring', 'software', 'unknown'];
/** Order of moisture findings: wettest first. */
const MOISTURE_ORDER = ['standing_water', 'corrosion', 'traces', 'none'];

/** The value a breakdown row stands for when nothing was recorded. */
export const NOT_RECORDED = 'not_recorded';

/** One row of a breakdown. */
export interface BreakdownRow {
  /** The root cause or moisture value, or `not_recorded`. */
  key: string;
  count: number;
  /** count / total (0 when there are no failures). */
  share: number;
}

/** A cohort's failures by root cause and by moisture finding. */
export interface FailureBreakdown {
  total: number;
  /** Rows with at least one failure, in a fixed order (part faults first; not recorded last). */
  byRootCause: BreakdownRow[];
  byMoisture: BreakdownRow[];
  /** Failures whose root cause is a fault of the part (sensor or mechanical). */
  partFaults: number;
  /** Failures with another recorded root cause (water ingress, connector, wiring, software). */
  otherCauses: number;
  /** Root cause recorded as unknown, or not recorded yet. */
  undetermined: number;
}

/** A failure as the breakdown reads it. */
export interface BreakdownFailure {
  rootCause: string | null;
  moisture: string | null;
}

function rows(values: (string | null)[], order: readonly string[], total: number): BreakdownRow[] {
  const counts = new Map<string, number>();
  for (const v of values) {
    const k = v ?? NOT_RECORDED;
    counts.set(k, (counts.get(k) ?? 0) + 1);
  }
  const keys = [...order, ...[...counts.keys()].filter((k) => !order.includes(k) && k !== NOT_RECORDED).sort(), NOT_RECORDED];
  return keys.filter((k) => counts.has(k)).map((k) => ({ key: k, count: counts.get(k)!, share: total > 0 ? counts.get(k)! / total : 0 }));
}

/** Count a cohort's failures by root cause and by moisture finding. */
export function computeFailureBreakdown(failures: readonly BreakdownFailure[]): FailureBreakdown {
  const total = failures.length;
  const byRootCause = rows(failures.map((f) => f.rootCause), CAUSE_ORDER, total);
  const byMoisture = rows(failures.map((f) => f.moisture), MOISTURE_ORDER, total);
  let partFaults = 0;
  let undetermined = 0;
  for (const f of failures) {
    if (f.rootCause !== null && PART_FAULT_CAUSES.includes(f.rootCause)) partFaults++;
    else if (f.rootCause === null || f.rootCause === 'unknown') undetermined++;
  }
  return { total, byRootCause, byMoisture, partFaults, otherCauses: total - partFaults - undetermined, undetermined };
}

/**
 * The breakdown in one sentence, e.g. "Of the 53 failures, 5 were faults of the part itself (sensor or mechanical),
 * 45 had another cause (water ingress 35, connector 7, wiring 2, software 1) and 3 have no known root cause."
 * `label` names a root cause for reading.
 */
export function describeFailureBreakdown(b: FailureBreakdown, label: (rootCause: string) => string): string {
  if (b.total === 0) return 'There are no failures to break down.';
  const n = (x: number, one: string, many: string) => `${x} ${x === 1 ? one : many}`;
  const others = b.byRootCause.filter((r) => r.key !== NOT_RECORDED && r.key !== 'unknown' && !PART_FAULT_CAUSES.includes(r.key));
  // The part faults are always said (a claim turns on them, even when none); the other kinds only when present.
  const parts = [`${n(b.partFaults, 'was a fault', 'were faults')} of the part itself (sensor or mechanical)`];
  if (b.otherCauses > 0) parts.push(`${b.otherCauses} had another cause${others.length ? ` (${others.map((r) => `${label(r.key).toLowerCase()} ${r.count}`).join(', ')})` : ''}`);
  if (b.undetermined > 0) parts.push(`${b.undetermined} ${b.undetermined === 1 ? 'has' : 'have'} no known root cause`);
  const last = parts.pop()!;
  return `Of the ${n(b.total, 'failure', 'failures')}, ${parts.length ? `${parts.join(', ')} and ${last}` : last}.`;
}
