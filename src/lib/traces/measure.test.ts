import { describe, it, expect } from 'vitest';
import type { EdgeTrain } from './crossings';
import {
  computePulseMetrics,
  countDropouts,
  estimateNoiseV,
  highTimePct,
  judgedPeriod,
  measureChannel,
  median,
  removeGlitches,
} from './measure';
import { generateCapture } from './generate';

const ms = (xs: number[]): Float64Array => Float64Array.from(xs, (x) => x / 1000);
const train = (timesMs: number[], firstRising = true): EdgeTrain => ({
  timesS: ms(timesMs),
  firstRising,
  initialHigh: !firstRising,
});

describe('computePulseMetrics (IEEE 181 period, width, duty)', () => {
  // REFERENCES.md section 9, "From edge times (ms)" check values (b).
  it('A rise 0, fall 5, rise 10 ms: duty 50.000%, f 100 Hz (REFERENCES.md section 9 (b))', () => {
    const m = computePulseMetrics(train([0, 5, 10]));
    expect(m.dutyPct).toBeCloseTo(50, 3);
    expect(m.freqHz).toBeCloseTo(100, 6);
    expect(m.medianPeriodS).toBeCloseTo(0.01, 12);
  });

  it('A rise 0, fall 4.2, rise 10 ms: duty 42.0% (REFERENCES.md section 9 (b), degraded channel)', () => {
    expect(computePulseMetrics(train([0, 4.2, 10])).dutyPct).toBeCloseTo(42, 6);
  });

  it('A rise 0, fall 5, rise 8 ms: duty 62.5%, f 125 Hz (REFERENCES.md section 9 (b))', () => {
    const m = computePulseMetrics(train([0, 5, 8]));
    expect(m.dutyPct).toBeCloseTo(62.5, 6);
    expect(m.freqHz).toBeCloseTo(125, 6);
  });

  it('uses falling-to-falling periods when a train has fewer than two rising edges', () => {
    const m = computePulseMetrics(train([0, 3, 10], false)); // fall 0, rise 3, fall 10
    expect(m.periodsS.length).toBe(1);
    expect(m.freqHz).toBeCloseTo(100, 6);
    expect(m.dutyPct).toBeCloseTo(70, 6); // high from 3 to 10 ms of a 10 ms period
  });

  it('leaves out cycles more than 25% from the median period (a missing pulse does not move freq or duty)', () => {
    // periods 10, 10, 20 (a missing pulse: low from 25 to 40), 10
    const m = computePulseMetrics(train([0, 5, 10, 15, 20, 25, 40, 45, 50]));
    expect(m.periodsS.length).toBe(4);
    expect(m.inlierCycles).toBe(3);
    expect(m.dutyPct).toBeCloseTo(50, 9);
    expect(m.freqHz).toBeCloseTo(100, 9);
  });

  it('averages the inlier cycles: periods 9.5, 10.5, 9.5 ms give 1 / 9.833 ms, not 1 / median', () => {
    const m = computePulseMetrics(train([0, 5, 9.5, 14.5, 20, 25, 29.5]));
    expect(m.medianPeriodS).toBeCloseTo(0.0095, 12);
    expect(m.freqHz).toBeCloseTo(3 / 0.0295, 9);
  });

  it('gives freq 0 and duty NaN without a full period', () => {
    const m = computePulseMetrics(train([0, 5]));
    expect(m.freqHz).toBe(0);
    expect(Number.isNaN(m.dutyPct)).toBe(true);
    expect(Number.isNaN(m.medianPeriodS)).toBe(true);
  });
});

describe('measureChannel on the REFERENCES.md section 9 sampled waveform (b)', () => {
  it('gives pulse duration 6.000 ms, period 10.000 ms, duty 0.6', () => {
    const values: number[] = [];
    for (let r = 0; r < 5; r++) values.push(0.1, 0.1, 0.1, 0.1, 4.9, 4.9, 4.9, 4.9, 4.9, 4.9);
    values.push(0.1);
    const time = values.map((_, i) => i / 1000);
    const d = measureChannel(time, values);
    expect(d.levels.lowV).toBeCloseTo(0.1, 9);
    expect(d.levels.highV).toBeCloseTo(4.9, 9);
    expect(d.levels.midV).toBeCloseTo(2.5, 9);
    expect(d.pulses.periodsS.length).toBe(4);
    d.pulses.periodsS.forEach((p) => expect(p).toBeCloseTo(0.01, 12));
    d.pulses.widthsS.forEach((w) => expect(w).toBeCloseTo(0.006, 12));
    expect(d.pulses.dutyPct / 100).toBeCloseTo(0.6, 9);
    expect(d.glitches).toBe(0);
    expect(d.raw.timesS.length).toBe(10);
  });
});

describe('removeGlitches (pulses under 10% of the median pulse)', () => {
  it('removes a short high pulse inside a low state', () => {
    const r = removeGlitches(train([0, 5, 10, 15, 17, 17.3, 20, 25, 30]));
    expect(r.glitches).toBe(1);
    expect(Array.from(r.clean.timesS, (t) => Math.round(t * 1e6) / 1e3)).toEqual([0, 5, 10, 15, 20, 25, 30]);
    expect(r.clean.firstRising).toBe(true);
  });

  it('removes a short dip inside a high state', () => {
    const r = removeGlitches(train([0, 2, 2.2, 5, 10, 15, 20, 25, 30]));
    expect(r.glitches).toBe(1);
    expect(Array.from(r.clean.timesS, (t) => Math.round(t * 1e6) / 1e3)).toEqual([0, 5, 10, 15, 20, 25, 30]);
  });

  it('keeps pulses at 10% of the median and above', () => {
    const r = removeGlitches(train([0, 5, 10, 15, 17, 17.5, 20, 25, 30])); // 0.5 ms = 10% of 5 ms
    expect(r.glitches).toBe(0);
    expect(r.clean.timesS.length).toBe(9);
  });

  it('counts a bounce burst as separate glitches and keeps the last edge', () => {
    const r = removeGlitches(train([0, 5, 10, 10.1, 10.2, 10.3, 10.4, 15, 20, 25, 30]));
    expect(r.glitches).toBe(2);
    expect(Array.from(r.clean.timesS, (t) => Math.round(t * 1e6) / 1e3)).toEqual([0, 5, 10.4, 15, 20, 25, 30]);
  });
});

describe('countDropouts (period over 1.8x its local median)', () => {
  it('finds one missing pulse', () => {
    expect(countDropouts([...Array(10).fill(10), 20, ...Array(10).fill(10)])).toBe(1);
  });

  it('does not count a period of 1.8x', () => {
    expect(countDropouts([...Array(10).fill(10), 18, ...Array(10).fill(10)])).toBe(0);
  });

  it('does not mistake a slowing motor (10 -> 30 over 40 periods) for dropouts', () => {
    expect(countDropouts(Array.from({ length: 40 }, (_, k) => 10 + (20 * k) / 39))).toBe(0);
  });

  it('counts a pulse broken in two by a brief loss of signal (a period under 0.55x) once', () => {
    expect(countDropouts([...Array(10).fill(10), 3, 7, ...Array(10).fill(10)])).toBe(1);
    expect(countDropouts([...Array(10).fill(10), 6, ...Array(10).fill(10)])).toBe(0);
  });

  it('needs at least three periods', () => {
    expect(countDropouts([10, 30])).toBe(0);
  });

  it('judges a channel that misses half its pulses against the other channel\'s period', () => {
    // Periods 20, 20, 10, 10: the channel's own median (15) hides both missing pulses; the other channel's 10 does not.
    expect(countDropouts([20, 20, 10, 10])).toBe(0);
    expect(countDropouts([20, 20, 10, 10], 1.8, 10)).toBe(2);
    // A reference within 25% of the local median changes nothing (a motor changing speed keeps its own median).
    expect(countDropouts([...Array(10).fill(10), 20, ...Array(10).fill(10)], 1.8, 12)).toBe(1);
    expect(countDropouts([20, 10], 1.8, 10)).toBe(1);
  });

  it('judgedPeriod keeps the local median unless the reference differs by more than 25%', () => {
    expect(judgedPeriod(15, 10)).toBe(10);
    expect(judgedPeriod(12, 10)).toBe(12);
    expect(judgedPeriod(12.5, 10)).toBe(12.5);
    expect(judgedPeriod(15)).toBe(15);
  });
});

describe('computePulseMetrics with a reference period', () => {
  it('averages the cycles near the reference instead of its own median (rises 0, 20, 40, 50, 60 ms; width 3 ms)', () => {
    const t = train([0, 3, 20, 23, 40, 43, 50, 53, 60]);
    expect(computePulseMetrics(t).freqHz).toBe(0); // median 15 ms: no period within 25%
    const m = computePulseMetrics(t, 0.01);
    expect(m.inlierCycles).toBe(2);
    expect(m.freqHz).toBeCloseTo(100, 9);
    expect(m.dutyPct).toBeCloseTo(30, 9);
  });
});

describe('helpers', () => {
  it('median of odd, even and empty inputs', () => {
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(Number.isNaN(median([]))).toBe(true);
  });

  it('highTimePct from edges and the initial state', () => {
    expect(highTimePct(train([2, 7]), 0, 0.01)).toBeCloseTo(50, 12);
    expect(highTimePct(train([3], false), 0, 0.01)).toBeCloseTo(30, 12);
    expect(highTimePct({ timesS: new Float64Array(0), firstRising: false, initialHigh: true }, 0, 10)).toBe(100);
  });

  it('estimateNoiseV recovers the noise of a generated square wave within 10%', () => {
    const g = generateCapture({ sampleRateHz: 100_000, samples: 100_000, freqHz: 200, noiseV: 0.1, seed: 3 });
    const sigma = estimateNoiseV(g.a, 0.2, 5);
    expect(sigma).toBeGreaterThan(0.09);
    expect(sigma).toBeLessThan(0.11);
  });
});

describe('measureChannel on generated waveforms', () => {
  const cases = [
    { name: '5 V, 200 Hz, 50%, 100 kS/s', sampleRateHz: 100_000, freqHz: 200, dutyPct: 50, lowV: 0.2, highV: 5, noiseV: 0.05 },
    { name: '5 V, 1.5 kHz, 35%, 1 MS/s', sampleRateHz: 1_000_000, freqHz: 1500, dutyPct: 35, lowV: 0.1, highV: 4.8, noiseV: 0.08 },
    { name: '12 V, 80 Hz, 60%, 20 kS/s', sampleRateHz: 20_000, freqHz: 80, dutyPct: 60, lowV: 0.4, highV: 12, noiseV: 0.2 },
    { name: '12 V, 383 Hz, 50%, 10 kS/s (26.1 samples a period, ideal steps)', sampleRateHz: 10_000, freqHz: 383, dutyPct: 50, lowV: 0.3, highV: 11.5, noiseV: 0.1, riseS: 0 },
  ];
  for (const c of cases) {
    it(`${c.name}: frequency within 0.2%, duty within 0.5 points, levels within 0.05 V`, () => {
      const samples = Math.round((c.sampleRateHz * 30) / c.freqHz); // 30 periods
      const g = generateCapture({ ...c, samples, seed: 11 });
      const d = measureChannel(g.time, g.a);
      expect(d.flat).toBe(false);
      expect(Math.abs(d.pulses.freqHz / c.freqHz - 1)).toBeLessThan(0.002);
      expect(Math.abs(d.pulses.dutyPct - c.dutyPct)).toBeLessThan(0.5);
      expect(Math.abs(d.levels.lowV - c.lowV)).toBeLessThan(0.05);
      expect(Math.abs(d.levels.highV - c.highV)).toBeLessThan(0.05);
      expect(d.glitches).toBe(0);
      expect(d.dropouts).toBe(0);
    });
  }

  it('flags a flat channel and searches no edges', () => {
    const g = generateCapture({ sampleRateHz: 10_000, samples: 5_000, freqHz: 100, noiseV: 0.05, a: { stuck: 'high' } });
    const d = measureChannel(g.time, g.a);
    expect(d.flat).toBe(true);
    expect(d.raw.timesS.length).toBe(0);
  });

  it('counts generated glitches and dropouts exactly', () => {
    const g = generateCapture({ sampleRateHz: 100_000, samples: 40_000, freqHz: 200, noiseV: 0.05, a: { glitches: 4, dropouts: 3 } });
    const d = measureChannel(g.time, g.a);
    expect(d.glitches).toBe(4);
    expect(d.dropouts).toBe(3);
    expect(Math.abs(d.pulses.freqHz / 200 - 1)).toBeLessThan(0.002);
  });
});
