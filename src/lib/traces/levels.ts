/**
 * State levels of a two-level waveform by the histogram method of IEEE Std 181 (as implemented by signal
 * processing libraries; REFERENCES.md section 9): find min and max, bin the samples, split the histogram
 * into two halves between the first and last non-empty bins, and take each half's mode as its state level.
 *
 * Three ways to turn the modal bin into a voltage:
 * - 'bin-centre': the centre of the modal bin (what the library documentation describes);
 * - 'modal-mean': the mean of the samples that fell in the modal bin (no half-bin quantisation: a clean
 *   4.9 V level reads 4.9 V, not 4.876 V);
 * - 'modal-region-mean' (default, used by the analysis): starting from the modal bin, the mean of the
 *   samples within MODAL_REGION_BINS bins either side of the current estimate, repeated until it settles
 *   (a mean shift over the histogram, within the same half). Identical to 'modal-mean' for clean levels; on
 *   noisy levels it finds the centre of the noise rather than whichever bin happened to peak.
 */

/** Default number of histogram bins (the library default). */
export const DEFAULT_STATE_LEVEL_BINS = 100;

/** Half-width, in bins, of the window 'modal-region-mean' averages. */
export const MODAL_REGION_BINS = 3;
/** Mean-shift steps of 'modal-region-mean' at most. */
const MODAL_REGION_STEPS = 8;

/** How the modal bin becomes a level. */
export type StateLevelMethod = 'bin-centre' | 'modal-mean' | 'modal-region-mean';

/** Options of computeStateLevels. */
export interface StateLevelOptions {
  /** Histogram bins (default 100). */
  bins?: number;
  /** Default 'modal-region-mean'. */
  method?: StateLevelMethod;
  /** Only samples within [lowest, highest] volts are binned (all samples when absent). */
  rangeV?: readonly [number, number];
  /** Use every stride-th sample (default 1). */
  stride?: number;
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
  const method = opts.method ?? 'modal-region-mean';
  if (!Number.isInteger(bins) || bins < 2) throw new RangeError('bins must be an integer of at least 2');
  const n = values.length;
  const stride = opts.stride ?? 1;
  if (!Number.isInteger(stride) || stride < 1) throw new RangeError('stride must be a positive integer');
  const ranged = opts.rangeV !== undefined;
  const lo = opts.rangeV?.[0] ?? -Infinity;
  const hi = opts.rangeV?.[1] ?? Infinity;
  let min = Infinity;
  let max = -Infinity;
  if (ranged) {
    for (let i = 0; i < n; i += stride) {
      const x = values[i]!;
      if (x < lo || x > hi) continue;
      if (x < min) min = x;
      if (x > max) max = x;
    }
  } else {
    for (let i = 0; i < n; i += stride) {
      const x = values[i]!;
      if (x < min) min = x;
      if (x > max) max = x;
    }
  }
  if (min === Infinity) throw new RangeError('no samples');
  if (!(max > min)) {
    return { lowV: min, highV: min, midV: min, modeV: min, minV: min, maxV: min, binWidthV: 0 };
  }
  const width = (max - min) / bins;
  const scale = bins / (max - min);
  const counts = new Int32Array(bins);
  const sums = new Float64Array(bins);
  const last = bins - 1;
  // Two copies of the loop so the common case (all samples) carries no range test.
  if (ranged) {
    for (let i = 0; i < n; i += stride) {
      const x = values[i]!;
      if (x < min || x > max) continue;
      let k = ((x - min) * scale) | 0;
      if (k > last) k = last;
      counts[k]!++;
      sums[k]! += x;
    }
  } else {
    for (let i = 0; i < n; i += stride) {
      const x = values[i]!;
      let k = ((x - min) * scale) | 0;
      if (k > last) k = last;
      counts[k]!++;
      sums[k]! += x;
    }
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
  const level = (k: number, from: number, to: number): number => {
    if (method === 'bin-centre') return min + (k + 0.5) * width;
    if (method === 'modal-mean') return sums[k]! / counts[k]!;
    let centre = k;
    let estimate = sums[k]! / counts[k]!;
    for (let step = 0; step < MODAL_REGION_STEPS; step++) {
      let s = 0;
      let c = 0;
      for (let j = Math.max(from, centre - MODAL_REGION_BINS); j <= Math.min(to - 1, centre + MODAL_REGION_BINS); j++) {
        s += sums[j]!;
        c += counts[j]!;
      }
      estimate = s / c;
      const next = Math.min(to - 1, Math.max(from, Math.floor((estimate - min) * scale)));
      if (next === centre) break;
      centre = next;
    }
    return estimate;
  };
  const lowV = level(lowBin, first, split);
  const highV = level(highBin, split, lastNonEmpty + 1);
  const modeV = level(modeBin, first, lastNonEmpty + 1);
  return { lowV, highV, midV: (lowV + highV) / 2, modeV, minV: min, maxV: max, binWidthV: width };
}

/** Index of the first largest count in [from, to). */
function argMax(counts: Int32Array, from: number, to: number): number {
  let best = from;
  for (let k = from + 1; k < to; k++) if (counts[k]! > counts[best]!) best = k;
  return best;
}
