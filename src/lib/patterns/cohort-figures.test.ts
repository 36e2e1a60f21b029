import { describe, expect, it } from 'vitest';
import { createCohortFigures } from './cohort-figures';
import { handFleet } from './hand-fleet.fixture';
import { PatternsInputError } from './types';

// The hand-built fleet (hand-fleet.fixture.ts): 60 vehicle-years, 15 WLR-2 failures; builds 2019-05..06 hold
// 8 vehicles, 32 vehicle-years and 12 failures.

describe('createCohortFigures: a build range taken as given', () => {
  const calc = createCohortFigures(handFleet(), '2024-01-01');
  const figures = calc.figures;

  it('the range the report finds gives the same figures: R poisson.test(c(12, 3), c(4e5, 3.5e5)) (REFERENCES §3 example 4, (b))', () => {
    const c = figures({ moduleCode: 'WLR-2', band: 'high', buildFrom: '2019-05', buildTo: '2019-06' })!;
    expect(c).toMatchObject({ id: 'WLR-2:high:2019-05:2019-06', key: 'WLR-2:high', vehicles: 8, failures: 12, repeatVehicles: 4, restFailures: 3, bandVehicles: 22, bandFailures: 15 });
    expect(c.vehicleIds).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(c.expected).toBeCloseTo(8, 12); // 32 × 15/60
    expect(c.rateRatio).toBeCloseTo(3.5, 10);
    expect(c.ciLow).toBeCloseTo(0.9445386408, 8);
    expect(c.ciHigh).toBeCloseTo(19.32725104, 7);
    expect(c.rateRatioPValue).toBeCloseTo(0.04113296, 7);
    // 8 wet of 10 diagnosed vs 0 of 3; Fisher one-sided p = C(5,2)/C(13,10) = 10/286 (by hand).
    expect(c.moistureP).toBeCloseTo(10 / 286, 12);
    // Nothing searched: no scan fields.
    expect(c).not.toHaveProperty('qValue');
    expect(c).not.toHaveProperty('pValue');
  });

  it('a wider range: 2019-04..06 adds two vehicles and 8 vehicle-years without failures', () => {
    const c = figures({ moduleCode: 'WLR-2', band: 'high', buildFrom: '2019-04', buildTo: '2019-06' })!;
    expect(c).toMatchObject({ vehicles: 10, failures: 12, restFailures: 3 });
    expect(c.vehicleYears).toBeCloseTo(36, 12);
    expect(c.expected).toBeCloseTo(9, 12); // 36 × 15/60
    expect(c.rateRatio).toBeCloseTo(12 / 36 / (3 / 24), 12);
    expect(c.byMonth.filter((m) => m.inCohort).map((m) => m.month)).toEqual(['2019-04', '2019-05', '2019-06']);
  });

  it('a range with no vehicles of the band has no figures to compare', () => {
    const c = figures({ moduleCode: 'WLR-2', band: 'high', buildFrom: '2018-01', buildTo: '2018-03' })!;
    expect(c).toMatchObject({ vehicles: 0, failures: 0, expected: 0, rateRatio: null, ciLow: 0, ciHigh: null, rateRatioPValue: 1, restFailures: 15 });
    expect(c.byMonth.some((m) => m.inCohort)).toBe(false);
    expect(figures({ moduleCode: 'WLR-2', band: 'low', buildFrom: '2019-05', buildTo: '2019-06' })).toMatchObject({ vehicles: 0, bandVehicles: 0 });
  });

  it('a range holding the whole fleet has no rest to compare with', () => {
    const c = figures({ moduleCode: 'WLR-2', band: 'high', buildFrom: '2019-01', buildTo: '2019-12' })!;
    expect(c).toMatchObject({ vehicles: 22, failures: 15, rateRatio: null, ciHigh: null, rateRatioPValue: 1, restFailures: 0 });
    expect(c.ratioToFleet).toBeCloseTo(1, 12);
  });

  it('the module baseline over the fleet given: 15 failures over 60 vehicle-years', () => {
    const b = calc.baseline('WLR-2')!;
    expect(b).toMatchObject({ moduleCode: 'WLR-2', failures: 15, vehicles: 22, diagnosedFailures: 13, moistureFailures: 8 });
    expect(b.ratePerVehicleYear).toBeCloseTo(0.25, 12);
    expect(calc.baseline('XX-9')).toBeNull();
  });

  it('unknown module: null; a range that ends before it starts or an unknown band: an input error', () => {
    expect(figures({ moduleCode: 'XX-9', band: 'high', buildFrom: '2019-05', buildTo: '2019-06' })).toBeNull();
    expect(() => figures({ moduleCode: 'WLR-2', band: 'high', buildFrom: '2019-06', buildTo: '2019-05' })).toThrow(PatternsInputError);
    expect(() => figures({ moduleCode: 'WLR-2', band: 'wet' as never, buildFrom: '2019-05', buildTo: '2019-06' })).toThrow(PatternsInputError);
  });
});
