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
  // Last sample index on the current side of mid (>= mid when high, <= mid when low).
  let lastSide = 0;
  for (let i = 1; i < n; i++) {
    const x = values[i]!;
    if (high) {
      if (x >= mid) lastSide = i;
      else if (x < lower) {
        const j = lastSide;
        const x0 = values[j]!;
        const x1 = values[j + 1]!;
        const t0 = time[j]!;
        const tc = t0 + ((mid - x0) / (x1 - x0)) * (time[j + 1]! - t0);
        if (count === out.length) out = grow(out);
        out[count++] = tc;
        high = false;
        lastSide = i;
      }
    } else if (x <= mid) lastSide = i;
    else if (x > upper) {
      const j = lastSide;
      const x0 = values[j]!;
      const x1 = values[j + 1]!;
      const t0 = time[j]!;
      const tc = t0 + ((mid - x0) / (x1 - x0)) * (time[j + 1]! - t0);
      if (count === out.length) out = grow(out);
      out[count++] = tc;
      high = true;
      lastSide = i;
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
