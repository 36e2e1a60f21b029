import { describe, it, expect } from 'vitest';
import { parseVin } from '@/lib/vin/vin';
import { DEFAULT_MODULES, generateFleet } from './fleet-generator';
import { computeExposureScore } from './exposure';
import { DAYS_PER_YEAR, toDayNumber } from './calendar';

describe('generateFleet', () => {
  const fleet = generateFleet({
    seed: 5,
    vehicleCount: 3000,
    planted: [{ label: 'wet', moduleCode: 'WLR-2', buildFrom: '2021-03', buildTo: '2021-09', band: 'high', rateMultiplier: 3, moistureShare: 0.9 }],
  });

  it('is deterministic for the same options and differs for another seed', () => {
    expect(generateFleet({ seed: 5, vehicleCount: 50 })).toEqual(generateFleet({ seed: 5, vehicleCount: 50 }));
    expect(generateFleet({ seed: 6, vehicleCount: 50 }).vehicles.map((v) => v.buildMonth)).not.toEqual(
      generateFleet({ seed: 5, vehicleCount: 50 }).vehicles.map((v) => v.buildMonth),
    );
  });

  it('produces valid, unique VINs and dates inside the build range and before asOf', () => {
    const asOf = toDayNumber(fleet.asOf);
    const vins = new Set<string>();
    for (const v of fleet.vehicles) {
      const parsed = parseVin(v.vin);
      expect(parsed.ok).toBe(true);
      if (parsed.ok) expect(parsed.checkDigit.valid).toBe(true);
      vins.add(v.vin);
      expect(v.buildMonth >= '2019-01' && v.buildMonth <= '2025-12').toBe(true);
      expect(toDayNumber(v.inServiceDate)).toBeLessThanOrEqual(asOf);
      expect(v.inServiceDate.slice(0, 7) >= v.buildMonth).toBe(true);
      if (v.retiredDate) expect(v.retiredDate > v.inServiceDate && toDayNumber(v.retiredDate) <= asOf).toBe(true);
    }
    expect(vins.size).toBe(fleet.vehicles.length);
  });

  it('records each vehicle’s band as the exposure index gives it, and every band occurs', () => {
    const depots = new Map(fleet.depots.map((d) => [d.id, d]));
    const counts = { low: 0, medium: 0, high: 0 };
    for (const v of fleet.vehicles) {
      const depot = depots.get(v.depotId);
      expect(depot).toBeDefined();
      if (!depot) continue;
      expect(v.exposureBand).toBe(computeExposureScore(depot, v).band);
      counts[v.exposureBand]++;
    }
    for (const n of Object.values(counts)) expect(n).toBeGreaterThan(fleet.vehicles.length * 0.1);
  });

  it('failures fall inside each vehicle’s observation and their ids are chronological', () => {
    const vehicles = new Map(fleet.vehicles.map((v) => [v.id, v]));
    let previous = '';
    fleet.failures.forEach((f, i) => {
      expect(f.id).toBe(i + 1);
      const v = vehicles.get(f.vehicleId);
      expect(v).toBeDefined();
      if (!v) return;
      const day = toDayNumber(f.reportedAt);
      expect(day).toBeGreaterThanOrEqual(toDayNumber(v.inServiceDate));
      expect(day).toBeLessThanOrEqual(toDayNumber(v.retiredDate ?? fleet.asOf));
      expect(f.reportedAt >= previous).toBe(true);
      previous = f.reportedAt;
      if (f.diagnosed === false) expect([f.moisture, f.rootCause]).toEqual([null, null]);
    });
  });

  it('background failure counts match rate × vehicle-years (within 4 Poisson standard deviations)', () => {
    const asOf = toDayNumber(fleet.asOf);
    let vehicleYears = 0;
    for (const v of fleet.vehicles) vehicleYears += (Math.min(toDayNumber(v.retiredDate ?? fleet.asOf), asOf) - toDayNumber(v.inServiceDate)) / DAYS_PER_YEAR;
    for (const spec of DEFAULT_MODULES) {
      const observed = fleet.failures.filter((f) => f.moduleCode === spec.code && f.plantedLabel === null).length;
      const expected = spec.failuresPerVehicleYear * vehicleYears;
      expect(Math.abs(observed - expected)).toBeLessThanOrEqual(4 * Math.sqrt(expected));
    }
  });

  it('adds planted failures only to matching vehicles, mostly wet', () => {
    const vehicles = new Map(fleet.vehicles.map((v) => [v.id, v]));
    const planted = fleet.failures.filter((f) => f.plantedLabel === 'wet');
    expect(planted.length).toBeGreaterThan(20);
    for (const f of planted) {
      const v = vehicles.get(f.vehicleId);
      expect(f.moduleCode).toBe('WLR-2');
      expect(v?.exposureBand).toBe('high');
      expect((v?.buildMonth ?? '') >= '2021-03' && (v?.buildMonth ?? '') <= '2021-09').toBe(true);
    }
    const diagnosed = planted.filter((f) => f.diagnosed);
    const wet = diagnosed.filter((f) => f.moisture !== null && f.moisture !== 'none');
    expect(wet.length / diagnosed.length).toBeGreaterThan(0.75);
  });

  it('rejects a planted cohort of an unknown module and an inverted build range', () => {
    expect(() => generateFleet({ seed: 1, vehicleCount: 1, planted: [{ label: 'x', moduleCode: 'NOPE', buildFrom: '2021-01', buildTo: '2021-02', rateMultiplier: 2, moistureShare: 0.5 }] })).toThrow(RangeError);
    expect(() => generateFleet({ seed: 1, vehicleCount: 1, buildFrom: '2022-01', buildTo: '2021-01' })).toThrow(RangeError);
  });
});
