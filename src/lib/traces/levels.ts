/**
 * State levels of a two-level waveform by the histogram method of IEEE Std 181 (as implemented by signal
 * processing libraries; REFERENCES.md section 9): find min and max, bin the samples, split the histogram
 * into two halves between the first and last non-empty bins, and take each half's mode as its state level.
 *
 * Two ways to turn the modal bin into a voltage:
 * - 'bin-centre': the centre of the modal bin (what the library documentation describes);
 * - 'modal-mean': the mean of the samples that fell in the modal bin (no half-bin quantisation; the
 *   analysis uses this one so a clean 4.9 V level reads 4.9 V, not 4.876 V).
 */

/** Default number of histogram bins (the library default). */
export const DEFAULT_STATE_LEVEL_BINS = 100;

/** How the modal bin becomes a level. */
export type StateLevelMethod = 'bin-centre' | 'modal-mean';

/** Options of computeStateLevels. */
export interface StateLevelOptions {
  /** Histogram bins (default 100). */
  bins?: number;
  /** Default 'modal-mean'. */
  method?: StateLevelMethod;
  /** Only samples within [lowest, highest] volts are binned (all samples when absent). */
  rangeV?: readonly [number, number];
}

/** State levels found in a waveform, volts. */
export interface StateLevels {
  /** Low state level (mode of the lower half of the histogram). */
  lowV: number;
  /** High state level (mode of the upper half). */
  highV: number;
  /** 50% reference level, (lowV + highV) / 2. */
  midV: number;
  /** The most common level over the whole histogram (where a channel rests when it is stuck). */
  modeV: number;
  minV: number;
  maxV: number;
  binWidthV: number;
}

/** Compute IEEE 181 histogram-method state levels of `values` (all samples). */
export function computeStateLevels(values: ArrayLike<number>, opts: StateLevelOptions = {}): StateLevels {
  const bins = opts.bins ?? DEFAULT_STATE_LEVEL_BINS;
  const method = opts.method ?? 'modal-mean';
  if (!Number.isInteger(bins) || bins < 2) throw new RangeError('bins must be an integer of at least 2');
  const n = values.length;
  const lo = opts.rangeV?.[0] ?? -Infinity;
  const hi = opts.rangeV?.[1] ?? Infinity;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < n; i++) {
    const x = values[i]!;
    if (x < lo || x > hi) continue;
    if (x < min) min = x;
    if (x > max) max = x;
  }
  if (min === Infinity) throw new RangeError('no samples');
  if (!(max > min)) {
    return { lowV: min, highV: min, midV: min, modeV: min, minV: min, maxV: min, binWidthV: 0 };
  }
  const width = (max - min) / bins;
  const scale = bins / (max - min);
  const counts = new Float64Array(bins);
  const sums = new Float64Array(bins);
  const last = bins - 1;
  for (let i = 0; i < n; i++) {
    const x = values[i]!;
    if (x < min || x > max) continue;
    let k = Math.floor((x - min) * scale);
    if (k > last) k = last;
    counts[k]!++;
    sums[k]! += x;
  }
  // First and last non-empty bins are 0 and bins-1 by construction (min and max fall there).
  let first = 0;
  while (counts[first] === 0) first++;
  let lastNonEmpty = last;
  while (counts[lastNonEmpty] === 0) lastNonEmpty--;
  const split = first + Math.floor((lastNonEmpty - first + 1) / 2);
  const lowBin = argMax(counts, first, split);
  const highBin = argMax(counts, split, lastNonEmpty + 1);
  const modeBin = argMax(counts, first, lastNonEmpty + 1);
  const level = (k: number): number =>
    method === 'bin-centre' ? min + (k + 0.5) * width : sums[k]! / counts[k]!;
  const lowV = level(lowBin);
  const highV = level(highBin);
  return { lowV, highV, midV: (lowV + highV) / 2, modeV: level(modeBin), minV: min, maxV: max, binWidthV: width };
}

/** Index of the first largest count in [from, to). */
function argMax(counts: Float64Array, from: number, to: number): number {
  let best = from;
  for (let k = from + 1; k < to; k++) if (counts[k]! > counts[best]!) best = k;
  return best;
}
