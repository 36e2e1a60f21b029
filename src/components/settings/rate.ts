/** Reading the labour-rate field of the Settings page. */
import { formatMoneyMinor } from '@/components/defects/format';
import { LABOUR_RATE_MAX_MINOR } from '@/lib/contracts/settings';

/** The client-side check of the labour rate (money per hour, up to two decimals; empty = no rate). */
export function checkRate(text: string): { minor: number | null } | { error: string } {
  const t = text.trim().replace(',', '.');
  if (t === '') return { minor: null };
  if (!/^\d+(\.\d{1,2})?$/.test(t)) return { error: 'Enter an amount per hour, such as 48.50.' };
  const minor = Math.round(Number(t) * 100);
  if (minor > LABOUR_RATE_MAX_MINOR) return { error: `At most ${formatMoneyMinor(LABOUR_RATE_MAX_MINOR)} an hour.` };
  return { minor };
}

