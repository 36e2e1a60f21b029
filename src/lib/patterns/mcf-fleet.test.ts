import { describe, it, expect } from 'vitest';
import { buildMcfUnits, computeMcfCompare, computeMcfSeries, UnknownModuleError } from './mcf-fleet';
import type { PatternsInput } from './types';

/** Three vehicles at a wet depot (high band with outdoor parking, low band indoors at the dry depot). */
function fleet(): PatternsInput {
  return {
    depots: [
      { id: 1, code: 'WET', coastal: true, rainDaysPerYear: 175, meanRhPct: 83, washBay: true },
      { id: 2, code: 'DRY', coastal: false, rainDaysPerYear: 60, meanRhPct: 55, washBay: false },
    ],
    modules: [
      { id: 1, code: 'WLR-2', function: 'window_lifter' },
      { id: 2, code: 'DLA-1', function: 'lock_actuator' },
    ],
    vehicles: [
      { id: 10, vin: 'A', buildMonth: '2020-01', inServiceDate: '2020-03-01', retiredDate: null, depotId: 1, parking: 'outdoor', washesPerMonth: 8 },
      { id: 11, vin: 'B', buildMonth: '2020-02', inServiceDate: '2020-03-01', retiredDate: '2020-03-21', depotId: 1, parking: 'outdoor', washesPerMonth: 8 },
      { id: 12, vin: 'C', buildMonth: '2020-02', inServiceDate: '2020-03-01', retiredDate: null, depotId: 2, parking: 'indoor', washesPerMonth: 0 },
      { id: 13, vin: 'D', buildMonth: '2020-02', inServiceDate: '2020-05-01', retiredDate: null, depotId: 2, parking: 'indoor', washesPerMonth: 0 },
    ],
    failures: [
      { id: 1, vehicleId: 10, moduleId: 1, reportedAt: '2020-03-11', moisture: 'traces', rootCause: 'water_ingress' },
      { id: 2, vehicleId: 10, moduleId: 1, reportedAt: '2020-03-31T16:00:00Z', moisture: null, rootCause: null },
      { id: 3, vehicleId: 11, moduleId: 1, reportedAt: '2020-03-21', moisture: null, rootCause: null }, // on the retirement day: counts
      { id: 4, vehicleId: 11, moduleId: 1, reportedAt: '2020-03-25', moisture: null, rootCause: null }, // after retirement
      { id: 5, vehicleId: 12, moduleId: 2, reportedAt: '2020-03-05', moisture: null, rootCause: null }, // other module
      { id: 6, vehicleId: 12, moduleId: 1, reportedAt: '2020-04-15', moisture: null, rootCause: null }, // after asOf
      { id: 7, vehicleId: 13, moduleId: 1, reportedAt: '2020-05-01', moisture: null, rootCause: null }, // in service that day
    ],
  };
}

describe('buildMcfUnits', () => {
  it('unit = vehicle, age from in-service date, end at min(retired, asOf), events of the module up to the end', () => {
    expect(buildMcfUnits(fleet(), 'WLR-2', '2020-04-10')).toEqual([
      { id: 10, endAgeDays: 40, eventAgesDays: [10, 30] },
      { id: 11, endAgeDays: 20, eventAgesDays: [20] },
      { id: 12, endAgeDays: 40, eventAgesDays: [] },
    ]);
  });

  it('filters by exposure band and leaves out vehicles not yet in service', () => {
    expect(buildMcfUnits(fleet(), 'WLR-2', '2020-04-10', 'high').map((u) => u.id)).toEqual([10, 11]);
    expect(buildMcfUnits(fleet(), 'WLR-2', '2020-04-10', 'low').map((u) => u.id)).toEqual([12]);
    expect(buildMcfUnits(fleet(), 'WLR-2', '2020-05-01', 'low')).toEqual([
      { id: 12, endAgeDays: 61, eventAgesDays: [45] },
      { id: 13, endAgeDays: 0, eventAgesDays: [0] },
    ]);
  });

  it('throws UnknownModuleError for a code not in the catalogue', () => {
    expect(() => buildMcfUnits(fleet(), 'NOPE', '2020-04-10')).toThrow(UnknownModuleError);
  });
});

describe('computeMcfSeries', () => {
  it('one "all" series by default, Nelson MCF with the at-risk tie rule', () => {
    const { series } = computeMcfSeries(fleet(), { moduleCode: 'WLR-2', asOf: '2020-04-10' });
    expect(series).toHaveLength(1);
    expect(series[0]?.key).toBe('all');
    // Ages 10 (n=3), 20 (n=3: vehicle 11 ends at 20, still at risk), 30 (n=2).
    expect(series[0]?.points.map((p) => [p.ageDays, p.atRisk, +p.mcf.toFixed(12)])).toEqual([
      [10, 3, +(1 / 3).toFixed(12)],
      [20, 3, +(2 / 3).toFixed(12)],
      [30, 2, +(2 / 3 + 1 / 2).toFixed(12)],
    ]);
  });

  it('by exposure band: one series per band with vehicles, in band order', () => {
    const { series } = computeMcfSeries(fleet(), { moduleCode: 'WLR-2', asOf: '2020-04-10', byExposureBand: true });
    expect(series.map((s) => s.key)).toEqual(['low', 'high']);
    expect(series[0]?.points).toEqual([]);
    expect(series[1]?.points.map((p) => p.ageDays)).toEqual([10, 20, 30]);
  });
});

describe('computeMcfCompare', () => {
  it('the cohort (high band, built 2020-01) against the rest of its band (built 2020-02), worked by hand', () => {
    // As of 2020-04-10: A (built 2020-01) fails at ages 10 and 30, end 40; B (2020-02) fails at age 20, end 20.
    // Cohort: one unit, MCF(10) = 1, MCF(30) = 2. Rest: one unit, MCF(20) = 1 (at risk on its last day).
    const s = computeMcfCompare(fleet(), { moduleCode: 'WLR-2', asOf: '2020-04-10', band: 'high', buildFrom: '2020-01', buildTo: '2020-01' });
    expect(s.map((x) => [x.key, x.points.map((p) => [p.ageDays, p.mcf, p.atRisk])])).toEqual([
      ['cohort', [[10, 1, 1], [30, 2, 1]]],
      ['rest', [[20, 1, 1]]],
    ]);
  });

  it('leaves out a curve without vehicles, and refuses a range that ends before it starts', () => {
    const s = computeMcfCompare(fleet(), { moduleCode: 'WLR-2', asOf: '2020-04-10', band: 'high', buildFrom: '2020-01', buildTo: '2020-02' });
    expect(s.map((x) => x.key)).toEqual(['cohort']);
    expect(() => computeMcfCompare(fleet(), { moduleCode: 'WLR-2', asOf: '2020-04-10', band: 'high', buildFrom: '2020-02', buildTo: '2020-01' })).toThrow(/ends before/);
  });
});
