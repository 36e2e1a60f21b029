// Test fixture (not shipped code): the hand-built fleet of report.test.ts and cohort-figures.test.ts.
import type { PatternsFailure, PatternsInput, PatternsVehicle } from './types';

/**
 * A hand-built fleet at one wet depot (every vehicle in the high band): 8 vehicles built 2019-05/06 in service
 * for exactly 1461 days (4 vehicle-years each, 32 in all) and 14 vehicles built 2019-01..04 and 2019-07..09 in
 * pairs of 730 + 731 days (4 vehicle-years per month, 28 in all). Module WLR-2 has 12 failures on the first group
 * and 3 on the rest, so the cohort : rest exposure ratio is 32 : 28 = 4e5 : 3.5e5 — REFERENCES.md §3 example 4.
 */
export function handFleet(): PatternsInput {
  const vehicles: PatternsVehicle[] = [];
  const add = (buildMonth: string, inServiceDate: string): number => {
    const id = vehicles.length + 1;
    vehicles.push({ id, vin: `V${id}`, buildMonth, inServiceDate, retiredDate: null, depotId: 1, parking: 'outdoor', washesPerMonth: 8 });
    return id;
  };
  for (const month of ['2019-05', '2019-06']) for (let k = 0; k < 4; k++) add(month, '2020-01-01');
  for (const month of ['2019-01', '2019-02', '2019-03', '2019-04', '2019-07', '2019-08', '2019-09']) {
    add(month, '2022-01-01'); // 730 days to 2024-01-01
    add(month, '2021-12-31'); // 731 days
  }
  const failures: PatternsFailure[] = [];
  const fail = (vehicleId: number, reportedAt: string, moisture: PatternsFailure['moisture'], rootCause: string | null, diagnosed?: boolean) => {
    const f: PatternsFailure = { id: 100 + failures.length, vehicleId, moduleId: 1, reportedAt, moisture, rootCause };
    if (diagnosed !== undefined) f.diagnosed = diagnosed;
    failures.push(f);
  };
  // Cohort (vehicles 1-8): 12 failures, 6 per build month; vehicles 1, 2, 5 and 6 fail twice.
  // 10 diagnosed, 8 of them wet.
  fail(1, '2021-03-01', 'traces', 'water_ingress');
  fail(1, '2022-03-01T10:00:00Z', 'corrosion', 'water_ingress');
  fail(2, '2021-04-01', 'corrosion', 'connector'); // wet by the finding
  fail(2, '2022-04-01', 'standing_water', 'water_ingress');
  fail(3, '2021-05-01', 'traces', null);
  fail(4, '2022-05-01', 'none', 'water_ingress'); // wet by the root cause
  fail(5, '2021-06-01', 'corrosion', 'water_ingress');
  fail(5, '2022-06-01', 'traces', 'water_ingress');
  fail(6, '2021-07-01', 'none', 'connector');
  fail(6, '2021-08-01', 'none', 'mechanical');
  fail(7, '2021-09-01', null, null); // not diagnosed (nothing recorded)
  fail(8, '2021-10-01', 'corrosion', 'water_ingress', false); // explicitly not diagnosed: does not count
  // Rest: 3 dry failures on vehicles built 2019-01, 2019-02 and 2019-09.
  fail(9, '2022-06-01', 'none', 'mechanical');
  fail(11, '2022-07-01', 'none', 'mechanical');
  fail(21, '2023-01-01', 'none', 'sensor');
  // Ignored: before in service, after asOf, unknown vehicle, unknown module.
  fail(9, '2021-06-01', 'none', 'mechanical');
  fail(10, '2024-01-02', 'none', 'mechanical');
  failures.push({ id: 900, vehicleId: 999, moduleId: 1, reportedAt: '2022-01-01', moisture: null, rootCause: null });
  failures.push({ id: 901, vehicleId: 1, moduleId: 77, reportedAt: '2022-01-01', moisture: null, rootCause: null });
  return {
    vehicles,
    depots: [{ id: 1, code: 'HBR', coastal: true, rainDaysPerYear: 175, meanRhPct: 83, washBay: true }],
    modules: [
      { id: 1, code: 'WLR-2', function: 'window_lifter' },
      { id: 2, code: 'DLA-1', function: 'lock_actuator' },
    ],
    failures,
  };
}

