import { describe, expect, it } from 'vitest';
import { DEFAULT_CURRENCY, isMoneyCurrency, moneyCurrencies } from './currency';

// Minor units of ISO 4217 (common practice; not in REFERENCES.md): the standard gives GBP, EUR, USD, SEK, CHF two minor
// digits, JPY and KRW none, BHD, KWD and TND three.
describe('isMoneyCurrency', () => {
  it('accepts ISO 4217 codes with two minor digits', () => {
    for (const c of ['GBP', 'EUR', 'USD', 'SEK', 'CHF', DEFAULT_CURRENCY]) expect(isMoneyCurrency(c), c).toBe(true);
  });
  it('refuses codes without two minor digits, unknown codes and bad forms', () => {
    for (const c of ['JPY', 'KRW', 'BHD', 'KWD', 'TND', 'XYZ', 'gbp', 'GB', 'GBPX', '']) expect(isMoneyCurrency(c), c).toBe(false);
  });
});

describe('moneyCurrencies', () => {
  it('lists the accepted codes by code with their English names', () => {
    const list = moneyCurrencies();
    expect(list.find((c) => c.code === 'GBP')?.name).toBe('British Pound');
    expect(list.find((c) => c.code === 'EUR')?.name).toBe('Euro');
    expect(list.some((c) => c.code === 'JPY')).toBe(false);
    const codes = list.map((c) => c.code);
    expect(codes).toEqual([...codes].sort());
    expect(list.every((c) => isMoneyCurrency(c.code))).toBe(true);
  });
});
