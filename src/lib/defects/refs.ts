/**
 * Defect references: `DF-YY-NNNNN`, the two-digit year the defect was reported (UTC) and its number within
 * that year, counted from 1 and padded to five digits (a sixth digit appears only past 99,999 in a year).
 * One format for every defect, whether reported on the form, through the API or by an import row without a
 * ref, so that the refs people write on job cards and read out on the phone all look alike. The server picks
 * the next number inside the write transaction (src/server/defect-refs.ts); this file is the pure part.
 */

/** The prefix of every generated reference. */
export const DEFECT_REF_PREFIX = 'DF';

/** Two-digit year (UTC) of an instant, as used in the reference: 2026-03-01 → "26". */
export function refYear(reportedAtMs: number): string {
  return String(new Date(reportedAtMs).getUTCFullYear() % 100).padStart(2, '0');
}

/** The reference of the `seq`-th defect of year `yy` ("26", 401 → "DF-26-00401"). */
export function formatDefectRef(yy: string, seq: number): string {
  if (!/^\d{2}$/.test(yy)) throw new RangeError(`year must be two digits, got "${yy}"`);
  if (!Number.isInteger(seq) || seq < 1) throw new RangeError(`sequence must be a whole number from 1, got ${seq}`);
  return `${DEFECT_REF_PREFIX}-${yy}-${String(seq).padStart(5, '0')}`;
}

/** The year and number of a reference in the generated format, or null for any other text. */
export function parseDefectRef(ref: string): { yy: string; seq: number } | null {
  const m = /^DF-(\d{2})-(\d{5,})$/.exec(ref);
  if (!m) return null;
  const seq = Number(m[2]);
  return Number.isSafeInteger(seq) && seq >= 1 ? { yy: m[1]!, seq } : null;
}

/**
 * References for new defects, in the order given: each takes the next number of its report year after the
 * highest already used (`highest`, per two-digit year; absent = none yet).
 */
export function nextDefectRefs(reportedAtMs: readonly number[], highest: ReadonlyMap<string, number>): string[] {
  const last = new Map(highest);
  return reportedAtMs.map((t) => {
    const yy = refYear(t);
    const seq = (last.get(yy) ?? 0) + 1;
    last.set(yy, seq);
    return formatDefectRef(yy, seq);
  });
}
