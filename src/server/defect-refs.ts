/**
 * Numbers new defects `DF-YY-NNNNN` (src/lib/defects/refs.ts) inside the caller's write transaction: the next
 * number of each report year after the highest already stored. Reading the highest and writing the new refs
 * happen in the same transaction, and the connection serialises transactions (better-sqlite3 is synchronous
 * and the report endpoint begins IMMEDIATE, taking the write lock first), so two reports at the same moment
 * never get the same number; the unique index on `defects.ref` is the last guard.
 */
import { eq, sql } from 'drizzle-orm';
import type { Db } from '@/db/client';
import { defects } from '@/db/schema';
import { nextDefectRefs, refYear } from '@/lib/defects/refs';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** The highest number used so far in each of these two-digit years (refs in the generated format only). */
function highestByYear(tx: Tx, years: readonly string[]): Map<string, number> {
  const out = new Map<string, number>();
  for (const yy of years) {
    // A range on the ref text uses the unique index; GLOB keeps only well-formed refs of that year.
    const row = tx.get<{ n: number | null }>(
      sql`select max(cast(substr(${defects.ref}, 7) as integer)) as n from ${defects}
          where ${defects.ref} >= ${`DF-${yy}-`} and ${defects.ref} < ${`DF-${yy}.`} and ${defects.ref} glob ${`DF-${yy}-[0-9][0-9][0-9][0-9][0-9]*`}`,
    );
    out.set(yy, row?.n ?? 0);
  }
  return out;
}

/** Give each of these new defects (id and report time, in numbering order) its reference. */
export function assignDefectRefs(tx: Tx, items: ReadonlyArray<{ id: number; reportedAt: number }>): string[] {
  if (items.length === 0) return [];
  const years = [...new Set(items.map((i) => refYear(i.reportedAt)))];
  const refs = nextDefectRefs(
    items.map((i) => i.reportedAt),
    highestByYear(tx, years),
  );
  items.forEach((item, k) => tx.update(defects).set({ ref: refs[k]! }).where(eq(defects.id, item.id)).run());
  return refs;
}
