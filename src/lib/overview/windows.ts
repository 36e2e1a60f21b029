/**
 * Calendar windows of the Overview, in UTC whole days so that every figure can be reproduced exactly by the
 * Defects list's `reportedFrom`/`reportedTo` filters (which read a bare date as a UTC day): the trailing
 * twelve calendar months (the current one included, so far) and each month in it.
 */
const DAY_MS = 86_400_000;

/** One calendar month: `YYYY-MM`, its first and last day, and the epoch-ms bounds [fromMs, toMs]. */
export type MonthWindow = { month: string; from: string; to: string; fromMs: number; toMs: number };

const pad = (n: number) => String(n).padStart(2, '0');

/** The `count` calendar months (UTC) ending with the month of `nowMs`, oldest first. */
export function monthWindows(nowMs: number, count = 12): MonthWindow[] {
  const now = new Date(nowMs);
  const y = now.getUTCFullYear();
  const m = now.getUTCMonth();
  const out: MonthWindow[] = [];
  for (let i = count - 1; i >= 0; i--) {
    const fromMs = Date.UTC(y, m - i, 1);
    const nextMs = Date.UTC(y, m - i + 1, 1);
    const first = new Date(fromMs);
    const last = new Date(nextMs - DAY_MS);
    out.push({
      month: `${first.getUTCFullYear()}-${pad(first.getUTCMonth() + 1)}`,
      from: `${first.getUTCFullYear()}-${pad(first.getUTCMonth() + 1)}-01`,
      to: `${last.getUTCFullYear()}-${pad(last.getUTCMonth() + 1)}-${pad(last.getUTCDate())}`,
      fromMs,
      toMs: nextMs - 1,
    });
  }
  return out;
}

/** Share of repeats among reported defects, or null when nothing was reported. */
export function repeatRate(repeats: number, reported: number): number | null {
  return reported > 0 ? repeats / reported : null;
}

/** Counts per month (`YYYY-MM` → counts) laid onto the windows, months without defects as zeros. */
export function fillMonths(
  windows: MonthWindow[],
  counts: ReadonlyMap<string, { reported: number; repeats: number }>,
): Array<MonthWindow & { reported: number; repeats: number; rate: number | null }> {
  return windows.map((w) => {
    const c = counts.get(w.month) ?? { reported: 0, repeats: 0 };
    return { ...w, reported: c.reported, repeats: c.repeats, rate: repeatRate(c.repeats, c.reported) };
  });
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const monthWord = (ym: string) => MONTHS[Number(ym.slice(5, 7)) - 1] ?? ym;

/**
 * The exact words of a window of calendar months, e.g. "Jan – Dec 2026" or "Jul 2025 – Jun 2026", with
 * ", this month so far" when the last month is still running, so that nobody reads it as "the last twelve months"
 * or takes the current month for a whole one.
 */
export function windowLabel(firstMonth: string, lastMonth: string, lastIsPartial: boolean): string {
  const y1 = firstMonth.slice(0, 4);
  const y2 = lastMonth.slice(0, 4);
  const span = firstMonth === lastMonth ? `${monthWord(lastMonth)} ${y2}` : y1 === y2 ? `${monthWord(firstMonth)} – ${monthWord(lastMonth)} ${y2}` : `${monthWord(firstMonth)} ${y1} – ${monthWord(lastMonth)} ${y2}`;
  return lastIsPartial ? `${span}, this month so far` : span;
}
