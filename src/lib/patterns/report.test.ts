import { describe, it, expect } from 'vitest';
import { computePatternsReport, isWaterEvidence, WATER_SHARE_MIN } from './report';
import { PatternsInputError, type PatternsFailure, type PatternsInput, type PatternsVehicle } from './types';
import { handFleet } from './hand-fleet.fixture';

describe('computePatternsReport on a hand-built fleet', () => {
  const report = computePatternsReport(handFleet(), { asOf: '2024-01-01', replicates: 999, seed: 3 });
  const cohort = report.cohorts[0];

  it('counts exposure and ignores failures outside observation or of unknown vehicles/modules', () => {
    expect(report.counts).toMatchObject({ vehicles: 22, vehiclesObserved: 22, failuresCounted: 15, failuresIgnored: 4 });
    expect(report.counts.vehicleYears).toBeCloseTo(60, 12);
    expect(report.bands).toEqual([
      { band: 'low', vehicles: 0, vehicleYears: 0, buildMonths: 0 },
      { band: 'medium', vehicles: 0, vehicleYears: 0, buildMonths: 0 },
      { band: 'high', vehicles: 22, vehicleYears: expect.closeTo(60, 12), buildMonths: 9 },
    ]);
    const wlr = report.modules.find((m) => m.moduleCode === 'WLR-2');
    expect(wlr?.failures).toBe(15);
    expect(wlr?.ratePerVehicleYear).toBeCloseTo(15 / 60, 12);
    // Garwood 95% for 15 events (REFERENCES §3 formula) divided by 60 vehicle-years; quantiles computed for this
    // test with scipy 1.17 chi2.ppf: ½χ²(0.025; 30) = 8.395386133, ½χ²(0.975; 32) = 24.740218871.
    expect(wlr?.rateCiLow).toBeCloseTo(8.395386133 / 60, 8);
    expect(wlr?.rateCiHigh).toBeCloseTo(24.740218871 / 60, 8);
  });

  it('tests one cohort (the module without failures is not tested) and finds build months 2019-05..2019-06', () => {
    expect(report.cohorts).toHaveLength(1);
    expect(cohort).toMatchObject({
      id: 'WLR-2:high:2019-05:2019-06',
      key: 'WLR-2:high',
      moduleCode: 'WLR-2',
      buildFrom: '2019-05',
      buildTo: '2019-06',
      exposureBand: 'high',
      vehicles: 8,
      failures: 12,
      repeatVehicles: 4,
      restFailures: 3,
      bandVehicles: 22,
      bandFailures: 15,
    });
    expect(cohort?.vehicleIds).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(cohort?.repeatVehicleIds).toEqual([1, 2, 5, 6]);
    expect(cohort?.failureIds).toEqual([100, 101, 102, 103, 104, 105, 106, 107, 108, 109, 110, 111]);
    expect(cohort?.vehicleYears).toBeCloseTo(32, 12);
    expect(cohort?.restVehicleYears).toBeCloseTo(28, 12);
  });

  it('expected = cohort vehicle-years × fleet rate = 32 × 15/60 = 8; scan LLR = 12 ln(12/8) + 3 ln(3/7) (by hand)', () => {
    expect(cohort?.expected).toBeCloseTo(8, 12);
    expect(cohort?.ratioToFleet).toBeCloseTo(1.5, 12);
    expect(cohort?.scanExpected).toBeCloseTo(8, 12);
    expect(cohort?.scanLlr).toBeCloseTo(12 * Math.log(12 / 8) + 3 * Math.log(3 / 7), 12);
  });

  it('rate ratio vs the rest of the module fleet = R poisson.test(c(12, 3), c(4e5, 3.5e5)) (REFERENCES §3 example 4, (b))', () => {
    expect(cohort?.rateRatio).toBeCloseTo(3.5, 10);
    expect(cohort?.ciLow).toBeCloseTo(0.9445386408, 8);
    expect(cohort?.ciHigh).toBeCloseTo(19.32725104, 7);
    expect(cohort?.rateRatioPValue).toBeCloseTo(0.04113296, 7);
  });

  it('moisture evidence: 8 wet of 10 diagnosed vs 0 of 3; Fisher one-sided p = C(5,2)/C(13,10) = 10/286 (by hand)', () => {
    expect(cohort).toMatchObject({ diagnosedFailures: 10, moistureFailures: 8, restDiagnosedFailures: 3, restMoistureFailures: 0 });
    expect(cohort?.moistureShare).toBeCloseTo(0.8, 12);
    expect(cohort?.moistureShareRest).toBe(0);
    expect(cohort?.moistureP).toBeCloseTo(10 / 286, 12);
  });

  it('cohort trend: Laplace and MIL-HDBK-189 over the 8 cohort vehicles (REFERENCES §2 formulas, computed by hand)', () => {
    // Every cohort vehicle is observed for T = 1461 days (2020-01-01..2024-01-01). The 12 failure ages (days from
    // 2020-01-01) are 425, 790, 456, 821, 486, 851, 517, 882, 547, 578, 609, 639, each placed at age + 0.5:
    // Σt = 7601 + 6 = 7607; U = (7607 − 12·1461/2) / √(12·1461²/12) = −1159/1461 = −0.793292266;
    // χ² = 2 Σ ln(1461/t) = 20.753468810 (df 24, python math.log); β̂ = 12 / (χ²/2) = 1.156433183.
    expect(cohort?.trend.systems).toBe(8);
    expect(cohort?.trend.events).toBe(12);
    expect(cohort?.trend.laplaceU).toBeCloseTo(-1159 / 1461, 12);
    expect(cohort?.trend.milHdbkChiSquare).toBeCloseTo(20.753468810, 8);
    expect(cohort?.trend.milHdbkDf).toBe(24);
    expect(cohort?.trend.beta).toBeCloseTo(1.156433183, 8);
    expect(cohort?.trend.direction).toBe('none');
  });

  it('by-month chart rows cover every build month of the band', () => {
    expect(cohort?.byMonth.map((m) => [m.month, m.vehicles, m.failures, m.inCohort])).toEqual([
      ['2019-01', 2, 1, false], ['2019-02', 2, 1, false], ['2019-03', 2, 0, false], ['2019-04', 2, 0, false],
      ['2019-05', 4, 6, true], ['2019-06', 4, 6, true], ['2019-07', 2, 0, false], ['2019-08', 2, 0, false],
      ['2019-09', 2, 1, false],
    ]);
    expect(cohort?.byMonth[0]?.vehicleYears).toBeCloseTo(4, 12);
    expect(cohort?.byMonth[4]?.expected).toBeCloseTo(16 * 0.25, 12);
  });

  it('p, q and verdict are consistent: q = p for one cohort; water ingress only when significant', () => {
    expect(cohort?.qValue).toBe(cohort?.pValue);
    expect(cohort?.mcP).toBeGreaterThan(0.001);
    expect(cohort?.significant).toBe((cohort?.qValue as number) < 0.05);
    expect(cohort?.waterIngress).toBe(Boolean(cohort?.significant) && isWaterEvidence(cohort as never));
    expect(cohort?.verdict).toBe(cohort?.waterIngress ? 'water_ingress' : cohort?.significant ? 'significant_dry' : 'not_significant');
  });

  it('is reproducible for the same seed', () => {
    expect(computePatternsReport(handFleet(), { asOf: '2024-01-01', replicates: 999, seed: 3 })).toEqual(report);
  });

  it('a later asOf adds exposure; an earlier one drops failures after it', () => {
    const early = computePatternsReport(handFleet(), { asOf: '2022-12-31', replicates: 99 });
    expect(early.counts.failuresCounted).toBe(14); // the 2023-01-01 failure is after asOf
    expect(early.counts.vehicleYears).toBeLessThan(60);
  });
});

describe('isWaterEvidence', () => {
  it('needs share ≥ WATER_SHARE_MIN and a one-sided Fisher p < 0.05', () => {
    expect(WATER_SHARE_MIN).toBe(0.5);
    expect(isWaterEvidence({ diagnosedFailures: 10, moistureShare: 0.8, moistureP: 0.01 })).toBe(true);
    expect(isWaterEvidence({ diagnosedFailures: 10, moistureShare: 0.45, moistureP: 0.001 })).toBe(false);
    expect(isWaterEvidence({ diagnosedFailures: 10, moistureShare: 0.9, moistureP: 0.2 })).toBe(false);
    expect(isWaterEvidence({ diagnosedFailures: 0, moistureShare: 0, moistureP: 1 })).toBe(false);
  });
});

describe('computePatternsReport input checks', () => {
  it('rejects a bad asOf, bad options, a vehicle of an unknown depot and duplicate ids', () => {
    const fleet = handFleet();
    expect(() => computePatternsReport(fleet, { asOf: '2024-1-1' })).toThrow(PatternsInputError);
    expect(() => computePatternsReport(fleet, { asOf: '2024-01-01T00:00' })).toThrow(PatternsInputError);
    expect(() => computePatternsReport(fleet, { asOf: '2024-01-01', replicates: 0 })).toThrow(PatternsInputError);
    expect(() => computePatternsReport(fleet, { asOf: '2024-01-01', maxWindowFraction: 1.5 })).toThrow(PatternsInputError);
    expect(() => computePatternsReport({ ...fleet, depots: [] }, { asOf: '2024-01-01' })).toThrow(PatternsInputError);
    const dup = { ...fleet, vehicles: [...fleet.vehicles, fleet.vehicles[0] as PatternsVehicle] };
    expect(() => computePatternsReport(dup, { asOf: '2024-01-01' })).toThrow(/duplicate vehicle/);
  });

  it('an empty fleet gives an empty report', () => {
    const r = computePatternsReport({ vehicles: [], depots: [], modules: [], failures: [] }, { asOf: '2024-01-01' });
    expect(r.cohorts).toEqual([]);
    expect(r.counts.cohortsTested).toBe(0);
  });

  it('one vehicle failing again and again in a thinly built month is not a cohort (windows of at least minWindowVehicles)', () => {
    // 60 vehicles in the high band, 10 per build month 2019-01..2019-06, except 2019-07 with a single vehicle
    // that fails 4 times; 6 failures spread over the others. Without a floor the scan takes the one-vehicle month.
    const vehicles: PatternsVehicle[] = [];
    const months = ['2019-01', '2019-02', '2019-03', '2019-04', '2019-05', '2019-06'];
    for (const m of months) for (let k = 0; k < 10; k++) vehicles.push({ id: vehicles.length + 1, vin: `V${vehicles.length + 1}`, buildMonth: m, inServiceDate: '2020-01-01', retiredDate: null, depotId: 1, parking: 'outdoor', washesPerMonth: 8 });
    vehicles.push({ id: 61, vin: 'V61', buildMonth: '2019-07', inServiceDate: '2020-01-01', retiredDate: null, depotId: 1, parking: 'outdoor', washesPerMonth: 8 });
    const failures: PatternsFailure[] = [];
    for (const [i, v] of [3, 14, 25, 36, 47, 58].entries()) failures.push({ id: i + 1, vehicleId: v, moduleId: 1, reportedAt: '2021-06-01', moisture: 'none', rootCause: 'mechanical' });
    for (let k = 0; k < 4; k++) failures.push({ id: 10 + k, vehicleId: 61, moduleId: 1, reportedAt: `202${1 + Math.floor(k / 2)}-0${3 + 4 * (k % 2)}-01`, moisture: 'none', rootCause: 'mechanical' });
    const input: PatternsInput = {
      vehicles,
      depots: [{ id: 1, code: 'HBR', coastal: true, rainDaysPerYear: 175, meanRhPct: 83, washBay: true }],
      modules: [{ id: 1, code: 'WLR-2', function: 'window_lifter' }],
      failures,
    };
    const floor1 = computePatternsReport(input, { asOf: '2024-01-01', replicates: 199, minWindowVehicles: 1 });
    expect(floor1.cohorts[0]).toMatchObject({ buildFrom: '2019-07', buildTo: '2019-07', vehicles: 1, failures: 4 });
    const r = computePatternsReport(input, { asOf: '2024-01-01', replicates: 199 });
    expect(r.method.minWindowVehicles).toBe(5);
    expect(r.cohorts[0]!.vehicles).toBeGreaterThanOrEqual(5);
    expect(r.cohorts.filter((c) => c.significant)).toEqual([]);
  });

  it('a band smaller than minBandVehicles is not scanned', () => {
    const r = computePatternsReport(handFleet(), { asOf: '2024-01-01', replicates: 99, minBandVehicles: 23 });
    expect(r.cohorts).toEqual([]);
  });
});
