/** Display formatting shared by the Vehicles and Defects views (dates, months, money, counts). */

const DAY = new Intl.DateTimeFormat('en-GB', { day: '2-digit', month: 'short', year: 'numeric', timeZone: 'UTC' });
const MONTH = new Intl.DateTimeFormat('en-GB', { month: 'short', year: 'numeric', timeZone: 'UTC' });

/** `YYYY-MM-DD` (calendar date, no zone) as "02 Nov 2021"; null/empty as an en dash. */
export function formatCalendarDate(s: string | null | undefined): string {
  if (!s) return '–';
  const m = /^(\d{4})-(\d{2})(?:-(\d{2}))?$/.exec(s);
  if (!m) return s;
  if (!m[3]) return formatBuildMonth(s);
  return DAY.format(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
}

/** `YYYY-MM` as "Nov 2021". */
export function formatBuildMonth(s: string | null | undefined): string {
  if (!s) return '–';
  const m = /^(\d{4})-(\d{2})/.exec(s);
  if (!m) return s;
  return MONTH.format(Date.UTC(Number(m[1]), Number(m[2]) - 1, 1));
}

/** An instant as a day in the given IANA zone (browser zone when omitted), e.g. "29 Nov 2026". */
export function formatInstantDate(iso: string | null | undefined, timeZone?: string | null): string {
  if (!iso) return '–';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return d.toLocaleDateString('en-GB', { day: '2-digit', month: 'short', year: 'numeric', ...(timeZone ? { timeZone } : {}) });
}

/** An instant as day and time in the given zone, e.g. "29 Nov 2026, 13:53". */
export function formatInstant(iso: string | null | undefined, timeZone?: string | null): string {
  if (!iso) return '–';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return d.toLocaleString('en-GB', {
    day: '2-digit',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    ...(timeZone ? { timeZone } : {}),
  });
}

/** Integer minor units as money with two decimals and thousands separators ("296.40"). */
export function formatMoneyMinor(minor: number | null | undefined, currency?: string | null): string {
  if (minor === null || minor === undefined) return '–';
  const s = (minor / 100).toLocaleString('en-GB', { minimumFractionDigits: 2, maximumFractionDigits: 2 });
  return currency ? `${s} ${currency}` : s;
}

/** Minutes as "1 h 58 min". */
export function formatMinutes(min: number | null | undefined): string {
  if (min === null || min === undefined) return '–';
  const h = Math.floor(min / 60);
  const m = min % 60;
  return h ? `${h} h ${m} min` : `${m} min`;
}

/** A count with en-GB grouping. */
export function formatCount(n: number): string {
  return n.toLocaleString('en-GB');
}

/** "1 defect" / "3 defects". */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${formatCount(n)} ${n === 1 ? one : many}`;
}
