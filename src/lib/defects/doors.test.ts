import { describe, expect, it } from 'vitest';
import { countByDoor, DOOR_ORDER, sortByDoor } from './doors';

describe('door order', () => {
  it('is the plan order: front, sliding, rear, then the tailgate', () => {
    expect(DOOR_ORDER).toEqual(['FL', 'FR', 'SL', 'SR', 'RL', 'RR', 'TG']);
  });
  it('sorts the import order into the plan order, unknown codes last and stable', () => {
    expect(sortByDoor(['FL', 'FR', 'RL', 'RR', 'SL', 'SR', 'TG'])).toEqual(['FL', 'FR', 'SL', 'SR', 'RL', 'RR', 'TG']);
    expect(sortByDoor(['XX', 'TG', 'YY', 'FL'])).toEqual(['FL', 'TG', 'XX', 'YY']);
    expect(sortByDoor([{ p: 'RR', n: 1 }, { p: 'FL', n: 2 }, { p: 'RR', n: 3 }], (x) => x.p).map((x) => x.n)).toEqual([2, 1, 3]);
    expect(sortByDoor([])).toEqual([]);
  });
});

describe('countByDoor', () => {
  it('counts defects, open ones, repeats and water findings per door', () => {
    expect(
      countByDoor([
        { position: 'FR', open: true, repeat: false, moisture: 'corrosion' },
        { position: 'FR', open: false, repeat: true, moisture: 'none' },
        { position: 'FR', open: false, repeat: false, moisture: null },
        { position: 'TG', open: false, repeat: false, moisture: 'standing_water' },
      ]),
    ).toEqual({ FR: { total: 3, open: 1, repeats: 1, water: 1 }, TG: { total: 1, open: 0, repeats: 0, water: 1 } });
    expect(countByDoor([])).toEqual({});
  });
});
