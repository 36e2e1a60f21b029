import { describe, expect, it } from 'vitest';
import { DOOR_ORDER, sortByDoor } from './doors';

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
