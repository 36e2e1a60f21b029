import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { formatDayNumber, formatMonthIndex, monthIndexToFirstDay, toDayNumber, toMonthIndex } from './calendar';
import { PatternsInputError } from './types';

describe('toDayNumber', () => {
  it('counts days from 1970-01-01 like Date.UTC', () => {
    expect(toDayNumber('1970-01-01')).toBe(0);
    expect(toDayNumber('2000-03-01')).toBe(Date.UTC(2000, 2, 1) / 86400000);
    expect(toDayNumber('2024-02-29')).toBe(Date.UTC(2024, 1, 29) / 86400000);
    expect(toDayNumber('1969-12-31')).toBe(-1);
  });

  it('takes the date written in a date-time', () => {
    expect(toDayNumber('2025-06-30T23:59:00Z')).toBe(toDayNumber('2025-06-30'));
    expect(toDayNumber('2025-06-30 08:00')).toBe(toDayNumber('2025-06-30'));
    expect(toDayNumber('2025-06-30T01:00:00+05:00')).toBe(toDayNumber('2025-06-30'));
  });

  it('rejects malformed and impossible dates', () => {
    for (const bad of ['2025-02-29', '2025-13-01', '2025-6-1', '20250601', '2025-06-01X', 'abcd-ef-gh', '']) {
      expect(() => toDayNumber(bad)).toThrow(PatternsInputError);
    }
  });

  it('round-trips with formatDayNumber and agrees with Date for any day 1900–2200', () => {
    fc.assert(
      fc.property(fc.integer({ min: -25567, max: 84006 }), (day) => {
        const text = formatDayNumber(day);
        expect(text).toBe(new Date(day * 86400000).toISOString().slice(0, 10));
        expect(toDayNumber(text)).toBe(day);
      }),
    );
  });
});

describe('month indices', () => {
  it('parse, format and first day', () => {
    expect(toMonthIndex('2021-03')).toBe(2021 * 12 + 2);
    expect(toMonthIndex('2021-03-17')).toBe(2021 * 12 + 2);
    expect(formatMonthIndex(2021 * 12 + 11)).toBe('2021-12');
    expect(formatDayNumber(monthIndexToFirstDay(toMonthIndex('2024-02')))).toBe('2024-02-01');
    expect(() => toMonthIndex('2021-00')).toThrow(PatternsInputError);
    expect(() => toMonthIndex('21-03')).toThrow(PatternsInputError);
  });
});
