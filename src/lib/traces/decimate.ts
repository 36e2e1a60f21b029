/**
 * Min/max decimation for plotting a capture window at screen resolution: one (min, max) pair per pixel
 * column, so edges, glitches and spikes a single sample wide stay visible at any zoom. When the window
 * holds fewer than RAW_SAMPLES_PER_COLUMN x columns samples, every sample is returned instead.
 */

/** Below this many samples per column the window is returned at full resolution. */
export const RAW_SAMPLES_PER_COLUMN = 2;

/** A plot-ready series for one channel. */
export interface DecimatedSeries {
  /** 'raw': one point per sample (minV = maxV); 'minmax': one point per column. */
  mode: 'raw' | 'minmax';
  /** Sample instants (raw) or column centres (minmax), seconds. */
  timeS: Float64Array;
  /** Lowest value in each column (NaN for an empty column), volts. */
  minV: Float64Array;
  /** Highest value in each column (NaN for an empty column), volts. */
  maxV: Float64Array;
  /** Sample index range covered, [fromIndex, toIndex). */
  fromIndex: number;
  toIndex: number;
}

/** First index whose time is >= t (time increasing). */
function lowerBound(time: ArrayLike<number>, t: number): number {
  let lo = 0;
  let hi = time.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (time[mid]! < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** First index whose time is > t (time increasing). */
function upperBound(time: ArrayLike<number>, t: number): number {
  let lo = 0;
  let hi = time.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (time[mid]! <= t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Decimate the samples with fromS <= time <= toS into `columns` min/max pairs (or return them all when
 * there are fewer than 2 x columns).
 */
export function decimateMinMax(
  time: Float64Array,
  values: Float64Array,
  fromS: number,
  toS: number,
  columns: number,
): DecimatedSeries {
  if (!Number.isInteger(columns) || columns < 1) throw new RangeError('columns must be a positive integer');
  if (!(toS >= fromS)) throw new RangeError('the window must end at or after its start');
  const fromIndex = lowerBound(time, fromS);
  const toIndex = Math.min(upperBound(time, toS), values.length);
  const count = Math.max(0, toIndex - fromIndex);
  if (count < RAW_SAMPLES_PER_COLUMN * columns || !(toS > fromS)) {
    const v = values.slice(fromIndex, fromIndex + count);
    return { mode: 'raw', timeS: time.slice(fromIndex, fromIndex + count), minV: v, maxV: v.slice(), fromIndex, toIndex: fromIndex + count };
  }
  const minV = new Float64Array(columns).fill(Infinity);
  const maxV = new Float64Array(columns).fill(-Infinity);
  const scale = columns / (toS - fromS);
  const last = columns - 1;
  for (let i = fromIndex; i < toIndex; i++) {
    let c = Math.floor((time[i]! - fromS) * scale);
    if (c > last) c = last;
    const x = values[i]!;
    if (x < minV[c]!) minV[c] = x;
    if (x > maxV[c]!) maxV[c] = x;
  }
  const timeS = new Float64Array(columns);
  const width = (toS - fromS) / columns;
  for (let c = 0; c < columns; c++) {
    timeS[c] = fromS + (c + 0.5) * width;
    if (minV[c] === Infinity) {
      minV[c] = NaN;
      maxV[c] = NaN;
    }
  }
  return { mode: 'minmax', timeS, minV, maxV, fromIndex, toIndex };
}
