/**
 * Mid-reference crossings (IEEE Std 181 "mid-reference level instants", REFERENCES.md section 9) with
 * hysteresis against noise and linear sub-sample interpolation.
 *
 * A transition is accepted only when the signal goes from one side of the hysteresis band
 * [midV - hysteresisV, midV + hysteresisV] right through to the other side, so noise riding on a level or
 * wobbling around the mid level on a slow edge gives one crossing, not many. Its instant is where the
 * straight line between the last sample on the old side of midV and the next sample crosses midV.
 */

/** Options of findMidCrossings. */
export interface CrossingOptions {
  /** 50% reference level, volts. */
  midV: number;
  /** Half-width of the hysteresis band, volts (0 = plain mid-level crossings). */
  hysteresisV: number;
}

/** Transitions of one channel, alternating in polarity. */
export interface EdgeTrain {
  /** Mid-reference instants, seconds, increasing; polarities alternate. */
  timesS: Float64Array;
  /** Polarity of timesS[0]: true = rising (low to high). Meaningless when there are no edges. */
  firstRising: boolean;
  /** Logic state at the first sample: true = high. */
  initialHigh: boolean;
}

/** Find the hysteresis-qualified mid-reference crossings of `values` sampled at `time` (seconds). */
export function findMidCrossings(time: ArrayLike<number>, values: ArrayLike<number>, opts: CrossingOptions): EdgeTrain {
  const n = Math.min(time.length, values.length);
  const mid = opts.midV;
  const h = Math.max(0, opts.hysteresisV);
  const upper = mid + h;
  const lower = mid - h;
  if (n === 0) return { timesS: new Float64Array(0), firstRising: true, initialHigh: false };
  const initialHigh = values[0]! > mid;
  let high = initialHigh;
  let out: Float64Array = new Float64Array(256);
  let count = 0;
  // Tight scans: skip samples on the current side of mid; then walk through the hysteresis band. Reaching
  // the far threshold is a transition between the last sample on the old side (j) and the next (j + 1);
  // coming back across mid first is noise, and the scan resumes.
  let i = 1;
  while (i < n) {
    if (high) {
      while (i < n && values[i]! >= mid) i++;
      if (i >= n) break;
      const j = i - 1;
      while (i < n && values[i]! < mid && values[i]! >= lower) i++;
      if (i >= n) break;
      if (values[i]! < lower) {
        const x0 = values[j]!;
        const t0 = time[j]!;
        if (count === out.length) out = grow(out);
        out[count++] = t0 + ((mid - x0) / (values[j + 1]! - x0)) * (time[j + 1]! - t0);
        high = false;
        i++;
      }
    } else {
      while (i < n && values[i]! <= mid) i++;
      if (i >= n) break;
      const j = i - 1;
      while (i < n && values[i]! > mid && values[i]! <= upper) i++;
      if (i >= n) break;
      if (values[i]! > upper) {
        const x0 = values[j]!;
        const t0 = time[j]!;
        if (count === out.length) out = grow(out);
        out[count++] = t0 + ((mid - x0) / (values[j + 1]! - x0)) * (time[j + 1]! - t0);
        high = true;
        i++;
      }
    }
  }
  return { timesS: out.slice(0, count), firstRising: !initialHigh, initialHigh };
}

/** Double a Float64Array's capacity, keeping its contents. */
function grow(x: Float64Array): Float64Array {
  const y = new Float64Array(x.length * 2);
  y.set(x);
  return y;
}

/** Polarity of edge k of a train: true = rising. */
export function isRisingEdge(train: EdgeTrain, k: number): boolean {
  return (k & 1) === 0 ? train.firstRising : !train.firstRising;
}

/** Times of the rising (or falling) edges of a train. */
export function edgesOfPolarity(train: EdgeTrain, rising: boolean): Float64Array {
  const n = train.timesS.length;
  const startAt = train.firstRising === rising ? 0 : 1;
  const out = new Float64Array(Math.max(0, Math.ceil((n - startAt) / 2)));
  for (let k = startAt, j = 0; k < n; k += 2, j++) out[j] = train.timesS[k]!;
  return out;
}
