/**
 * Deterministic synthetic hall-sensor captures with known parameters, for the tests, the benchmark and the
 * demo data: frequency (optionally ramping), duty cycle, phase either way, levels, Gaussian noise from a
 * seeded PRNG, finite edge time, glitches, dropouts, stuck channels and bridged (shorted) channels; plus the
 * capture as CSV text in any of the reader's variants (capture-parse.ts).
 *
 * Waveform model: A's phase in cycles is theta(t) = startCycle + f0 t + (f1 - f0) t^2 / (2 T) (a linear
 * frequency ramp from f0 to f1 over the capture length T). A is high for the first dutyPct of each cycle;
 * B is the same with its cycle shifted by phaseDeg / 360 (B lags A by phaseDeg; negative = B leads). Edges
 * are linear ramps of riseS (10%-90% is 0.8 riseS) centred on the ideal edge instant, so with riseS of at
 * least two sample intervals a linearly interpolated 50% crossing falls exactly on the ideal instant.
 */
import type { CaptureData } from './capture-parse';

/** Per-channel settings (each falls back to the capture-wide value). */
export interface GenerateChannelSpec {
  lowV?: number;
  highV?: number;
  dutyPct?: number;
  /** Flat line: at lowV, at highV, or at this voltage. */
  stuck?: 'low' | 'high' | number;
  /** Number of short full-swing pulses inserted in the middle of low states, spread over the capture. */
  glitches?: number;
  /** Width of each glitch, seconds (default 2% of the nominal period). */
  glitchWidthS?: number;
  /** Number of missing pulses (the channel stays low for a whole cycle), spread over the capture. */
  dropouts?: number;
}

/** What to generate. */
export interface GenerateSpec {
  sampleRateHz: number;
  samples: number;
  /** A's frequency at the start, hertz. */
  freqHz: number;
  /** A's frequency at the end (linear ramp); default freqHz. */
  endFreqHz?: number;
  /** How far B lags A, electrical degrees (negative = B leads); default 90. */
  phaseDeg?: number;
  /** Default 0.2 V. */
  lowV?: number;
  /** Default 5 V. */
  highV?: number;
  /** Default 50%. */
  dutyPct?: number;
  /** Standard deviation of Gaussian noise on each channel, volts; default 0. */
  noiseV?: number;
  /** PRNG seed; default 1. */
  seed?: number;
  /** Edge duration, seconds; default two sample intervals (0 = ideal steps). */
  riseS?: number;
  /** Time of the first sample, seconds; default 0. */
  startS?: number;
  /** A's phase at the first sample, cycles; default 0.1. */
  startCycle?: number;
  a?: GenerateChannelSpec;
  b?: GenerateChannelSpec;
  /**
   * Bridged channels: both carry one combined waveform. 'wired-and' = low when either sensor pulls low
   * (open-collector outputs on one pull-up); 'average' = the outputs fight, giving a middle level while
   * they disagree.
   */
  bridged?: 'wired-and' | 'average';
  /** Bridged only: height of the spikes at each sensor's switching instant, volts; default 40% of the swing. */
  spikeV?: number;
}

/** A generated capture: the arrays analyzeCapture takes, plus the spec. */
export interface GeneratedCapture extends CaptureData {
  sampleRateHz: number;
  spec: GenerateSpec;
}

/** Seeded 32-bit PRNG (mulberry32): returns a function giving uniform numbers in [0, 1). */
export function createRng(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates from a uniform PRNG (Box-Muller, both values used). */
function createGaussian(rng: () => number): () => number {
  let spare = NaN;
  return () => {
    if (!Number.isNaN(spare)) {
      const x = spare;
      spare = NaN;
      return x;
    }
    let u = rng();
    while (u <= 1e-300) u = rng();
    const r = Math.sqrt(-2 * Math.log(u));
    const angle = 2 * Math.PI * rng();
    spare = r * Math.sin(angle);
    return r * Math.cos(angle);
  };
}

/** Ideal-edge shape in [0, 1] at cycle position p in [0, 1) for duty d and half-edge h (cycles). */
function shape(p: number, d: number, h: number): number {
  if (h <= 0) return p < d ? 1 : 0;
  let s: number;
  if (p < d / 2) s = (p + h) / (2 * h);
  else if (p < (1 + d) / 2) s = (d - p + h) / (2 * h);
  else s = (p - 1 + h) / (2 * h);
  return s < 0 ? 0 : s > 1 ? 1 : s;
}

/** Generate a synthetic two-channel capture from known parameters. */
export function generateCapture(spec: GenerateSpec): GeneratedCapture {
  const n = spec.samples;
  const fs = spec.sampleRateHz;
  if (!(n >= 2) || !Number.isInteger(n)) throw new RangeError('samples must be an integer of at least 2');
  if (!(fs > 0) || !(spec.freqHz > 0)) throw new RangeError('sampleRateHz and freqHz must be positive');
  const f0 = spec.freqHz;
  const f1 = spec.endFreqHz ?? f0;
  const T = (n - 1) / fs;
  const ramp = T > 0 ? (f1 - f0) / (2 * T) : 0;
  const theta0 = spec.startCycle ?? 0.1;
  const lag = (spec.phaseDeg ?? 90) / 360;
  const riseS = spec.riseS ?? 2 / fs;
  const noise = spec.noiseV ?? 0;
  const startS = spec.startS ?? 0;
  const gauss = createGaussian(createRng(spec.seed ?? 1));
  const ch = (c: GenerateChannelSpec | undefined) => ({
    lowV: c?.lowV ?? spec.lowV ?? 0.2,
    highV: c?.highV ?? spec.highV ?? 5,
    duty: (c?.dutyPct ?? spec.dutyPct ?? 50) / 100,
    stuck: c?.stuck,
    glitches: c?.glitches ?? 0,
    glitchWidthS: c?.glitchWidthS ?? 0.02 / f0,
    dropouts: c?.dropouts ?? 0,
  });
  const A = ch(spec.a);
  const B = ch(spec.b);
  const thetaAt = (ts: number): number => theta0 + f0 * ts + ramp * ts * ts;
  /** Time (from the first sample) at which A's phase reaches theta. */
  const timeAt = (theta: number): number => {
    const c = theta0 - theta;
    if (ramp === 0) return -c / f0;
    return (-f0 + Math.sqrt(f0 * f0 - 4 * ramp * c)) / (2 * ramp);
  };
  const totalCycles = thetaAt(T) - theta0;
  // Cycles (integer indices of the channel's own phase) that get a dropout; glitch intervals in time.
  const plan = (c: typeof A, shiftCycles: number) => {
    const firstCycle = Math.ceil(theta0 - shiftCycles) + 1;
    const lastCycle = Math.floor(theta0 - shiftCycles + totalCycles) - 2;
    const span = Math.max(0, lastCycle - firstCycle);
    const dropped = new Set<number>();
    for (let k = 0; k < c.dropouts; k++) dropped.add(firstCycle + Math.floor(((k + 0.5) * span) / c.dropouts));
    const glitchStarts: number[] = [];
    for (let k = 0; k < c.glitches; k++) {
      const cycle = firstCycle + Math.floor(((k + 0.5) * span) / c.glitches);
      const centre = timeAt(cycle + shiftCycles + (1 + c.duty) / 2);
      glitchStarts.push(centre - c.glitchWidthS / 2);
    }
    return { dropped, glitchStarts };
  };
  const planA = plan(A, 0);
  const planB = plan(B, lag);
  const time = new Float64Array(n);
  const a = new Float64Array(n);
  const b = new Float64Array(n);
  const spikeV = spec.spikeV ?? 0.4 * (A.highV - A.lowV);
  let ga = 0;
  let gb = 0;
  let prevBitA = -1;
  let prevBitB = -1;
  let spike = 0;
  for (let i = 0; i < n; i++) {
    const ts = i / fs;
    time[i] = startS + ts;
    const theta = thetaAt(ts);
    const h = (riseS / 2) * (f0 + 2 * ramp * ts);
    const thetaB = theta - lag;
    const cycleA = Math.floor(theta);
    const cycleB = Math.floor(thetaB);
    let sa = shape(theta - cycleA, A.duty, h);
    let sb = shape(thetaB - cycleB, B.duty, h);
    if (planA.dropped.has(cycleA)) sa = 0;
    if (planB.dropped.has(cycleB)) sb = 0;
    while (ga < planA.glitchStarts.length && ts >= planA.glitchStarts[ga]! + A.glitchWidthS) ga++;
    if (ga < planA.glitchStarts.length && ts >= planA.glitchStarts[ga]!) sa = 1 - sa;
    while (gb < planB.glitchStarts.length && ts >= planB.glitchStarts[gb]! + B.glitchWidthS) gb++;
    if (gb < planB.glitchStarts.length && ts >= planB.glitchStarts[gb]!) sb = 1 - sb;
    const na = noise > 0 ? noise * gauss() : 0;
    const nb = noise > 0 ? noise * gauss() : 0;
    if (spec.bridged) {
      const bitA = sa >= 0.5 ? 1 : 0;
      const bitB = sb >= 0.5 ? 1 : 0;
      if (prevBitA >= 0 && (bitA !== prevBitA || bitB !== prevBitB)) {
        const rising = bitA > prevBitA || bitB > prevBitB;
        spike = rising ? spikeV : -spikeV;
      }
      prevBitA = bitA;
      prevBitB = bitB;
      const s = spec.bridged === 'wired-and' ? Math.min(sa, sb) : (sa + sb) / 2;
      const node = A.lowV + (A.highV - A.lowV) * s + spike;
      spike *= 0.4; // decays over a few samples
      a[i] = node + na;
      b[i] = node + nb;
      continue;
    }
    a[i] = level(A, sa) + na;
    b[i] = level(B, sb) + nb;
  }
  return { time, a, b, sampleRateHz: fs, spec };
}

/** Voltage of a channel for edge shape s, honouring `stuck`. */
function level(c: { lowV: number; highV: number; stuck: 'low' | 'high' | number | undefined }, s: number): number {
  if (c.stuck === 'low') return c.lowV;
  if (c.stuck === 'high') return c.highV;
  if (typeof c.stuck === 'number') return c.stuck;
  return c.lowV + (c.highV - c.lowV) * s;
}

/** How to write a capture as text (the reader's variants). */
export interface CsvVariant {
  /** Default ','. */
  delimiter?: ',' | ';' | '\t';
  /** Write ',' as the decimal mark (semicolon or tab delimiter only). */
  decimalComma?: boolean;
  /** Unit of the time column; default 's'. 'µs' writes the micro sign. */
  timeUnit?: 's' | 'ms' | 'us' | 'µs';
  /** Write both channels in millivolts. */
  millivolts?: boolean;
  /**
   * Header row: 'paren' `time (ms),A (V),B (V)` (default), 'bracket' `Time[ms];CH1[V];CH2[V]`,
   * 'underscore' `t_ms,a_V,b_V`, 'none' for no header, or a literal header line.
   */
  header?: 'paren' | 'bracket' | 'underscore' | 'none' | { line: string };
  /** Lines written before the header. */
  preamble?: string[];
  crlf?: boolean;
  bom?: boolean;
  /** Decimals of the time column (default: enough to resolve the sample interval, plus two). */
  timeDecimals?: number;
  /** Decimals of the channel columns (default 4 in volts, 1 in millivolts). */
  valueDecimals?: number;
}

/** Write a capture (time in seconds, channels in volts) as CSV text in the given variant. */
export function captureToCsv(capture: CaptureData, variant: CsvVariant = {}): string {
  const delimiter = variant.delimiter ?? ',';
  if (variant.decimalComma && delimiter === ',') throw new RangeError('a decimal comma needs a semicolon or tab delimiter');
  const unit = variant.timeUnit ?? 's';
  const timeScale = unit === 's' ? 1 : unit === 'ms' ? 1e3 : 1e6;
  const valueScale = variant.millivolts ? 1e3 : 1;
  const vUnit = variant.millivolts ? 'mV' : 'V';
  const eol = variant.crlf ? '\r\n' : '\n';
  const n = capture.time.length;
  const dt = n > 1 ? (capture.time[n - 1]! - capture.time[0]!) / (n - 1) : 1;
  const timeDecimals = variant.timeDecimals ?? Math.max(0, Math.ceil(-Math.log10(dt * timeScale)) + 2);
  const valueDecimals = variant.valueDecimals ?? (variant.millivolts ? 1 : 4);
  const header = variant.header ?? 'paren';
  const lines: string[] = [];
  for (const p of variant.preamble ?? []) lines.push(p);
  if (header === 'paren') lines.push([`time (${unit})`, `A (${vUnit})`, `B (${vUnit})`].join(delimiter));
  else if (header === 'bracket') lines.push([`Time[${unit}]`, `CH1[${vUnit}]`, `CH2[${vUnit}]`].join(delimiter));
  else if (header === 'underscore') lines.push([`t_${unit}`, `a_${vUnit}`, `b_${vUnit}`].join(delimiter));
  else if (typeof header === 'object') lines.push(header.line);
  const fmt = variant.decimalComma
    ? (x: number, d: number): string => x.toFixed(d).replace('.', ',')
    : (x: number, d: number): string => x.toFixed(d);
  const chunks: string[] = [(variant.bom ? '\uFEFF' : '') + (lines.length > 0 ? lines.join(eol) + eol : '')];
  const CHUNK = 20_000;
  let rows: string[] = [];
  for (let i = 0; i < n; i++) {
    rows.push(
      fmt(capture.time[i]! * timeScale, timeDecimals) +
        delimiter +
        fmt(capture.a[i]! * valueScale, valueDecimals) +
        delimiter +
        fmt(capture.b[i]! * valueScale, valueDecimals),
    );
    if (rows.length === CHUNK) {
      chunks.push(rows.join(eol) + eol);
      rows = [];
    }
  }
  if (rows.length > 0) chunks.push(rows.join(eol) + eol);
  return chunks.join('');
}
