/**
 * Hall-sensor capture analysis (CONTRACT.md "Traces"): measures both channels (measure.ts), relates them
 * (phase.ts), decides which channels are stuck, follows the speed across the capture, and classifies the
 * capture (verdict.ts).
 *
 * Stuck: a channel is stuck when its state levels are under STUCK_MIN_SWING_V apart, when it is high (or low)
 * for more than STUCK_MAX_HIGH_TIME_PCT of the capture, or when it switches less than STUCK_EDGE_RATIO as
 * often as the other channel. Bridged channels (verdict.ts isBridged: one waveform on both) are measured on
 * shared state levels and are never called stuck, whatever their levels look like.
 *
 * Output conventions for degenerate cases:
 * - a stuck channel reports lowV = highV = the level it rests at (its median), freqHz 0, dutyPct 100 when it rests high
 *   (above the other channel's mid level, or half the supply when both are stuck) and 0 when low,
 *   glitches 0; `edges` still counts the transitions it did make;
 * - when the phase cannot be measured (a channel stuck, channels bridged, or no A period holding a B edge),
 *   phaseDeg is 0 and direction 'none';
 * - rpm is null without pulsesPerRev or with both channels stuck; speedTrend is null with fewer than 4
 *   periods or an empty start/end window.
 * A capture whose switching channels hold fewer than two full periods throws CaptureError (line null).
 */
import { CaptureError, type CaptureData } from './capture-parse';
import { edgesOfPolarity, type EdgeTrain } from './crossings';
import {
  DROPOUT_PERIOD_RATIO,
  GLITCH_FRACTION,
  PERIOD_INLIER_FRACTION,
  STUCK_MIN_SWING_V,
  computePulseMetrics,
  countDropouts,
  measureChannel,
  median,
  type ChannelDetail,
  type PulseMetrics,
} from './measure';
import { computeCorrelationStats, computePhase, countQuadrature, type Direction } from './phase';
import {
  DUTY_TOLERANCE_PCT,
  LOW_AMPLITUDE_FRACTION,
  LOW_LEVEL_RAISED_FRACTION,
  QUADRATURE_NOMINAL_DEG,
  QUADRATURE_TOLERANCE_DEG,
  SHORTED_MAX_AMPLITUDE_RATIO,
  SHORTED_MIN_CORRELATION,
  SPEED_CHANGE_PCT,
  assumeSupplyV,
  computeVerdict,
  isBridged,
  type Finding,
  type SpeedTrend,
  type Verdict,
  type VerdictChannel,
} from './verdict';

/** A channel high (or low) for more than this share of the capture, percent, is stuck (spikes aside). */
export const STUCK_MAX_HIGH_TIME_PCT = 97;
/** A channel with fewer than this fraction of the other channel's edges is stuck ... */
export const STUCK_EDGE_RATIO = 0.25;
/** ... provided the other channel has at least this many edges. */
export const STUCK_EDGE_RATIO_MIN_EDGES = 8;
/** Share of the capture at each end used for the start and end speed. */
export const SPEED_WINDOW_FRACTION = 0.2;
/** Fewest full periods a switching channel must hold. */
export const MIN_PERIODS = 2;

/** Options of analyzeCapture. */
export interface AnalyzeOptions {
  /** Encoder pulses per motor revolution (per channel); gives rpm. */
  pulsesPerRev?: number;
  /** Sensor supply, volts; when absent it is assumed (5 V or 12 V) from the high states. */
  supplyV?: number;
}

/** Measurements of one channel (CONTRACT.md fields first, then extras). */
export interface TraceChannel {
  lowV: number;
  highV: number;
  freqHz: number;
  dutyPct: number;
  edges: number;
  glitches: number;
  /** 50% reference level used for the crossings, volts. */
  midV: number;
  stuck: boolean;
  /** Missing pulses (periods over 1.8x their local median, or a long silence while the other channel switches). */
  dropouts: number;
  /** Noise standard deviation around the state levels, volts. */
  noiseV: number;
  /** Half-width of the hysteresis band used, volts. */
  hysteresisV: number;
}

/** Thresholds the analysis used, for display beside the verdict. */
export interface TraceThresholds {
  quadratureNominalDeg: number;
  quadratureToleranceDeg: number;
  glitchFraction: number;
  dropoutPeriodRatio: number;
  lowAmplitudeFraction: number;
  lowAmplitudeHighV: number;
  lowLevelRaisedFraction: number;
  shortedMinCorrelation: number;
  shortedMaxAmplitudeRatio: number;
  stuckMinSwingV: number;
  stuckMaxHighTimePct: number;
  dutyTolerancePct: number;
  speedChangePct: number;
}

/** Result of analyzeCapture: the CONTRACT.md JSON fields (without `id`) plus extras. */
export interface TraceAnalysis {
  samples: number;
  sampleRateHz: number;
  channels: { a: TraceChannel; b: TraceChannel };
  /** How far B lags A, electrical degrees 0-180 (0 when not measurable). */
  phaseDeg: number;
  direction: Direction;
  /** Pearson correlation of the two channels' samples. */
  correlation: number;
  verdict: Verdict;
  findings: Finding[];
  durationS: number;
  /** Motor speed from the median frequency and pulsesPerRev; null when not given or not measurable. */
  rpm: number | null;
  speedTrend: SpeedTrend | null;
  /** x4 decoder over the capture: net count (+ = A leads) and steps changing both channels at once. */
  quadrature: { count: number; invalidTransitions: number };
  supplyV: number;
  supplySource: 'given' | 'assumed';
  thresholds: TraceThresholds;
}

/** Analyse a two-channel hall-sensor capture (time in seconds, channels in volts). */
export function analyzeCapture(capture: CaptureData, opts: AnalyzeOptions = {}): TraceAnalysis {
  return analyzeCaptureDetail(capture, opts).analysis;
}

/** The analysis plus the transitions it found on each channel (what a plot marks as edges). */
export interface TraceAnalysisDetail {
  analysis: TraceAnalysis;
  /** Hysteresis-qualified mid-reference transitions of each channel as found (glitch edges included). */
  edges: { a: EdgeTrain; b: EdgeTrain };
}

/** analyzeCapture, keeping each channel's transitions for display. */
export function analyzeCaptureDetail(capture: CaptureData, opts: AnalyzeOptions = {}): TraceAnalysisDetail {
  const { time, a, b } = capture;
  const n = time.length;
  if (a.length !== n || b.length !== n) throw new RangeError('time, a and b must have the same length');
  if (opts.pulsesPerRev !== undefined && !(opts.pulsesPerRev > 0 && Number.isFinite(opts.pulsesPerRev))) {
    throw new RangeError('pulsesPerRev must be a positive number');
  }
  if (opts.supplyV !== undefined && !(opts.supplyV > 0 && Number.isFinite(opts.supplyV))) {
    throw new RangeError('supplyV must be a positive number of volts');
  }
  if (n < 4) throw new CaptureError(`too short: ${n} samples cannot hold two periods`);
  const startS = time[0]!;
  const endS = time[n - 1]!;
  const durationS = endS - startS;
  const sampleRateHz = (n - 1) / durationS;

  const detail = { a: measureChannel(time, a), b: measureChannel(time, b) };
  const keys = ['a', 'b'] as const;
  const stats = computeCorrelationStats(a, b);
  const correlation = stats.correlation;
  const amplitudeRatio = stats.stdA > 0 ? stats.stdB / stats.stdA : stats.stdB > 0 ? Infinity : 1;
  // Bridged channels carry one waveform: measure both on the same state levels (those of a switching
  // channel), so that three-level bridges do not give each channel a different pair of levels.
  const bridged = isBridged(correlation, amplitudeRatio) && !(detail.a.flat && detail.b.flat);
  if (bridged) {
    if (detail.a.flat) detail.a = measureChannel(time, a, detail.b.levels);
    else detail.b = measureChannel(time, b, detail.a.levels);
  }
  const stuck = { a: false, b: false };
  for (const k of keys) {
    const d = detail[k];
    stuck[k] =
      !bridged && (d.flat || d.highTimePct > STUCK_MAX_HIGH_TIME_PCT || d.highTimePct < 100 - STUCK_MAX_HIGH_TIME_PCT);
  }
  const switching = keys.filter((k) => !stuck[k]);
  if (switching.length > 0) {
    const most = Math.max(...switching.map((k) => detail[k].pulses.periodsS.length));
    if (most < MIN_PERIODS) {
      const edges = keys.map((k) => `${k.toUpperCase()} ${detail[k].clean.timesS.length}`).join(', ');
      throw new CaptureError(
        `too short: the capture (${formatDuration(durationS)}) holds fewer than ${MIN_PERIODS} full periods (edges: ${edges}); capture for longer or use a slower time base`,
      );
    }
  }
  if (!stuck.a && !stuck.b && !bridged) {
    const ea = detail.a.clean.timesS.length;
    const eb = detail.b.clean.timesS.length;
    if (eb >= STUCK_EDGE_RATIO_MIN_EDGES && ea < STUCK_EDGE_RATIO * eb) stuck.a = true;
    else if (ea >= STUCK_EDGE_RATIO_MIN_EDGES && eb < STUCK_EDGE_RATIO * ea) stuck.b = true;
  }

  const bothLive = !stuck.a && !stuck.b;
  // The two channels share one period. Where their median periods disagree, the channel that misses
  // pulses is judged against the other's period (frequency, duty, dropouts and phase).
  const sharedPeriod = bothLive && !bridged ? referencePeriods(detail.a, detail.b) : { a: undefined, b: undefined };
  for (const k of keys) {
    const ref = sharedPeriod[k];
    if (ref === undefined) continue;
    const d = detail[k];
    detail[k] = { ...d, pulses: computePulseMetrics(d.clean, ref), dropouts: countDropouts(d.pulses.periodsS, DROPOUT_PERIOD_RATIO, ref) };
  }
  const dropouts = { a: detail.a.dropouts, b: detail.b.dropouts };
  if (bothLive) {
    dropouts.a += silentEnds(detail.a, detail.b, startS, endS);
    dropouts.b += silentEnds(detail.b, detail.a, startS, endS);
  }

  const risingA = edgesOfPolarity(detail.a.clean, true);
  const risingB = edgesOfPolarity(detail.b.clean, true);
  // Bridged channels carry one waveform: there is no phase between them and no direction to tell (and on
  // a three-level bridge the middle level sits on the 50% line, so edge times there are noise).
  const phase = bothLive && !bridged ? computePhase(risingA, risingB, sharedPeriod.a) : null;
  const phaseMeasured = phase !== null && phase.cycles > 0;
  const phaseDeg = phaseMeasured ? phase.phaseDeg : 0;
  const direction: Direction = phaseMeasured ? phase.direction : 'none';
  const quadrature = bothLive
    ? countQuadrature(detail.a.clean, detail.b.clean, 0.5 / sampleRateHz)
    : { count: 0, invalidTransitions: 0 };

  const liveHighs = keys.filter((k) => !stuck[k]).map((k) => detail[k].levels.highV);
  const guessFrom = liveHighs.length > 0 ? Math.max(...liveHighs) : Math.max(detail.a.levels.modeV, detail.b.levels.modeV);
  const supplyV = opts.supplyV ?? assumeSupplyV(guessFrom);
  const supplySource = opts.supplyV === undefined ? 'assumed' : 'given';

  const reference = !stuck.a ? detail.a : !stuck.b ? detail.b : null;
  const speedTrend = reference ? computeSpeedTrend(reference.pulses, startS, endS) : null;
  const rpm =
    opts.pulsesPerRev !== undefined && reference && reference.pulses.freqHz > 0
      ? (60 * reference.pulses.freqHz) / opts.pulsesPerRev
      : null;

  const channel = (k: 'a' | 'b'): VerdictChannel & { midV: number; noiseV: number; hysteresisV: number } => {
    const d = detail[k];
    const other = detail[k === 'a' ? 'b' : 'a'];
    const otherStuck = stuck[k === 'a' ? 'b' : 'a'];
    const edges = d.raw.timesS.length;
    if (stuck[k]) {
      const restV = restLevel(k === 'a' ? a : b);
      const ref = otherStuck ? supplyV / 2 : other.levels.midV;
      return {
        lowV: restV,
        highV: restV,
        freqHz: 0,
        dutyPct: restV > ref ? 100 : 0,
        edges,
        glitches: 0,
        dropouts: 0,
        stuck: true,
        restV,
        midV: d.levels.midV,
        noiseV: d.noiseV,
        hysteresisV: d.hysteresisV,
      };
    }
    return {
      lowV: d.levels.lowV,
      highV: d.levels.highV,
      freqHz: d.pulses.freqHz,
      dutyPct: Number.isFinite(d.pulses.dutyPct) ? d.pulses.dutyPct : d.highTimePct,
      edges,
      glitches: d.glitches,
      dropouts: dropouts[k],
      stuck: false,
      restV: d.levels.modeV,
      midV: d.levels.midV,
      noiseV: d.noiseV,
      hysteresisV: d.hysteresisV,
    };
  };
  const ca = channel('a');
  const cb = channel('b');
  const { verdict, findings } = computeVerdict({
    channels: { a: ca, b: cb },
    phaseDeg,
    direction,
    phaseMeasured,
    correlation,
    amplitudeRatio,
    supplyV,
    supplySource,
    speedTrend,
  });

  const out = (c: typeof ca): TraceChannel => ({
    lowV: round(c.lowV, 3),
    highV: round(c.highV, 3),
    freqHz: roundSig(c.freqHz, 7),
    dutyPct: round(c.dutyPct, 2),
    edges: c.edges,
    glitches: c.glitches,
    midV: round(c.midV, 3),
    stuck: c.stuck,
    dropouts: c.dropouts,
    noiseV: round(c.noiseV, 4),
    hysteresisV: round(c.hysteresisV, 3),
  });
  const analysis: TraceAnalysis = {
    samples: n,
    sampleRateHz: roundSig(sampleRateHz, 7),
    channels: { a: out(ca), b: out(cb) },
    phaseDeg: round(phaseDeg, 2),
    direction,
    correlation: round(correlation, 4),
    verdict,
    findings,
    durationS: roundSig(durationS, 7),
    rpm: rpm === null ? null : round(rpm, 1),
    speedTrend: speedTrend
      ? {
          startHz: roundSig(speedTrend.startHz, 6),
          endHz: roundSig(speedTrend.endHz, 6),
          changePct: round(speedTrend.changePct, 2),
        }
      : null,
    quadrature,
    supplyV,
    supplySource,
    thresholds: {
      quadratureNominalDeg: QUADRATURE_NOMINAL_DEG,
      quadratureToleranceDeg: QUADRATURE_TOLERANCE_DEG,
      glitchFraction: GLITCH_FRACTION,
      dropoutPeriodRatio: DROPOUT_PERIOD_RATIO,
      lowAmplitudeFraction: LOW_AMPLITUDE_FRACTION,
      lowAmplitudeHighV: round(LOW_AMPLITUDE_FRACTION * supplyV, 3),
      lowLevelRaisedFraction: LOW_LEVEL_RAISED_FRACTION,
      shortedMinCorrelation: SHORTED_MIN_CORRELATION,
      shortedMaxAmplitudeRatio: SHORTED_MAX_AMPLITUDE_RATIO,
      stuckMinSwingV: STUCK_MIN_SWING_V,
      stuckMaxHighTimePct: STUCK_MAX_HIGH_TIME_PCT,
      dutyTolerancePct: DUTY_TOLERANCE_PCT,
      speedChangePct: SPEED_CHANGE_PCT,
    },
  };
  return { analysis, edges: { a: detail.a.raw, b: detail.b.raw } };
}

/**
 * Dropouts at the ends: a stretch before the first or after the last edge of `x` longer than 1.8 median
 * periods while `other` keeps switching (at least two edges in it) — the channel went quiet, not the motor.
 */
function silentEnds(x: ChannelDetail, other: ChannelDetail, startS: number, endS: number): number {
  const period = x.pulses.medianPeriodS;
  const tx = x.clean.timesS;
  if (!(period > 0) || tx.length === 0) return 0;
  const limit = DROPOUT_PERIOD_RATIO * period;
  let count = 0;
  const edgesIn = (from: number, to: number): number => {
    let c = 0;
    for (const t of other.clean.timesS) if (t > from && t < to) c++;
    return c;
  };
  const first = tx[0]!;
  const last = tx[tx.length - 1]!;
  if (first - startS > limit && edgesIn(startS, first) >= 2) count++;
  if (endS - last > limit && edgesIn(last, endS) >= 2) count++;
  return count;
}

/** Share of a channel's cycles that must lie near its median period for that median to be trusted. */
export const CONSISTENT_CYCLE_SHARE = 0.5;

/**
 * Reference periods for channels whose median period disagrees with the other channel's by more than
 * PERIOD_INLIER_FRACTION: the channel whose cycles sit more consistently around its median (the shorter
 * median on a tie, since missing pulses are commoner than extra ones) sets the period for the other.
 */
function referencePeriods(a: ChannelDetail, b: ChannelDetail): { a: number | undefined; b: number | undefined } {
  const ma = a.pulses.medianPeriodS;
  const mb = b.pulses.medianPeriodS;
  const none = { a: undefined, b: undefined };
  if (!(ma > 0) || !(mb > 0)) return none;
  if (Math.abs(ma - mb) <= PERIOD_INLIER_FRACTION * Math.min(ma, mb)) return none;
  const share = (d: ChannelDetail): number => d.pulses.inlierCycles / Math.max(1, d.pulses.periodsS.length);
  const sa = share(a);
  const sb = share(b);
  const trustA = sa > sb || (sa === sb && ma < mb);
  if (trustA) return sa >= CONSISTENT_CYCLE_SHARE ? { a: undefined, b: ma } : none;
  return sb >= CONSISTENT_CYCLE_SHARE ? { a: mb, b: undefined } : none;
}

/** Median frequency in the first and last SPEED_WINDOW_FRACTION of the capture. */
export function computeSpeedTrend(pulses: PulseMetrics, startS: number, endS: number): SpeedTrend | null {
  const n = pulses.periodsS.length;
  if (n < 4) return null;
  const window = SPEED_WINDOW_FRACTION * (endS - startS);
  const head: number[] = [];
  const tail: number[] = [];
  for (let k = 0; k < n; k++) {
    const s = pulses.periodStartsS[k]!;
    const p = pulses.periodsS[k]!;
    if (s < startS + window) head.push(p);
    if (s + p > endS - window) tail.push(p);
  }
  if (head.length === 0 || tail.length === 0) return null;
  const startHz = 1 / median(head);
  const endHz = 1 / median(tail);
  return { startHz, endHz, changePct: ((endHz - startHz) / startHz) * 100 };
}

/** Where a stuck channel rests: the median of (at most about 65,536 evenly strided) samples, volts. */
function restLevel(values: Float64Array): number {
  const stride = Math.max(1, Math.floor(values.length / 65_536));
  const picked = new Float64Array(Math.ceil(values.length / stride));
  let m = 0;
  for (let i = 0; i < values.length; i += stride) picked[m++] = values[i]!;
  return median(picked, m);
}

/** Round to `decimals` places. */
function round(x: number, decimals: number): number {
  if (!Number.isFinite(x)) return x;
  const f = 10 ** decimals;
  return Math.round(x * f) / f + 0; // + 0 turns -0 into 0
}

/** Round to `digits` significant digits. */
function roundSig(x: number, digits: number): number {
  if (!Number.isFinite(x) || x === 0) return x;
  return Number(x.toPrecision(digits));
}

/** A duration for messages: "12.5 ms". */
function formatDuration(s: number): string {
  if (s >= 1) return `${Number(s.toPrecision(3))} s`;
  if (s >= 1e-3) return `${Number((s * 1e3).toPrecision(3))} ms`;
  return `${Number((s * 1e6).toPrecision(3))} µs`;
}
