/**
 * Repeat-repair detection. A defect is a repeat when the same vehicle had a closed defect on the same door
 * position and the same module function, closed no more than `windowDays` (default 90, common practice for
 * a "comeback" window) before the new defect was reported. It links to the most recently closed such defect.
 * Cancelled defects take no part: they are never the earlier repair, and never a repeat themselves (a
 * cancelled report was no repair). Re-opening a defect clears its closed time, so the later defects that
 * repeated it lose the link until it is closed again.
 */
export const DEFAULT_REPEAT_WINDOW_DAYS = 90;
const DAY_MS = 86_400_000;

export type RepeatCandidate = {
  id: number;
  vehicleId: number;
  position: string;
  moduleFunction: string;
  reportedAt: number;
  closedAt: number | null;
  /** Cancelled defects are never the earlier repair of a repeat. */
  cancelled?: boolean;
};

/** For each defect, the id of the earlier closed defect it repeats, or null. */
export function computeRepeats(defects: RepeatCandidate[], windowDays = DEFAULT_REPEAT_WINDOW_DAYS): Map<number, number | null> {
  const out = new Map<number, number | null>();
  const groups = new Map<string, RepeatCandidate[]>();
  for (const d of defects) {
    const k = `${d.vehicleId}|${d.position}|${d.moduleFunction}`;
    let g = groups.get(k);
    if (!g) groups.set(k, (g = []));
    g.push(d);
  }
  const limitMs = windowDays * DAY_MS;
  for (const g of groups.values()) {
    const closed = g.filter((d) => d.closedAt !== null && !d.cancelled).sort((a, b) => a.closedAt! - b.closedAt!);
    for (const d of g) {
      if (d.cancelled) {
        out.set(d.id, null);
        continue;
      }
      let best: RepeatCandidate | null = null;
      for (const e of closed) {
        if (e.id === d.id) continue;
        const gap = d.reportedAt - e.closedAt!;
        if (gap < 0) break;
        if (gap <= limitMs && e.reportedAt < d.reportedAt) best = e;
      }
      out.set(d.id, best ? best.id : null);
    }
  }
  return out;
}
