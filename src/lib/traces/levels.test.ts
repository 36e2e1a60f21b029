import { describe, it, expect } from 'vitest';
import { computeStateLevels } from './levels';
import { generateCapture } from './generate';

/**
 * REFERENCES.md section 9, "Sampled waveform" check values (b): fs = 1 kHz, period pattern [0.1 x4, 4.9 x6]
 * repeated 5 times plus a final 0.1 (51 samples), 100-bin histogram. Method: IEEE Std 181-2011 histogram
 * state levels as described by signal-processing library documentation (a, secondary).
 */
function referenceWaveform(): { time: Float64Array; values: Float64Array } {
  const values: number[] = [];
  for (let r = 0; r < 5; r++) values.push(0.1, 0.1, 0.1, 0.1, 4.9, 4.9, 4.9, 4.9, 4.9, 4.9);
  values.push(0.1);
  const time = values.map((_, i) => i / 1000);
  return { time: Float64Array.from(time), values: Float64Array.from(values) };
}

describe('computeStateLevels (IEEE 181 histogram method)', () => {
  it('gives the REFERENCES.md section 9 bin-centre levels 0.124 / 4.876 and 50% level 2.5000 (b)', () => {
    const { values } = referenceWaveform();
    expect(values.length).toBe(51);
    const l = computeStateLevels(values, { bins: 100, method: 'bin-centre' });
    expect(computeStateLevels(values).lowV).toBeCloseTo(0.1, 12); // default method on clean levels
    expect(l.lowV).toBeCloseTo(0.124, 9);
    expect(l.highV).toBeCloseTo(4.876, 9);
    expect(l.midV).toBeCloseTo(2.5, 9);
  });

  it('gives 0.1 / 4.9 with the mean of the modal bin, 50% level 2.5000 either way (REFERENCES.md section 9 (b))', () => {
    const l = computeStateLevels(referenceWaveform().values, { bins: 100, method: 'modal-mean' });
    expect(l.lowV).toBeCloseTo(0.1, 12);
    expect(l.highV).toBeCloseTo(4.9, 12);
    expect(l.midV).toBeCloseTo(2.5, 12);
  });

  it('reports min, max, bin width and the overall mode', () => {
    const l = computeStateLevels([0, 0, 0, 10, 10], { bins: 10 });
    expect(l.minV).toBe(0);
    expect(l.maxV).toBe(10);
    expect(l.binWidthV).toBe(1);
    expect(l.modeV).toBe(0);
    expect(l.lowV).toBe(0);
    expect(l.highV).toBe(10);
  });

  it('returns equal levels for a constant signal', () => {
    const l = computeStateLevels([3.3, 3.3, 3.3]);
    expect(l).toMatchObject({ lowV: 3.3, highV: 3.3, midV: 3.3, modeV: 3.3, binWidthV: 0 });
  });

  it('finds noisy 5 V and 12 V levels within 0.03 V (generated, noise 2% of the swing)', () => {
    for (const [lowV, highV] of [
      [0.2, 5],
      [0.4, 12],
    ] as const) {
      const g = generateCapture({ sampleRateHz: 100_000, samples: 50_000, freqHz: 250, lowV, highV, noiseV: 0.02 * (highV - lowV), seed: 7 });
      const l = computeStateLevels(g.a);
      expect(Math.abs(l.lowV - lowV)).toBeLessThan(0.03);
      expect(Math.abs(l.highV - highV)).toBeLessThan(0.03);
    }
  });

  it('bins only samples inside rangeV when given', () => {
    const l = computeStateLevels([0, 0, 1, 1, 1, 5, 5, 9], { rangeV: [4, 10], bins: 10 });
    expect(l.minV).toBe(5);
    expect(l.maxV).toBe(9);
    expect(l.lowV).toBe(5);
  });

  it('with a stride, bins every k-th sample (same levels on the reference waveform)', () => {
    const values = referenceWaveform().values;
    const l = computeStateLevels(values, { stride: 2 });
    expect(l.lowV).toBeCloseTo(0.1, 12);
    expect(l.highV).toBeCloseTo(4.9, 12);
    expect(() => computeStateLevels(values, { stride: 0 })).toThrow(RangeError);
  });

  it('rejects no samples and fewer than 2 bins', () => {
    expect(() => computeStateLevels([])).toThrow(RangeError);
    expect(() => computeStateLevels([1, 2], { bins: 1 })).toThrow(RangeError);
    expect(() => computeStateLevels([1, 2], { rangeV: [5, 6] })).toThrow(RangeError);
  });
});
