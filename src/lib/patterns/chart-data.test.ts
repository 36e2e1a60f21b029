import { describe, expect, it } from 'vitest';
import { fillBuildMonths, trimMcfTail, yearTicks } from './chart-data';
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
