import { describe, expect, it } from 'vitest';
import { beforeBuildMessage, buildMonthStartMs, checkVerificationTime, localBeforeBuild, monthWords, reportedBeforeBuild } from './times';

describe('report time against the build month', () => {
  it('names the month in words', () => {
    expect(monthWords('2022-01')).toBe('Jan 2022');
    expect(monthWords('2021-12')).toBe('Dec 2021');
    expect(monthWords('2022-13')).toBe('2022-13');
    expect(beforeBuildMessage('2022-01')).toBe('Reported at is before the vehicle was built (Jan 2022): check the date');
  });
  it('starts the build month at midnight in the depot time zone', () => {
    expect(buildMonthStartMs('2022-01')).toBe(Date.parse('2022-01-01T00:00:00Z'));
    // London is on GMT in January, on BST (UTC+1) in June.
    expect(buildMonthStartMs('2022-01', 'Europe/London')).toBe(Date.parse('2022-01-01T00:00:00Z'));
    expect(buildMonthStartMs('2022-06', 'Europe/London')).toBe(Date.parse('2022-05-31T23:00:00Z'));
    expect(buildMonthStartMs('2022-06-15')).toBeNull();
  });
  it('refuses only reports before the first day of the build month', () => {
    expect(reportedBeforeBuild(Date.parse('2019-01-01T10:00:00Z'), '2022-01', 'Europe/London')).toBe(true);
    expect(reportedBeforeBuild(Date.parse('2021-12-31T23:59:00Z'), '2022-01', 'UTC')).toBe(true);
    expect(reportedBeforeBuild(Date.parse('2022-01-01T00:00:00Z'), '2022-01', 'UTC')).toBe(false);
    // 23:30 UTC on 31 May is already 1 June in London (BST): not before a June build.
    expect(reportedBeforeBuild(Date.parse('2022-05-31T23:30:00Z'), '2022-06', 'Europe/London')).toBe(false);
    expect(reportedBeforeBuild(Date.parse('2022-05-31T22:30:00Z'), '2022-06', 'Europe/London')).toBe(true);
  });
  it('reads a form date-time by its month', () => {
    expect(localBeforeBuild('2019-01-01T10:00', '2022-01')).toBe(true);
    expect(localBeforeBuild('2021-12-31T23:59', '2022-01')).toBe(true);
    expect(localBeforeBuild('2022-01-01T00:00', '2022-01')).toBe(false);
    expect(localBeforeBuild('', '2022-01')).toBe(false);
  });
});

describe('release verification time', () => {
  // Repaired at 5,010,000 ms = minute 83 (4,980,000–5,039,999).
  const base = { nowMs: 10_000_000, reportedAtMs: 1_000_000, repairedAtMs: 5_010_000, skewMs: 300_000 };
  it('accepts a time from the minute of the repair to now (with clock drift)', () => {
    expect(checkVerificationTime({ ...base, atMs: 5_010_000 })).toBeNull();
    expect(checkVerificationTime({ ...base, atMs: 4_980_000 })).toBeNull();
    expect(checkVerificationTime({ ...base, atMs: 10_300_000 })).toBeNull();
  });
  it('refuses the future, an earlier minute than the repair, and before the report', () => {
    expect(checkVerificationTime({ ...base, atMs: 10_300_001 })?.code).toBe('future');
    expect(checkVerificationTime({ ...base, atMs: 4_979_999 })?.code).toBe('before_repair');
    expect(checkVerificationTime({ ...base, atMs: 999_999 })?.code).toBe('before_repair');
    expect(checkVerificationTime({ ...base, repairedAtMs: null, atMs: 999_999 })?.code).toBe('before_report');
    expect(checkVerificationTime({ ...base, repairedAtMs: null, atMs: 1_000_000 })).toBeNull();
  });
});
