/**
 * Calendar-date and date-time parsing for imports and forms. Dates are ISO `YYYY-MM-DD`; build dates may be
 * `YYYY-MM`; date-times are ISO 8601 with `T` or a space, optional seconds, and `Z` or an offset. A date-time
 * without a zone is read in the given IANA time zone (the depot's), UTC when none.
 */
import { TZDate } from '@date-fns/tz';

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;
const MONTH_RE = /^(\d{4})-(\d{2})$/;
const DATETIME_RE = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3})\d*)?)?\s*(Z|[+-]\d{2}:?\d{2})?$/i;

/** True when y-m-d is a real calendar day. */
export function isRealDate(y: number, m: number, d: number): boolean {
  if (m < 1 || m > 12 || d < 1) return false;
  const dim = new Date(Date.UTC(y, m, 0)).getUTCDate();
  return d <= dim && y >= 1900 && y <= 2200;
}

/** Parse `YYYY-MM-DD` into itself (validated) or null. */
export function parseIsoDate(s: string): string | null {
  const m = DATE_RE.exec(s.trim());
  if (!m) return null;
  return isRealDate(Number(m[1]), Number(m[2]), Number(m[3])) ? `${m[1]}-${m[2]}-${m[3]}` : null;
}

/** Parse a build date `YYYY-MM` or `YYYY-MM-DD`; returns the text as given and its month. */
export function parseBuildDate(s: string): { date: string; month: string } | null {
  const t = s.trim();
  const mm = MONTH_RE.exec(t);
  if (mm) {
    const mo = Number(mm[2]);
    return mo >= 1 && mo <= 12 && Number(mm[1]) >= 1900 ? { date: t, month: t } : null;
  }
  const d = parseIsoDate(t);
  return d ? { date: d, month: d.slice(0, 7) } : null;
}

/** True when `tz` is an IANA time zone this runtime knows. */
export function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

/**
 * Parse a date or date-time into epoch milliseconds. A bare date is midnight at the start of that day in `tz`.
 * Returns null when the text is not one of the accepted forms or not a real date.
 */
export function parseInstant(s: string, tz?: string | null): number | null {
  const t = s.trim();
  const d = DATE_RE.exec(t);
  const zone = tz && isTimeZone(tz) ? tz : 'UTC';
  if (d) {
    const [y, m, day] = [Number(d[1]), Number(d[2]), Number(d[3])];
    if (!isRealDate(y, m, day)) return null;
    return new TZDate(y, m - 1, day, 0, 0, 0, zone).getTime();
  }
  const x = DATETIME_RE.exec(t);
  if (!x) return null;
  const [y, m, day, hh, mi, ss] = [1, 2, 3, 4, 5, 6].map((i) => Number(x[i] ?? 0)) as [number, number, number, number, number, number];
  const ms = Number((x[7] ?? '0').padEnd(3, '0'));
  if (!isRealDate(y, m, day) || hh > 23 || mi > 59 || ss > 59) return null;
  const off = x[8];
  if (off) {
    const base = Date.UTC(y, m - 1, day, hh, mi, ss, ms);
    if (off.toUpperCase() === 'Z') return base;
    const sign = off.startsWith('-') ? -1 : 1;
    const digits = off.slice(1).replace(':', '');
    const offMin = Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2, 4));
    if (Number(digits.slice(0, 2)) > 14 || Number(digits.slice(2, 4)) > 59) return null;
    return base - sign * offMin * 60_000;
  }
  return new TZDate(y, m - 1, day, hh, mi, ss, ms, zone).getTime();
}

/** `YYYY-MM-DD` of an instant in a time zone (UTC default). */
export function toIsoDate(ms: number, tz?: string | null): string {
  const zone = tz && isTimeZone(tz) ? tz : 'UTC';
  const d = new TZDate(ms, zone);
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
}

/** Whole days from date a to date b (both `YYYY-MM-DD`, UTC calendar). */
export function daysBetween(a: string, b: string): number {
  return Math.round((Date.parse(b + 'T00:00:00Z') - Date.parse(a + 'T00:00:00Z')) / 86_400_000);
}
