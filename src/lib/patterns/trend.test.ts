import { describe, it, expect } from 'vitest';
import { computeLaplaceTrend, computeMilHdbkTrend, fitPowerLawNhpp, type TrendSystem } from './trend';

// REFERENCES.md §2: Crow (1975) AMSAA TR-138 Table 1 (a), references/crow1975_amsaa_tr138_table1.csv:
// K = 3 systems, each time-truncated at T = 200 h.
const S1 = [4.3, 4.4, 10.2, 23.5, 23.8, 26.4, 74, 77.1, 92.1, 197.2];
const S2 = [0.1, 5.6, 18.6, 19.5, 24.2, 26.7, 45.1, 45.8, 75.7, 79.7, 98.6, 120.1, 161.8, 180.6, 190.8];
const S3 = [8.4, 32.5, 44.7, 48.4, 50.6, 73.6, 98.7, 112.2, 129.8, 136, 195.8];
const CROW: TrendSystem[] = [S1, S2, S3].map((eventTimes) => ({ endTime: 200, eventTimes }));
// REFERENCES.md §2 second example (constructed single system; use only as a computed check (b)).
const SINGLE: TrendSystem[] = [{ endTime: 1500, eventTimes: [5, 40, 43, 175, 389, 712, 747, 795, 1299, 1478] }];

describe('computeLaplaceTrend', () => {
  it('Crow data combined: U = −3.012036, two-sided p = 0.00259502 ((b); mcotear vignette "Laplace Combined -3.012036 0.002595015" (a))', () => {
    const r = computeLaplaceTrend(CROW);
    expect(r?.u).toBeCloseTo(-3.012036, 6);
    expect(r?.pTwoSided).toBeCloseTo(0.00259502, 8);
    expect(r?.events).toBe(36);
  });

  it('Crow data per system: U = −2.557864, −1.820607, −0.884140 ((b))', () => {
    expect(computeLaplaceTrend([CROW[0] as TrendSystem])?.u).toBeCloseTo(-2.557864, 6);
    expect(computeLaplaceTrend([CROW[1] as TrendSystem])?.u).toBeCloseTo(-1.820607, 6);
    expect(computeLaplaceTrend([CROW[2] as TrendSystem])?.u).toBeCloseTo(-0.88414, 6);
  });

  it('single system: U = −1.326949, two-sided p = 0.184525 ((b))', () => {
    const r = computeLaplaceTrend(SINGLE);
    expect(r?.u).toBeCloseTo(-1.326949, 6);
    expect(r?.pTwoSided).toBeCloseTo(0.184525, 6);
  });

  it('null without events; failures arriving late give U > 0', () => {
    expect(computeLaplaceTrend([{ endTime: 10, eventTimes: [] }])).toBeNull();
    expect(computeLaplaceTrend([{ endTime: 10, eventTimes: [8, 9, 9.5, 9.9] }])?.u).toBeGreaterThan(0);
  });
});

describe('computeMilHdbkTrend', () => {
  it('Crow data combined: χ² = 117.009196, df 72, P(χ² ≥ x) = 0.000634625, two-sided 0.00126925 ((b); mcotear "Mil-HDBK Combined 117.0092 72 0.001269251" (a))', () => {
    const r = computeMilHdbkTrend(CROW);
    expect(r?.chiSquare).toBeCloseTo(117.009196, 5);
    expect(r?.df).toBe(72);
    expect(r?.pDecreasing).toBeCloseTo(0.000634625, 8);
    expect(r?.pTwoSided).toBeCloseTo(0.00126925, 8);
  });

  it('Crow data per system: χ² = 39.328509 (df 20), 52.877011 (df 30), 24.803676 (df 22) ((b))', () => {
    const per = CROW.map((s) => computeMilHdbkTrend([s]));
    expect(per.map((r) => r?.df)).toEqual([20, 30, 22]);
    expect(per[0]?.chiSquare).toBeCloseTo(39.328509, 5);
    expect(per[1]?.chiSquare).toBeCloseTo(52.877011, 5);
    expect(per[2]?.chiSquare).toBeCloseTo(24.803676, 5);
  });

  it('single system: χ² = 37.228081 (df 20), upper p = 0.0109864 — disagrees with Laplace at 5% ((b))', () => {
    const r = computeMilHdbkTrend(SINGLE);
    expect(r?.chiSquare).toBeCloseTo(37.228081, 5);
    expect(r?.pDecreasing).toBeCloseTo(0.0109864, 6);
    expect(computeLaplaceTrend(SINGLE)?.pTwoSided).toBeGreaterThan(0.05);
  });
});

describe('fitPowerLawNhpp', () => {
  it('Crow data: β̂ = 0.615336 (published 0.615), λ̂ = 0.460547 (0.461), β̄ = 0.598244 (0.598) (REFERENCES §2, (a)/(b))', () => {
    const fit = fitPowerLawNhpp(CROW);
    expect(fit?.beta).toBeCloseTo(0.615336, 6);
    expect(fit?.beta.toFixed(3)).toBe('0.615');
    expect(fit?.lambda).toBeCloseTo(0.460547, 6);
    expect(fit?.betaUnbiased).toBeCloseTo(0.598244, 6);
  });

  it('Crow data, failure truncated (M = 33): β̂ = 0.574675 (0.575), unbiased 0.557260 (0.557) ((a)/(b))', () => {
    const fit = fitPowerLawNhpp(CROW, 'failure');
    expect(fit?.events).toBe(33);
    expect(fit?.beta).toBeCloseTo(0.574675, 6);
    expect(fit?.betaUnbiased).toBeCloseTo(0.55726, 6);
  });

  it('single system: β̂ = 0.537229, λ̂ = 0.19665822, β̄ = 0.483506 ((b))', () => {
    const fit = fitPowerLawNhpp(SINGLE);
    expect(fit?.beta).toBeCloseTo(0.537229, 6);
    expect(fit?.lambda).toBeCloseTo(0.19665822, 8);
    expect(fit?.betaUnbiased).toBeCloseTo(0.483506, 6);
  });

  it('null with fewer than 2 events', () => {
    expect(fitPowerLawNhpp([{ endTime: 10, eventTimes: [3] }])).toBeNull();
  });
});
