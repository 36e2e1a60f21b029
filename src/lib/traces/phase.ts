/**
 * Relation between the two encoder channels (REFERENCES.md section 9): phase offset in electrical degrees,
 * direction, correlation, and an x4 quadrature decoder.
 *
 * - Lag: for each full A period (rising edge to rising edge) within 25% of the local median A period, the first
 *   B rising edge at or after the A rising edge gives lag = 360 x (tB - tA) / periodA, in [0, 360). Lags are combined by a circular mean,
 *   so values around 0/360 average correctly. A lag of 90 means B lags A a quarter period (A leads); 270
 *   (= -90) means B leads.
 * - phaseDeg (CONTRACT.md): how far B lags A, folded to 0-180, with `direction` saying which channel
 *   leads. Within DIRECTION_MIN_DEG of 0 or 180 the direction cannot be told: 'none'.
 * - x4 decoder: state = (A << 1) | B; the forward (A leads) sequence 00 -> 10 -> 11 -> 01 -> 00 counts +1
 *   per step, the reverse sequence -1, and a step changing both bits at once is invalid (counted as an error,
 *   position unchanged).
 */
import type { EdgeTrain } from './crossings';

/** Which channel leads. */
export type Direction = 'a_leads' | 'b_leads' | 'none';

/** Closer than this to 0 or 180 degrees, no direction can be told. */
export const DIRECTION_MIN_DEG = 5;

/** Phase relation of two channels. */
export interface PhaseResult {
  /** Circular mean of the per-cycle lag of B behind A, degrees in [0, 360); NaN without a measurable cycle. */
  lagDeg: number;
  /** How far B lags A folded to 0-180 (CONTRACT.md phaseDeg); 0 when not measurable. */
  phaseDeg: number;
  direction: Direction;
  /** A periods that had a B rising edge inside them. */
  cycles: number;
  /** Circular standard deviation of the per-cycle lags, degrees (0 = perfectly steady). */
  spreadDeg: number;
}

/** A periods further than this fraction from their median are left out of the phase (a missing or broken A pulse). */
export const PHASE_PERIOD_INLIER_FRACTION = 0.25;
/** A periods on each side that make up the local median. */
const PHASE_NEIGHBOURS = 4;

/** Median of an array (NaN when empty). */
function medianOf(values: Float64Array): number {
  if (values.length === 0) return NaN;
  const copy = Float64Array.from(values).sort();
  return (copy[(copy.length - 1) >> 1]! + copy[copy.length >> 1]!) / 2;
}

/**
 * Phase of B relative to A from the rising-edge instants of each (seconds, increasing). Only A periods
 * within PHASE_PERIOD_INLIER_FRACTION of the median of the A periods around them (or of `referencePeriodS`, B's median
 * period, where that median disagrees with it by more than the same fraction) are used, and only those holding a B edge.
 */
export function computePhase(risingA: ArrayLike<number>, risingB: ArrayLike<number>, referencePeriodS?: number): PhaseResult {
  let sumCos = 0;
  let sumSin = 0;
  let cycles = 0;
  let j = 0;
  const nb = risingB.length;
  const periods = new Float64Array(Math.max(0, risingA.length - 1));
  for (let k = 0; k < periods.length; k++) periods[k] = risingA[k + 1]! - risingA[k]!;
  for (let k = 0; k + 1 < risingA.length; k++) {
    const t0 = risingA[k]!;
    const period = periods[k]!;
    // A missed a pulse here (or one was broken): the angle would be taken against the wrong period. The
    // median is local (PHASE_NEIGHBOURS each side) so that a motor changing speed keeps all its cycles.
    let local = medianOf(periods.subarray(Math.max(0, k - PHASE_NEIGHBOURS), Math.min(periods.length, k + PHASE_NEIGHBOURS + 1)));
    if (referencePeriodS !== undefined && referencePeriodS > 0 && Math.abs(local - referencePeriodS) > PHASE_PERIOD_INLIER_FRACTION * referencePeriodS) {
      local = referencePeriodS; // A misses so many pulses that its own median misleads; B's period is the encoder's
    }
    if (Math.abs(period - local) > PHASE_PERIOD_INLIER_FRACTION * local) continue;
    while (j < nb && risingB[j]! < t0) j++;
    if (j >= nb) break;
    const lag = risingB[j]! - t0;
    if (lag >= period) continue; // B missed this cycle (dropout): no pair to measure
    const angle = (2 * Math.PI * lag) / period;
    sumCos += Math.cos(angle);
    sumSin += Math.sin(angle);
    cycles++;
  }
  if (cycles === 0) return { lagDeg: NaN, phaseDeg: 0, direction: 'none', cycles: 0, spreadDeg: 0 };
  let lagDeg = (Math.atan2(sumSin, sumCos) * 180) / Math.PI;
  if (lagDeg < 0) lagDeg += 360;
  if (lagDeg >= 360) lagDeg -= 360;
  const resultant = Math.min(1, Math.hypot(sumCos, sumSin) / cycles);
  const spreadDeg = resultant > 0 ? (Math.sqrt(-2 * Math.log(resultant)) * 180) / Math.PI : 180;
  return { lagDeg, ...foldLag(lagDeg), cycles, spreadDeg };
}

/** Fold a lag of B behind A (degrees, any range) into phaseDeg 0-180 and a direction. */
export function foldLag(lagDeg: number): { phaseDeg: number; direction: Direction } {
  const lag = ((lagDeg % 360) + 360) % 360;
  const phaseDeg = lag <= 180 ? lag : 360 - lag;
  if (phaseDeg < DIRECTION_MIN_DEG || phaseDeg > 180 - DIRECTION_MIN_DEG) return { phaseDeg, direction: 'none' };
  return { phaseDeg, direction: lag < 180 ? 'a_leads' : 'b_leads' };
}

/** Samples the correlation uses at most (every k-th pair beyond this). */
export const CORRELATION_SAMPLE_LIMIT = 500_000;

/** Correlation and spread of two channels. */
export interface CorrelationStats {
  /** Pearson correlation (0 when either channel is constant). */
  correlation: number;
  /** Standard deviations of the two channels, volts. */
  stdA: number;
  stdB: number;
}

/** Pearson correlation and standard deviations of two equally long sample arrays. */
export function computeCorrelationStats(a: ArrayLike<number>, b: ArrayLike<number>): CorrelationStats {
  const total = Math.min(a.length, b.length);
  if (total < 2) return { correlation: 0, stdA: 0, stdB: 0 };
  const stride = Math.max(1, Math.floor(total / CORRELATION_SAMPLE_LIMIT));
  // One pass over values shifted by the first sample (keeps the sums small, so no cancellation trouble).
  const ka = a[0]!;
  const kb = b[0]!;
  let sa = 0;
  let sb = 0;
  let saa = 0;
  let sbb = 0;
  let sab = 0;
  let n = 0;
  for (let i = 0; i < total; i += stride, n++) {
    const da = a[i]! - ka;
    const db = b[i]! - kb;
    sa += da;
    sb += db;
    saa += da * da;
    sbb += db * db;
    sab += da * db;
  }
  const va = Math.max(0, saa - (sa * sa) / n);
  const vb = Math.max(0, sbb - (sb * sb) / n);
  const stdA = Math.sqrt(va / n);
  const stdB = Math.sqrt(vb / n);
  if (!(va > 1e-12 * saa) || !(vb > 1e-12 * sbb) || !(va > 0) || !(vb > 0)) return { correlation: 0, stdA, stdB };
  const correlation = Math.max(-1, Math.min(1, (sab - (sa * sb) / n) / Math.sqrt(va * vb)));
  return { correlation, stdA, stdB };
}

/** Pearson correlation of two equally long sample arrays (0 when either is constant). */
export function computeCorrelation(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return computeCorrelationStats(a, b).correlation;
}

/** Count change for each (previous state, next state) pair, index prev * 4 + next; NaN = invalid step. */
const X4_STEP: readonly number[] = (() => {
  const forward = [0, 2, 3, 1]; // 00 -> 10 -> 11 -> 01 -> 00
  const table: number[] = new Array(16).fill(NaN);
  for (let s = 0; s < 4; s++) table[s * 4 + s] = 0;
  for (let i = 0; i < 4; i++) {
    const from = forward[i]!;
    const to = forward[(i + 1) % 4]!;
    table[from * 4 + to] = 1;
    table[to * 4 + from] = -1;
  }
  return table;
})();

/** Result of x4 quadrature decoding. */
export interface QuadratureCount {
  /** Net count: +1 per forward (A leads) step, -1 per reverse step. */
  count: number;
  /** Steps where both channels changed at once (position unchanged). */
  invalidTransitions: number;
}

/** Decode a sequence of 2-bit states (A << 1 | B) with an x4 quadrature decoder. */
export function decodeQuadratureX4(states: ArrayLike<number>): QuadratureCount {
  let count = 0;
  let invalid = 0;
  for (let i = 1; i < states.length; i++) {
    const step = X4_STEP[(states[i - 1]! & 3) * 4 + (states[i]! & 3)]!;
    if (Number.isNaN(step)) invalid++;
    else count += step;
  }
  return { count, invalidTransitions: invalid };
}

/**
 * Decode two channels' edge trains with the x4 decoder. Edges of A and B closer than `simultaneousS` are
 * taken as one step that changes both bits (invalid), as happens when the channels are bridged.
 */
export function countQuadrature(a: EdgeTrain, b: EdgeTrain, simultaneousS: number): QuadratureCount {
  const ta = a.timesS;
  const tb = b.timesS;
  let bitA = a.initialHigh ? 1 : 0;
  let bitB = b.initialHigh ? 1 : 0;
  const states: number[] = [(bitA << 1) | bitB];
  let i = 0;
  let j = 0;
  while (i < ta.length || j < tb.length) {
    const nextA = i < ta.length ? ta[i]! : Infinity;
    const nextB = j < tb.length ? tb[j]! : Infinity;
    if (Math.abs(nextA - nextB) < simultaneousS) {
      bitA ^= 1;
      bitB ^= 1;
      i++;
      j++;
    } else if (nextA < nextB) {
      bitA ^= 1;
      i++;
    } else {
      bitB ^= 1;
      j++;
    }
    states.push((bitA << 1) | bitB);
  }
  return decodeQuadratureX4(states);
}
