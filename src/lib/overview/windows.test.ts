import { describe, expect, it } from 'vitest';
import { fillMonths, monthWindows, repeatRate, windowLabel } from './windows';

describe('monthWindows', () => {
  it('gives the twelve calendar months ending with the current one, across a year end', () => {
    const w = monthWindows(Date.UTC(2026, 11, 2, 15, 0), 12);
    expect(w).toHaveLength(12);
    expect(w[0]).toEqual({ month: '2026-01', from: '2026-01-01', to: '2026-01-31', fromMs: Date.UTC(2026, 0, 1), toMs: Date.UTC(2026, 1, 1) - 1 });
    expect(w[11]!.month).toBe('2026-12');
    expect(w[11]!.to).toBe('2026-12-31');
    const jan = monthWindows(Date.UTC(2027, 0, 15), 3).map((x) => x.month);
    expect(jan).toEqual(['2026-11', '2026-12', '2027-01']);
  });
  it('knows month lengths, leap February included', () => {
    const w = monthWindows(Date.UTC(2028, 2, 1), 2);
    expect(w[0]).toMatchObject({ month: '2028-02', from: '2028-02-01', to: '2028-02-29' });
    expect(monthWindows(Date.UTC(2027, 1, 28), 1)[0]!.to).toBe('2027-02-28');
    expect(monthWindows(Date.UTC(2026, 3, 30), 1)[0]!.to).toBe('2026-04-30');
  });
  it('treats the first and last millisecond of a month as inside it', () => {
    const [w] = monthWindows(Date.UTC(2026, 5, 30, 23, 59, 59, 999), 1);
    expect(w!.month).toBe('2026-06');
    expect(monthWindows(Date.UTC(2026, 6, 1), 1)[0]!.month).toBe('2026-07');
  });
});

describe('repeatRate / fillMonths', () => {
  it('is null without reports and a share otherwise', () => {
    expect(repeatRate(0, 0)).toBeNull();
    expect(repeatRate(1, 4)).toBe(0.25);
  });
  it('fills months without defects with zeros', () => {
    const w = monthWindows(Date.UTC(2026, 2, 10), 3);
    const f = fillMonths(w, new Map([['2026-02', { reported: 8, repeats: 2 }]]));
    expect(f.map((x) => [x.month, x.reported, x.repeats, x.rate])).toEqual([
      ['2026-01', 0, 0, null],
      ['2026-02', 8, 2, 0.25],
      ['2026-03', 0, 0, null],
    ]);
  });
});

describe('windowLabel', () => {
  it('names the months exactly, within a year and across a year end, and says when the last one is still running', () => {
    expect(windowLabel('2026-01', '2026-12', true)).toBe('Jan – Dec 2026, this month so far');
    expect(windowLabel('2025-07', '2026-06', true)).toBe('Jul 2025 – Jun 2026, this month so far');
    expect(windowLabel('2025-07', '2026-06', false)).toBe('Jul 2025 – Jun 2026');
    expect(windowLabel('2026-03', '2026-03', false)).toBe('Mar 2026');
  });
  it('fits the windows monthWindows gives on 2 Dec 2026', () => {
    const w = monthWindows(Date.UTC(2026, 11, 2, 15, 0), 12);
    expect(windowLabel(w[0]!.month, w[11]!.month, true)).toBe('Jan – Dec 2026, this month so far');
  });
});
