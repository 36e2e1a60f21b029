import { describe, it, expect } from 'vitest';
import { generateFleet, type PlantedCohort } from './fleet-generator';
import { computePatternsReport } from './report';
import { toMonthIndex } from './calendar';
import type { PatternCohort } from './types';

// Planted-cohort and null-fleet checks on the seeded generator (our own synthetic data; no published values).

const WET: PlantedCohort = { label: 'wet', moduleCode: 'WLR-2', buildFrom: '2021-03', buildTo: '2021-09', band: 'high', rateMultiplier: 3, moistureShare: 0.9 };
const DRY: PlantedCohort = { label: 'dry', moduleCode: 'DLA-1', buildFrom: '2022-05', buildTo: '2022-12', band: 'low', rateMultiplier: 3, moistureShare: 0.05 };

function monthsApart(a: string, b: string): number {
  return Math.abs(toMonthIndex(a) - toMonthIndex(b));
}

describe('planted cohorts (6 000 vehicles, seed 1)', () => {
  const fleet = generateFleet({ seed: 1, vehicleCount: 6000, planted: [WET, DRY] });
  const report = computePatternsReport(fleet, { asOf: fleet.asOf });
  const byKey = new Map(report.cohorts.map((c) => [c.key, c]));

  it('finds the wet cohort with the right module, band and build range, and calls it water ingress', () => {
    const c = byKey.get('WLR-2:high') as PatternCohort;
    expect(c).toBeDefined();
    expect(monthsApart(c.buildFrom, WET.buildFrom)).toBeLessThanOrEqual(1);
    expect(monthsApart(c.buildTo, WET.buildTo)).toBeLessThanOrEqual(1);
    expect(c.significant).toBe(true);
    expect(c.waterIngress).toBe(true);
    expect(c.verdict).toBe('water_ingress');
    expect(c.rateRatio as number).toBeGreaterThan(2);
    expect(c.ciLow).toBeGreaterThan(1);
    expect(c.moistureShare).toBeGreaterThanOrEqual(0.5);
    // Most of the cohort's vehicles are the planted ones (built in range, high band).
    const planted = new Set(
      fleet.vehicles
        .filter((v) => v.exposureBand === 'high' && v.buildMonth >= WET.buildFrom && v.buildMonth <= WET.buildTo)
        .map((v) => v.id),
    );
    const overlap = c.vehicleIds.filter((id) => planted.has(id)).length;
    expect(overlap / c.vehicleIds.length).toBeGreaterThan(0.8);
    expect(overlap / planted.size).toBeGreaterThan(0.8);
  });

  it('finds the dry cohort: significant but not water ingress', () => {
    const c = byKey.get('DLA-1:low') as PatternCohort;
    expect(c).toBeDefined();
    expect(monthsApart(c.buildFrom, DRY.buildFrom)).toBeLessThanOrEqual(1);
    expect(monthsApart(c.buildTo, DRY.buildTo)).toBeLessThanOrEqual(1);
    expect(c.significant).toBe(true);
    expect(c.waterIngress).toBe(false);
    expect(c.verdict).toBe('significant_dry');
    expect(c.moistureShare).toBeLessThan(0.5);
  });

  it('the two planted cohorts come first and nothing else is significant', () => {
    expect(report.cohorts.slice(0, 2).map((c) => c.key).sort()).toEqual(['DLA-1:low', 'WLR-2:high']);
    expect(report.cohorts.filter((c) => c.significant).map((c) => c.key).sort()).toEqual(['DLA-1:low', 'WLR-2:high']);
  });

  it('reports every module × band with failures, sorted by q, with q ≥ p and ids stable across Monte Carlo seeds', () => {
    expect(report.cohorts).toHaveLength(7 * 3);
    for (let i = 1; i < report.cohorts.length; i++) {
      expect((report.cohorts[i] as PatternCohort).qValue).toBeGreaterThanOrEqual((report.cohorts[i - 1] as PatternCohort).qValue);
    }
    for (const c of report.cohorts) expect(c.qValue).toBeGreaterThanOrEqual(c.pValue);
    const other = computePatternsReport(fleet, { asOf: fleet.asOf, seed: 777 });
    const ids = (r: typeof report) => r.cohorts.map((c) => c.id).sort();
    // The window is found from the data; only the p-values depend on the Monte Carlo seed.
    expect(ids(other)).toEqual(ids(report));
  });
});

describe('null fleets: no real effect', () => {
  it('over 20 seeds at most one report flags anything', () => {
    let flagged = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const fleet = generateFleet({ seed, vehicleCount: 3000, buildFrom: '2021-07', buildTo: '2024-06' });
      const report = computePatternsReport(fleet, { asOf: fleet.asOf, seed });
      expect(report.cohorts.length).toBe(21);
      if (report.cohorts.some((c) => c.significant)) flagged++;
    }
    expect(flagged).toBeLessThanOrEqual(1);
  }, 120_000);
});
