/**
 * Settings an admin changes (src/lib/contracts/settings.ts). Changing the repeat-repair window recomputes every
 * vehicle's repeat links in the same transaction as the change and its audit rows, and reports how many
 * defects changed; a dry run does the same work inside a transaction that is rolled back. The labour rate
 * applies to costs worked out from then on (a defect's cost is recomputed when its parts or labour are saved).
 * The currency names the unit of every amount; changing it converts nothing (amounts are kept as entered).
 */
import { eq, sql } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { defects, settings } from '@/db/schema';
import type { Settings, SettingsChangeResult, SettingsPatch } from '@/lib/contracts/settings';
import { writeAudit, type Actor } from './audit';
import { refreshRepeats, repeatWindowDays } from './repeats';
import { labourRateMinorPerHour } from './defect-record';
import { CURRENCY_KEY, currencyCode } from './currency';

/** Key of the repeat window in the settings table (read by src/server/repeats.ts). */
export const REPEAT_WINDOW_KEY = 'repeat_window_days';
/** Key of the hourly labour rate (read by src/server/defect-record.ts). */
export const LABOUR_RATE_KEY = 'labour_rate_minor_per_hour';

/** The settings in force (defaults where none is stored). */
export function getSettings(): Settings {
  const db = getDb();
  return { repeatWindowDays: repeatWindowDays(db), labourRateMinorPerHour: labourRateMinorPerHour(db), currency: currencyCode(db) };
}

/** Thrown inside a dry run's transaction to roll it back, carrying the result out. */
class DryRunDone extends Error {
  constructor(readonly result: SettingsChangeResult) {
    super('dry run');
  }
}

/** Change settings; a new repeat window recomputes every repeat link (one transaction, audited). */
export function updateSettings(patch: SettingsPatch, actor: Actor, opts: { dryRun?: boolean } = {}): SettingsChangeResult {
  const db = getDb();
  const dryRun = opts.dryRun ?? false;
  try {
    return db.transaction((tx) => {
      const before = repeatWindowDays(tx);
      const next = patch.repeatWindowDays ?? before;
      const rateBefore = labourRateMinorPerHour(tx);
      const rate = patch.labourRateMinorPerHour === undefined ? rateBefore : patch.labourRateMinorPerHour;
      if (rate !== rateBefore) {
        if (rate === null) tx.delete(settings).where(eq(settings.key, LABOUR_RATE_KEY)).run();
        else tx.insert(settings).values({ key: LABOUR_RATE_KEY, value: String(rate) }).onConflictDoUpdate({ target: settings.key, set: { value: String(rate) } }).run();
        writeAudit(tx, actor, { entity: 'settings', entityId: LABOUR_RATE_KEY, action: 'update', field: LABOUR_RATE_KEY, oldValue: rateBefore === null ? null : String(rateBefore), newValue: rate === null ? null : String(rate) });
      }
      const currencyBefore = currencyCode(tx);
      const currency = patch.currency ?? currencyBefore;
      if (currency !== currencyBefore) {
        tx.insert(settings).values({ key: CURRENCY_KEY, value: currency }).onConflictDoUpdate({ target: settings.key, set: { value: currency } }).run();
        writeAudit(tx, actor, { entity: 'settings', entityId: CURRENCY_KEY, action: 'update', field: CURRENCY_KEY, oldValue: currencyBefore, newValue: currency });
      }
      const links = () => new Map(tx.select({ id: defects.id, repeatOfId: defects.repeatOfId }).from(defects).all().map((r) => [r.id, r.repeatOfId]));
      const old = links();
      const repeatsBefore = [...old.values()].filter((v) => v !== null).length;
      let result: SettingsChangeResult = {
        settings: { repeatWindowDays: before, labourRateMinorPerHour: rate, currency },
        dryRun,
        recompute: { defectsChanged: 0, repeatsBefore, repeatsAfter: repeatsBefore, vehiclesChecked: 0 },
      };
      if (next !== before) {
        tx.insert(settings).values({ key: REPEAT_WINDOW_KEY, value: String(next) }).onConflictDoUpdate({ target: settings.key, set: { value: String(next) } }).run();
        const vehicleIds = tx
          .select({ id: defects.vehicleId })
          .from(defects)
          .groupBy(defects.vehicleId)
          .all()
          .map((r) => r.id);
        refreshRepeats(tx, vehicleIds);
        const now = links();
        let changed = 0;
        for (const [id, was] of old) if ((now.get(id) ?? null) !== was) changed++;
        const repeatsAfter = [...now.values()].filter((v) => v !== null).length;
        result = { settings: { repeatWindowDays: next, labourRateMinorPerHour: rate, currency }, dryRun, recompute: { defectsChanged: changed, repeatsBefore, repeatsAfter, vehiclesChecked: vehicleIds.length } };
        writeAudit(tx, actor, { entity: 'settings', entityId: REPEAT_WINDOW_KEY, action: 'update', field: REPEAT_WINDOW_KEY, oldValue: String(before), newValue: String(next) });
        writeAudit(tx, actor, {
          entity: 'settings',
          entityId: REPEAT_WINDOW_KEY,
          action: 'recompute_repeats',
          field: 'repeat_links',
          oldValue: `${repeatsBefore} repeats`,
          newValue: `${repeatsAfter} repeats; ${changed} defects changed`,
        });
      }
      if (dryRun) throw new DryRunDone(result);
      return result;
    });
  } catch (e) {
    if (e instanceof DryRunDone) return e.result;
    throw e;
  }
}

/** Recent audit rows about settings, newest first (the Settings page's history). */
export function listSettingsChanges(limit = 10) {
  return getDb().all<{ at: number; field: string | null; old_value: string | null; new_value: string | null; action: string; who: string | null }>(
    sql`select a.at, a.field, a.old_value, a.new_value, a.action, coalesce(u.name, a.actor) as who
        from audit_log a left join users u on u.id = a.user_id
        where a.entity = 'settings' order by a.at desc, a.id desc limit ${limit}`,
  ).map((r) => ({ at: new Date(r.at).toISOString(), action: r.action, field: r.field, oldValue: r.old_value, newValue: r.new_value, who: r.who ?? 'system' }));
}
