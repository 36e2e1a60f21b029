import { describe, expect, it } from 'vitest';
import { checkRate } from './rate';

describe('checkRate', () => {
  it('reads an amount per hour into minor units', () => {
    expect(checkRate('48')).toEqual({ minor: 4800 });
    expect(checkRate(' 48.5 ')).toEqual({ minor: 4850 });
    expect(checkRate('48,75')).toEqual({ minor: 4875 });
    expect(checkRate('0.07')).toEqual({ minor: 7 });
    expect(checkRate('100000')).toEqual({ minor: 10_000_000 });
  });
  it('reads an empty field as no rate', () => {
    expect(checkRate('')).toEqual({ minor: null });
    expect(checkRate('   ')).toEqual({ minor: null });
  });
  it('refuses what is not an amount, more than two decimals, negatives and the excess over the limit', () => {
    for (const bad of ['abc', '48.505', '-5', '1e3', '48.', '100000.01']) expect(checkRate(bad), bad).toHaveProperty('error');
  });
});
