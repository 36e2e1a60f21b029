import { describe, expect, it } from 'vitest';
import { explainCohort, explainTrend, formatProbability, formatRatio, formatShare, formatStat, type ExplainCohort } from './explain';
import type { ModuleTrend } from './types';

// Wording checks on literal cohorts; the rule it restates is docs/patterns-method.md section 5.

describe('number formats', () => {
  it('probabilities', () => {
    expect(formatProbability(1)).toBe('1');
    expect(formatProbability(0.04113296)).toBe('0.041');
    expect(formatProbability(0.0012)).toBe('0.0012');
    expect(formatProbability(7.61e-7)).toBe('7.6×10⁻⁷');
    expect(formatProbability(3.2e-12)).toBe('3.2×10⁻¹²');
    expect(formatProbability(0)).toBe('< 10⁻¹⁶');
  });
  it('a named statistic', () => {
    expect(formatStat('p', 0.03)).toBe('p = 0.03');
    expect(formatStat('q', 0)).toBe('q < 10⁻¹⁶');
  });
  it('ratios and shares', () => {
    expect(formatRatio(3.874)).toBe('3.9');
    expect(formatRatio(0.944)).toBe('0.94');
    expect(formatRatio(19.3)).toBe('19');
    expect(formatRatio(null)).toBe('∞');
    expect(formatShare(0.866)).toBe('87%');
    expect(formatShare(null)).toBe('–');
  });
});

const wet: ExplainCohort = {
  moduleCode: 'WLR-2',
  exposureBand: 'high',
  vehicles: 38,
  failures: 53,
  expected: 16.8,
  rateRatio: 3.87,
  ciLow: 2.8,
  ciHigh: 5.3,
  pValue: 1e-8,
  qValue: 7.6e-7,
  significant: true,
  waterIngress: true,
  diagnosedFailures: 50,
  moistureFailures: 45,
  moistureShare: 0.9,
  moistureShareRest: 0.18,
  restDiagnosedFailures: 200,
  restMoistureFailures: 36,
  moistureP: 2e-20,
  repeatVehicles: 9,
};

describe('explainCohort', () => {
  it('a water-ingress cohort meets all three conditions', () => {
    const e = explainCohort(wet);
    expect(e.rate).toBe(
      '53 failures on 38 vehicles where 17 would be expected at the fleet\'s rate: these vehicles fail 3.9 times as often as the rest of the fleet (95% confidence: between 2.8 and 5.3 times).',
    );
    expect(e.waterRule.map((r) => r.met)).toEqual([true, true, true]);
    expect(e.waterVerdict).toMatch(/^Called water ingress/);
    expect(e.moisture).toContain('45 of the 50 diagnosed failures (90%), against 18% (36 of 200)');
    expect(e.moisture).toContain('is p < 10⁻¹⁶ (one-sided Fisher exact test)');
    expect(e.repeats).toBe('9 vehicles failed more than once.');
    expect(e.chance).toContain('q = 7.6×10⁻⁷, below the 0.05');
  });
  it('a dry significant cohort names the conditions it fails', () => {
    const e = explainCohort({ ...wet, waterIngress: false, moistureFailures: 1, moistureShare: 0.04, moistureP: 0.99, repeatVehicles: 0 });
    expect(e.waterRule.map((r) => r.met)).toEqual([true, false, false]);
    expect(e.waterVerdict).toBe(
      "Not called water ingress — a significant but dry pattern. It fails: at least 50% of diagnosed failures show water; wetter than the module's other failures. Look for another cause (mechanical wear, a supplier batch, wiring).",
    );
    expect(e.repeats).toBeNull();
  });
  it('a cohort that is not significant gets no cause', () => {
    const e = explainCohort({ ...wet, significant: false, waterIngress: false, qValue: 0.4, pValue: 0.2 });
    expect(e.chance).toContain('it could well be chance, so it is not flagged');
    expect(e.waterVerdict).toBe('Not called water ingress: the cohort is not significant, so no verdict on its cause is given.');
  });
  it('no diagnosed failures, an unbounded ratio', () => {
    const e = explainCohort({ ...wet, diagnosedFailures: 0, moistureFailures: 0, moistureShare: 0, rateRatio: null, ciHigh: null, expected: 4.25 });
    expect(e.moisture).toBe('None of these failures has been diagnosed yet, so there is no moisture evidence either way.');
    expect(e.rate).toBe("53 failures on 38 vehicles where 4.3 would be expected at the fleet's rate, and none on the rest of the fleet.");
    expect(e.waterRule[1]).toEqual({ label: 'At least 50% of diagnosed failures show water', met: false, detail: 'none diagnosed' });
  });
});

describe('explainTrend', () => {
  const base: ModuleTrend = {
    systems: 100,
    events: 40,
    laplaceU: 2.5,
    laplacePTwoSided: 0.0124,
    milHdbkChiSquare: 55.2,
    milHdbkDf: 80,
    milHdbkPTwoSided: 0.03,
    beta: 1.45,
    direction: 'increasing',
    accelerating: true,
  };
  it('says yes, no or not clear, with the figures', () => {
    expect(explainTrend(base, 'in this cohort')).toBe(
      'Yes: failures in this cohort come faster as the vehicles age — both tests reject a steady rate (Laplace U = 2.50, p = 0.012; MIL-HDBK-189 χ² = 55.2 on 80 degrees of freedom, p = 0.03; power-law shape β = 1.45).',
    );
    expect(explainTrend({ ...base, direction: 'none', accelerating: false, laplacePTwoSided: 0.3, milHdbkPTwoSided: 0.4 }, 'of WLR-2')).toMatch(/^No clear sign: failures of WLR-2 come at a steady rate/);
    expect(explainTrend({ ...base, direction: 'none', accelerating: false, laplacePTwoSided: 0.14 }, 'here')).toMatch(
      /^Not clear: the MIL-HDBK-189 test points to failures here coming faster with age but the Laplace test does not/,
    );
    expect(explainTrend({ ...base, direction: 'decreasing', accelerating: false }, 'here')).toMatch(/^No, the opposite/);
    expect(explainTrend({ ...base, laplaceU: null, events: 1 }, 'here')).toBe('Too few failures here to test whether they come faster with age.');
  });
});
