/**
 * The currency of every amount in Seepline (one per installation, the `currency` setting): an ISO 4217 code.
 * Amounts are stored as whole hundredths (`…Minor` columns), so only currencies with two minor digits can be
 * chosen; Intl (the runtime's ICU data) says which codes exist and how many digits each has.
 */

/** The currency until an admin picks another (the demo operator's). */
export const DEFAULT_CURRENCY = 'GBP';

/** True for an ISO 4217 code the runtime knows whose amounts have two minor digits (GBP, EUR, SEK; not JPY, BHD). */
export function isMoneyCurrency(code: string): boolean {
  if (!/^[A-Z]{3}$/.test(code)) return false;
  if (!supported().has(code)) return false;
  try {
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency: code }).resolvedOptions().maximumFractionDigits === 2;
  } catch {
    return false;
  }
}

let cache: Set<string> | null = null;
function supported(): Set<string> {
  cache ??= new Set((Intl as unknown as { supportedValuesOf: (k: string) => string[] }).supportedValuesOf('currency'));
  return cache;
}

/** The currencies offered on the Settings page: code and English name, by code. */
export function moneyCurrencies(): Array<{ code: string; name: string }> {
  const names = new Intl.DisplayNames(['en-GB'], { type: 'currency' });
  return [...supported()]
    .filter(isMoneyCurrency)
    .sort()
    .map((code) => ({ code, name: names.of(code) ?? code }));
}
