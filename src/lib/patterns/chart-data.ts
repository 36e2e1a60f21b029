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

/** One point of a step curve to merge (x in any unit; `y` the curve's value from x on). */
export interface StepPoint {
  x: number;
  y: number;
  lower: number;
  upper: number;
  atRisk: number;
}

/** A merged row: the x and, for each curve still running there, its value (`${key}`), limits and vehicles at risk. */
export type MergedRow = { x: number } & Record<string, number | null>;

/**
 * Merge step curves onto one x axis so that a chart can show every curve's value at any x (one tooltip for all):
 * each curve's value at x is its last point at or before x, null before its first point and after its last (the
 * curve ends there). Keys: `${key}`, `${key}Lower`, `${key}Upper`, `${key}AtRisk`. Rows sorted by x.
 */
export function mergeStepCurves(curves: readonly { key: string; points: readonly StepPoint[] }[]): MergedRow[] {
  const xs = [...new Set(curves.flatMap((c) => c.points.map((p) => p.x)))].sort((a, b) => a - b);
  const cursor = curves.map(() => -1);
  return xs.map((x) => {
    const row: MergedRow = { x } as MergedRow;
    curves.forEach((c, i) => {
      let k = cursor[i] as number;
      while (k + 1 < c.points.length && (c.points[k + 1] as StepPoint).x <= x) k++;
      cursor[i] = k;
      const last = c.points[c.points.length - 1];
      const p = k >= 0 && last && x <= last.x ? (c.points[k] as StepPoint) : null;
      row[c.key] = p ? p.y : null;
      row[`${c.key}Lower`] = p ? p.lower : null;
      row[`${c.key}Upper`] = p ? p.upper : null;
      row[`${c.key}AtRisk`] = p ? p.atRisk : null;
    });
    return row;
  });
}

/**
 * Round ticks from 0 to at least `max`: about `count` steps of 1, 2, 2.5 or 5 times a power of ten (so an axis
 * reads 0, 0.5, 1, 1.5, 2 rather than 0, 0.55, 1.1).
 */
export function niceTicks(max: number, count = 4): number[] {
  if (!(max > 0) || !Number.isFinite(max)) return [0, 1];
  const raw = max / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = ([1, 2, 2.5, 5, 10].find((m) => m * power >= raw) ?? 10) * power;
  const n = Math.ceil(max / step - 1e-9);
  // Round away binary noise (0.1 + 0.2) so the labels read cleanly.
  return Array.from({ length: n + 1 }, (_, i) => Number((i * step).toPrecision(12)));
}
