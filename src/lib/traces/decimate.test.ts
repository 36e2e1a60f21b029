import { describe, it, expect } from 'vitest';
import { decimateMinMax } from './decimate';

const ramp = (n: number, dt = 1e-3): Float64Array => Float64Array.from({ length: n }, (_, i) => i * dt);

describe('decimateMinMax', () => {
  it('returns every sample when the window holds fewer than 2 x columns', () => {
    const t = ramp(100);
    const v = Float64Array.from({ length: 100 }, (_, i) => i % 7);
    const d = decimateMinMax(t, v, 0.010, 0.019, 10); // 10 samples for 10 columns
    expect(d.mode).toBe('raw');
    expect(d.fromIndex).toBe(10);
    expect(d.toIndex).toBe(20);
    expect(Array.from(d.timeS)).toEqual(Array.from(t.slice(10, 20)));
    expect(Array.from(d.minV)).toEqual(Array.from(v.slice(10, 20)));
    expect(Array.from(d.maxV)).toEqual(Array.from(v.slice(10, 20)));
  });

  it('keeps a one-sample spike in its column', () => {
    const n = 100_000;
    const t = ramp(n, 1e-5); // 1 s
    const v = new Float64Array(n);
    v[54_321] = 7.5;
    v[12_345] = -3;
    const d = decimateMinMax(t, v, 0, 1, 100);
    expect(d.mode).toBe('minmax');
    expect(d.timeS.length).toBe(100);
    expect(d.maxV[54]).toBe(7.5);
    expect(d.minV[12]).toBe(-3);
    expect(Math.max(...Array.from(d.maxV).filter((_, c) => c !== 54))).toBe(0);
    expect(d.timeS[0]).toBeCloseTo(0.005, 12);
  });

  it('marks columns without samples with NaN', () => {
    const t = Float64Array.from([0, 0.1, 0.2, 0.3, 0.7, 0.8, 0.9, 1.0, 0.95, 0.99].sort());
    const v = Float64Array.from(t, (x) => x * 10);
    const d = decimateMinMax(t, v, 0, 1, 5);
    expect(d.mode).toBe('minmax');
    expect(Number.isNaN(d.minV[2])).toBe(true); // 0.4-0.6 has no sample
    expect(d.maxV[4]).toBe(10);
    expect(d.minV[0]).toBe(0);
  });

  it('windows outside the capture give an empty raw series', () => {
    const d = decimateMinMax(ramp(10), new Float64Array(10), 5, 6, 100);
    expect(d.mode).toBe('raw');
    expect(d.timeS.length).toBe(0);
  });

  it('rejects bad columns and reversed windows', () => {
    expect(() => decimateMinMax(ramp(10), new Float64Array(10), 0, 1, 0)).toThrow(RangeError);
    expect(() => decimateMinMax(ramp(10), new Float64Array(10), 1, 0, 10)).toThrow(RangeError);
  });
});
