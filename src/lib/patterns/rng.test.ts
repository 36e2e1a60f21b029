import { describe, it, expect } from 'vitest';
import { createAliasTable, createRandom, deriveSeed, drawMultinomialInto, drawPoisson } from './rng';

describe('createRandom', () => {
  it('is reproducible per seed and uniform-looking', () => {
    const a = createRandom(42);
    const b = createRandom(42);
    const xs = Array.from({ length: 5 }, () => a.nextUint32());
    expect(Array.from({ length: 5 }, () => b.nextUint32())).toEqual(xs);
    expect(createRandom(43).nextUint32()).not.toBe(xs[0]);
    const r = createRandom(7);
    let sum = 0;
    let min = 1;
    let max = 0;
    const n = 100000;
    for (let i = 0; i < n; i++) {
      const u = r.nextDouble();
      sum += u;
      min = Math.min(min, u);
      max = Math.max(max, u);
    }
    expect(min).toBeGreaterThanOrEqual(0);
    expect(max).toBeLessThan(1);
    // Mean of U(0,1): 0.5 ± 4·√(1/12/n).
    expect(Math.abs(sum / n - 0.5)).toBeLessThan(4 * Math.sqrt(1 / 12 / n));
  });

  it('drawMultinomialInto follows the same stream as nextUint32', () => {
    const table = createAliasTable([1, 1]);
    const r1 = createRandom(3);
    const counts = new Int32Array(2);
    drawMultinomialInto(table, 10, r1, counts);
    const r2 = createRandom(3);
    for (let i = 0; i < 10; i++) r2.nextUint32();
    expect(r1.nextUint32()).toBe(r2.nextUint32());
  });
});

describe('deriveSeed', () => {
  it('is deterministic and separates labels and seeds', () => {
    expect(deriveSeed(1, 'WLR-2:high')).toBe(deriveSeed(1, 'WLR-2:high'));
    expect(deriveSeed(1, 'WLR-2:high')).not.toBe(deriveSeed(1, 'WLR-2:low'));
    expect(deriveSeed(1, 'WLR-2:high')).not.toBe(deriveSeed(2, 'WLR-2:high'));
  });
});

describe('alias multinomial', () => {
  it('bin frequencies match the weights (each within 4 standard deviations)', () => {
    const weights = [1, 2, 3, 4, 0, 10];
    const total = 20;
    const draws = 200000;
    const counts = new Int32Array(weights.length);
    drawMultinomialInto(createAliasTable(weights), draws, createRandom(99), counts);
    weights.forEach((w, i) => {
      const p = w / total;
      const sd = Math.sqrt(draws * p * (1 - p));
      expect(Math.abs((counts[i] as number) - draws * p)).toBeLessThanOrEqual(4 * sd + 1e-9);
    });
    expect(counts[4]).toBe(0);
  });

  it('rejects negative weights and a zero sum', () => {
    expect(() => createAliasTable([1, -1])).toThrow(RangeError);
    expect(() => createAliasTable([0, 0])).toThrow(RangeError);
  });
});

describe('drawPoisson', () => {
  it.each([0.3, 4, 75])('mean and variance of Poisson(%f) draws are close to the mean', (mean) => {
    const r = createRandom(123);
    const n = 40000;
    let s = 0;
    let ss = 0;
    for (let i = 0; i < n; i++) {
      const k = drawPoisson(mean, r);
      s += k;
      ss += k * k;
    }
    const m = s / n;
    const v = ss / n - m * m;
    expect(Math.abs(m - mean)).toBeLessThan(4 * Math.sqrt(mean / n));
    expect(Math.abs(v / mean - 1)).toBeLessThan(0.05);
  });
  it('is 0 for mean 0 and rejects a negative mean', () => {
    expect(drawPoisson(0, createRandom(1))).toBe(0);
    expect(() => drawPoisson(-1, createRandom(1))).toThrow(RangeError);
  });
});
