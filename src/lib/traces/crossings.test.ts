import { describe, it, expect } from 'vitest';
import { edgesOfPolarity, findMidCrossings, isRisingEdge } from './crossings';
import { createRng, generateCapture } from './generate';

/** REFERENCES.md section 9 sampled waveform (b): fs = 1 kHz, [0.1 x4, 4.9 x6] x5 + final 0.1. */
function referenceWaveform(): { time: Float64Array; values: Float64Array } {
  const values: number[] = [];
  for (let r = 0; r < 5; r++) values.push(0.1, 0.1, 0.1, 0.1, 4.9, 4.9, 4.9, 4.9, 4.9, 4.9);
  values.push(0.1);
  return { time: Float64Array.from(values.map((_, i) => i / 1000)), values: Float64Array.from(values) };
}

describe('findMidCrossings', () => {
  it('gives the REFERENCES.md section 9 interpolated crossings: rise 3.5, 13.5 ... ms, fall 9.5, 19.5 ... ms (b)', () => {
    const { time, values } = referenceWaveform();
    for (const hysteresisV of [0, 0.48, 1.5]) {
      const e = findMidCrossings(time, values, { midV: 2.5, hysteresisV });
      expect(e.firstRising).toBe(true);
      expect(e.initialHigh).toBe(false);
      const rises = Array.from(edgesOfPolarity(e, true), (t) => t * 1000);
      const falls = Array.from(edgesOfPolarity(e, false), (t) => t * 1000);
      const expectedRises = [3.5, 13.5, 23.5, 33.5, 43.5];
      const expectedFalls = [9.5, 19.5, 29.5, 39.5, 49.5];
      expect(rises.length).toBe(5);
      expect(falls.length).toBe(5);
      rises.forEach((t, i) => expect(t).toBeCloseTo(expectedRises[i]!, 9));
      falls.forEach((t, i) => expect(t).toBeCloseTo(expectedFalls[i]!, 9));
    }
  });

  it('interpolates between samples: a ramp 0 -> 5 V over 1 s sampled every 0.3 s crosses 2.5 V at 0.5 s', () => {
    const time = [0, 0.3, 0.6, 0.9, 1.2];
    const values = [0, 1.5, 3, 4.5, 5];
    const e = findMidCrossings(time, values, { midV: 2.5, hysteresisV: 0.2 });
    expect(e.timesS.length).toBe(1);
    expect(e.timesS[0]).toBeCloseTo(0.5, 12);
  });

  it('gives one crossing for a slow noisy edge with hysteresis, and several without', () => {
    const rng = createRng(42);
    const n = 2000;
    const time = new Float64Array(n);
    const values = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      time[i] = i * 1e-5;
      values[i] = (5 * i) / (n - 1) + (rng() - 0.5) * 0.6; // +/-0.3 V of noise on a 20 ms edge
    }
    const plain = findMidCrossings(time, values, { midV: 2.5, hysteresisV: 0 });
    expect(plain.timesS.length).toBeGreaterThan(2);
    const withBand = findMidCrossings(time, values, { midV: 2.5, hysteresisV: 0.5 });
    expect(withBand.timesS.length).toBe(1);
    // The true crossing is at the middle of the ramp; noise of +/-0.3 V on a 250 V/s slope moves it < 1.3 ms.
    expect(Math.abs(withBand.timesS[0]! - ((n - 1) / 2) * 1e-5)).toBeLessThan(1.3e-3);
  });

  it('starts from the state of the first sample (high start gives a falling first edge)', () => {
    const e = findMidCrossings([0, 1, 2, 3], [5, 5, 0, 0], { midV: 2.5, hysteresisV: 0.5 });
    expect(e.initialHigh).toBe(true);
    expect(e.firstRising).toBe(false);
    expect(isRisingEdge(e, 0)).toBe(false);
    expect(Array.from(e.timesS)).toEqual([1.5]);
  });

  it('finds generated edges at their ideal instants to 1 ns (edges at least two samples long)', () => {
    // A: 1 kHz, 50% duty, startCycle 0.1 -> rising edges at (k - 0.1) ms, falling at (k + 0.4) ms.
    const g = generateCapture({ sampleRateHz: 200_000, samples: 2_000, freqHz: 1000, startCycle: 0.1 });
    const e = findMidCrossings(g.time, g.a, { midV: 2.6, hysteresisV: 0.5 });
    const rises = edgesOfPolarity(e, true);
    const falls = edgesOfPolarity(e, false);
    expect(rises.length).toBe(10);
    rises.forEach((t, k) => expect(Math.abs(t - (k + 0.9) * 1e-3)).toBeLessThan(1e-9));
    falls.forEach((t, k) => expect(Math.abs(t - (k + 0.4) * 1e-3)).toBeLessThan(1e-9));
  });

  it('returns no edges for an empty or flat signal', () => {
    expect(findMidCrossings([], [], { midV: 1, hysteresisV: 0 }).timesS.length).toBe(0);
    expect(findMidCrossings([0, 1, 2], [1, 1, 1], { midV: 2.5, hysteresisV: 0.5 }).timesS.length).toBe(0);
  });
});
