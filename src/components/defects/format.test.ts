import { describe, expect, it } from 'vitest';
import { daysSince, depotZone, formatBuildMonth, formatCalendarDate, formatDepotDate, formatDepotInstant, formatInstant, formatInstantDate, formatMinutes, formatMoneyMinor, plural } from './format';
import { pageOf, pageSizeOf, splitList } from './FilterControls';

describe('formatCalendarDate / formatBuildMonth', () => {
  it('formats calendar dates without shifting them by a time zone', () => {
    expect(formatCalendarDate('2021-11-02')).toBe('02 Nov 2021');
    expect(formatCalendarDate('2024-01-01')).toBe('01 Jan 2024');
    expect(formatCalendarDate('2021-11')).toBe('Nov 2021');
    expect(formatCalendarDate(null)).toBe('–');
    expect(formatCalendarDate('not a date')).toBe('not a date');
  });
  it('formats build months', () => {
    expect(formatBuildMonth('2023-02')).toBe('Feb 2023');
    expect(formatBuildMonth('2023-02-24')).toBe('Feb 2023');
    expect(formatBuildMonth('')).toBe('–');
  });
});

describe('formatInstant', () => {
  it('shows an instant in the depot time zone', () => {
    // 10:29 UTC on 6 Nov 2026 is 10:29 in London (GMT) and 11:29 in Berlin (CET).
    expect(formatInstant('2026-11-06T10:29:00.000Z', 'Europe/London')).toBe('06 Nov 2026, 10:29');
    expect(formatInstant('2026-11-06T10:29:00.000Z', 'Europe/Berlin')).toBe('06 Nov 2026, 11:29');
    // 23:30 UTC on 30 Jun is already 1 Jul in London (BST, UTC+1).
    expect(formatInstantDate('2026-06-30T23:30:00.000Z', 'Europe/London')).toBe('01 Jul 2026');
    expect(formatInstant(null)).toBe('–');
  });
});

describe('depot times (one rule: the depot\'s zone, labelled)', () => {
  it('shows an event at a depot in the depot\'s zone with the abbreviation in force then', () => {
    // 19:48 UTC on 20 Sep 2026 is 20:48 British Summer Time; 10:29 UTC on 6 Nov 2026 is 10:29 GMT.
    expect(formatDepotInstant('2026-09-20T19:48:00.000Z', 'Europe/London')).toMatch(/^20 Sept? 2026, 20:48 BST$/);
    expect(formatDepotInstant('2026-11-06T10:29:00.000Z', 'Europe/London')).toBe('06 Nov 2026, 10:29 GMT');
    expect(formatDepotInstant('2026-11-06T10:29:00.000Z', 'Europe/Berlin')).toBe('06 Nov 2026, 11:29 CET');
  });
  it('uses UTC for a depot without a zone (how its local times are read on import)', () => {
    expect(depotZone(null)).toBe('UTC');
    expect(depotZone('Not/AZone')).toBe('UTC');
    expect(formatDepotInstant('2026-11-06T10:29:00.000Z', null)).toBe('06 Nov 2026, 10:29 UTC');
    expect(formatDepotInstant(null, 'Europe/London')).toBe('–');
  });
  it('dates an event by the depot\'s calendar', () => {
    // 23:30 UTC on 30 Jun is 00:30 on 1 Jul in London (BST).
    expect(formatDepotDate('2026-06-30T23:30:00.000Z', 'Europe/London')).toBe('01 Jul 2026');
    expect(formatDepotDate('2026-06-30T23:30:00.000Z', null)).toBe('30 Jun 2026');
  });
  it('counts whole days since an instant', () => {
    const now = Date.parse('2026-12-02T12:00:00Z');
    expect(daysSince('2026-11-05T16:51:00Z', now)).toBe(26);
    expect(daysSince('2026-12-02T11:00:00Z', now)).toBe(0);
    expect(daysSince(null, now)).toBeNull();
  });
});

describe('formatMoneyMinor / formatMinutes / plural', () => {
  it('formats minor units with two decimals', () => {
    expect(formatMoneyMinor(29640)).toBe('296.40');
    expect(formatMoneyMinor(5)).toBe('0.05');
    expect(formatMoneyMinor(123456789)).toBe('1,234,567.89');
    expect(formatMoneyMinor(29640, 'GBP')).toBe('£296.40');
    expect(formatMoneyMinor(123450, 'EUR')).toBe('€1,234.50');
    expect(formatMoneyMinor(7800, 'SEK')).toBe('SEK\u00a078.00');
    expect(formatMoneyMinor(0, 'GBP')).toBe('£0.00');
    expect(formatMoneyMinor(null, 'GBP')).toBe('–');
    expect(formatMoneyMinor(null)).toBe('–');
  });
  it('formats minutes', () => {
    expect(formatMinutes(118)).toBe('1 h 58 min');
    expect(formatMinutes(45)).toBe('45 min');
    expect(formatMinutes(120)).toBe('2 h 0 min');
    expect(formatMinutes(null)).toBe('–');
  });
  it('pluralises', () => {
    expect(plural(1, 'defect')).toBe('1 defect');
    expect(plural(0, 'defect')).toBe('0 defects');
    expect(plural(1200, 'defect')).toBe('1,200 defects');
  });
});

describe('URL state helpers', () => {
  it('reads page and page size defensively', () => {
    expect(pageOf(undefined)).toBe(1);
    expect(pageOf('3')).toBe(3);
    expect(pageOf('0')).toBe(1);
    expect(pageOf('2.5')).toBe(1);
    expect(pageOf('x')).toBe(1);
    expect(pageSizeOf('100')).toBe(100);
    expect(pageSizeOf('37')).toBe(50);
    expect(pageSizeOf(undefined, 25)).toBe(25);
  });
  it('splits comma lists', () => {
    expect(splitList('reported,diagnosing')).toEqual(['reported', 'diagnosing']);
    expect(splitList('')).toEqual([]);
    expect(splitList(',FL,')).toEqual(['FL']);
  });
});
