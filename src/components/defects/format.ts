/**
 * Display formatting shared by the Vehicles and Defects views (dates, months, money, counts).
 *
 * Times follow one rule across the app (docs/decisions/015-times-currency-off-road.md): an event that happened
 * at a depot (a defect reported, a trace stored, a vehicle taken off road) is shown in that depot's time zone
 * with the zone's abbreviation ("20 Sept 2026, 20:48 BST"), so that the same event reads the same on every page
 * and for every viewer; a depot without a zone is shown in UTC. Anything else (a settings change, a sign-in)
 * is shown in the viewer's own zone without a label.
 */

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

/** The zone a depot's events are shown in: its own IANA zone, or UTC when it has none (or an unknown one). */
export function depotZone(timeZone: string | null | undefined): string {
  if (!timeZone) return 'UTC';
  try {
    new Intl.DateTimeFormat('en-GB', { timeZone });
    return timeZone;
  } catch {
    return 'UTC';
  }
}

/** The short name of a zone at an instant ("BST", "GMT", "CEST", "GMT-4"). */
export function zoneAbbreviation(iso: string, timeZone: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return '';
  return new Intl.DateTimeFormat('en-GB', { timeZone, timeZoneName: 'short' }).formatToParts(d).find((p) => p.type === 'timeZoneName')?.value ?? timeZone;
}

/** An event at a depot: day and time in the depot's zone with the zone's abbreviation, e.g. "20 Sept 2026, 20:48 BST". */
export function formatDepotInstant(iso: string | null | undefined, timeZone: string | null | undefined): string {
  if (!iso) return '–';
  const zone = depotZone(timeZone);
  const text = formatInstant(iso, zone);
  return text === iso ? text : `${text} ${zoneAbbreviation(iso, zone)}`;
}

/** The day of an event at a depot, in the depot's zone ("20 Sept 2026"; the time and zone go in a tooltip). */
export function formatDepotDate(iso: string | null | undefined, timeZone: string | null | undefined): string {
  return formatInstantDate(iso, depotZone(timeZone));
}

/** Whole days from an instant to `nowMs` (0 on the same day-length span), for "off road for 12 d". */
export function daysSince(iso: string | null | undefined, nowMs: number): number | null {
  if (!iso) return null;
  const t = Date.parse(iso);
  return Number.isNaN(t) ? null : Math.max(0, Math.floor((nowMs - t) / 86_400_000));
}

/**
 * Integer minor units as money: with an ISO 4217 currency code, the currency's sign and two decimals ("£296.40",
 * "€1,234.50", "SEK 296.40"); without one, the bare amount ("296.40"). Amounts are stored in hundredths, so only
 * currencies with two minor digits are offered (src/lib/contracts/settings.ts).
 */
export function formatMoneyMinor(minor: number | null | undefined, currency?: string | null): string {
  if (minor === null || minor === undefined) return '–';
  const opts = { minimumFractionDigits: 2, maximumFractionDigits: 2 };
  if (currency) {
    try {
      return (minor / 100).toLocaleString('en-GB', { ...opts, style: 'currency', currency });
    } catch {
      // An unknown code (never stored: the API checks it) falls through to the plain amount and the code.
      return `${(minor / 100).toLocaleString('en-GB', opts)} ${currency}`;
    }
  }
  return (minor / 100).toLocaleString('en-GB', opts);
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
