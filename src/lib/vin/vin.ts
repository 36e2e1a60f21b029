/**
 * VIN engine: form (ISO 3779), check digit (49 CFR Part 565) and model year.
 *
 * Rules (REFERENCES.md section 6; CONTRACT.md "Imports"):
 * - Input is trimmed and its ASCII letters upper-cased. A VIN is exactly 17 characters of A-Z/0-9 without
 *   I, O and Q (Table III of 49 CFR 565 has no values for them).
 * - Check digit (position 9): transliterate letters by Table III (digits keep their face value), multiply by
 *   the Table IV weights 8 7 6 5 4 3 2 10 0 9 8 7 6 5 4 3 2, sum, take the remainder mod 11; a remainder of
 *   10 is written "X".
 * - Region: a first character 1-5 is North American. There the check digit is required and a mismatch is an
 *   error. Elsewhere the check digit is optional: a mismatch is a warning, and a letter other than X in
 *   position 9 means the VIN carries no check digit at all (also a warning).
 * - Model year (position 10): A-Y without I, O, Q, U, Z = 1980-2000, then 1-9 = 2001-2009, repeating every
 *   30 years (2010-2039); the digit 0 and the letters U, Z are not year codes (model year null).
 *   North American VINs are disambiguated by position 7: a digit means 1980-2009, a letter 2010-2039
 *   (73 FR 23367, Apr 30 2008). NOTE: that rule is written for vehicles of 10 000 lb GVWR or less; for
 *   heavier North American vehicles the same rule is applied as a best guess.
 *   Other VINs need not encode the year at all; when position 10 is a year code, the candidate chosen is the
 *   latest one not after `referenceYear` (default 2039, i.e. the later candidate).
 * - The WMI is positions 1-3. NOTE: makers of fewer than 1 000 vehicles a year put 9 in position 3 and
 *   continue the WMI in positions 12-14; `wmi` still reports only positions 1-3.
 */

/** Number of characters in a VIN. */
export const VIN_LENGTH = 17;

/** Table III of 49 CFR 565: value of each letter allowed in a VIN (digits keep their face value). */
export const VIN_TRANSLITERATION: Readonly<Record<string, number>> = Object.freeze({
  A: 1, B: 2, C: 3, D: 4, E: 5, F: 6, G: 7, H: 8,
  J: 1, K: 2, L: 3, M: 4, N: 5, P: 7, R: 9,
  S: 2, T: 3, U: 4, V: 5, W: 6, X: 7, Y: 8, Z: 9,
});

/** Table IV of 49 CFR 565: weight of each position 1-17 (index 0 = position 1; position 9 weighs 0). */
export const VIN_WEIGHTS: readonly number[] = Object.freeze([8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2]);

/** Position-10 year codes in cycle order: index i means 1980 + i (and 2010 + i). */
const MODEL_YEAR_CODES = 'ABCDEFGHJKLMNPRSTVWXY123456789';
const FIRST_CYCLE_START_YEAR = 1980;
const CYCLE_YEARS = 30;
const DEFAULT_REFERENCE_YEAR = 2039;
/** Position 9 as a 0-based index. */
const CHECK_DIGIT_INDEX = 8;

/** Outcome of the check-digit comparison of a VIN with a valid form. */
export interface VinCheckDigit {
  /** Check digit computed from the other 16 characters ('0'-'9' or 'X'). */
  expected: string;
  /** Character found in position 9. */
  actual: string;
  valid: boolean;
  /** True for North American VINs (first character 1-5), where a mismatch is an error. */
  required: boolean;
}

/** Region by the first character of the VIN: 1-5 North America, anything else 'other'. */
export type VinRegion = 'north_america' | 'other';

/** A VIN of valid form (for North American VINs also with a correct check digit). */
export interface VinOk {
  ok: true;
  /** Normalised VIN (trimmed, upper case). */
  vin: string;
  checkDigit: VinCheckDigit;
  region: VinRegion;
  /** World manufacturer identifier, positions 1-3. */
  wmi: string;
  /** Decoded model year, or null when position 10 is not a year code or no candidate fits. */
  modelYear: number | null;
  /** Both years position 10 can mean, ascending (empty when it is not a year code). */
  modelYearCandidates: number[];
  /** Plain-English warnings (check digit mismatch outside North America, odd position 10). */
  warnings: string[];
}

/** A rejected VIN with a plain-English message. */
export interface VinError {
  ok: false;
  code: 'length' | 'characters' | 'check_digit';
  message: string;
}

/** Result of `parseVin`. */
export type VinResult = VinOk | VinError;

/** Options for `parseVin`. */
export interface ParseVinOptions {
  /**
   * Latest plausible model year for a non-North-American VIN (default 2039). NOTE: a model year can run up to
   * a year ahead of the calendar, so pass e.g. the build year + 1 rather than the build year.
   */
  referenceYear?: number;
}

/** Thrown by `computeVinCheckDigit` / `computeVinWeightedSum` when the input is not of VIN form. */
export class VinFormatError extends Error {
  override name = 'VinFormatError';
}

/** Trim and upper-case ASCII letters only (so that e.g. "ß" does not turn into two characters). */
function normaliseVinText(input: string): string {
  return input.trim().replace(/[a-z]/g, (c) => c.toUpperCase());
}

/** Value of one VIN character per Table III, or undefined if the character is not allowed. */
function transliterate(char: string): number | undefined {
  if (char.length === 1 && char >= '0' && char <= '9') return char.charCodeAt(0) - 48;
  return VIN_TRANSLITERATION[char];
}

function joinWithAnd(items: string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

function describeCharacter(char: string): string {
  if (char === ' ') return 'a space';
  if (char === '\t') return 'a tab';
  if (/^[A-Z]$/.test(char)) return `the letter ${char}`;
  if (/^\s$/.test(char) || char < ' ') return `the character U+${(char.codePointAt(0) ?? 0).toString(16).toUpperCase().padStart(4, '0')}`;
  return `the character "${char}"`;
}

/** Message naming every disallowed character and its 1-based positions, or null if all are allowed. */
function describeBadCharacters(chars: string[]): string | null {
  const positionsByChar = new Map<string, number[]>();
  chars.forEach((char, index) => {
    if (transliterate(char) !== undefined) return;
    const positions = positionsByChar.get(char) ?? [];
    positions.push(index + 1);
    positionsByChar.set(char, positions);
  });
  if (positionsByChar.size === 0) return null;
  const parts: string[] = [];
  let hasIoq = false;
  let hasOther = false;
  for (const [char, positions] of positionsByChar) {
    if (char === 'I' || char === 'O' || char === 'Q') hasIoq = true;
    else hasOther = true;
    const where = positions.length === 1 ? `position ${positions[0]}` : `positions ${joinWithAnd(positions.map(String))}`;
    parts.push(`${describeCharacter(char)} at ${where}`);
  }
  const reasons: string[] = [];
  if (hasIoq) reasons.push('I, O and Q are never used in a VIN');
  if (hasOther) reasons.push('a VIN uses only the letters A-Z and the digits 0-9');
  return `VIN has ${joinWithAnd(parts)}; ${reasons.join(', and ')}`;
}

/** Characters as code points, so that a non-BMP character counts once. */
function splitCharacters(text: string): string[] {
  return Array.from(text);
}

function requireVinForm(vin17: string): string[] {
  const chars = splitCharacters(normaliseVinText(vin17));
  if (chars.length !== VIN_LENGTH) {
    throw new VinFormatError(`VIN must have ${VIN_LENGTH} characters; this one has ${chars.length}`);
  }
  // Position 9 weighs 0, so any placeholder there is accepted (the regulation prints it blank).
  const checked = chars.map((c, i) => (i === CHECK_DIGIT_INDEX ? '0' : c));
  const bad = describeBadCharacters(checked);
  if (bad !== null) throw new VinFormatError(bad);
  return chars;
}

function weightedSum(chars: string[]): number {
  let sum = 0;
  chars.forEach((char, index) => {
    if (index === CHECK_DIGIT_INDEX) return;
    sum += (transliterate(char) ?? 0) * (VIN_WEIGHTS[index] ?? 0);
  });
  return sum;
}

function checkDigitFromSum(sum: number): string {
  const remainder = sum % 11;
  return remainder === 10 ? 'X' : String(remainder);
}

/**
 * Sum of transliterated values times Table IV weights for a 17-character VIN (position 9 ignored).
 * @throws VinFormatError when the input (trimmed, upper-cased) is not 17 allowed characters
 */
export function computeVinWeightedSum(vin17: string): number {
  return weightedSum(requireVinForm(vin17));
}

/**
 * Check digit ('0'-'9' or 'X') that position 9 of a 17-character VIN should hold; position 9 itself is ignored.
 * @throws VinFormatError when the input (trimmed, upper-cased) is not 17 allowed characters
 */
export function computeVinCheckDigit(vin17: string): string {
  return checkDigitFromSum(computeVinWeightedSum(vin17));
}

/** Both model years (ascending) a position-10 character can mean, or [] if it is not a year code. */
export function vinModelYearCandidates(yearCode: string): number[] {
  const code = normaliseVinText(yearCode);
  const index = code.length === 1 ? MODEL_YEAR_CODES.indexOf(code) : -1;
  if (index < 0) return [];
  const first = FIRST_CYCLE_START_YEAR + index;
  return [first, first + CYCLE_YEARS];
}

function isRegionNorthAmerica(firstChar: string): boolean {
  return firstChar >= '1' && firstChar <= '5';
}

/**
 * Validate and decode a VIN (see the rules at the top of this file).
 *
 * Model year: North American VINs take the 1980-2009 candidate when position 7 is a digit and the
 * 2010-2039 candidate when it is a letter (`referenceYear` is not used). Other VINs take the latest
 * candidate not after `options.referenceYear` (default 2039, which picks the later candidate); if both
 * candidates are after it, `modelYear` is null and a warning says so. `modelYearCandidates` always lists both.
 */
export function parseVin(input: string, options: ParseVinOptions = {}): VinResult {
  const referenceYear = options.referenceYear ?? DEFAULT_REFERENCE_YEAR;
  if (!Number.isInteger(referenceYear)) {
    throw new RangeError(`referenceYear must be a whole year, got ${String(options.referenceYear)}`);
  }
  const vin = normaliseVinText(input);
  const chars = splitCharacters(vin);
  if (chars.length !== VIN_LENGTH) {
    const message =
      chars.length === 0
        ? `VIN is empty; a VIN has ${VIN_LENGTH} characters`
        : `VIN must have ${VIN_LENGTH} characters; this one has ${chars.length}`;
    return { ok: false, code: 'length', message };
  }
  const bad = describeBadCharacters(chars);
  if (bad !== null) return { ok: false, code: 'characters', message: bad };

  const firstChar = chars[0] ?? '';
  const region: VinRegion = isRegionNorthAmerica(firstChar) ? 'north_america' : 'other';
  const required = region === 'north_america';
  const expected = checkDigitFromSum(weightedSum(chars));
  const actual = chars[CHECK_DIGIT_INDEX] ?? '';
  const valid = expected === actual;
  const actualIsCheckDigitChar = /^[0-9X]$/.test(actual);
  const warnings: string[] = [];

  if (!valid) {
    if (required) {
      const message = actualIsCheckDigitChar
        ? `Check digit is ${actual} but the VIN's other characters give ${expected} (49 CFR Part 565)`
        : `Position 9 is ${actual} but must be the check digit (0-9 or X); the VIN's other characters give ${expected} (49 CFR Part 565)`;
      return { ok: false, code: 'check_digit', message };
    }
    warnings.push(
      actualIsCheckDigitChar
        ? `Check digit is ${actual} but the VIN's other characters give ${expected} (49 CFR Part 565); outside North America a check digit is optional, so this is only a warning`
        : `Position 9 is ${actual}, so this VIN carries no check digit (49 CFR Part 565 would give ${expected}); outside North America a check digit is optional`,
    );
  }

  const yearCode = chars[9] ?? '';
  const modelYearCandidates = vinModelYearCandidates(yearCode);
  let modelYear: number | null = null;
  const [earlier, later] = modelYearCandidates;
  if (earlier !== undefined && later !== undefined) {
    if (required) {
      const position7 = chars[6] ?? '';
      modelYear = position7 >= '0' && position7 <= '9' ? earlier : later;
    } else {
      const fitting = modelYearCandidates.filter((year) => year <= referenceYear);
      modelYear = fitting.length > 0 ? Math.max(...fitting) : null;
      if (modelYear === null) {
        warnings.push(
          `Model year code ${yearCode} means ${earlier} or ${later}, both after the reference year ${referenceYear}`,
        );
      }
    }
  } else if (required) {
    warnings.push(`Position 10 is ${yearCode}, which is not a model-year code (0, U and Z are not used)`);
  }

  return {
    ok: true,
    vin,
    checkDigit: { expected, actual, valid, required },
    region,
    wmi: vin.slice(0, 3),
    modelYear,
    modelYearCandidates,
    warnings,
  };
}
