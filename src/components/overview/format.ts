/** Number formatting of the Overview (shares as percentages, months as "Jan 26"). */

const MONTH = new Intl.DateTimeFormat('en-GB', { month: 'short', year: '2-digit', timeZone: 'UTC' });

/** A share (0–1) as a percentage with one decimal, or an en dash when there is nothing to divide. */
export function formatPct(rate: number | null | undefined): string {
  if (rate === null || rate === undefined || !Number.isFinite(rate)) return '–';
  return `${(rate * 100).toFixed(1)}%`;
}

/** `YYYY-MM` as "Jan 26". */
export function formatMonth(month: string): string {
  const m = /^(\d{4})-(\d{2})$/.exec(month);
  return m ? MONTH.format(Date.UTC(Number(m[1]), Number(m[2]) - 1, 1)) : month;
}

/** Open defects per 100 vehicles in service, one decimal; an en dash without vehicles. */
export function formatPer100(n: number, vehicles: number): string {
  return vehicles > 0 ? ((n / vehicles) * 100).toFixed(1) : '–';
}

/** Round percentage ticks from 0 to just above `maxPct` (steps of 5, 10 or 20). */
export function percentTicks(maxPct: number): number[] {
  const step = maxPct <= 30 ? 5 : maxPct <= 60 ? 10 : 20;
  const top = Math.min(100, Math.max(10, Math.ceil((maxPct + 0.001) / step) * step));
  const out: number[] = [];
  for (let t = 0; t <= top; t += step) out.push(t);
  return out;
}
