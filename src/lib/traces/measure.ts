/**
 * Per-channel pulse measurements following the IEEE Std 181 definitions quoted in REFERENCES.md section 9:
 * - state levels by the histogram method (levels.ts), mid-reference level = 50% between them;
 * - transitions at the mid-reference instants (crossings.ts), with hysteresis sized from the noise;
 * - pulse period = between the initial (rising) transitions of successive positive pulses; pulse width =
 *   from a rising to the next falling transition; duty cycle = width / period.
 * - frequency and duty are taken around the median period: the cycles whose period lies within
 *   PERIOD_INLIER_FRACTION (25%) of the median period are averaged (1 / their mean period, and the mean
 *   of their width / period). The median makes this robust to a missing pulse or a leftover glitch; the
 *   averaging over the inliers removes the one-sample quantisation of captures with ideal steps (a
 *   median of periods that are 24 or 25 samples long would be off by up to one sample).
 *
 * Thresholds (common practice, CONTRACT.md "Traces"):
 * - a glitch is a pulse (high or low) shorter than GLITCH_FRACTION (10%) of the median pulse of the same
 *   polarity; glitches are counted, then removed (merged into the surrounding pulse) before the period,
 *   duty and phase are measured;
 * - a dropout (missing pulse) is a period longer than DROPOUT_PERIOD_RATIO (1.8x) the median of its
 *   neighbouring periods (a local median, so a motor that speeds up or slows down is not mistaken for one);
 *   a period shorter than DROPOUT_SHORT_PERIOD_RATIO (0.55x) of it also counts: a pulse broken by a brief
 *   loss of signal that is too long to be a glitch;
 * - a channel is flat (stuck) when its two state levels are less than STUCK_MIN_SWING_V apart.
 */
import { computeStateLevels, type StateLevels } from './levels';
import { findMidCrossings, isRisingEdge, type EdgeTrain } from './crossings';

/** Cycles whose period is within this fraction of the median period are averaged for frequency and duty. */
export const PERIOD_INLIER_FRACTION = 0.25;
/** A glitch is a pulse shorter than this fraction of the median pulse of its polarity. */
export const GLITCH_FRACTION = 0.1;
/** A period longer than this multiple of its local median period is a dropout (missing pulse). */
export const DROPOUT_PERIOD_RATIO = 1.8;
/** A period shorter than this multiple of its local median is a broken pulse (counted as a dropout). */
export const DROPOUT_SHORT_PERIOD_RATIO = 0.55;
/** Periods on each side of a period that make up its local median. */
export const DROPOUT_NEIGHBOURS = 4;
/** Two state levels closer than this (volts) mean the channel does not switch. */
export const STUCK_MIN_SWING_V = 0.5;
/** Hysteresis half-band: NOISE_SIGMAS x the noise, kept between these fractions of the swing. */
export const HYSTERESIS_MIN_FRACTION = 0.1;
export const HYSTERESIS_MAX_FRACTION = 0.3;
export const HYSTERESIS_NOISE_SIGMAS = 4;
/**
 * Samples the state-level histogram uses at most (every k-th sample beyond this). State levels describe the
 * amplitude distribution, which evenly strided samples represent; edges and glitches use every sample.
 */
export const LEVEL_SAMPLE_LIMIT = 500_000;
/** Samples used at most for the noise estimate (evenly strided). */
const NOISE_SAMPLE_LIMIT = 16_384;
/** Median absolute deviation to standard deviation for Gaussian noise. */
const MAD_TO_SIGMA = 1.4826;

/** Period, width and duty of a pulse train (IEEE 181 definitions). */
export interface PulseMetrics {
  /** Full periods between successive initial transitions, seconds (rising to rising; falling to falling when a train has fewer than two rising edges). */
  periodsS: Float64Array;
  /** Start instant of each period, seconds (same length as periodsS). */
  periodStartsS: Float64Array;
  /** Positive pulse width within each period, seconds (same length as periodsS). */
  widthsS: Float64Array;
  /** Median period, seconds; NaN without a full period. */
  medianPeriodS: number;
  /** 1 / mean of the periods within 25% of the median period; 0 without a full period. */
  freqHz: number;
  /** Mean of width / period over those cycles, percent; NaN without a full period. */
  dutyPct: number;
  /** Cycles averaged (period within 25% of the median). */
  inlierCycles: number;
}

/** Median of the first `n` values of an array (copies; NaN when empty). */
export function median(values: ArrayLike<number>, count?: number): number {
  // NOTE: read length on every call; a default parameter read it only sometimes and V8 kept deoptimising.
  const length = values.length;
  const n = count === undefined ? length : Math.min(count, length);
  if (n <= 0) return NaN;
  const copy = new Float64Array(n);
  for (let i = 0; i < n; i++) copy[i] = values[i]!;
  copy.sort();
  // Same expression for odd and even n ((x + x) / 2 is exactly x), so no path goes unseen by the optimiser.
  return (copy[(n - 1) >> 1]! + copy[n >> 1]!) / 2;
}

/**
 * Periods, widths, frequency and duty cycle of an alternating edge train. With `referencePeriodS` (the
 * other channel's median period, when this channel misses so many pulses that its own median is no longer
 * the encoder's period) the cycles averaged are those within 25% of the reference instead.
 */
export function computePulseMetrics(train: EdgeTrain, referencePeriodS?: number): PulseMetrics {
  const t = train.timesS;
  const n = t.length;
  const risingCount = train.firstRising ? Math.ceil(n / 2) : Math.floor(n / 2);
  const fallingCount = n - risingCount;
  // Use rising-to-rising periods (IEEE 181); fall back to falling-to-falling for a train like f r f.
  const byRising = risingCount >= 2 || fallingCount < 2;
  const startAt = train.firstRising === byRising ? 0 : 1;
  const cycles = Math.max(0, Math.floor((n - 1 - startAt) / 2));
  const periodsS = new Float64Array(cycles);
  const periodStartsS = new Float64Array(cycles);
  const widthsS = new Float64Array(cycles);
  const duty = new Float64Array(cycles);
  for (let k = 0, i = startAt; k < cycles; k++, i += 2) {
    const period = t[i + 2]! - t[i]!;
    // From a rising edge the positive pulse is the first half-cycle; from a falling edge, the second.
    const width = byRising ? t[i + 1]! - t[i]! : t[i + 2]! - t[i + 1]!;
    periodsS[k] = period;
    periodStartsS[k] = t[i]!;
    widthsS[k] = width;
    duty[k] = width / period;
  }
  const medianPeriodS = median(periodsS);
  const centre = referencePeriodS !== undefined && referencePeriodS > 0 ? referencePeriodS : medianPeriodS;
  let sumPeriod = 0;
  let sumDuty = 0;
  let inliers = 0;
  for (let k = 0; k < cycles; k++) {
    if (Math.abs(periodsS[k]! - centre) <= PERIOD_INLIER_FRACTION * centre) {
      sumPeriod += periodsS[k]!;
      sumDuty += duty[k]!;
      inliers++;
    }
  }
  return {
    periodsS,
    periodStartsS,
    widthsS,
    medianPeriodS,
    freqHz: inliers > 0 ? inliers / sumPeriod : 0,
    dutyPct: inliers > 0 ? (100 * sumDuty) / inliers : NaN,
    inlierCycles: inliers,
  };
}

/** An edge train with its glitches removed. */
export interface GlitchRemoval {
  clean: EdgeTrain;
  /** Pulses removed for being shorter than the glitch threshold. */
  glitches: number;
  /** Median high and low pulse durations of the raw train, seconds (NaN when there are none). */
  medianHighS: number;
  medianLowS: number;
}

/**
 * Remove glitches: pulses shorter than `fraction` of the median pulse of the same polarity. Each glitch's
 * two edges are dropped, which merges it into the surrounding pulse.
 */
export function removeGlitches(train: EdgeTrain, fraction = GLITCH_FRACTION): GlitchRemoval {
  const t = train.timesS;
  const n = t.length;
  const highs = new Float64Array(n);
  const lows = new Float64Array(n);
  let nh = 0;
  let nl = 0;
  for (let k = 0; k + 1 < n; k++) {
    const d = t[k + 1]! - t[k]!;
    if (isRisingEdge(train, k)) highs[nh++] = d;
    else lows[nl++] = d;
  }
  const medianHighS = median(highs, nh);
  const medianLowS = median(lows, nl);
  const thresholdHigh = nh > 0 ? fraction * medianHighS : 0;
  const thresholdLow = nl > 0 ? fraction * medianLowS : 0;
  const keptT = new Float64Array(n);
  const keptRising = new Uint8Array(n);
  let m = 0;
  let glitches = 0;
  for (let k = 0; k < n; k++) {
    const rising = isRisingEdge(train, k);
    if (m > 0) {
      const topRising = keptRising[m - 1] === 1;
      const d = t[k]! - keptT[m - 1]!;
      if (d < (topRising ? thresholdHigh : thresholdLow)) {
        m--;
        glitches++;
        continue;
      }
    }
    keptT[m] = t[k]!;
    keptRising[m] = rising ? 1 : 0;
    m++;
  }
  const clean: EdgeTrain = {
    timesS: keptT.slice(0, m),
    firstRising: m > 0 ? keptRising[0] === 1 : !train.initialHigh,
    initialHigh: train.initialHigh,
  };
  return { clean, glitches, medianHighS, medianLowS };
}

/**
 * The period a cycle is judged against: the local median, unless a reference period (the other channel's
 * median) is given and differs from it by more than PERIOD_INLIER_FRACTION, in which case the reference.
 * A channel that misses (or breaks) many pulses has a misleading median of its own; the two channels of a
 * quadrature encoder share one period.
 */
export function judgedPeriod(localS: number, referencePeriodS?: number): number {
  if (referencePeriodS === undefined || !(referencePeriodS > 0)) return localS;
  return Math.abs(localS - referencePeriodS) > PERIOD_INLIER_FRACTION * referencePeriodS ? referencePeriodS : localS;
}

/**
 * Count dropouts: periods longer than `ratio` times, or shorter than DROPOUT_SHORT_PERIOD_RATIO times, the
 * median of the periods around them (DROPOUT_NEIGHBOURS on each side, itself included), or the reference
 * period where that median disagrees with it (judgedPeriod).
 */
export function countDropouts(periodsS: ArrayLike<number>, ratio = DROPOUT_PERIOD_RATIO, referencePeriodS?: number): number {
  const n = periodsS.length;
  const withReference = referencePeriodS !== undefined && referencePeriodS > 0;
  if (n < (withReference ? 1 : 3)) return 0;
  const window = new Float64Array(2 * DROPOUT_NEIGHBOURS + 1);
  let dropouts = 0;
  for (let k = 0; k < n; k++) {
    const from = Math.max(0, k - DROPOUT_NEIGHBOURS);
    const to = Math.min(n, k + DROPOUT_NEIGHBOURS + 1);
    // Insertion sort of at most 2 x DROPOUT_NEIGHBOURS + 1 values in a scratch array (no allocation).
    let w = 0;
    for (let j = from; j < to; j++) {
      const x = periodsS[j]!;
      let q = w++;
      while (q > 0 && window[q - 1]! > x) {
        window[q] = window[q - 1]!;
        q--;
      }
      window[q] = x;
    }
    const local = judgedPeriod((window[(w - 1) >> 1]! + window[w >> 1]!) / 2, referencePeriodS);
    if (periodsS[k]! > ratio * local || periodsS[k]! < DROPOUT_SHORT_PERIOD_RATIO * local) dropouts++;
  }
  return dropouts;
}

/**
 * Noise standard deviation (volts) around the state levels: 1.4826 x the median absolute deviation of the
 * samples lying within a quarter of the swing from their nearest level (edges excluded).
 */
export function estimateNoiseV(values: ArrayLike<number>, lowV: number, highV: number): number {
  const n = values.length;
  if (n === 0) return 0;
  const stride = Math.max(1, Math.floor(n / NOISE_SAMPLE_LIMIT));
  const swing = highV - lowV;
  const band = swing > 0 ? swing / 4 : Infinity;
  const mid = (lowV + highV) / 2;
  const deviations = new Float64Array(Math.ceil(n / stride));
  let m = 0;
  for (let i = 0; i < n; i += stride) {
    const x = values[i]!;
    const d = Math.abs(x - (x > mid ? highV : lowV));
    if (d <= band) deviations[m++] = d;
  }
  return m > 0 ? MAD_TO_SIGMA * median(deviations, m) : 0;
}

/** Share of the capture a train spends high, percent, from its edges and initial state. */
export function highTimePct(train: EdgeTrain, startS: number, endS: number): number {
  const total = endS - startS;
  if (!(total > 0)) return train.initialHigh ? 100 : 0;
  let high = train.initialHigh;
  let from = startS;
  let highS = 0;
  for (let k = 0; k < train.timesS.length; k++) {
    const t = train.timesS[k]!;
    if (high) highS += t - from;
    from = t;
    high = !high;
  }
  if (high) highS += endS - from;
  return (100 * highS) / total;
}

/** Share of samples that must lie well away from the resting level for a narrow-swing channel to count as switching. */
const MULTI_LEVEL_MIN_SHARE = 0.1;

/**
 * NOTE: with three levels (two bridged push-pull outputs fighting give a middle level while they disagree)
 * the middle level can straddle the histogram's split, so both halves find the same mode and the IEEE levels
 * come out almost equal although the signal swings widely. When at least 10% of the samples lie more than
 * 2 x STUCK_MIN_SWING_V from that mode, the levels are taken instead as the modes of the samples below and
 * above it (the outer levels). A flat, noisy line keeps its near-equal levels and is reported stuck.
 */
function multiLevelFallback(values: ArrayLike<number>, levels: StateLevels, stride: number): StateLevels {
  if (levels.highV - levels.lowV >= STUCK_MIN_SWING_V) return levels;
  const away = 2 * STUCK_MIN_SWING_V;
  const n = values.length;
  let below = 0;
  let above = 0;
  for (let i = 0; i < n; i++) {
    const x = values[i]!;
    if (x < levels.modeV - away) below++;
    else if (x > levels.modeV + away) above++;
  }
  if (below + above < MULTI_LEVEL_MIN_SHARE * n) return levels;
  const side = MULTI_LEVEL_MIN_SHARE * n * 0.5;
  const lowV = below >= side ? computeStateLevels(values, { rangeV: [-Infinity, levels.modeV - away], stride }).modeV : levels.modeV;
  const highV = above >= side ? computeStateLevels(values, { rangeV: [levels.modeV + away, Infinity], stride }).modeV : levels.modeV;
  return { ...levels, lowV, highV, midV: (lowV + highV) / 2 };
}

/** Everything measured on one channel (internal arrays included; analyze.ts reduces it to JSON). */
export interface ChannelDetail {
  levels: StateLevels;
  /** highV - lowV. */
  swingV: number;
  noiseV: number;
  hysteresisV: number;
  /** True when the swing is under STUCK_MIN_SWING_V (no crossings are searched then). */
  flat: boolean;
  /** Hysteresis-qualified transitions as found. */
  raw: EdgeTrain;
  /** Transitions with glitches removed. */
  clean: EdgeTrain;
  glitches: number;
  /** Period, width and duty from the clean transitions. */
  pulses: PulseMetrics;
  dropouts: number;
  /** Share of the capture spent high, percent (clean transitions). */
  highTimePct: number;
}

/**
 * Measure one channel sampled at `time` (seconds): levels, noise, transitions, glitches, pulses, dropouts.
 * `levels` replaces the channel's own state levels (used for bridged channels, which carry one waveform).
 */
export function measureChannel(time: ArrayLike<number>, values: ArrayLike<number>, levelsOverride?: StateLevels): ChannelDetail {
  const n = Math.min(time.length, values.length);
  const stride = Math.max(1, Math.floor(n / LEVEL_SAMPLE_LIMIT));
  const levels = levelsOverride ?? multiLevelFallback(values, computeStateLevels(values, { stride }), stride);
  const swingV = levels.highV - levels.lowV;
  const noiseV = estimateNoiseV(values, levels.lowV, levels.highV);
  const flat = !(swingV >= STUCK_MIN_SWING_V);
  const hysteresisV = flat
    ? 0
    : Math.min(HYSTERESIS_MAX_FRACTION * swingV, Math.max(HYSTERESIS_MIN_FRACTION * swingV, HYSTERESIS_NOISE_SIGMAS * noiseV));
  const raw: EdgeTrain = flat
    ? { timesS: new Float64Array(0), firstRising: !(levels.modeV > levels.midV), initialHigh: levels.modeV > levels.midV }
    : findMidCrossings(time, values, { midV: levels.midV, hysteresisV });
  const { clean, glitches } = removeGlitches(raw);
  const pulses = computePulseMetrics(clean);
  const startS = n > 0 ? time[0]! : 0;
  const endS = n > 0 ? time[n - 1]! : 0;
  return {
    levels,
    swingV,
    noiseV,
    hysteresisV,
    flat,
    raw,
    clean,
    glitches,
    pulses,
    dropouts: countDropouts(pulses.periodsS),
    highTimePct: highTimePct(clean, startS, endS),
  };
}
