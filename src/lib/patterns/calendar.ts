/**
 * Calendar arithmetic for the patterns engine: whole days since 1970-01-01 and month indices, computed by hand
 * (no Date objects in the hot paths). Dates are ISO `YYYY-MM-DD`; a date-time counts on the date written in its
 * first ten characters (the day as the reporter wrote it, i.e. the UTC day for `...Z` strings).
 */
import { PatternsInputError } from './types';

/** Days from 0000-03-01-based civil date to 1970-01-01 (Hinnant's days_from_civil). */
function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (month + (month > 2 ? -3 : 9)) + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

function daysInMonth(year: number, month: number): number {
  if (month === 2) return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28;
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
}

function digits(text: string, from: number, count: number): number {
  let value = 0;
  for (let i = from; i < from + count; i++) {
    const code = text.charCodeAt(i) - 48;
    if (code < 0 || code > 9) return -1;
    value = value * 10 + code;
  }
  return value;
}

/**
 * Day number (days since 1970-01-01) of a `YYYY-MM-DD` date or of the date part of an ISO date-time.
 * @throws PatternsInputError when the text does not start with a real calendar date
 */
export function toDayNumber(text: string): number {
  if (text.length < 10 || text.charCodeAt(4) !== 45 || text.charCodeAt(7) !== 45) {
    throw new PatternsInputError(`not a date: ${JSON.stringify(text)}`);
  }
  if (text.length > 10) {
    const sep = text.charAt(10);
    if (sep !== 'T' && sep !== 't' && sep !== ' ') throw new PatternsInputError(`not a date: ${JSON.stringify(text)}`);
  }
  const year = digits(text, 0, 4);
  const month = digits(text, 5, 2);
  const day = digits(text, 8, 2);
  if (year < 0 || month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) {
    throw new PatternsInputError(`not a date: ${JSON.stringify(text)}`);
  }
  return daysFromCivil(year, month, day);
}

/** `YYYY-MM-DD` of a day number (inverse of toDayNumber for dates). */
export function formatDayNumber(dayNumber: number): string {
  const z = dayNumber + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  const year = yoe + era * 400 + (month <= 2 ? 1 : 0);
  return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
}

/**
 * Month index (year × 12 + month − 1) of a `YYYY-MM` build month (a longer date string uses its first 7 characters).
 * @throws PatternsInputError when the text does not start with a valid year and month
 */
export function toMonthIndex(text: string): number {
  if (text.length < 7 || text.charCodeAt(4) !== 45) throw new PatternsInputError(`not a month: ${JSON.stringify(text)}`);
  const year = digits(text, 0, 4);
  const month = digits(text, 5, 2);
  if (year < 0 || month < 1 || month > 12) throw new PatternsInputError(`not a month: ${JSON.stringify(text)}`);
  return year * 12 + month - 1;
}

/** `YYYY-MM` of a month index. */
export function formatMonthIndex(monthIndex: number): string {
  const year = Math.floor(monthIndex / 12);
  const month = monthIndex - year * 12 + 1;
  return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}`;
}

/** Day number of the first day of a month index. */
export function monthIndexToFirstDay(monthIndex: number): number {
  const year = Math.floor(monthIndex / 12);
  return daysFromCivil(year, monthIndex - year * 12 + 1, 1);
}

/** Days per year used for vehicle-years (Julian year). */
export const DAYS_PER_YEAR = 365.25;
