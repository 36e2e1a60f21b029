/**
 * Shaping the patterns charts' data (pure, so the pattern page and the printed pack draw the same thing): every build
 * month of the range on the build-month axis, empty months as gaps rather than squeezed out; MCF curves that stop
 * where too few vehicles remain observed to say anything; whole-year ticks on the age axis.
 */
import { formatMonthIndex, toMonthIndex } from './calendar';
import type { CohortMonth } from './types';

/** A build month on the chart: the engine's month, or an empty month (no vehicles of the band built then). */
export type ChartMonth = Omit<CohortMonth, 'expected'> & { expected: number | null; empty: boolean };

/**
 * Every month from the first to the last build month given, in order. Months without vehicles are added as empty
 * (no failures, no expectation: a gap in the line); a month inside buildFrom..buildTo counts as in the cohort.
 */
export function fillBuildMonths(months: readonly CohortMonth[], range?: { buildFrom: string; buildTo: string }): ChartMonth[] {
  if (months.length === 0) return [];
  const byMonth = new Map(months.map((m) => [m.month, m]));
  const indices = months.map((m) => toMonthIndex(m.month));
  const first = Math.min(...indices);
  const last = Math.max(...indices);
  const from = range ? toMonthIndex(range.buildFrom) : null;
  const to = range ? toMonthIndex(range.buildTo) : null;
  const out: ChartMonth[] = [];
  for (let i = first; i <= last; i++) {
    const month = formatMonthIndex(i);
    const m = byMonth.get(month);
    if (m) out.push({ ...m, empty: false });
    else out.push({ month, vehicles: 0, vehicleYears: 0, failures: 0, expected: null, inCohort: from !== null && to !== null && i >= from && i <= to, empty: true });
  }
  return out;
}

/** Fewest vehicles still observed at an age for an MCF curve to go on: beyond it, one vehicle moves the curve. */
export const MCF_MIN_AT_RISK = 5;

/** An MCF curve cut where fewer than `minAtRisk` vehicles remain observed (at-risk falls with age, so this is a tail). */
export function trimMcfTail<P extends { atRisk: number }>(points: readonly P[], minAtRisk = MCF_MIN_AT_RISK): { points: P[]; dropped: number } {
  let end = points.length;
  while (end > 0 && (points[end - 1] as P).atRisk < minAtRisk) end--;
  return { points: points.slice(0, end), dropped: points.length - end };
}

/** Whole-year ticks from 0 up to the largest whole year not beyond `maxYears` (at least [0, 1]). */
export function yearTicks(maxYears: number): number[] {
  const top = Math.max(1, Math.floor(maxYears + 1e-9));
  return Array.from({ length: top + 1 }, (_, i) => i);
}
