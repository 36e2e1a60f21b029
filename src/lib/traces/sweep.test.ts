// A broad, seeded sweep over captures of known parameters, written in every reader variant of CONTRACT.md
// "Traces" and measured end to end (parseCapture -> analyzeCapture). The acceptance tolerances are the ones
// the issue names: frequency within 1%, duty within 1.5 points, phase within 3 degrees, and the right verdict
// and direction. The expected values come from the generator's parameters (an independent description of
// the waveform), never from the engine.
//
// What a sampled capture cannot tell: with ideal (zero-time) steps an edge is only known to within one
// sample interval, so at 20 samples a period one sample is 18 electrical degrees and 5 duty points. The
// engine averages many cycles, which recovers the true values when the sample clock is not locked to the
// signal; the steep-edge cases below therefore use a frequency ratio with a golden-ratio fraction (the
// least-locked choice) and at least 15 periods at low ratios. Captures with finite edges (two or more
// samples) locate every edge by interpolation and are swept from 3 periods up.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analyzeCapture, type TraceAnalysis } from './analyze';
import { CaptureError, parseCapture } from './capture-parse';
import { captureToCsv, createRng, generateCapture, type CsvVariant, type GenerateSpec } from './generate';
import type { Verdict } from './verdict';

const enc = (s: string): Uint8Array => new TextEncoder().encode(s);

/** Every reader variant of CONTRACT.md "Traces" (and the header spellings scopes use). */
const VARIANTS: Array<[string, CsvVariant]> = [
  ['comma, seconds, volts', {}],
  ['preamble lines before the header', { preamble: ['Seepline sweep capture', 'Probe,10:1', 'Sample interval,see rows'] }],
  ['time in ms', { timeUnit: 'ms' }],
  ['time in us, bracket header', { timeUnit: 'us', header: 'bracket' }],
  ['time in µs (micro sign)', { timeUnit: 'µs' }],
  ['channels in mV', { millivolts: true }],
  ['semicolon with decimal comma', { delimiter: ';', decimalComma: true }],
  ['semicolon with decimal point, ms', { delimiter: ';', timeUnit: 'ms' }],
  ['tab', { delimiter: '\t' }],
  ['tab with decimal comma, ms, mV', { delimiter: '\t', decimalComma: true, timeUnit: 'ms', millivolts: true }],
  ['CRLF line ends and a BOM', { crlf: true, bom: true }],
  ['no header (seconds, volts)', { header: 'none' }],
  ['underscore header t_ms,a_mV,b_mV', { header: 'underscore', timeUnit: 'ms', millivolts: true }],
  ['preamble + semicolon/decimal comma + us + CRLF + BOM', { preamble: ['Export', 'Channels;2'], delimiter: ';', decimalComma: true, timeUnit: 'us', crlf: true, bom: true }],
];

/** One generated case: the spec and what the analysis must find. */
interface SweepCase {
  label: string;
  spec: GenerateSpec;
  variant: [string, CsvVariant];
  verdict: Verdict;
  direction: 'a_leads' | 'b_leads' | 'none';
  /** Check frequency, duty and phase against the spec (healthy and phase-error cases). */
  numbers: boolean;
  /** Phase expected (0-180) when `numbers`. */
  phaseDeg: number;
}

const GOLDEN_FRACTION = 0.381966; // 2 - golden ratio: the fraction furthest from any ratio of small whole numbers

/** Build the seeded sweep: `count` cases of each kind. */
function buildCases(seed: number, count: number): SweepCase[] {
  const rng = createRng(seed);
  const logUniform = (lo: number, hi: number) => Math.exp(Math.log(lo) + rng() * (Math.log(hi) - Math.log(lo)));
  const cases: SweepCase[] = [];
  for (let k = 0; k < count; k++) {
    // Quadrature (healthy) and phase well outside 90 +/- 30 (both directions); 3 degrees clear of the limits.
    const kind = k % 4 === 3 ? 'phase_error' : 'healthy';
    const freqHz = logUniform(20, 5000);
    const steep = k % 3 === 0;
    let ratio = logUniform(20, 1000);
    if (steep) ratio = Math.floor(ratio) + GOLDEN_FRACTION;
    const sampleRateHz = freqHz * ratio;
    const minPeriods = steep && ratio < 60 ? 15 : 3;
    const periods = logUniform(minPeriods, 300);
    const samples = Math.min(60_000, Math.max(64, Math.round(periods * ratio)));
    const dutyPct = 25 + rng() * 50;
    const sign = rng() < 0.5 ? 1 : -1;
    const phase = kind === 'healthy' ? 63 + rng() * 54 : rng() < 0.5 ? 12 + rng() * 45 : 123 + rng() * 45;
    const twelve = rng() < 0.5;
    const highV = twelve ? 11 + rng() * 2 : 4.6 + rng() * 0.6;
    const lowV = rng() * (twelve ? 0.8 : 0.4);
    const noiseV = rng() < 0.25 ? 0 : rng() * 0.05 * (highV - lowV);
    // Finite edges: 1-4 sample intervals, and at most 4% of the period (hall sensors switch in microseconds).
    const riseS = steep ? 0 : Math.min((1 + rng() * 3) / sampleRateHz, 0.04 / freqHz);
    const variant = VARIANTS[k % VARIANTS.length]!;
    cases.push({
      label: `${kind} #${k}: ${freqHz.toFixed(1)} Hz, ${ratio.toFixed(1)}x, ${periods.toFixed(1)} periods, duty ${dutyPct.toFixed(1)}%, ${sign > 0 ? 'B lags' : 'B leads'} ${phase.toFixed(1)}°, ${highV.toFixed(1)} V, noise ${noiseV.toFixed(3)} V, ${steep ? 'steep' : 'finite'} edges; ${variant[0]}`,
      spec: { freqHz, sampleRateHz, samples, dutyPct, phaseDeg: sign * phase, highV, lowV, noiseV, riseS, seed: seed * 1000 + k, startCycle: rng() },
      variant,
      verdict: kind,
      direction: sign > 0 ? 'a_leads' : 'b_leads',
      numbers: true,
      phaseDeg: phase,
    });
  }
  return cases;
}

/** Faults of every verdict across the same parameter space (verdict and direction checked). */
function buildFaultCases(seed: number, count: number): SweepCase[] {
  const rng = createRng(seed);
  const logUniform = (lo: number, hi: number) => Math.exp(Math.log(lo) + rng() * (Math.log(hi) - Math.log(lo)));
  const kinds = ['stuck_a', 'stuck_b', 'weak', 'bridge_and', 'bridge_fight', 'glitches', 'dropouts'] as const;
  const cases: SweepCase[] = [];
  for (let k = 0; k < count; k++) {
    const kind = kinds[k % kinds.length]!;
    const freqHz = logUniform(20, 5000);
    const steep = rng() < 0.4;
    let ratio = logUniform(20, 1000);
    if (steep) ratio = Math.floor(ratio) + GOLDEN_FRACTION;
    const sampleRateHz = freqHz * ratio;
    const periods = logUniform(kind === 'dropouts' || kind === 'glitches' ? 12 : 6, 200);
    const samples = Math.min(60_000, Math.round(periods * ratio));
    const dutyPct = 35 + rng() * 30;
    const sign = rng() < 0.5 ? 1 : -1;
    const phase = 65 + rng() * 50;
    const twelve = rng() < 0.5;
    const highV = twelve ? 11 + rng() * 2 : 4.6 + rng() * 0.6;
    const lowV = rng() * (twelve ? 0.8 : 0.4);
    const noiseV = rng() * 0.03 * (highV - lowV);
    const riseS = steep ? 0 : Math.min((1 + rng() * 3) / sampleRateHz, 0.04 / freqHz);
    const spec: GenerateSpec = { freqHz, sampleRateHz, samples, dutyPct, phaseDeg: sign * phase, highV, lowV, noiseV, riseS, seed: seed * 1000 + k, startCycle: rng() };
    const channel = rng() < 0.5 ? 'a' : 'b';
    let verdict: Verdict = 'healthy';
    let direction: SweepCase['direction'] = sign > 0 ? 'a_leads' : 'b_leads';
    if (kind === 'stuck_a' || kind === 'stuck_b') {
      const where = [lowV, highV, lowV + (highV - lowV) * (0.3 + 0.4 * rng())][k % 3]!;
      spec[kind === 'stuck_a' ? 'a' : 'b'] = { stuck: where };
      verdict = 'channel_stuck';
      direction = 'none';
    } else if (kind === 'weak') {
      // A high state at 30-50% of the swing: under 60% of the supply either way.
      spec[channel] = { highV: lowV + (highV - lowV) * (0.3 + 0.2 * rng()) };
      verdict = 'low_amplitude';
    } else if (kind === 'bridge_and' || kind === 'bridge_fight') {
      spec.bridged = kind === 'bridge_and' ? 'wired-and' : 'average';
      if (kind === 'bridge_and') spec.dutyPct = 55 + rng() * 15; // the AND of two pulses must overlap to switch at all
      verdict = 'channels_shorted';
      direction = 'none';
    } else if (kind === 'glitches') {
      // Glitches 2% of a period wide, so at least 2 samples even at 100x.
      spec.sampleRateHz = freqHz * Math.max(ratio, 100 + GOLDEN_FRACTION);
      spec.samples = Math.min(60_000, Math.round(periods * (spec.sampleRateHz / freqHz)));
      spec[channel] = { glitches: 1 + (k % 4) };
      verdict = 'intermittent';
    } else {
      spec[channel] = { dropouts: 1 + (k % 3) };
      verdict = 'intermittent';
    }
    const variant = VARIANTS[(k * 5) % VARIANTS.length]!;
    cases.push({
      label: `${kind} #${k} on ${channel}: ${freqHz.toFixed(1)} Hz, ${ratio.toFixed(1)}x, ${periods.toFixed(1)} periods, ${highV.toFixed(1)} V; ${variant[0]}`,
      spec,
      variant,
      verdict,
      direction,
      numbers: false,
      phaseDeg: phase,
    });
  }
  return cases;
}

/** Write the case in its variant, read it back and analyse it. */
function run(c: SweepCase): TraceAnalysis {
  const capture = generateCapture(c.spec);
  return analyzeCapture(parseCapture(enc(captureToCsv(capture, c.variant[1]))));
}

/** Everything outside tolerance, in words (empty when the case passes). */
function problems(c: SweepCase, r: TraceAnalysis): string[] {
  const out: string[] = [];
  if (r.verdict !== c.verdict) out.push(`verdict ${r.verdict}, expected ${c.verdict} (${r.findings.map((f) => `${f.code}:${f.channel ?? '-'}`).join(', ')})`);
  if (r.direction !== c.direction) out.push(`direction ${r.direction}, expected ${c.direction}`);
  if (c.numbers) {
    for (const k of ['a', 'b'] as const) {
      const ch = r.channels[k];
      if (!(Math.abs(ch.freqHz / c.spec.freqHz - 1) <= 0.01)) out.push(`${k} frequency ${ch.freqHz} Hz, expected ${c.spec.freqHz.toFixed(3)} (1%)`);
      if (!(Math.abs(ch.dutyPct - c.spec.dutyPct!) <= 1.5)) out.push(`${k} duty ${ch.dutyPct}%, expected ${c.spec.dutyPct!.toFixed(2)} (±1.5)`);
    }
    if (!(Math.abs(r.phaseDeg - c.phaseDeg) <= 3)) out.push(`phase ${r.phaseDeg}°, expected ${c.phaseDeg.toFixed(2)} (±3)`);
  }
  return out;
}

describe('sweep: quadrature and phase errors, 20 Hz to 5 kHz, 20x to 1000x, 3 to 300 periods, every reader variant', () => {
  const cases = buildCases(181, 168);
  it('covers both directions, both verdicts, 5 V and 12 V, steep and finite edges, every variant', () => {
    expect(new Set(cases.map((c) => c.direction))).toEqual(new Set(['a_leads', 'b_leads']));
    expect(new Set(cases.map((c) => c.verdict))).toEqual(new Set(['healthy', 'phase_error']));
    expect(cases.some((c) => c.spec.highV! > 10) && cases.some((c) => c.spec.highV! < 6)).toBe(true);
    expect(cases.some((c) => c.spec.riseS === 0) && cases.some((c) => c.spec.riseS! > 0)).toBe(true);
    expect(new Set(cases.map((c) => c.variant[0])).size).toBe(VARIANTS.length);
    expect(Math.min(...cases.map((c) => c.spec.sampleRateHz / c.spec.freqHz))).toBeLessThan(25);
    expect(Math.max(...cases.map((c) => c.spec.sampleRateHz / c.spec.freqHz))).toBeGreaterThan(700);
  });
  // One test per batch keeps the report readable while listing every failing case with its parameters.
  for (let batch = 0; batch < cases.length; batch += 24) {
    const slice = cases.slice(batch, batch + 24);
    it(`cases ${batch}-${batch + slice.length - 1}: verdict, direction, frequency 1%, duty ±1.5, phase ±3°`, () => {
      const failed = slice.map((c) => ({ c, p: problems(c, run(c)) })).filter((x) => x.p.length > 0);
      expect(failed.map((x) => `${x.c.label}: ${x.p.join('; ')}`)).toEqual([]);
    });
  }
});

describe('sweep: every fault verdict across the same space', () => {
  const cases = buildFaultCases(407, 140);
  for (let batch = 0; batch < cases.length; batch += 35) {
    const slice = cases.slice(batch, batch + 35);
    it(`cases ${batch}-${batch + slice.length - 1}: stuck, low amplitude, shorted (both kinds), glitches, dropouts`, () => {
      const failed = slice.map((c) => ({ c, p: problems(c, run(c)) })).filter((x) => x.p.length > 0);
      expect(failed.map((x) => `${x.c.label}: ${x.p.join('; ')}`)).toEqual([]);
    });
  }
});

describe('sweep: short captures where one channel misses many pulses', () => {
  it('B misses 2 of 6 pulses: B is judged against A period (frequency, duty, dropouts) and the verdict is intermittent', () => {
    const g = generateCapture({ freqHz: 800, sampleRateHz: 40_400, samples: 320, dutyPct: 30, phaseDeg: -100, highV: 12.8, lowV: 0.2, riseS: 5e-5, startCycle: 0.58, b: { dropouts: 2 } });
    const r = analyzeCapture(g);
    expect(r.verdict).toBe('intermittent');
    expect(r.channels.b.dropouts).toBe(2);
    expect(Math.abs(r.channels.b.freqHz / 800 - 1)).toBeLessThan(0.01);
    expect(Math.abs(r.channels.b.dutyPct - 30)).toBeLessThan(1.5);
    expect(r.direction).toBe('b_leads');
    expect(Math.abs(r.phaseDeg - 100)).toBeLessThan(3);
  });

  it('A misses 3 pulses in 8: the phase is taken only over whole A periods', () => {
    const g = generateCapture({ freqHz: 1140, sampleRateHz: 611_000, samples: 4630, dutyPct: 53, phaseDeg: -111, highV: 11.4, lowV: 0.76, noiseV: 0.2, riseS: 6e-6, startCycle: 0.1, a: { dropouts: 3 } });
    const r = analyzeCapture(g);
    expect(r.verdict).toBe('intermittent');
    expect(r.channels.a.dropouts).toBeGreaterThanOrEqual(2);
    expect(r.direction).toBe('b_leads');
    expect(Math.abs(r.phaseDeg - 111)).toBeLessThan(3);
  });

  it('shorted channels report no phase and no direction, whatever the bridge looks like', () => {
    for (const bridged of ['wired-and', 'average'] as const) {
      const r = analyzeCapture(generateCapture({ freqHz: 108, sampleRateHz: 8736, samples: 2823, dutyPct: 58, phaseDeg: 100, highV: 12.3, lowV: 0.5, noiseV: 0.43, seed: 82, bridged }));
      expect(r.verdict).toBe('channels_shorted');
      expect(r.direction).toBe('none');
      expect(r.phaseDeg).toBe(0);
    }
  });
});

describe('reader variants: property (fast-check, fixed seed)', () => {
  it('any capture written in any variant reads back to the same samples (to the printed precision)', () => {
    const variant = fc.constantFrom(...VARIANTS.map((v) => v[1]));
    const row = fc.record({
      a: fc.double({ min: -1, max: 14, noNaN: true }),
      b: fc.double({ min: -1, max: 14, noNaN: true }),
    });
    fc.assert(
      fc.property(variant, fc.array(row, { minLength: 1, maxLength: 40 }), fc.double({ min: 1e-7, max: 1e-2, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), (v, rows, dtS, startS) => {
        const n = rows.length;
        const time = Float64Array.from({ length: n }, (_, i) => startS + i * dtS);
        const capture = { time, a: Float64Array.from(rows, (r) => r.a), b: Float64Array.from(rows, (r) => r.b) };
        const text = captureToCsv(capture, { ...v, timeDecimals: 12, valueDecimals: v.millivolts ? 3 : 6 });
        const back = parseCapture(enc(text));
        expect(back.samples).toBe(n);
        for (let i = 0; i < n; i++) {
          expect(Math.abs(back.time[i]! - time[i]!)).toBeLessThan(1e-9);
          expect(Math.abs(back.a[i]! - capture.a[i]!)).toBeLessThan(1e-5);
          expect(Math.abs(back.b[i]! - capture.b[i]!)).toBeLessThan(1e-5);
        }
      }),
      { seed: 20261202, numRuns: 150 },
    );
  });

  it('reads UTF-16 text with a byte-order mark (spreadsheet "Unicode text") as the same capture', () => {
    const text = 'time (ms)\tA (V)\tB (V)\n0\t0,1\t4,9\n0,5\t4,9\t4,9\n1\t4,9\t0,1\n';
    const le = new Uint8Array(2 + text.length * 2);
    le[0] = 0xff;
    le[1] = 0xfe;
    for (let i = 0; i < text.length; i++) le[2 + 2 * i] = text.charCodeAt(i);
    const r = parseCapture(le);
    expect(r.samples).toBe(3);
    expect(Array.from(r.time)).toEqual([0, 0.0005, 0.001]);
    expect(Array.from(r.a)).toEqual([0.1, 4.9, 4.9]);
    expect(r.decimalComma).toBe(true);
  });
});

describe('bad files in every variant: a clear error naming the line', () => {
  /** Lines before the first data row that a variant writes (BOM, preamble, header). */
  const headerLines = (v: CsvVariant): number => (v.preamble?.length ?? 0) + (v.header === 'none' ? 0 : 1);
  const good = generateCapture({ freqHz: 200, sampleRateHz: 20_000, samples: 400, seed: 3 });
  for (const [name, v] of VARIANTS) {
    it(`${name}: a value that is not a number, time going back, a missing channel`, () => {
      const eol = v.crlf ? '\r\n' : '\n';
      const lines = captureToCsv(good, v).split(eol);
      const first = headerLines(v); // 0-based index of the first data row in `lines`
      const d = v.delimiter ?? ',';
      const broken = (i: number, replace: (cells: string[]) => string[]) => {
        const copy = [...lines];
        copy[i] = replace(copy[i]!.split(d)).join(d);
        return copy.join(eol);
      };
      const cases: Array<[string, RegExp, number]> = [
        [broken(first + 10, (c) => [c[0]!, 'n/a', c[2]!]), /channel A \(column 2\) is not a number/, first + 11],
        [broken(first + 20, (c) => [lines[first + 5]!.split(d)[0]!, c[1]!, c[2]!]), /time does not increase/, first + 21],
        [broken(first + 30, (c) => [c[0]!, c[1]!]), /only one channel/, first + 31],
      ];
      for (const [text, message, line] of cases) {
        let error: unknown = null;
        try {
          parseCapture(enc(text));
        } catch (e) {
          error = e;
        }
        expect(error).toBeInstanceOf(CaptureError);
        expect((error as CaptureError).line).toBe(line);
        expect((error as Error).message).toMatch(new RegExp(`^line ${line}: `));
        expect((error as Error).message).toMatch(message);
      }
    });
  }
});
