// A factory fleet with no real effect (no planted cohort, the same rates at every build month and band): the
// report through the API flags nothing and a sync records nothing. The false-discovery control makes this hold
// for about 19 fleets in 20 (docs/patterns-method.md §9); this fleet's seed is fixed.
import { beforeAll, describe, expect, it } from 'vitest';
import { body, call } from '../setup/call';
import { personWithToken } from '../factories/fleet';
import { loadGeneratedFleet, type LoadedFleet } from '../factories/patterns-fleet';
import * as report from '../../src/pages/api/patterns/index';
import * as records from '../../src/pages/api/patterns/records';
import * as sync from '../../src/pages/api/patterns/sync';

let loaded: LoadedFleet;
let manager: string;

beforeAll(async () => {
  loaded = loadGeneratedFleet({ seed: 11, vehicleCount: 3000, buildFrom: '2021-07', buildTo: '2024-06' });
  manager = (await personWithToken('manager')).token;
}, 120_000);

describe('a fleet with no effect', () => {
  it('tests every module type and band but flags nothing', async () => {
    const r = await body(await call(report, 'GET', `/api/patterns?asOf=${loaded.fleet.asOf}`, { token: manager }));
    expect(r.cohorts).toHaveLength(21);
    expect(r.cohorts.filter((c: { significant: boolean }) => c.significant)).toEqual([]);
    expect(r.cohorts.every((c: { qValue: number; pValue: number }) => c.qValue >= c.pValue)).toBe(true);
  });

  it('a sync creates no pattern record', async () => {
    expect(await body(await call(sync, 'POST', '/api/patterns/sync', { token: manager, json: {} }))).toMatchObject({ created: 0, updated: 0 });
    expect(await body(await call(records, 'GET', '/api/patterns/records', { token: manager }))).toMatchObject({ items: [], total: 0 });
  });
});
