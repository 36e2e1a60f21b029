import { describe, expect, it } from 'vitest';
import { changedFields, defaultChoices, diffRecord, rebase, resolve, sameValue } from './record-diff';

const F = ['action', 'notes', 'labourMinutes', 'parts'] as const;
type K = (typeof F)[number];
const base: Record<K, unknown> = { action: 'Replaced motor', notes: null, labourMinutes: 60, parts: [{ partNumber: 'A', quantity: 1 }] };

describe('sameValue', () => {
  it('treats null and undefined alike and compares lists and objects by content, key order aside', () => {
    expect(sameValue(null, undefined)).toBe(true);
    expect(sameValue('', null)).toBe(false);
    expect(sameValue(0, null)).toBe(false);
    expect(sameValue([{ a: 1, b: 2 }], [{ b: 2, a: 1 }])).toBe(true);
    expect(sameValue([{ a: 1 }], [{ a: 2 }])).toBe(false);
    expect(sameValue([1, 2], [2, 1])).toBe(false);
    expect(sameValue({ a: 1, b: undefined }, { a: 1 })).toBe(true);
    expect(sameValue(60, '60')).toBe(false);
  });
});

describe('changedFields', () => {
  it('lists the fields the person changed', () => {
    expect(changedFields(F, base, { ...base, notes: 'damp', parts: [{ quantity: 1, partNumber: 'A' }] })).toEqual(['notes']);
    expect(changedFields(F, base, base)).toEqual([]);
  });
});

describe('diffRecord', () => {
  it('shows each moved field once, marks conflicts, and skips fields both changed the same way', () => {
    const mine = { ...base, action: 'Replaced motor and membrane', notes: 'damp', labourMinutes: 90 };
    const theirs = { ...base, action: 'Cleaned connector', labourMinutes: 90, parts: [] };
    expect(diffRecord(F, base, mine, theirs)).toEqual([
      { field: 'action', base: 'Replaced motor', mine: 'Replaced motor and membrane', theirs: 'Cleaned connector', changedByMe: true, changedByThem: true, conflict: true },
      { field: 'notes', base: null, mine: 'damp', theirs: null, changedByMe: true, changedByThem: false, conflict: false },
      { field: 'parts', base: base.parts, mine: base.parts, theirs: [], changedByMe: false, changedByThem: true, conflict: false },
    ]);
  });
  it('is empty when nothing moved', () => {
    expect(diffRecord(F, base, base, base)).toEqual([]);
  });
});

describe('rebase', () => {
  it('takes their change where the person did not touch the field and keeps the person’s edits', () => {
    const mine = { ...base, notes: 'damp' };
    const theirs = { ...base, labourMinutes: 75 };
    expect(rebase(F, base, mine, theirs)).toEqual({ mine: { ...base, notes: 'damp', labourMinutes: 75 }, conflicts: [] });
  });
  it('reports a field both changed differently, and not one both changed alike', () => {
    const mine = { ...base, action: 'A', labourMinutes: 90 };
    const theirs = { ...base, action: 'B', labourMinutes: 90 };
    expect(rebase(F, base, mine, theirs)).toEqual({ mine, conflicts: ['action'] });
  });
});

describe('choices and resolve', () => {
  it('defaults to the person’s own changes and their changes elsewhere, and re-applies the choice', () => {
    const mine = { ...base, action: 'A', notes: 'damp' };
    const theirs = { ...base, action: 'B', labourMinutes: 30 };
    const diffs = diffRecord(F, base, mine, theirs);
    const choices = defaultChoices(diffs);
    expect(choices).toEqual({ action: 'mine', notes: 'mine', labourMinutes: 'theirs' });
    expect(resolve(F, mine, theirs, choices)).toEqual({ ...base, action: 'A', notes: 'damp', labourMinutes: 30 });
    expect(resolve(F, mine, theirs, { ...choices, action: 'theirs' })).toEqual({ ...base, action: 'B', notes: 'damp', labourMinutes: 30 });
  });
});
