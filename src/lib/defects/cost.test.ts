import { describe, expect, it } from 'vitest';
import { labourCostMinor, partsTotalMinor, repairCostMinor } from './cost';

describe('repair cost', () => {
  it('adds quantity × unit cost and skips lines without a cost', () => {
    expect(partsTotalMinor([])).toBe(0);
    expect(partsTotalMinor([{ quantity: 2, unitCostMinor: 2450 }, { quantity: 1, unitCostMinor: null }, { quantity: 3, unitCostMinor: 1350 }])).toBe(8950);
  });
  it('prices labour by the minute and rounds half up', () => {
    // 95 min at 78.00/h = 123.50 exactly; 7 min at 1.00/h = 11.67 minor units -> 12.
    expect(labourCostMinor(95, 7800)).toBe(12350);
    expect(labourCostMinor(7, 100)).toBe(12);
    expect(labourCostMinor(0, 7800)).toBe(0);
  });
  it('is parts plus labour, parts alone without a rate, and null when nothing is costed', () => {
    const parts = [{ quantity: 1, unitCostMinor: 18900 }];
    expect(repairCostMinor(parts, 95, 7800)).toBe(31250);
    expect(repairCostMinor(parts, 95, null)).toBe(18900);
    expect(repairCostMinor([], 60, 7800)).toBe(7800);
    expect(repairCostMinor([], 60, null)).toBeNull();
    expect(repairCostMinor([{ quantity: 1, unitCostMinor: null }], null, 7800)).toBeNull();
  });
});
