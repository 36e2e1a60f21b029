import { describe, expect, it } from 'vitest';
import { formatDefectRef, nextDefectRefs, parseDefectRef, refYear } from './refs';

const at = (iso: string) => Date.parse(iso);

describe('defect references', () => {
  it('use the UTC year of the report', () => {
    expect(refYear(at('2026-03-01T10:00:00Z'))).toBe('26');
    // 23:30 on 31 Dec UTC is still 2025; 00:30 on 1 Jan UTC is 2026.
    expect(refYear(at('2025-12-31T23:30:00Z'))).toBe('25');
    expect(refYear(at('2026-01-01T00:30:00Z'))).toBe('26');
    expect(refYear(at('2009-06-01T00:00:00Z'))).toBe('09');
  });
  it('pad the number to five digits and grow past 99,999', () => {
    expect(formatDefectRef('26', 1)).toBe('DF-26-00001');
    expect(formatDefectRef('26', 401)).toBe('DF-26-00401');
    expect(formatDefectRef('26', 100_000)).toBe('DF-26-100000');
    expect(() => formatDefectRef('2026', 1)).toThrow(RangeError);
    expect(() => formatDefectRef('26', 0)).toThrow(RangeError);
  });
  it('read back only the generated format', () => {
    expect(parseDefectRef('DF-26-00401')).toEqual({ yy: '26', seq: 401 });
    expect(parseDefectRef('DF-26-100000')).toEqual({ yy: '26', seq: 100000 });
    expect(parseDefectRef('DF-001283')).toBeNull();
    expect(parseDefectRef('DF-26-0401')).toBeNull();
    expect(parseDefectRef('df-26-00401')).toBeNull();
    expect(parseDefectRef('DF-26-00000')).toBeNull();
    expect(parseDefectRef('X-26-00001')).toBeNull();
  });
  it('number new defects after the highest of their year, each year on its own', () => {
    const highest = new Map([
      ['26', 401],
      ['25', 733],
    ]);
    expect(nextDefectRefs([at('2026-05-01T00:00:00Z'), at('2025-11-02T00:00:00Z'), at('2026-05-02T00:00:00Z'), at('2024-01-01T00:00:00Z')], highest)).toEqual([
      'DF-26-00402',
      'DF-25-00734',
      'DF-26-00403',
      'DF-24-00001',
    ]);
    // The map passed in is not changed.
    expect(highest.get('26')).toBe(401);
    expect(nextDefectRefs([], highest)).toEqual([]);
  });
});
