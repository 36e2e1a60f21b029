import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  VIN_LENGTH,
  VIN_TRANSLITERATION,
  VIN_WEIGHTS,
  VinFormatError,
  computeVinCheckDigit,
  computeVinWeightedSum,
  parseVin,
  vinModelYearCandidates,
  type VinOk,
  type VinResult,
} from './vin';

/** Narrow a result to the success branch, failing the test with the message otherwise. */
function expectOk(result: VinResult): VinOk {
  if (!result.ok) throw new Error(`expected ok, got ${result.code}: ${result.message}`);
  return result;
}

// Invented VINs used below (no real maker). Their check digits were computed for these tests with a separate
// 15-line Python 3 implementation of Tables III-IV (independent of this module): the sums are given beside each.
const INVENTED = {
  naLetterPos7YearL: '1A4BC5DE4LA123456', // sum 246 -> 4
  naYearZ: '1A4BC5DE3ZA123456', // sum 300 -> 3
  naDigitPos7YearA: '1A4BC5107AA123456', // sum 172 -> 7
  naLetterPos7YearA: '2A4BC5D0XAA123456', // sum 186 -> X
  naLetterPos7Year9: '3A4BC5D029A123456', // sum 266 -> 2
  naYear0: '4A4BC51000A123456', // sum 187 -> 0
  naYearU: '5A4BC5DE1UA123456', // sum 287 -> 1
  otherYearS: 'SZZAB1CD3S1000001', // sum 223 -> 3
  otherFirst6: '6ZZAB1CD2S1000001', // sum 255 -> 2
  otherYearY: '9ZZAB1CD3Y1000001', // sum 333 -> 3
  otherValid: 'WZZZZZ1K06A012345', // sum 407 -> 0
} as const;

describe('Tables III and IV', () => {
  it('matches the published transliteration and weights', () => {
    // REFERENCES.md section 6: 49 CFR 565 Tables III-IV, as quoted in public copies of the regulation (a)
    expect(VIN_TRANSLITERATION).toEqual({
      A: 1, B: 2, C: 3, D: 4, E: 5, F: 6, G: 7, H: 8, J: 1, K: 2, L: 3, M: 4, N: 5, P: 7, R: 9,
      S: 2, T: 3, U: 4, V: 5, W: 6, X: 7, Y: 8, Z: 9,
    });
    expect(VIN_WEIGHTS).toEqual([8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2]);
    expect(VIN_LENGTH).toBe(17);
  });
});

describe('computeVinWeightedSum / computeVinCheckDigit', () => {
  it('gives sum 411 and check digit 4 for the regulation sample', () => {
    // REFERENCES.md section 6: 49 CFR 565 Table V sample, 411 / 11 = 37 r 4 (a); independent code agrees (b)
    expect(computeVinWeightedSum('1G4AH59H45G118341')).toBe(411);
    expect(computeVinCheckDigit('1G4AH59H45G118341')).toBe('4');
  });

  it('ignores position 9, which the regulation prints blank', () => {
    // REFERENCES.md section 6: Table V prints position 9 blank; sum 411 (a)
    expect(computeVinWeightedSum('1G4AH59H 5G118341')).toBe(411);
    expect(computeVinCheckDigit('1G4AH59H_5G118341')).toBe('4');
  });

  it('gives X for remainder 10', () => {
    // REFERENCES.md section 6: 1M8GDM9AXKP042788, sum 351 -> X, independent implementation (b); textbook example from memory (c)
    expect(computeVinWeightedSum('1M8GDM9AXKP042788')).toBe(351);
    expect(computeVinCheckDigit('1M8GDM9A1KP042788')).toBe('X');
  });

  it('gives 1 for seventeen ones', () => {
    // REFERENCES.md section 6: 11111111111111111, sum 89 -> 1, independent implementation (b)
    expect(computeVinWeightedSum('11111111111111111')).toBe(89);
    expect(computeVinCheckDigit('11111111111111111')).toBe('1');
  });

  it('agrees with the independent Python sums for the invented VINs', () => {
    // Sums from the separate Python implementation noted at INVENTED (computed for these tests)
    expect(computeVinWeightedSum(INVENTED.naLetterPos7YearL)).toBe(246);
    expect(computeVinWeightedSum(INVENTED.naLetterPos7YearA)).toBe(186);
    expect(computeVinCheckDigit(INVENTED.naLetterPos7YearA)).toBe('X');
    expect(computeVinWeightedSum(INVENTED.otherValid)).toBe(407);
    expect(computeVinCheckDigit(INVENTED.otherValid)).toBe('0');
  });

  it('normalises case and surrounding spaces', () => {
    // REFERENCES.md section 6: regulation sample, check digit 4 (a)
    expect(computeVinCheckDigit('  1g4ah59h45g118341 ')).toBe('4');
  });

  it('throws VinFormatError on a wrong length or a disallowed character', () => {
    expect(() => computeVinCheckDigit('1G4AH59H45G11834')).toThrow(VinFormatError);
    expect(() => computeVinCheckDigit('1G4AH59H45G11834O')).toThrow(/letter O at position 17/);
  });
});

describe('parseVin: published valid VINs', () => {
  it('accepts the regulation sample 1G4AH59H45G118341', () => {
    // REFERENCES.md section 6: 49 CFR 565 Table V, check digit 4 (a); independent code: valid (b)
    const result = expectOk(parseVin('1G4AH59H45G118341'));
    expect(result.vin).toBe('1G4AH59H45G118341');
    expect(result.checkDigit).toEqual({ expected: '4', actual: '4', valid: true, required: true });
    expect(result.region).toBe('north_america');
    expect(result.wmi).toBe('1G4');
    expect(result.warnings).toEqual([]);
  });

  it('accepts 1M8GDM9AXKP042788 with check digit X', () => {
    // REFERENCES.md section 6: sum 351 -> X, independent implementation (b); textbook example from memory (c)
    const result = expectOk(parseVin('1M8GDM9AXKP042788'));
    expect(result.checkDigit).toEqual({ expected: 'X', actual: 'X', valid: true, required: true });
    expect(result.wmi).toBe('1M8');
  });

  it('accepts 11111111111111111', () => {
    // REFERENCES.md section 6: sum 89 -> 1, independent implementation (b)
    const result = expectOk(parseVin('11111111111111111'));
    expect(result.checkDigit).toEqual({ expected: '1', actual: '1', valid: true, required: true });
  });
});

describe('parseVin: published invalid VINs', () => {
  it('rejects 1M8GDM9A1KP042788 (computed X, has 1)', () => {
    // REFERENCES.md section 6: invalid, computed X, has 1 — independent implementation (b)
    expect(parseVin('1M8GDM9A1KP042788')).toEqual({
      ok: false,
      code: 'check_digit',
      message: "Check digit is 1 but the VIN's other characters give X (49 CFR Part 565)",
    });
  });

  it('rejects 1G4AH59H55G118341 (computed 4, has 5)', () => {
    // REFERENCES.md section 6: invalid, computed 4, has 5 — independent implementation (b)
    expect(parseVin('1G4AH59H55G118341')).toEqual({
      ok: false,
      code: 'check_digit',
      message: "Check digit is 5 but the VIN's other characters give 4 (49 CFR Part 565)",
    });
  });

  it('rejects 1G4AH59H45G11834O (contains O)', () => {
    // REFERENCES.md section 6: invalid, contains 'O'; I, O, Q have no Table III value (a)
    expect(parseVin('1G4AH59H45G11834O')).toEqual({
      ok: false,
      code: 'characters',
      message: 'VIN has the letter O at position 17; I, O and Q are never used in a VIN',
    });
  });
});

describe('parseVin: form', () => {
  it('trims and upper-cases the input', () => {
    // REFERENCES.md section 6: regulation sample, check digit 4 (a)
    const result = expectOk(parseVin('\t 1g4ah59h45g118341  \n'));
    expect(result.vin).toBe('1G4AH59H45G118341');
    expect(result.checkDigit.valid).toBe(true);
  });

  it('rejects wrong lengths with the count', () => {
    expect(parseVin('')).toEqual({ ok: false, code: 'length', message: 'VIN is empty; a VIN has 17 characters' });
    expect(parseVin('   ')).toEqual({ ok: false, code: 'length', message: 'VIN is empty; a VIN has 17 characters' });
    expect(parseVin('1G4AH59H45G11834')).toEqual({
      ok: false,
      code: 'length',
      message: 'VIN must have 17 characters; this one has 16',
    });
    expect(parseVin('1G4AH59H45G1183411')).toEqual({
      ok: false,
      code: 'length',
      message: 'VIN must have 17 characters; this one has 18',
    });
  });

  it('counts a non-ASCII character once and does not expand it when upper-casing', () => {
    // "ß".toUpperCase() is "SS"; only ASCII letters are upper-cased, so the length stays 17
    expect(parseVin('1G4AH59H45G11834ß')).toEqual({
      ok: false,
      code: 'characters',
      message: 'VIN has the character "ß" at position 17; a VIN uses only the letters A-Z and the digits 0-9',
    });
  });

  it('names every I, O, Q with all its positions', () => {
    expect(parseVin('1Q4AH59H45G1I834I')).toEqual({
      ok: false,
      code: 'characters',
      message: 'VIN has the letter Q at position 2 and the letter I at positions 13 and 17; I, O and Q are never used in a VIN',
    });
    // lower-case i is upper-cased before the check
    expect(parseVin('1g4ah59h45g11834i')).toMatchObject({ code: 'characters', message: expect.stringContaining('letter I at position 17') });
  });

  it('names spaces and punctuation inside the VIN', () => {
    expect(parseVin('1G4AH 9H45G11834-')).toEqual({
      ok: false,
      code: 'characters',
      message: 'VIN has a space at position 6 and the character "-" at position 17; a VIN uses only the letters A-Z and the digits 0-9',
    });
    expect(parseVin('1G4AH59H45G1183O*')).toEqual({
      ok: false,
      code: 'characters',
      message:
        'VIN has the letter O at position 16 and the character "*" at position 17; I, O and Q are never used in a VIN, and a VIN uses only the letters A-Z and the digits 0-9',
    });
  });

  it('reports a letter other than X in position 9 of a North American VIN as a check-digit error', () => {
    // REFERENCES.md section 6: 1M8GDM9A?KP042788 gives X (b); K is not a check-digit character
    expect(parseVin('1M8GDM9AKKP042788')).toEqual({
      ok: false,
      code: 'check_digit',
      message: "Position 9 is K but must be the check digit (0-9 or X); the VIN's other characters give X (49 CFR Part 565)",
    });
  });
});

describe('parseVin: region and optional check digit outside North America', () => {
  it('treats first characters 1-5 as North American and others as other', () => {
    // CONTRACT.md "Imports": first character 1-5 is North American
    expect(expectOk(parseVin(INVENTED.naLetterPos7YearA)).region).toBe('north_america'); // starts with 2
    expect(expectOk(parseVin(INVENTED.naLetterPos7Year9)).region).toBe('north_america'); // 3
    expect(expectOk(parseVin(INVENTED.naYear0)).region).toBe('north_america'); // 4
    expect(expectOk(parseVin(INVENTED.naYearU)).region).toBe('north_america'); // 5
    const six = expectOk(parseVin(INVENTED.otherFirst6));
    expect(six.region).toBe('other');
    expect(six.checkDigit).toEqual({ expected: '2', actual: '2', valid: true, required: false });
    expect(expectOk(parseVin(INVENTED.otherValid)).region).toBe('other');
  });

  it('accepts a valid non-North-American VIN without warnings', () => {
    const result = expectOk(parseVin(INVENTED.otherValid));
    expect(result.checkDigit).toEqual({ expected: '0', actual: '0', valid: true, required: false });
    expect(result.wmi).toBe('WZZ');
    expect(result.warnings).toEqual([]);
  });

  it('warns on a digit mismatch outside North America', () => {
    // Python sum 407 -> 0 for WZZZZZ1K?6A012345 (see INVENTED); position 9 holds 3
    const result = expectOk(parseVin('WZZZZZ1K36A012345'));
    expect(result.checkDigit).toEqual({ expected: '0', actual: '3', valid: false, required: false });
    expect(result.warnings).toEqual([
      "Check digit is 3 but the VIN's other characters give 0 (49 CFR Part 565); outside North America a check digit is optional, so this is only a warning",
    ]);
  });

  it('warns that a letter in position 9 outside North America means no check digit', () => {
    // REFERENCES.md section 6: a non-North-American VIN with a letter other than X in position 9 has no check digit (warning)
    const result = expectOk(parseVin('wzzzzz1kz6a012345'));
    expect(result.vin).toBe('WZZZZZ1KZ6A012345');
    expect(result.checkDigit).toEqual({ expected: '0', actual: 'Z', valid: false, required: false });
    expect(result.warnings).toEqual([
      'Position 9 is Z, so this VIN carries no check digit (49 CFR Part 565 would give 0); outside North America a check digit is optional',
    ]);
  });

  it('warns on a Japanese-style VIN (first character J) with a mismatch', () => {
    // Python sum for JZZAB1CD?S1000001 = 215 -> 6 (see INVENTED); position 9 holds 3
    const result = expectOk(parseVin('JZZAB1CD3S1000001'));
    expect(result.checkDigit).toEqual({ expected: '6', actual: '3', valid: false, required: false });
    expect(result.warnings).toHaveLength(1);
  });
});

describe('vinModelYearCandidates', () => {
  it('follows the 30-year cycle of position 10', () => {
    // REFERENCES.md section 6: A = 1980/2010, Y = 2000/2030, 1-9 = 2001-2009 / 2031-2039 (a, secondary)
    expect(vinModelYearCandidates('A')).toEqual([1980, 2010]);
    expect(vinModelYearCandidates('H')).toEqual([1987, 2017]);
    expect(vinModelYearCandidates('J')).toEqual([1988, 2018]); // I skipped
    expect(vinModelYearCandidates('P')).toEqual([1993, 2023]); // O skipped
    expect(vinModelYearCandidates('R')).toEqual([1994, 2024]); // Q skipped
    expect(vinModelYearCandidates('V')).toEqual([1997, 2027]); // U skipped
    expect(vinModelYearCandidates('Y')).toEqual([2000, 2030]);
    expect(vinModelYearCandidates('1')).toEqual([2001, 2031]);
    expect(vinModelYearCandidates('9')).toEqual([2009, 2039]);
    expect(vinModelYearCandidates('s')).toEqual([1995, 2025]);
  });

  it('returns [] for characters that are not year codes', () => {
    // REFERENCES.md section 6: I, O, Q, U, Z and digit 0 not used (a, secondary)
    for (const code of ['I', 'O', 'Q', 'U', 'Z', '0', '', 'AB', '-']) {
      expect(vinModelYearCandidates(code)).toEqual([]);
    }
  });
});

describe('parseVin: model year', () => {
  it('uses position 7 for North American VINs', () => {
    // REFERENCES.md section 6: position 7 numeric -> 1980-2009, alphabetic -> 2010-2039 (73 FR 23367) (a)
    const sample = expectOk(parseVin('1G4AH59H45G118341')); // position 7 '9', position 10 '5'
    expect(sample.modelYear).toBe(2005);
    expect(sample.modelYearCandidates).toEqual([2005, 2035]);
    expect(expectOk(parseVin('1M8GDM9AXKP042788')).modelYear).toBe(1989); // position 7 '9', position 10 'K'
    expect(expectOk(parseVin('11111111111111111')).modelYear).toBe(2001); // '1', '1'
    expect(expectOk(parseVin(INVENTED.naDigitPos7YearA)).modelYear).toBe(1980); // '1', 'A'
    expect(expectOk(parseVin(INVENTED.naLetterPos7YearA)).modelYear).toBe(2010); // 'D', 'A'
    expect(expectOk(parseVin(INVENTED.naLetterPos7YearL)).modelYear).toBe(2020); // 'D', 'L'
    expect(expectOk(parseVin(INVENTED.naLetterPos7Year9)).modelYear).toBe(2039); // 'D', '9'
  });

  it('ignores referenceYear for North American VINs', () => {
    // REFERENCES.md section 6: position 7 letter -> 2010-2039 (a)
    expect(expectOk(parseVin(INVENTED.naLetterPos7YearL, { referenceYear: 2000 })).modelYear).toBe(2020);
  });

  it('gives null and a warning when position 10 of a North American VIN is not a year code', () => {
    // REFERENCES.md section 6: letters U, Z and digit 0 not used (a, secondary)
    for (const [vin, code] of [
      [INVENTED.naYearZ, 'Z'],
      [INVENTED.naYear0, '0'],
      [INVENTED.naYearU, 'U'],
    ] as const) {
      const result = expectOk(parseVin(vin));
      expect(result.modelYear).toBeNull();
      expect(result.modelYearCandidates).toEqual([]);
      expect(result.warnings).toEqual([
        `Position 10 is ${code}, which is not a model-year code (0, U and Z are not used)`,
      ]);
    }
  });

  it('picks the later candidate by default outside North America', () => {
    // REFERENCES.md section 6: S = 1995/2025, Y = 2000/2030 (a, secondary)
    const s = expectOk(parseVin(INVENTED.otherYearS));
    expect(s.modelYearCandidates).toEqual([1995, 2025]);
    expect(s.modelYear).toBe(2025);
    expect(s.warnings).toEqual([]);
    expect(expectOk(parseVin(INVENTED.otherYearY)).modelYear).toBe(2030);
    expect(expectOk(parseVin(INVENTED.otherValid)).modelYear).toBe(2036); // position 10 '6'
  });

  it('picks the latest candidate not after referenceYear outside North America', () => {
    // REFERENCES.md section 6: S = 1995/2025 (a, secondary)
    expect(expectOk(parseVin(INVENTED.otherYearS, { referenceYear: 2024 })).modelYear).toBe(1995);
    expect(expectOk(parseVin(INVENTED.otherYearS, { referenceYear: 2025 })).modelYear).toBe(2025);
    expect(expectOk(parseVin(INVENTED.otherYearS, { referenceYear: 2100 })).modelYear).toBe(2025);
    expect(expectOk(parseVin(INVENTED.otherYearS, { referenceYear: 1995 })).modelYear).toBe(1995);
  });

  it('gives null and a warning when both candidates are after referenceYear', () => {
    // REFERENCES.md section 6: S = 1995/2025 (a, secondary)
    const result = expectOk(parseVin(INVENTED.otherYearS, { referenceYear: 1990 }));
    expect(result.modelYear).toBeNull();
    expect(result.modelYearCandidates).toEqual([1995, 2025]);
    expect(result.warnings).toEqual(['Model year code S means 1995 or 2025, both after the reference year 1990']);
  });

  it('gives null without a warning when position 10 outside North America is not a year code', () => {
    // Outside North America position 10 need not encode the year; Python sum for WZZZZZ1K?ZA012345 = 434 -> 5
    const result = expectOk(parseVin('WZZZZZ1K5ZA012345'));
    expect(result.checkDigit.valid).toBe(true);
    expect(result.modelYear).toBeNull();
    expect(result.modelYearCandidates).toEqual([]);
    expect(result.warnings).toEqual([]);
  });

  it('rejects a non-integer referenceYear', () => {
    expect(() => parseVin(INVENTED.otherYearS, { referenceYear: 2024.5 })).toThrow(RangeError);
  });
});

describe('check digit properties', () => {
  const ALLOWED = '0123456789ABCDEFGHJKLMNPRSTUVWXYZ'.split('');
  const value = (c: string): number => (c >= '0' && c <= '9' ? Number(c) : (VIN_TRANSLITERATION[c] ?? -1));
  const sixteen = fc.array(fc.constantFrom(...ALLOWED), { minLength: 16, maxLength: 16 });
  /** Insert the computed check digit as position 9 of 16 characters. */
  const withCheckDigit = (chars: string[]): string => {
    const placeholder = [...chars.slice(0, 8), '0', ...chars.slice(8)].join('');
    const digit = computeVinCheckDigit(placeholder);
    return placeholder.slice(0, 8) + digit + placeholder.slice(9);
  };

  it('a VIN with the computed check digit always validates', () => {
    fc.assert(
      fc.property(sixteen, (chars) => {
        const result = parseVin(withCheckDigit(chars));
        expect(result.ok).toBe(true);
        if (result.ok) expect(result.checkDigit.valid).toBe(true);
      }),
      { seed: 565, numRuns: 500 },
    );
  });

  it('detects every single substitution outside position 9 that changes the transliterated value', () => {
    // A substitution at position p changes the sum by w_p * (v1 - v2); w_p is 1..10 and |v1 - v2| is 1..9,
    // neither divisible by the prime 11, so the remainder always changes.
    fc.assert(
      fc.property(
        sixteen,
        fc.integer({ min: 0, max: 16 }).filter((i) => i !== 8),
        fc.constantFrom(...ALLOWED),
        (chars, index, replacement) => {
          const vin = withCheckDigit(chars);
          const original = vin[index] ?? '';
          fc.pre(value(original) !== value(replacement));
          const changed = vin.slice(0, index) + replacement + vin.slice(index + 1);
          const result = parseVin(changed);
          if ('12345'.includes(changed[0] ?? '')) {
            expect(result).toMatchObject({ ok: false, code: 'check_digit' });
          } else {
            expect(result).toMatchObject({ ok: true, checkDigit: { valid: false } });
          }
        },
      ),
      { seed: 3779, numRuns: 1000 },
    );
  });

  it('cannot detect substitutions between characters of equal value (such as A, J and 1)', () => {
    // Table III gives A and J the value 1, like the digit 1 (REFERENCES.md section 6, (a)), so swapping them leaves the sum unchanged
    const sameValue = fc.constantFrom('A', 'J', '1');
    fc.assert(
      fc.property(sixteen, fc.integer({ min: 0, max: 15 }), sameValue, sameValue, (chars, index, before, after) => {
        const seeded = chars.map((c, i) => (i === index ? before : c));
        const vin = withCheckDigit(seeded);
        const position = index < 8 ? index : index + 1; // index into the 17 characters, skipping position 9
        const changed = vin.slice(0, position) + after + vin.slice(position + 1);
        expect(computeVinCheckDigit(changed)).toBe(vin[8]);
      }),
      { seed: 17, numRuns: 300 },
    );
  });

  it('detects any change of position 9 itself', () => {
    fc.assert(
      fc.property(sixteen, fc.constantFrom(...ALLOWED), (chars, replacement) => {
        const vin = withCheckDigit(chars);
        fc.pre(replacement !== vin[8]);
        const changed = vin.slice(0, 8) + replacement + vin.slice(9);
        const result = parseVin(changed);
        if (result.ok) expect(result.checkDigit.valid).toBe(false);
        else expect(result.code).toBe('check_digit');
      }),
      { seed: 9, numRuns: 500 },
    );
  });
});
