/**
 * The currency setting (`currency`, an ISO 4217 code) read by every place that shows or exports money. Kept apart
 * from src/server/settings.ts so that the defect and export services can read it without importing the settings
 * service (which imports them).
 */
import { eq } from 'drizzle-orm';
import { getDb, type Db } from '@/db/client';
import { settings } from '@/db/schema';
import { DEFAULT_CURRENCY, isMoneyCurrency } from '@/lib/money/currency';

/** Key of the currency in the settings table. */
export const CURRENCY_KEY = 'currency';

/** The currency in force (DEFAULT_CURRENCY until an admin sets one). */
export function currencyCode(tx: Pick<Db, 'select'> = getDb()): string {
  const v = tx.select().from(settings).where(eq(settings.key, CURRENCY_KEY)).get()?.value;
  return v && isMoneyCurrency(v) ? v : DEFAULT_CURRENCY;
}
