import { describe, it, expect } from 'vitest';
import { computeGumbelTailP, computeScanLlr, createScanLayout, GUMBEL_MIN_CASES, runPoissonScan, scanPoisson1d } from './scan';

// REFERENCES.md §5, references/scan1d_examples.csv (constructed data; expected values computed with numpy and
// re-derived in R — (b)).
const A = { population: [50, 60, 40, 70, 50, 30], cases: [1, 2, 6, 7, 1, 1] };
const B = {
  population: [120, 130, 125, 118, 140, 135, 128, 122, 131, 126, 119, 124],
  cases: [2, 3, 1, 2, 3, 9, 8, 7, 2, 1, 2, 2],
};
const EXACT_P_A = 0.012592; // REFERENCES §5 example A: exact p by enumerating all 33 649 outcomes (b)

/** Allowed Monte Carlo deviation: 3·√(p(1−p)/R) (REFERENCES §5). */
function mcTolerance(p: number, replicates: number): number {
  return 3 * Math.sqrt((p * (1 - p)) / replicates);
}

describe('computeScanLlr', () => {
  it('single-window sanity: LLR(c=20, E=10, C=40) = 5.753641449; LLR(c = E) = 0 (REFERENCES §5, (b))', () => {
    expect(computeScanLlr(20, 10, 40)).toBeCloseTo(5.753641449, 9);
    expect(computeScanLlr(10, 10, 40)).toBe(0);
    expect(computeScanLlr(5, 10, 40)).toBe(0);
    expect(computeScanLlr(40, 10, 40)).toBeCloseTo(40 * Math.log(4), 12);
  });

  it('example A window LLRs: bins 3–4 4.691558995, bin 3 2.349373, bin 4 1.081273, bins 2–3 0.478241, bins 4–5 0.073274 (REFERENCES §5, (b))', () => {
    const C = 18;
    const N = 300;
    const llr = (bins: number[]) => {
      const c = bins.reduce((s, b) => s + (A.cases[b - 1] as number), 0);
      const pop = bins.reduce((s, b) => s + (A.population[b - 1] as number), 0);
      return computeScanLlr(c, (C * pop) / N, C);
    };
    expect(llr([3, 4])).toBeCloseTo(4.691558995, 9);
    expect(llr([3])).toBeCloseTo(2.349373, 6);
    expect(llr([4])).toBeCloseTo(1.081273, 6);
    expect(llr([2, 3])).toBeCloseTo(0.478241, 6);
    expect(llr([4, 5])).toBeCloseTo(0.073274, 6);
    expect(llr([1])).toBe(0);
  });
});

describe('createScanLayout', () => {
  it('example A has 13 admissible windows under the 50% cap; example B has 51 (REFERENCES §5, (b))', () => {
    expect(createScanLayout(A.population).starts.length).toBe(13);
    expect(createScanLayout(B.population).starts.length).toBe(51);
  });

  it('caps on size, not population, when sizes are given; windows ordered by start then end', () => {
    const layout = createScanLayout([1, 1, 1, 97], [1, 1, 1, 1], 0.5);
    // Sizes 1 each: windows of at most 2 bins (3 singles + 3 pairs + the last single), population share < 1.
    expect(Array.from(layout.starts)).toEqual([0, 0, 1, 1, 2, 2, 3]);
    expect(Array.from(layout.ends)).toEqual([0, 1, 1, 2, 2, 3, 3]);
    expect(Array.from(layout.rowStart)).toEqual([0, 2, 4, 6, 7]);
  });

  it('skips windows smaller than minSize (sizes only: the same windows in every replicate)', () => {
    // Sizes 1, 2, 3, 4 (total 10), cap 100%: without a floor every run but the whole row; with minSize 3 the
    // single bins 0 and 1 (sizes 1 and 2) drop out.
    const all = createScanLayout([1, 2, 3, 4], [1, 2, 3, 4], 1);
    expect(Array.from(all.starts)).toEqual([0, 0, 0, 1, 1, 1, 2, 2, 3]);
    const floored = createScanLayout([1, 2, 3, 4], [1, 2, 3, 4], 1, 3);
    expect(Array.from(floored.starts)).toEqual([0, 0, 1, 1, 2, 2, 3]);
    expect(Array.from(floored.ends)).toEqual([1, 2, 2, 3, 2, 3, 3]);
    expect(Array.from(floored.size)).toEqual([3, 6, 5, 9, 3, 7, 4]);
  });

  it('skips windows without population', () => {
    const layout = createScanLayout([0, 5, 5, 5], [1, 1, 1, 1], 0.5);
    expect(Array.from(layout.starts)).toEqual([0, 1, 1, 2, 2, 3]);
    expect(Array.from(layout.ends)).toEqual([1, 1, 2, 2, 3, 3]);
  });

  it('rejects mismatched lengths and bad fractions', () => {
    expect(() => createScanLayout([1, 2], [1])).toThrow(RangeError);
    expect(() => createScanLayout([1, 2], [1, 2], 0)).toThrow(RangeError);
  });
});

describe('scanPoisson1d on example A (REFERENCES §5)', () => {
  it('finds bins 3–4: c = 13, E = 6.6, LLR = 4.691558995 ((b))', () => {
    const r = scanPoisson1d({ ...A, replicates: 99, seed: 1 });
    expect(r.best).not.toBeNull();
    expect(r.best?.start).toBe(2);
    expect(r.best?.end).toBe(3);
    expect(r.best?.cases).toBe(13);
    expect(r.best?.expected).toBeCloseTo(6.6, 12);
    expect(r.best?.llr).toBeCloseTo(4.691558995, 9);
    expect(r.windowsTested).toBe(13);
  });

  it('exact p by enumerating all multinomial outcomes is 0.012592 ((b)) — checks the engine LLR on every outcome', () => {
    const layout = createScanLayout(A.population);
    const C = 18;
    const N = 300;
    const share = A.population.map((p) => p / N);
    const observed = 4.691558994747297;
    let exact = 0;
    let outcomes = 0;
    const logFact = [0];
    for (let i = 1; i <= C; i++) logFact[i] = (logFact[i - 1] as number) + Math.log(i);
    const counts = new Array<number>(6).fill(0);
    const visit = (bin: number, left: number): void => {
      if (bin === 5) {
        counts[5] = left;
        outcomes++;
        let best = 0;
        for (let w = 0; w < layout.starts.length; w++) {
          let c = 0;
          for (let b = layout.starts[w] as number; b <= (layout.ends[w] as number); b++) c += counts[b] as number;
          best = Math.max(best, computeScanLlr(c, C * (layout.populationShare[w] as number), C));
        }
        if (best >= observed - 1e-9) {
          let logP = logFact[C] as number;
          counts.forEach((k, i) => (logP += k * Math.log(share[i] as number) - (logFact[k] as number)));
          exact += Math.exp(logP);
        }
        return;
      }
      for (let k = 0; k <= left; k++) {
        counts[bin] = k;
        visit(bin + 1, left - k);
      }
    };
    visit(0, C);
    expect(outcomes).toBe(33649);
    expect(exact).toBeCloseTo(EXACT_P_A, 6);
  });

  it.each([1, 2, 3, 20240601])('Monte Carlo p with R = 999 (seed %i) is within 3·√(p(1−p)/R) of the exact 0.012592', (seed) => {
    const r = scanPoisson1d({ ...A, replicates: 999, seed });
    expect(Math.abs(r.mcP - EXACT_P_A)).toBeLessThanOrEqual(mcTolerance(EXACT_P_A, 999));
    // 18 cases are below GUMBEL_MIN_CASES: the Monte Carlo p is reported as is.
    expect(r.pValueMethod).toBe('monte_carlo');
    expect(r.pValue).toBe(r.mcP);
  });

  it('Monte Carlo p with R = 9999 is within tolerance of the exact p', () => {
    const r = scanPoisson1d({ ...A, replicates: 9999, seed: 11 });
    expect(Math.abs(r.mcP - EXACT_P_A)).toBeLessThanOrEqual(mcTolerance(EXACT_P_A, 9999));
    expect(r.mcP).toBe((1 + r.exceedances) / 10000);
  });

  it('is reproducible for a seed and changes with the seed', () => {
    const a = scanPoisson1d({ ...A, replicates: 999, seed: 5 });
    const b = scanPoisson1d({ ...A, replicates: 999, seed: 5 });
    const c = scanPoisson1d({ ...A, replicates: 999, seed: 6 });
    expect(b).toEqual(a);
    expect(c.exceedances).not.toBe(a.exceedances);
  });
});

describe('scanPoisson1d on example B (REFERENCES §5)', () => {
  it('finds weeks 6–8: c = 24, E = 10.652174, LLR = 9.509039115 ((b))', () => {
    const r = scanPoisson1d({ ...B, replicates: 99, seed: 1 });
    expect(r.best?.start).toBe(5);
    expect(r.best?.end).toBe(7);
    expect(r.best?.cases).toBe(24);
    expect(r.best?.expected).toBeCloseTo(10.652174, 6);
    expect(r.best?.llr).toBeCloseTo(9.509039115, 9);
    expect(r.windowsTested).toBe(51);
  });

  it('Monte Carlo p (R = 9999) is consistent with the published 0.0004 (numpy seed 7, (b))', () => {
    const r = scanPoisson1d({ ...B, replicates: 9999, seed: 7 });
    expect(r.mcP).toBeLessThanOrEqual(0.0004 + mcTolerance(0.0004, 9999));
    expect(r.mcP).toBeGreaterThanOrEqual(1 / 10000);
  });

  it('uses the Gumbel tail only when no replicate reaches the observed maximum (42 cases ≥ GUMBEL_MIN_CASES)', () => {
    expect(42).toBeGreaterThanOrEqual(GUMBEL_MIN_CASES);
    const r = scanPoisson1d({ ...B, replicates: 999, seed: 3 });
    if (r.exceedances === 0) {
      expect(r.pValueMethod).toBe('gumbel');
      expect(r.pValue).toBeLessThan(r.mcP);
      expect(r.pValue).toBe(r.gumbelP);
    } else {
      expect(r.pValueMethod).toBe('monte_carlo');
      expect(r.pValue).toBe(r.mcP);
    }
  });
});

describe('runPoissonScan edge cases', () => {
  it('no cases: no window, p = 1', () => {
    const r = scanPoisson1d({ population: [1, 2, 3], cases: [0, 0, 0], replicates: 9 });
    expect(r.best).toBeNull();
    expect(r.pValue).toBe(1);
  });

  it('cases exactly proportional to population: no window exceeds expectation', () => {
    const r = scanPoisson1d({ population: [10, 10, 10, 10], cases: [1, 1, 1, 1], replicates: 9 });
    expect(r.best).toBeNull();
  });

  it('rejects non-integer counts and a wrong number of bins', () => {
    const layout = createScanLayout([1, 1, 1]);
    expect(() => runPoissonScan(layout, [1, 0.5, 0], { replicates: 9, seed: 1 })).toThrow(RangeError);
    expect(() => runPoissonScan(layout, [1, 0], { replicates: 9, seed: 1 })).toThrow(RangeError);
  });

  it('the count filter leaves every replicate maximum exact (same exceedances and Gumbel fit as evaluating all windows)', () => {
    const layout = createScanLayout(B.population);
    for (const seed of [1, 2, 3]) {
      const fast = runPoissonScan(layout, B.cases, { replicates: 999, seed });
      const slow = runPoissonScan(layout, B.cases, { replicates: 999, seed, countFilter: false });
      expect(fast).toEqual(slow);
    }
    // A weaker signal, where many replicates fall near the filter level.
    const weak = [3, 4, 2, 3, 5, 4, 3, 6, 2, 3, 4, 3];
    expect(runPoissonScan(layout, weak, { replicates: 999, seed: 4 })).toEqual(
      runPoissonScan(layout, weak, { replicates: 999, seed: 4, countFilter: false }),
    );
  });
});

describe('computeGumbelTailP', () => {
  it('moment fit: for a sample with mean μ and sd σ, P(X > μ) = 1 − exp(−exp(−γ·π/√6... )) matches the closed form', () => {
    // Sample {0, 2}: mean 1, sd √2 → scale β = √2·√6/π, location 1 − γβ; P(X > 1) = 1 − exp(−exp(−γ)).
    const p = computeGumbelTailP([0, 2], 1);
    expect(p).toBeCloseTo(1 - Math.exp(-Math.exp(-0.5772156649015329)), 12);
    expect(computeGumbelTailP([3, 3, 3], 4)).toBeNull();
    expect(computeGumbelTailP([1], 4)).toBeNull();
  });
});
