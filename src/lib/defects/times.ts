/**
 * The time rules of a defect record, shared by the server (which enforces them) and the forms (which say the
 * same thing before anything is sent):
 * - a defect cannot be reported before its vehicle was built (the build month, in the depot's time zone);
 * - the release verification cannot be in the future, before the report, or before the repair it verifies
 *   (the latest step to "repaired").
 */
import { parseInstant } from '../dates/dates';

const MINUTE_MS = 60_000;
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "2022-01" → "Jan 2022" (other text is returned as it is). */
export function monthWords(yyyyMm: string): string {
  const m = /^(\d{4})-(\d{2})$/.exec(yyyyMm);
  const name = m ? MONTHS[Number(m[2]) - 1] : undefined;
  return m && name ? `${name} ${m[1]}` : yyyyMm;
}

/** The first instant of a build month ("YYYY-MM") in a time zone (UTC when none), or null for other text. */
export function buildMonthStartMs(buildMonth: string, tz?: string | null): number | null {
  return /^\d{4}-\d{2}$/.test(buildMonth) ? parseInstant(`${buildMonth}-01`, tz) : null;
}

/** The sentence for a report dated before the vehicle was built. */
export function beforeBuildMessage(buildMonth: string): string {
  return `Reported at is before the vehicle was built (${monthWords(buildMonth)}): check the date`;
}

/** True when a report time falls before the vehicle's build month (read in the depot's time zone). */
export function reportedBeforeBuild(reportedAtMs: number, buildMonth: string, tz?: string | null): boolean {
  const start = buildMonthStartMs(buildMonth, tz);
  return start !== null && reportedAtMs < start;
}

/** The same rule on a form's local date-time text ("2019-01-01T10:00"): its month before the build month. */
export function localBeforeBuild(localDateTime: string, buildMonth: string): boolean {
  return /^\d{4}-\d{2}/.test(localDateTime) && /^\d{4}-\d{2}$/.test(buildMonth) && localDateTime.slice(0, 7) < buildMonth;
}

/** Why a release-verification time is refused. */
export type VerificationTimeProblem = { code: 'future' | 'before_report' | 'before_repair'; message: string };

/**
 * Check the time a release verification was done. `repairedAtMs` is the latest step to "repaired" (null when
 * the record has none, e.g. imported history), compared to the minute; `skewMs` is how far ahead of `nowMs`
 * a clock may drift.
 */
export function checkVerificationTime(o: { atMs: number; nowMs: number; reportedAtMs: number; repairedAtMs: number | null; skewMs: number }): VerificationTimeProblem | null {
  if (o.atMs > o.nowMs + o.skewMs) return { code: 'future', message: 'The verification cannot be in the future.' };
  // People give the time to the minute: the minute the repair was recorded in is allowed.
  if (o.repairedAtMs !== null && Math.floor(o.atMs / MINUTE_MS) < Math.floor(o.repairedAtMs / MINUTE_MS)) {
    return { code: 'before_repair', message: 'The verification cannot be before the repair was recorded: check the time it was done.' };
  }
  if (o.atMs < o.reportedAtMs) return { code: 'before_report', message: 'The verification cannot be before the defect was reported.' };
  return null;
}
