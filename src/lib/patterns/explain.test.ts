import { describe, expect, it } from 'vitest';
import { explainCohort, explainTrend, formatCount, formatExpected, formatProbability, formatRatio, formatShare, formatStat, formatTimes, type ExplainCohort } from './explain';
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
    expect(formatRatio(10)).toBe('10');
    expect(formatRatio(9.96)).toBe('10');
    expect(formatRatio(9.94)).toBe('9.9');
    expect(formatRatio(0.0567)).toBe('0.057');
    expect(formatRatio(null)).toBe('∞');
    expect(formatTimes(10.04)).toBe('10×');
    expect(formatTimes(3.874)).toBe('3.9×');
    expect(formatShare(0.866)).toBe('87%');
    expect(formatShare(null)).toBe('–');
    expect(formatExpected(16.84)).toBe('17');
    expect(formatExpected(8.36)).toBe('8.4');
  });
  it('counts with their nouns', () => {
    expect(formatCount(1, 'vehicle')).toBe('1 vehicle');
    expect(formatCount(0, 'failure')).toBe('0 failures');
    expect(formatCount(1204, 'failure')).toBe('1,204 failures');
  });
});

const wet: ExplainCohort = {
  moduleCode: 'WLR-2',
  vehicles: 38,
  failures: 53,
  expected: 16.8,
  ratioToFleet: 53 / 16.8,
  rateRatio: 3.87,
  ciLow: 2.8,
  ciHigh: 5.3,
  search: { pValue: 1e-8, qValue: 7.6e-7 },
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

/** No jargon on the first level: no p or q, no test names, no powers of ten. */
const JARGON = /\b[pq] [=<]|Fisher|Laplace|MIL-HDBK|χ²|β|×10|q-value|false-discovery/;

describe('explainCohort', () => {
  it('a water-ingress cohort: both ratios named apart, plain words first, the statistics one level deeper', () => {
    const e = explainCohort(wet);
    expect(e.rate).toBe(
      "53 failures on 38 vehicles, where 17 would be expected at the fleet's rate for WLR-2 (3.2 times that). Compared with the rest of the fleet (every vehicle outside this group), they fail 3.9 times as often (95% confidence: between 2.8 and 5.3 times); the two figures differ because the fleet's rate includes these vehicles' own failures.",
    );
    expect(e.chance).toBe('Far beyond chance: even allowing for every build range searched and every group tested, a cluster this strong would almost never appear by chance, so it is flagged.');
    expect(e.moisture).toBe("Water was found in 45 of the 50 diagnosed failures (90%), against 18% of this module's other diagnosed failures — far more often than chance would explain.");
    for (const text of [e.rate, e.chance!, e.moisture, e.waterVerdict, e.repeats!, ...e.waterRule.map((r) => `${r.label} ${r.detail}`)]) expect(text).not.toMatch(JARGON);
    expect(e.chanceStat).toContain('q = 7.6×10⁻⁷, below the 0.05');
    expect(e.moistureStat).toContain('one-sided Fisher exact test p < 10⁻¹⁶');
    expect(e.waterRule.map((r) => r.met)).toEqual([true, true, true]);
    expect(e.waterRule[0]!.stat).toBe('q = 7.6×10⁻⁷ (needs < 0.05)');
    expect(e.waterVerdict).toMatch(/^Called water ingress/);
    expect(e.repeats).toBe('9 vehicles of the group failed twice or more.');
  });

  it('flagged but not far beyond chance', () => {
    expect(explainCohort({ ...wet, search: { pValue: 0.002, qValue: 0.02 } }).chance).toMatch(/^Unlikely to be chance/);
  });

  it('a dry cohort says it is not wetter than the rest, never "p = 1"', () => {
    const e = explainCohort({ ...wet, waterIngress: false, moistureFailures: 1, moistureShare: 0.04, moistureP: 1, repeatVehicles: 1 });
    expect(e.moisture).toBe("Not wetter than the rest: water was found in 1 of the 50 diagnosed failures (4%), against 18% of this module's other diagnosed failures.");
    expect(e.waterRule.map((r) => r.met)).toEqual([true, false, false]);
    expect(e.waterVerdict).toBe(
      "Not called water ingress — a pattern that fails dry. It does not meet: at least 50% of diagnosed failures show water; wetter than the module's other failures, beyond chance. Look for another cause (mechanical wear, a supplier batch, wiring).",
    );
    expect(e.repeats).toBe('1 vehicle of the group failed twice or more.');
  });

  it('somewhat wetter, but not beyond chance', () => {
    expect(explainCohort({ ...wet, moistureShare: 0.3, moistureFailures: 15, moistureP: 0.08 }).moisture).toMatch(/: somewhat more often, but not clearly more than chance would give\.$/);
  });

  it('a cohort that is not significant: could be chance, no cause', () => {
    const e = explainCohort({ ...wet, significant: false, waterIngress: false, search: { pValue: 0.2, qValue: 0.4 } });
    expect(e.chance).toMatch(/^Could well be chance/);
    expect(e.chanceStat).toContain('q = 0.4, not below the 0.05');
    expect(e.waterVerdict).toBe('Not called water ingress: the group is not flagged, so no verdict on its cause is given.');
  });

  it('no diagnosed failures, an unbounded ratio', () => {
    const e = explainCohort({ ...wet, diagnosedFailures: 0, moistureFailures: 0, moistureShare: 0, rateRatio: null, ciHigh: null, expected: 4.25, ratioToFleet: 53 / 4.25 });
    expect(e.moisture).toBe('None of these failures has been diagnosed yet, so there is no moisture evidence either way.');
    expect(e.moistureStat).toBeNull();
    expect(e.rate).toBe("53 failures on 38 vehicles, where 4.3 would be expected at the fleet's rate for WLR-2 (12 times that). The rest of the fleet had none, so there is no rate to compare them with.");
    expect(e.waterRule[1]).toMatchObject({ label: 'At least 50% of diagnosed failures show water', met: false, detail: 'none diagnosed' });
  });

  it('a record read over one person’s depots: their rate, no search, the fleet-wide verdict', () => {
    const e = explainCohort({ ...wet, search: null, vehicles: 15, failures: 17, expected: 5.1, ratioToFleet: 17 / 5.1 }, 'depots');
    expect(e.rate).toMatch(/^17 failures on 15 vehicles, where 5\.1 would be expected at your depots' rate for WLR-2 \(3\.3 times that\)\. Compared with the rest of the vehicles at your depots/);
    expect(e.chance).toBeNull();
    expect(e.chanceStat).toBeNull();
    expect(e.waterRule[0]).toMatchObject({ label: 'Flagged by the fleet-wide report', met: true, stat: 'decided on the whole fleet' });
    expect(e.waterVerdict).toMatch(/^Called water ingress on the whole fleet/);
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
  it('says yes, no or not clear in plain words, with the figures one level deeper', () => {
    const yes = explainTrend(base, 'in this group');
    expect(yes.plain).toBe('Failures in this group are coming faster as these vehicles age.');
    expect(yes.stat).toBe(
      'Laplace U = 2.50, p = 0.012; MIL-HDBK-189 χ² = 55.2 on 80 degrees of freedom, p = 0.03; power-law shape β = 1.45. A trend is called only when both tests reject a steady rate at 0.05 (two-sided) in the same direction.',
    );
    expect(explainTrend({ ...base, direction: 'none', accelerating: false, laplacePTwoSided: 0.3, milHdbkPTwoSided: 0.4 }, 'of WLR-2').plain).toBe('No clear sign that failures of WLR-2 come faster or slower as the vehicles age.');
    expect(explainTrend({ ...base, direction: 'none', accelerating: false, laplacePTwoSided: 0.14 }, 'here').plain).toBe('Not clear: one of the two tests hints that failures here come faster as the vehicles age, the other does not.');
    expect(explainTrend({ ...base, direction: 'decreasing', accelerating: false }, 'here').plain).toBe('Failures here are coming more slowly as these vehicles age.');
    expect(explainTrend({ ...base, laplaceU: null, events: 1 }, 'here')).toEqual({ plain: 'Too few failures here to tell whether they come faster with age.', stat: null });
    for (const t of [yes.plain]) expect(t).not.toMatch(JARGON);
  });
});
