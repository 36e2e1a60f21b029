import { describe, it, expect } from 'vitest';
import {
  adjustBenjaminiHochberg,
  binomialTestTwoSided,
  binomialUpperTail,
  compareRatesExact,
  computeClopperPearsonInterval,
  computeGarwoodInterval,
  fisherExactGreater,
  normalTwoSidedP,
} from './stats';

/** Relative closeness: |a − b| ≤ tol·|b|. */
function expectRel(actual: number | null, expected: number, tol = 1e-7): void {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(tol * Math.abs(expected));
}

describe('computeGarwoodInterval', () => {
  // REFERENCES.md §3: Garwood (1936) 95% limits, computed with R qchisq and poisson.test (identical) — (b).
  const table: Array<[number, number, number]> = [
    [0, 0, 3.688879],
    [1, 0.025318, 5.571643],
    [2, 0.242209, 7.224688],
    [3, 0.618672, 8.767273],
    [5, 1.623486, 11.668332],
    [10, 4.795389, 18.390356],
    [20, 12.21652, 30.888378],
  ];
  it.each(table)('x = %i → [%f, %f] (REFERENCES §3, R 4.2.2, (b))', (x, lower, upper) => {
    const ci = computeGarwoodInterval(x);
    if (lower === 0) expect(ci.lower).toBe(0);
    else expect(ci.lower).toBeCloseTo(lower, 5);
    expect(ci.upper).toBeCloseTo(upper, 5);
  });

  it('one-sided 95% upper limit for x = 0 is −ln 0.05 = 2.995732 (REFERENCES §3, (b))', () => {
    // A one-sided 95% upper limit is the upper end of the two-sided 90% interval.
    expect(computeGarwoodInterval(0, 0.9).upper).toBeCloseTo(2.995732, 6);
    expect(computeGarwoodInterval(0, 0.9).upper).toBeCloseTo(-Math.log(0.05), 9);
  });

  it('rejects a negative or fractional count', () => {
    expect(() => computeGarwoodInterval(-1)).toThrow(RangeError);
    expect(() => computeGarwoodInterval(1.5)).toThrow(RangeError);
  });
});

describe('compareRatesExact (rule: R binom.test two-sided — sum of outcomes no more likely than observed)', () => {
  it('poisson.test(c(11, 21), c(800, 3011)) — R help example (REFERENCES §3 example 2, (b))', () => {
    const r = compareRatesExact(11, 800, 21, 3011);
    expectRel(r.rateRatio, 1.971488095, 1e-9);
    expectRel(r.ciLow, 0.8584264034, 1e-8);
    expectRel(r.ciHigh, 4.277265944, 1e-8);
    expectRel(r.pTwoSided, 0.07966863, 1e-6);
  });

  it('binom.test(11, 32, 800/3811) Clopper–Pearson limits (REFERENCES §3 example 2, (b))', () => {
    const ci = computeClopperPearsonInterval(11, 32);
    expectRel(ci.lower, 0.1857190917, 1e-8);
    expectRel(ci.upper, 0.5319310363, 1e-8);
  });

  it('poisson.test(c(2, 9), c(17877, 16660)) — CI matches Fay rateratio.test vignette (REFERENCES §3 example 3, (a)/(b))', () => {
    const r = compareRatesExact(2, 17877, 9, 16660);
    expectRel(r.rateRatio, 0.2070941557, 1e-9);
    expectRel(r.ciLow, 0.02177406276, 1e-8);
    expectRel(r.ciHigh, 1.000549104, 1e-8);
    // R's rule gives 0.03309420 (b); "twice the smaller one-sided p" would give 0.05010650 (b) — we pin R's.
    expectRel(r.pTwoSided, 0.0330942, 1e-6);
    expect(Math.abs(r.pTwoSided - 0.0501065)).toBeGreaterThan(0.01);
  });

  it('poisson.test(c(12, 3), c(4e5, 3.5e5)): p < 0.05 although the CI contains 1 (REFERENCES §3 example 4, (b))', () => {
    const r = compareRatesExact(12, 4e5, 3, 3.5e5);
    expectRel(r.rateRatio, 3.5, 1e-12);
    expectRel(r.ciLow, 0.9445386408, 1e-8);
    expectRel(r.ciHigh, 19.32725104, 1e-8);
    expectRel(r.pTwoSided, 0.04113296, 1e-6);
    expect(r.pTwoSided).toBeLessThan(0.05);
    expect(r.ciLow).toBeLessThan(1);
  });

  it('poisson.test(c(10, 10), c(1000, 1000)): p = 1 (REFERENCES §3 example 4, (b))', () => {
    const r = compareRatesExact(10, 1000, 10, 1000);
    expect(r.rateRatio).toBe(1);
    expect(r.pTwoSided).toBe(1);
    expectRel(r.ciLow, 0.3735468467, 1e-8);
    expectRel(r.ciHigh, 2.6770404, 1e-7);
  });

  it('edge cases: no events, no events in the rest, none in the first group', () => {
    expect(compareRatesExact(0, 1, 0, 1)).toEqual({ rateRatio: null, ciLow: 0, ciHigh: null, pTwoSided: 1, pGreater: 1 });
    const allFirst = compareRatesExact(5, 1, 0, 1);
    expect(allFirst.rateRatio).toBeNull();
    expect(allFirst.ciHigh).toBeNull();
    expect(allFirst.ciLow).toBeGreaterThan(0);
    const noneFirst = compareRatesExact(0, 1, 5, 1);
    expect(noneFirst.rateRatio).toBe(0);
    expect(noneFirst.ciLow).toBe(0);
    // One-sided p of "first is higher" with x1 = 0 is 1.
    expect(noneFirst.pGreater).toBe(1);
  });

  it('one-sided p equals the binomial upper tail computed from the pmf by hand', () => {
    // x1 = 4 of n = 6 with p0 = 1/3 (t1 = 1, t2 = 2): P(X ≥ 4) = Σ C(6,k)(1/3)^k(2/3)^(6−k), k = 4..6 = 73/729.
    expectRel(compareRatesExact(4, 1, 2, 2).pGreater, 73 / 729, 1e-12);
    expectRel(binomialUpperTail(4, 6, 1 / 3), 73 / 729, 1e-12);
  });
});

describe('binomialTestTwoSided', () => {
  it('matches hand enumeration of R rule on Bin(10, 0.3) at x = 6', () => {
    // pmf by hand; sum of all outcomes with pmf ≤ pmf(6).
    const n = 10;
    const p = 0.3;
    const choose = (a: number, b: number): number => {
      let r = 1;
      for (let i = 1; i <= b; i++) r = (r * (a - b + i)) / i;
      return r;
    };
    const pmf = (k: number): number => choose(n, k) * p ** k * (1 - p) ** (n - k);
    const d = pmf(6);
    let expected = 0;
    for (let k = 0; k <= n; k++) if (pmf(k) <= d * (1 + 1e-7)) expected += pmf(k);
    expectRel(binomialTestTwoSided(6, n, p), expected, 1e-10);
    expectRel(binomialTestTwoSided(0, n, p), (() => {
      const d0 = pmf(0);
      let s = 0;
      for (let k = 0; k <= n; k++) if (pmf(k) <= d0 * (1 + 1e-7)) s += pmf(k);
      return s;
    })(), 1e-10);
  });

  it('degenerate p', () => {
    expect(binomialTestTwoSided(0, 5, 0)).toBe(1);
    expect(binomialTestTwoSided(1, 5, 0)).toBe(0);
    expect(binomialTestTwoSided(5, 5, 1)).toBe(1);
  });
});

describe('adjustBenjaminiHochberg', () => {
  it('15 p-values of Benjamini & Hochberg (1995) → p.adjust(p, "BH"), 4 rejections (REFERENCES §4, (a, secondary)/(b))', () => {
    const p = [0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459, 0.324, 0.4262, 0.5719, 0.6528, 0.759, 1.0];
    const expected = [0.0015, 0.003, 0.0095, 0.035625, 0.0603, 0.06385714286, 0.06385714286, 0.0645, 0.0765, 0.486, 0.5811818182, 0.714875, 0.7532307692, 0.8132142857, 1.0];
    const q = adjustBenjaminiHochberg(p);
    q.forEach((value, i) => expect(value).toBeCloseTo(expected[i] as number, 9));
    expect(q.filter((value) => value < 0.05)).toHaveLength(4);
  });

  it('keeps input order and steps up (REFERENCES §4 small cases, (b))', () => {
    expect(adjustBenjaminiHochberg([0.01, 0.04, 0.03, 0.05, 0.2]).map((v) => +v.toFixed(10))).toEqual([0.05, 0.0625, 0.0625, 0.0625, 0.2]);
    expect(adjustBenjaminiHochberg([0.04, 0.03]).map((v) => +v.toFixed(10))).toEqual([0.04, 0.04]);
    const q = adjustBenjaminiHochberg([0.001, 0.008, 0.039, 0.041, 0.042, 0.06, 0.074, 0.205]);
    const expected = [0.008, 0.032, 0.0672, 0.0672, 0.0672, 0.08, 0.08457142857, 0.205];
    q.forEach((value, i) => expect(value).toBeCloseTo(expected[i] as number, 9));
  });

  it('the largest p is its own q exactly, never a rounding below it (q_(m) = p_(m)·m/m, by definition)', () => {
    const p = [...Array.from({ length: 20 }, (_, i) => 0.3 + i * 0.01), 0.975];
    const q = adjustBenjaminiHochberg(p);
    expect(q[20]).toBe(0.975);
    q.forEach((value, i) => expect(value).toBeGreaterThanOrEqual(p[i] as number));
  });

  it('empty and single inputs; rejects values outside [0, 1]', () => {
    expect(adjustBenjaminiHochberg([])).toEqual([]);
    expect(adjustBenjaminiHochberg([0.3])).toEqual([0.3]);
    expect(() => adjustBenjaminiHochberg([1.2])).toThrow(RangeError);
  });
});

describe('fisherExactGreater', () => {
  it('lady tasting tea, all four right: p = 1/70 (Fisher 1935, The Design of Experiments — from memory, (c))', () => {
    expect(fisherExactGreater(4, 0, 0, 4)).toBeCloseTo(1 / 70, 12);
  });

  it('[[3,1],[1,3]]: P(A ≥ 3) = (C(4,3)C(4,1) + C(4,4)C(4,0)) / C(8,4) = 17/70 (hypergeometric pmf by hand)', () => {
    expect(fisherExactGreater(3, 1, 1, 3)).toBeCloseTo(17 / 70, 12);
  });

  it('[[8,2],[0,3]]: P(A ≥ 8) = C(8,8)C(5,2)/C(13,10) = 10/286 (by hand)', () => {
    expect(fisherExactGreater(8, 2, 0, 3)).toBeCloseTo(10 / 286, 12);
  });

  it('no positives in the group or an empty group gives 1', () => {
    expect(fisherExactGreater(0, 5, 3, 2)).toBe(1);
    expect(fisherExactGreater(0, 0, 3, 2)).toBe(1);
  });
});

describe('normalTwoSidedP', () => {
  it('z = 1.959964 → 0.05; Laplace U = −3.012036 → 0.002595 (REFERENCES §2, (b))', () => {
    expect(normalTwoSidedP(1.959963985)).toBeCloseTo(0.05, 9);
    expect(normalTwoSidedP(-3.012036)).toBeCloseTo(0.00259502, 7);
  });
});
