import { describe, expect, it } from 'vitest';
import { fillBuildMonths, mergeStepCurves, niceTicks, trimMcfTail, yearTicks } from './chart-data';
import type { CohortMonth } from './types';

const m = (month: string, failures: number, inCohort = false): CohortMonth => ({ month, vehicles: 2, vehicleYears: 4, failures, expected: 1, inCohort });

describe('fillBuildMonths', () => {
  it('puts back the months without vehicles as empty gaps, across a year end', () => {
    const out = fillBuildMonths([m('2022-11', 1), m('2023-02', 3, true), m('2023-03', 2, true)], { buildFrom: '2023-01', buildTo: '2023-03' });
    expect(out.map((x) => [x.month, x.empty, x.failures, x.expected, x.inCohort])).toEqual([
      ['2022-11', false, 1, 1, false],
      ['2022-12', true, 0, null, false],
      ['2023-01', true, 0, null, true],
      ['2023-02', false, 3, 1, true],
      ['2023-03', false, 2, 1, true],
    ]);
  });
  it('empty in, empty out; one month stays one month', () => {
    expect(fillBuildMonths([])).toEqual([]);
    expect(fillBuildMonths([m('2020-05', 0)])).toHaveLength(1);
  });
});

describe('trimMcfTail', () => {
  it('cuts the curve where fewer than 5 vehicles remain observed', () => {
    const pts = [10, 8, 5, 4, 2].map((atRisk, i) => ({ ageDays: i * 100, atRisk }));
    expect(trimMcfTail(pts)).toEqual({ points: pts.slice(0, 3), dropped: 2 });
    expect(trimMcfTail(pts, 1)).toEqual({ points: pts, dropped: 0 });
    expect(trimMcfTail([{ atRisk: 3 }])).toEqual({ points: [], dropped: 1 });
  });
});

describe('yearTicks', () => {
  it('whole years up to the end of the data, no odd end tick', () => {
    expect(yearTicks(4.87)).toEqual([0, 1, 2, 3, 4]);
    expect(yearTicks(3)).toEqual([0, 1, 2, 3]);
    expect(yearTicks(0.4)).toEqual([0, 1]);
  });
});

describe('mergeStepCurves', () => {
  it('carries each step curve forward to every x, and ends it after its last point', () => {
    const a = { key: 'a', points: [{ x: 0, y: 0, lower: 0, upper: 0, atRisk: 9 }, { x: 2, y: 1, lower: 0.5, upper: 2, atRisk: 8 }, { x: 5, y: 2, lower: 1, upper: 3, atRisk: 6 }] };
    const b = { key: 'b', points: [{ x: 0, y: 0, lower: 0, upper: 0, atRisk: 4 }, { x: 3, y: 0.5, lower: 0.1, upper: 1, atRisk: 3 }] };
    const rows = mergeStepCurves([a, b]);
    expect(rows.map((r) => [r.x, r.a, r.b, r.bAtRisk])).toEqual([
      [0, 0, 0, 4],
      [2, 1, 0, 4],
      [3, 1, 0.5, 3],
      [5, 2, null, null],
    ]);
    expect(rows[2]).toMatchObject({ aLower: 0.5, aUpper: 2, bLower: 0.1, bUpper: 1 });
    expect(mergeStepCurves([])).toEqual([]);
  });
});

describe('niceTicks', () => {
  it('round steps of 1, 2, 2.5 or 5 times a power of ten, up to at least the maximum', () => {
    expect(niceTicks(2.2)).toEqual([0, 1, 2, 3]);
    expect(niceTicks(1.9)).toEqual([0, 0.5, 1, 1.5, 2]);
    expect(niceTicks(0.31)).toEqual([0, 0.1, 0.2, 0.3, 0.4]);
    expect(niceTicks(16)).toEqual([0, 5, 10, 15, 20]);
    expect(niceTicks(0)).toEqual([0, 1]);
  });
});
