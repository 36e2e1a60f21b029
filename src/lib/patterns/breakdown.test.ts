import { describe, expect, it } from 'vitest';
import { computeFailureBreakdown, describeFailureBreakdown, type BreakdownFailure } from './breakdown';

const f = (rootCause: string | null, moisture: string | null): BreakdownFailure => ({ rootCause, moisture });
const label = (k: string) => ({ water_ingress: 'Water ingress', connector: 'Connector', wiring: 'Wiring', software: 'Software', sensor: 'Sensor', mechanical: 'Mechanical' })[k] ?? k;

describe('computeFailureBreakdown', () => {
  it('counts and shares by root cause (part faults first) and by moisture (wettest first; not recorded last)', () => {
    const b = computeFailureBreakdown([
      f('water_ingress', 'corrosion'),
      f('water_ingress', 'traces'),
      f('connector', 'corrosion'),
      f('sensor', 'none'),
      f('mechanical', 'none'),
      f('wiring', null),
      f(null, null),
      f('unknown', 'standing_water'),
    ]);
    expect(b.total).toBe(8);
    expect(b.byRootCause.map((r) => [r.key, r.count, r.share])).toEqual([
      ['sensor', 1, 0.125],
      ['mechanical', 1, 0.125],
      ['water_ingress', 2, 0.25],
      ['connector', 1, 0.125],
      ['wiring', 1, 0.125],
      ['unknown', 1, 0.125],
      ['not_recorded', 1, 0.125],
    ]);
    expect(b.byMoisture.map((r) => [r.key, r.count])).toEqual([
      ['standing_water', 1],
      ['corrosion', 2],
      ['traces', 1],
      ['none', 2],
      ['not_recorded', 2],
    ]);
    expect(b).toMatchObject({ partFaults: 2, otherCauses: 4, undetermined: 2 });
    expect(describeFailureBreakdown(b, label)).toBe(
      'Of the 8 failures, 2 were faults of the part itself (sensor or mechanical), 4 had another cause (water ingress 2, connector 1, wiring 1) and 2 have no known root cause.',
    );
  });

  it('empty and single cases', () => {
    const none = computeFailureBreakdown([]);
    expect(none).toEqual({ total: 0, byRootCause: [], byMoisture: [], partFaults: 0, otherCauses: 0, undetermined: 0 });
    expect(describeFailureBreakdown(none, label)).toBe('There are no failures to break down.');
    const one = computeFailureBreakdown([f('sensor', 'none')]);
    expect(describeFailureBreakdown(one, label)).toBe('Of the 1 failure, 1 was a fault of the part itself (sensor or mechanical).');
    const dry = computeFailureBreakdown([f('mechanical', 'none'), f('mechanical', 'none'), f('unknown', 'none')]);
    expect(describeFailureBreakdown(dry, label)).toBe('Of the 3 failures, 2 were faults of the part itself (sensor or mechanical) and 1 has no known root cause.');
  });
});
