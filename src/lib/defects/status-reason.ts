/**
 * The reason that explains where a defect stands now: the latest re-open, cancel or restore, as long as no
 * close came after it (a close ends that round of work). The status panel shows it at the top, so the
 * technician picking up a re-opened defect reads why before anything else.
 */

/** A status change as the timeline lists it. */
export interface StepLike {
  at: string;
  from: string;
  to: string;
  by: string | null;
  reason: string | null;
}

/** What kind of reasoned step it was. */
export type ReasonedStep = 'reopened' | 'cancelled' | 'restored';

/** The kind of a reasoned step, or null for any other step. */
export function reasonedStep(t: Pick<StepLike, 'from' | 'to'>): ReasonedStep | null {
  if (t.to === 'cancelled') return 'cancelled';
  if (t.from === 'closed' && t.to === 'diagnosing') return 'reopened';
  if (t.from === 'cancelled' && t.to === 'reported') return 'restored';
  return null;
}

/** The latest re-open, cancel or restore with a reason, unless the defect was closed since (oldest-first timeline). */
export function latestReason<T extends StepLike>(timeline: readonly T[]): (T & { kind: ReasonedStep }) | null {
  for (let i = timeline.length - 1; i >= 0; i--) {
    const t = timeline[i]!;
    if (t.to === 'closed') return null;
    const kind = reasonedStep(t);
    if (kind && t.reason) return { ...t, kind };
  }
  return null;
}
