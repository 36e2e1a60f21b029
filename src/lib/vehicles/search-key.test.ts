import { describe, expect, it } from 'vitest';
import { stripSeparators, vehicleSearchKey } from './search-key';

describe('vehicle search key', () => {
  it('drops dashes, spaces, dots, slashes and underscores, upper-cased', () => {
    expect(stripSeparators('ghq-4941 j')).toBe('GHQ4941J');
    expect(stripSeparators('AB.12/C_D')).toBe('AB12CD');
    expect(stripSeparators(' - ')).toBe('');
  });
  it('keeps the registration and fleet number apart', () => {
    expect(vehicleSearchKey('GHQ-4941-J', 'LV 1016')).toBe('GHQ4941J|LV1016');
    expect(vehicleSearchKey(null, 'LV1016')).toBe('|LV1016');
    expect(vehicleSearchKey('AB12 CDE', undefined)).toBe('AB12CDE|');
    // "J" at the end of one and "LV" at the start of the other never read as "JLV".
    expect(vehicleSearchKey('GHQ-4941-J', 'LV 1016').includes('JLV')).toBe(false);
  });
});
