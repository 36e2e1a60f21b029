/**
 * Diagnostic trouble codes of SAE J2012 / ISO 15031-6 form, with the optional failure-type byte (FTB).
 *
 * Rules (REFERENCES.md section 7; CONTRACT.md "Imports", column `dtcs`):
 * - Text form: a system letter P, C, B or U; a digit 0-3; three hex digits 0-9/A-F (`B1234`); optionally
 *   "-" and the FTB as two hex digits (`B1234-13`). Input is trimmed and upper-cased first.
 * - 2-byte form: bits 15-14 system (00 P, 01 C, 10 B, 11 U), bits 13-12 the second character, bits 11-0 the
 *   three hex characters (B1234 = 0x9234). 0x0000 decodes to P0000, which by convention means "no DTC".
 * - 3-byte form (ISO 14229-1, DTCFormatIdentifier 0x04 = SAE_J2012-DA_DTCFormat_04): the 2-byte DTC as high and
 *   middle byte, the FTB as low byte (B1234-13 = 0x923413).
 * - FTB: the high nibble is the category (0 General ... 9 Component); the sub-types listed in REFERENCES.md
 *   section 7 have a plain-English meaning, others have none (null).
 * - Scope (generic = defined by SAE, manufacturer = defined by the vehicle maker), from memory (c) of the SAE J2012
 *   convention: P0, P2 generic; P1 manufacturer; P3 mixed, resolved per code: P30-P33 manufacturer, P34-P3F
 *   generic (c); B0, C0, U0 generic; B1, B2, C1, C2, U1, U2 manufacturer; B3, C3, U3 are SAE-reserved and
 *   treated as generic (c).
 */

/** System named by the first character of a DTC. */
export type DtcSystem = 'powertrain' | 'chassis' | 'body' | 'network';
/** First character of a DTC. */
export type DtcSystemLetter = 'P' | 'C' | 'B' | 'U';
/** Who defines the code: SAE (generic), the vehicle maker (manufacturer), or split by the third character (mixed). */
export type DtcScope = 'generic' | 'manufacturer' | 'mixed';

/** A parsed DTC. */
export interface DtcOk {
  ok: true;
  /** Five-character code, upper case (`B1234`). */
  code: string;
  /** Failure-type byte as two upper-case hex digits, or null when none was given. */
  failureType: string | null;
  /** `B1234-13`, or `B1234` without a failure type. */
  display: string;
  system: DtcSystem;
  systemLetter: DtcSystemLetter;
  /** 'generic' or 'manufacturer' (P3 codes are resolved by their third character, so never 'mixed'). */
  scope: DtcScope;
  /** 2-byte SAE J2012 form, 0x0000-0xFFFF. */
  twoByte: number;
  /** 3-byte UDS form (DTCFormatIdentifier 0x04), or null when there is no failure type. */
  threeByte: number | null;
  /** FTB category by high nibble (e.g. "General Electrical"), or null when there is no failure type. */
  failureTypeCategory: string | null;
  /** Plain-English FTB meaning (e.g. "circuit open"), or null when unknown or absent. */
  failureTypeMeaning: string | null;
}

/** A rejected DTC with a plain-English message. */
export interface DtcError {
  ok: false;
  message: string;
}

/** Result of `parseDtc`. */
export type DtcParseResult = DtcOk | DtcError;

/** Result of `parseDtcList`: either every code parsed, or the bad tokens with one message. */
export type DtcListResult = { ok: true; codes: DtcOk[] } | { ok: false; message: string; bad: string[] };

/** Thrown by the encode/decode functions on input that is not a DTC. */
export class DtcFormatError extends Error {
  override name = 'DtcFormatError';
}

/** DTCFormatIdentifier of the 3-byte form with a failure-type byte (ISO 14229-1: SAE_J2012-DA_DTCFormat_04). */
export const DTC_FORMAT_IDENTIFIER_J2012_DA_04 = 0x04;

const SYSTEM_LETTERS: readonly DtcSystemLetter[] = ['P', 'C', 'B', 'U'];
const SYSTEM_BY_LETTER: Readonly<Record<DtcSystemLetter, DtcSystem>> = {
  P: 'powertrain',
  C: 'chassis',
  B: 'body',
  U: 'network',
};
const SYSTEM_LABEL: Readonly<Record<DtcSystem, string>> = {
  powertrain: 'Powertrain',
  chassis: 'Chassis',
  body: 'Body',
  network: 'Network',
};

/** FTB categories by high nibble (REFERENCES.md section 7: 0-7 (a, secondary), 8-9 (a, secondary)). */
export const FAILURE_TYPE_CATEGORIES: Readonly<Record<number, string>> = Object.freeze({
  0x0: 'General',
  0x1: 'General Electrical',
  0x2: 'General Signal',
  0x3: 'FM/PWM',
  0x4: 'System Internal',
  0x5: 'System Programming',
  0x6: 'Algorithm-Based',
  0x7: 'Mechanical',
  0x8: 'Bus Signal/Message',
  0x9: 'Component',
  // From memory (c) of SAE J2012-DA: A-E are reserved, F is left to the manufacturer.
  0xa: 'Reserved',
  0xb: 'Reserved',
  0xc: 'Reserved',
  0xd: 'Reserved',
  0xe: 'Reserved',
  0xf: 'Manufacturer-specific',
});

/** Plain-English meanings of the FTB sub-types listed in REFERENCES.md section 7 (a, secondary unless marked). */
export const FAILURE_TYPE_MEANINGS: Readonly<Record<number, string>> = Object.freeze({
  0x00: 'no sub-type information',
  0x11: 'circuit short to ground',
  0x12: 'circuit short to battery',
  0x13: 'circuit open',
  0x14: 'circuit short to ground or open',
  0x15: 'circuit short to battery or open',
  0x16: 'circuit voltage below threshold',
  0x17: 'circuit voltage above threshold',
  0x1f: 'circuit intermittent',
  0x29: 'signal invalid',
  0x4b: 'over temperature',
  0x71: 'actuator stuck', // (c) from memory
  0x87: 'missing message', // (c) from memory
  0x96: 'component internal failure', // (c) from memory
});

const HEX_DIGIT = /^[0-9A-F]$/;

function isSystemLetter(char: string): char is DtcSystemLetter {
  return (SYSTEM_LETTERS as readonly string[]).includes(char);
}

/**
 * Scope of a DTC group by its first two characters; 'mixed' for P3, whose scope depends on the third character.
 * From memory (c) of the SAE J2012 convention (see the top of this file).
 */
export function scopeOfDtcGroup(systemLetter: DtcSystemLetter, secondDigit: number): DtcScope {
  if (systemLetter === 'P') {
    if (secondDigit === 1) return 'manufacturer';
    if (secondDigit === 3) return 'mixed'; // (c) P30-P33 manufacturer, P34-P3F generic
    return 'generic'; // P0, P2
  }
  // B, C, U: 0 generic; 1, 2 manufacturer; 3 SAE-reserved, treated as generic (c)
  return secondDigit === 1 || secondDigit === 2 ? 'manufacturer' : 'generic';
}

function scopeOfCode(systemLetter: DtcSystemLetter, secondDigit: number, thirdHex: number): DtcScope {
  const group = scopeOfDtcGroup(systemLetter, secondDigit);
  if (group !== 'mixed') return group;
  return thirdHex <= 3 ? 'manufacturer' : 'generic'; // (c) from memory
}

function notACode(text: string, reason: string): DtcError {
  return { ok: false, message: `"${text}" is not a fault code: ${reason}` };
}

function toHex(value: number, digits: number): string {
  return value.toString(16).toUpperCase().padStart(digits, '0');
}

/** FTB category for a byte 0-255 (by its high nibble). */
function categoryOf(failureTypeByte: number): string | null {
  return FAILURE_TYPE_CATEGORIES[failureTypeByte >> 4] ?? null;
}

/** Parse one DTC such as `B1234` or `b1234-13` (surrounding spaces allowed). */
export function parseDtc(text: string): DtcParseResult {
  const shown = text.trim();
  const upper = shown.toUpperCase();
  if (upper === '') return { ok: false, message: 'Empty fault code; a fault code looks like B1234 or B1234-13' };
  const dash = upper.indexOf('-');
  const base = dash < 0 ? upper : upper.slice(0, dash);
  const ftbText = dash < 0 ? null : upper.slice(dash + 1);

  if (base.length !== 5) {
    return notACode(shown, 'a fault code has five characters (such as B1234), optionally followed by a failure type (B1234-13)');
  }
  const letter = base[0] ?? '';
  if (!isSystemLetter(letter)) return notACode(shown, 'the first character must be P, C, B or U');
  const second = base[1] ?? '';
  if (!/^[0-3]$/.test(second)) return notACode(shown, 'the second character must be 0, 1, 2 or 3');
  const lastThree = base.slice(2);
  if (![...lastThree].every((c) => HEX_DIGIT.test(c))) {
    return notACode(shown, 'the last three characters must be hex digits (0-9, A-F)');
  }
  if (ftbText !== null && !/^[0-9A-F]{2}$/.test(ftbText)) {
    return notACode(shown, 'the failure type after "-" must be two hex digits (0-9, A-F), such as B1234-13');
  }

  const secondDigit = Number(second);
  const twoByte = (SYSTEM_LETTERS.indexOf(letter) << 14) | (secondDigit << 12) | Number.parseInt(lastThree, 16);
  const failureByte = ftbText === null ? null : Number.parseInt(ftbText, 16);
  return {
    ok: true,
    code: base,
    failureType: ftbText,
    display: ftbText === null ? base : `${base}-${ftbText}`,
    system: SYSTEM_BY_LETTER[letter],
    systemLetter: letter,
    scope: scopeOfCode(letter, secondDigit, Number.parseInt(lastThree[0] ?? '0', 16)),
    twoByte,
    threeByte: failureByte === null ? null : twoByte * 256 + failureByte,
    failureTypeCategory: failureByte === null ? null : categoryOf(failureByte),
    failureTypeMeaning: failureByte === null ? null : (FAILURE_TYPE_MEANINGS[failureByte] ?? null),
  };
}

function requireBareCode(code: string, caller: string): DtcOk {
  const parsed = parseDtc(code);
  if (!parsed.ok) throw new DtcFormatError(parsed.message);
  if (parsed.failureType !== null) {
    throw new DtcFormatError(`${caller} takes a five-character code such as B1234, not "${code.trim()}"`);
  }
  return parsed;
}

function requireInteger(n: number, max: number, what: string): void {
  if (!Number.isInteger(n) || n < 0 || n > max) {
    throw new DtcFormatError(`${what} must be a whole number from 0 to 0x${toHex(max, 2)}, got ${String(n)}`);
  }
}

/**
 * 2-byte SAE J2012 value of a five-character code (`B1234` -> 0x9234).
 * @throws DtcFormatError when the code is not valid or carries a failure type
 */
export function encodeDtc(code: string): number {
  return requireBareCode(code, 'encodeDtc').twoByte;
}

/**
 * Five-character code of a 2-byte value (0x9234 -> `B1234`; 0x0000 -> `P0000`, conventionally "no DTC").
 * @throws DtcFormatError unless n is an integer 0-0xFFFF
 */
export function decodeDtc(n: number): string {
  requireInteger(n, 0xffff, 'A 2-byte DTC');
  const letter = SYSTEM_LETTERS[n >> 14] ?? 'P';
  return `${letter}${(n >> 12) & 0x3}${toHex(n & 0xfff, 3)}`;
}

/**
 * 3-byte UDS value (DTCFormatIdentifier 0x04) of a code and failure-type byte (`B1234`, 0x13 -> 0x923413).
 * @param failureType the FTB as a number 0-255 or as two hex digits ("13")
 * @throws DtcFormatError when the code or failure type is not valid
 */
export function encodeDtc3(code: string, failureType: number | string): number {
  const twoByte = requireBareCode(code, 'encodeDtc3').twoByte;
  let failureByte: number;
  if (typeof failureType === 'string') {
    const ftb = failureType.trim().toUpperCase();
    if (!/^[0-9A-F]{2}$/.test(ftb)) {
      throw new DtcFormatError(`The failure type must be two hex digits (0-9, A-F), got "${failureType}"`);
    }
    failureByte = Number.parseInt(ftb, 16);
  } else {
    requireInteger(failureType, 0xff, 'A failure-type byte');
    failureByte = failureType;
  }
  return twoByte * 256 + failureByte;
}

/**
 * Display form (`B1234-13`) of a 3-byte UDS value with DTCFormatIdentifier 0x04.
 * @throws DtcFormatError unless n is an integer 0-0xFFFFFF
 */
export function decodeDtc3(n: number): string {
  requireInteger(n, 0xffffff, 'A 3-byte DTC');
  return `${decodeDtc(Math.floor(n / 256))}-${toHex(n % 256, 2)}`;
}

/**
 * Parse a `dtcs` cell: codes separated by spaces (commas, semicolons and runs of whitespace tolerated).
 * Empty text gives an empty list; duplicates (same display form) are collapsed, first occurrence kept.
 */
export function parseDtcList(text: string): DtcListResult {
  const tokens = text.split(/[\s,;]+/).filter((t) => t !== '');
  const codes: DtcOk[] = [];
  const seen = new Set<string>();
  const bad: string[] = [];
  const messages: string[] = [];
  for (const token of tokens) {
    const parsed = parseDtc(token);
    if (!parsed.ok) {
      if (!bad.includes(token)) {
        bad.push(token);
        messages.push(parsed.message);
      }
      continue;
    }
    if (seen.has(parsed.display)) continue;
    seen.add(parsed.display);
    codes.push(parsed);
  }
  if (bad.length > 0) return { ok: false, message: messages.join('; '), bad };
  return { ok: true, codes };
}

/** Short description, e.g. "Body, manufacturer-specific · failure type 13: circuit open (General Electrical)". */
export function describeDtc(parsed: DtcOk): string {
  const scope = parsed.scope === 'manufacturer' ? 'manufacturer-specific' : parsed.scope;
  const head = `${SYSTEM_LABEL[parsed.system]}, ${scope}`;
  if (parsed.failureType === null) return head;
  const meaning = parsed.failureTypeMeaning === null ? '' : `: ${parsed.failureTypeMeaning}`;
  const category = parsed.failureTypeCategory === null ? '' : ` (${parsed.failureTypeCategory})`;
  return `${head} · failure type ${parsed.failureType}${meaning}${category}`;
}
