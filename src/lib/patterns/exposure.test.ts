import { describe, it, expect } from 'vitest';
import {
  bandForExposureIndex,
  computeExposureIndex,
  computeExposureScore,
  computeVehicleObservation,
  EXPOSURE_THRESHOLDS,
} from './exposure';
import { toDayNumber } from './calendar';

const wetCoast = { coastal: true, rainDaysPerYear: 175, meanRhPct: 83, washBay: true };
const dryInland = { coastal: false, rainDaysPerYear: 60, meanRhPct: 55, washBay: false };

describe('computeExposureScore', () => {
  it('gives every point at a wet coastal depot with outdoor parking and frequent pressure washing', () => {
    const s = computeExposureScore(wetCoast, { parking: 'outdoor', washesPerMonth: 8 });
    expect(s.points).toEqual({ coastal: 2, rain: 2, humidity: 2, parking: 2, washing: 2 });
    expect(s.index).toBe(10);
    expect(s.band).toBe('high');
  });

  it('gives no points at a dry inland depot, indoor parking, no washing', () => {
    const s = computeExposureScore(dryInland, { parking: 'indoor', washesPerMonth: 0 });
    expect(s.index).toBe(0);
    expect(s.band).toBe('low');
  });

  it('applies the rain and humidity steps at their thresholds (inclusive)', () => {
    const at = (rain: number, rh: number) =>
      computeExposureScore({ coastal: false, rainDaysPerYear: rain, meanRhPct: rh, washBay: false }, { parking: 'indoor', washesPerMonth: 0 }).points;
    expect(at(99, 69.9)).toMatchObject({ rain: 0, humidity: 0 });
    expect(at(100, 70)).toMatchObject({ rain: 1, humidity: 1 });
    expect(at(149, 79.9)).toMatchObject({ rain: 1, humidity: 1 });
    expect(at(150, 80)).toMatchObject({ rain: 2, humidity: 2 });
  });

  it('counts a wash bay as 1.5 washes per wash (pressure washing on site)', () => {
    const withBay = { ...dryInland, washBay: true };
    // 3 washes: 3 → 0 points without a bay, 4.5 → 1 point with one; 6 washes: 1 vs 2 (9 ≥ 8).
    expect(computeExposureScore(dryInland, { parking: 'indoor', washesPerMonth: 3 }).points.washing).toBe(0);
    expect(computeExposureScore(withBay, { parking: 'indoor', washesPerMonth: 3 }).points.washing).toBe(1);
    expect(computeExposureScore(dryInland, { parking: 'indoor', washesPerMonth: 6 }).points.washing).toBe(1);
    expect(computeExposureScore(withBay, { parking: 'indoor', washesPerMonth: 6 }).points.washing).toBe(2);
  });

  it('parking points: indoor 0, mixed 1, outdoor 2', () => {
    for (const [parking, points] of [['indoor', 0], ['mixed', 1], ['outdoor', 2]] as const) {
      expect(computeExposureScore(dryInland, { parking, washesPerMonth: 0 }).points.parking).toBe(points);
    }
  });

  it('computeExposureIndex agrees with computeExposureScore on every factor combination', () => {
    for (const coastal of [false, true])
      for (const rain of [50, 100, 150])
        for (const rh of [60, 70, 80])
          for (const washBay of [false, true])
            for (const parking of ['indoor', 'mixed', 'outdoor'] as const)
              for (const washes of [0, 3, 4, 6, 8]) {
                const depot = { coastal, rainDaysPerYear: rain, meanRhPct: rh, washBay };
                expect(computeExposureIndex(depot, parking, washes)).toBe(computeExposureScore(depot, { parking, washesPerMonth: washes }).index);
              }
  });
});

describe('bandForExposureIndex', () => {
  it('low 0–3, medium 4–6, high 7–10 (fixed, not fleet terciles)', () => {
    expect([0, 1, 2, 3].map(bandForExposureIndex)).toEqual(['low', 'low', 'low', 'low']);
    expect([4, 5, 6].map(bandForExposureIndex)).toEqual(['medium', 'medium', 'medium']);
    expect([7, 8, 9, 10].map(bandForExposureIndex)).toEqual(['high', 'high', 'high', 'high']);
    expect(EXPOSURE_THRESHOLDS.maxIndex).toBe(10);
  });
});

describe('computeVehicleObservation', () => {
  const asOf = toDayNumber('2025-01-01');
  it('in service to asOf: 2024-01-01 → 2025-01-01 is 366 days = 366/365.25 vehicle-years', () => {
    const o = computeVehicleObservation({ inServiceDate: '2024-01-01', retiredDate: null }, asOf);
    expect(o.observedDays).toBe(366);
    expect(o.vehicleYears).toBeCloseTo(366 / 365.25, 12);
  });
  it('retired before asOf ends at retirement', () => {
    const o = computeVehicleObservation({ inServiceDate: '2024-01-01', retiredDate: '2024-07-01' }, asOf);
    expect(o.observedDays).toBe(182);
    expect(o.endDay).toBe(toDayNumber('2024-07-01'));
  });
  it('retired after asOf ends at asOf', () => {
    expect(computeVehicleObservation({ inServiceDate: '2024-01-01', retiredDate: '2026-01-01' }, asOf).observedDays).toBe(366);
  });
  it('entering service after asOf, or retired before entering, has no exposure', () => {
    expect(computeVehicleObservation({ inServiceDate: '2025-03-01', retiredDate: null }, asOf).vehicleYears).toBe(0);
    expect(computeVehicleObservation({ inServiceDate: '2024-03-01', retiredDate: '2024-01-01' }, asOf).vehicleYears).toBe(0);
  });
});
