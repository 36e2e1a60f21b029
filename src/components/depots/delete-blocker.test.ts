import { describe, expect, it } from 'vitest';
import { depotDeleteBlocker, moduleDeleteBlocker } from './delete-blocker';

describe('depotDeleteBlocker', () => {
  it('is null for an empty depot or when the counts were not sent', () => {
    expect(depotDeleteBlocker({ vehicles: 0, defects: 0, people: 0 })).toBeNull();
    expect(depotDeleteBlocker(undefined)).toBeNull();
  });
  it('names everything still attached, with plurals', () => {
    expect(depotDeleteBlocker({ vehicles: 74, defects: 0, people: 0 })).toBe(
      'This depot cannot be deleted: it still holds 74 vehicles (retired vehicles and closed defects count too). Move them to another depot first.',
    );
    expect(depotDeleteBlocker({ vehicles: 1, defects: 1, people: 1 })).toBe(
      'This depot cannot be deleted: it still holds 1 vehicle, 1 defect and 1 person (retired vehicles and closed defects count too). Move them to another depot first.',
    );
    expect(depotDeleteBlocker({ vehicles: 0, defects: 1200, people: 2 })).toBe(
      'This depot cannot be deleted: it still holds 1,200 defects and 2 people (retired vehicles and closed defects count too). Move them to another depot first.',
    );
  });
});

describe('moduleDeleteBlocker', () => {
  it('blocks a module type with defects and says how many', () => {
    expect(moduleDeleteBlocker({ defects: 0 })).toBeNull();
    expect(moduleDeleteBlocker(undefined)).toBeNull();
    expect(moduleDeleteBlocker({ defects: 1 })).toBe('This module type cannot be deleted: 1 defect is recorded against it.');
    expect(moduleDeleteBlocker({ defects: 53 })).toBe('This module type cannot be deleted: 53 defects are recorded against it.');
  });
});
