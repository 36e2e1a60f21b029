/** Keeps defects' repeat links (repeatOfId) up to date for the vehicles whose defects changed. */
import { eq, inArray } from 'drizzle-orm';
import type { Db } from '@/db/client';
import { defects, modules, settings } from '@/db/schema';
import { computeRepeats, DEFAULT_REPEAT_WINDOW_DAYS } from '@/lib/defects/repeat';

type Tx = Pick<Db, 'select' | 'update'>;

/** The configured repeat window in days (setting `repeat_window_days`). */
export function repeatWindowDays(tx: Tx): number {
  const row = tx.select().from(settings).where(eq(settings.key, 'repeat_window_days')).get();
  const n = Number(row?.value);
  return Number.isInteger(n) && n > 0 && n <= 3650 ? n : DEFAULT_REPEAT_WINDOW_DAYS;
}

/** Recompute repeat links for the given vehicles, writing only the ones that changed. */
export function refreshRepeats(tx: Tx, vehicleIds: number[]): void {
  const window = repeatWindowDays(tx);
  for (let i = 0; i < vehicleIds.length; i += 500) {
    const part = vehicleIds.slice(i, i + 500);
    const rows = tx
      .select({
        id: defects.id,
        vehicleId: defects.vehicleId,
        position: defects.position,
        moduleFunction: modules.function,
        reportedAt: defects.reportedAt,
        closedAt: defects.closedAt,
        status: defects.status,
        repeatOfId: defects.repeatOfId,
      })
      .from(defects)
      .innerJoin(modules, eq(modules.id, defects.moduleId))
      .where(inArray(defects.vehicleId, part))
      .all();
    const links = computeRepeats(rows.map((r) => ({ ...r, cancelled: r.status === 'cancelled' })), window);
    for (const r of rows) {
      const next = links.get(r.id) ?? null;
      if (next !== r.repeatOfId) tx.update(defects).set({ repeatOfId: next }).where(eq(defects.id, r.id)).run();
    }
  }
}
