import { describe, it, expect } from 'vitest';
import {
  DTC_FORMAT_IDENTIFIER_J2012_DA_04,
  DtcFormatError,
  FAILURE_TYPE_CATEGORIES,
  FAILURE_TYPE_MEANINGS,
  decodeDtc,
  decodeDtc3,
  describeDtc,
  encodeDtc,
  encodeDtc3,
  parseDtc,
  parseDtcList,
  scopeOfDtcGroup,
  type DtcOk,
  type DtcParseResult,
} from './dtc';

function expectOk(result: DtcParseResult): DtcOk {
  if (!result.ok) throw new Error(`expected ok, got: ${result.message}`);
  return result;
}

// REFERENCES.md section 7, encode/decode check values, computed independently (b).
const TWO_BYTE: ReadonlyArray<readonly [string, number]> = [
  ['B1234', 0x9234],
  ['P0300', 0x0300],
  ['U0100', 0xc100],
  ['C0035', 0x4035],
  ['P0127', 0x0127],
  ['B0039', 0x8039],
  ['C0031', 0x4031],
  ['P0A80', 0x0a80],
  ['B1A2F', 0x9a2f],
  ['P0143', 0x0143],
];

// REFERENCES.md section 7, 3-byte check values (b); 803910, 403123, 012700 also quoted from ISO 14229-1 Annex D articles (a, secondary).
const THREE_BYTE: ReadonlyArray<readonly [string, string, number]> = [
  ['B0039', '10', 0x803910],
  ['C0031', '23', 0x403123],
  ['B1234', '13', 0x923413],
  ['P0127', '00', 0x012700],
  ['U0100', '87', 0xc10087],
];

describe('encodeDtc / decodeDtc (2-byte)', () => {
  it.each(TWO_BYTE)('%s <-> %d', (code, value) => {
    // REFERENCES.md section 7, encode/decode check values (b)
    expect(encodeDtc(code)).toBe(value);
    expect(decodeDtc(value)).toBe(code);
  });

  it('decodes bytes $92 $34 to B1234', () => {
    // REFERENCES.md section 7: vehicle-network tool documentation, "$92 $34 decode to B1234" (a)
    expect(decodeDtc(0x92 * 256 + 0x34)).toBe('B1234');
  });

  it('decodes the extremes', () => {
    // REFERENCES.md section 7: 0xFFFF -> U3FFF, 0x0000 -> P0000 ("no DTC" by convention) (b)
    expect(decodeDtc(0xffff)).toBe('U3FFF');
    expect(decodeDtc(0x0000)).toBe('P0000');
    expect(encodeDtc('U3FFF')).toBe(0xffff);
    expect(encodeDtc('p0000')).toBe(0);
  });

  it('puts the system in bits 15-14 and the second character in bits 13-12', () => {
    // REFERENCES.md section 7: 00 = P, 01 = C, 10 = B, 11 = U (a)
    expect(decodeDtc(0b00 << 14)).toBe('P0000');
    expect(decodeDtc(0b01 << 14)).toBe('C0000');
    expect(decodeDtc(0b10 << 14)).toBe('B0000');
    expect(decodeDtc(0b11 << 14)).toBe('U0000');
    expect(decodeDtc(0x3 << 12)).toBe('P3000');
  });

  it('accepts lower case and spaces, rejects failure types and bad codes', () => {
    expect(encodeDtc('  b1a2f ')).toBe(0x9a2f);
    expect(() => encodeDtc('B1234-13')).toThrow(DtcFormatError);
    expect(() => encodeDtc('B4123')).toThrow('"B4123" is not a fault code: the second character must be 0, 1, 2 or 3');
  });

  it('rejects values outside 0-0xFFFF', () => {
    for (const n of [-1, 0x10000, 1.5, Number.NaN]) expect(() => decodeDtc(n)).toThrow(DtcFormatError);
  });
});

describe('encodeDtc3 / decodeDtc3 (3-byte, DTCFormatIdentifier 0x04)', () => {
  it('uses format identifier 0x04', () => {
    // REFERENCES.md section 7: 0x04 = SAE_J2012-DA_DTCFormat_04 (a, secondary)
    expect(DTC_FORMAT_IDENTIFIER_J2012_DA_04).toBe(0x04);
  });

  it.each(THREE_BYTE)('%s-%s <-> %d', (code, ftb, value) => {
    // REFERENCES.md section 7, 3-byte check values (b)
    expect(encodeDtc3(code, ftb)).toBe(value);
    expect(encodeDtc3(code, Number.parseInt(ftb, 16))).toBe(value);
    expect(decodeDtc3(value)).toBe(`${code}-${ftb}`);
  });

  it('matches parseDtc().threeByte for the published values', () => {
    // REFERENCES.md section 7, 3-byte check values (b)
    for (const [code, ftb, value] of THREE_BYTE) expect(expectOk(parseDtc(`${code}-${ftb}`)).threeByte).toBe(value);
  });

  it('decodes the extremes', () => {
    // From 0xFFFF -> U3FFF and 0x0000 -> P0000 (REFERENCES.md section 7, (b)) with an FTB byte appended
    expect(decodeDtc3(0xffffff)).toBe('U3FFF-FF');
    expect(decodeDtc3(0)).toBe('P0000-00');
  });

  it('rejects bad failure types and values', () => {
    expect(() => encodeDtc3('B1234', 256)).toThrow(DtcFormatError);
    expect(() => encodeDtc3('B1234', -1)).toThrow(DtcFormatError);
    expect(() => encodeDtc3('B1234', '1G')).toThrow(DtcFormatError);
    expect(() => encodeDtc3('B1234', '123')).toThrow(DtcFormatError);
    expect(() => encodeDtc3('B1234-13', '13')).toThrow(DtcFormatError);
    expect(() => decodeDtc3(0x1000000)).toThrow(DtcFormatError);
    expect(() => decodeDtc3(-1)).toThrow(DtcFormatError);
  });
});

describe('parseDtc', () => {
  it('parses a code with a failure type', () => {
    // REFERENCES.md section 7: B1234 <-> 0x9234, B1234-13 <-> 0x923413 (b); 0x13 circuit open, 1x General Electrical (a, secondary)
    expect(parseDtc('B1234-13')).toEqual({
      ok: true,
      code: 'B1234',
      failureType: '13',
      display: 'B1234-13',
      system: 'body',
      systemLetter: 'B',
      scope: 'manufacturer',
      twoByte: 0x9234,
      threeByte: 0x923413,
      failureTypeCategory: 'General Electrical',
      failureTypeMeaning: 'circuit open',
    });
  });

  it('parses a bare code, lower case with spaces', () => {
    // REFERENCES.md section 7: P0300 <-> 0x0300 (b)
    expect(parseDtc('  p0300 ')).toEqual({
      ok: true,
      code: 'P0300',
      failureType: null,
      display: 'P0300',
      system: 'powertrain',
      systemLetter: 'P',
      scope: 'generic',
      twoByte: 0x0300,
      threeByte: null,
      failureTypeCategory: null,
      failureTypeMeaning: null,
    });
    expect(expectOk(parseDtc('b1a2f-1f')).display).toBe('B1A2F-1F');
  });

  it('names the system of each letter', () => {
    // REFERENCES.md section 7: "00 = P = Powertrain, 01 = C = Chassis, 10 = B = Body, 11 = U" (a)
    expect(expectOk(parseDtc('P0127')).system).toBe('powertrain');
    expect(expectOk(parseDtc('C0035')).system).toBe('chassis');
    expect(expectOk(parseDtc('B0039')).system).toBe('body');
    expect(expectOk(parseDtc('U0100')).system).toBe('network');
  });

  it('rejects malformed codes with a message saying why', () => {
    const cases: ReadonlyArray<readonly [string, string]> = [
      ['B4123', '"B4123" is not a fault code: the second character must be 0, 1, 2 or 3'],
      ['X1234', '"X1234" is not a fault code: the first character must be P, C, B or U'],
      [
        'B123',
        '"B123" is not a fault code: a fault code has five characters (such as B1234), optionally followed by a failure type (B1234-13)',
      ],
      [
        'B12345',
        '"B12345" is not a fault code: a fault code has five characters (such as B1234), optionally followed by a failure type (B1234-13)',
      ],
      ['B12G4', '"B12G4" is not a fault code: the last three characters must be hex digits (0-9, A-F)'],
      [
        'B1234-1G',
        '"B1234-1G" is not a fault code: the failure type after "-" must be two hex digits (0-9, A-F), such as B1234-13',
      ],
      [
        'B1234-123',
        '"B1234-123" is not a fault code: the failure type after "-" must be two hex digits (0-9, A-F), such as B1234-13',
      ],
      [
        'B1234-',
        '"B1234-" is not a fault code: the failure type after "-" must be two hex digits (0-9, A-F), such as B1234-13',
      ],
      [' b12g4 ', '"b12g4" is not a fault code: the last three characters must be hex digits (0-9, A-F)'],
    ];
    for (const [text, message] of cases) expect(parseDtc(text)).toEqual({ ok: false, message });
    expect(parseDtc('   ')).toEqual({ ok: false, message: 'Empty fault code; a fault code looks like B1234 or B1234-13' });
  });
});

describe('scope (SAE J2012 convention, from memory (c))', () => {
  it('classifies each group', () => {
    // From memory (c): P0, P2 generic; P1 manufacturer; P3 mixed; B/C/U 0 generic, 1-2 manufacturer, 3 reserved/generic
    expect(scopeOfDtcGroup('P', 0)).toBe('generic');
    expect(scopeOfDtcGroup('P', 1)).toBe('manufacturer');
    expect(scopeOfDtcGroup('P', 2)).toBe('generic');
    expect(scopeOfDtcGroup('P', 3)).toBe('mixed');
    for (const letter of ['B', 'C', 'U'] as const) {
      expect(scopeOfDtcGroup(letter, 0)).toBe('generic');
      expect(scopeOfDtcGroup(letter, 1)).toBe('manufacturer');
      expect(scopeOfDtcGroup(letter, 2)).toBe('manufacturer');
      expect(scopeOfDtcGroup(letter, 3)).toBe('generic');
    }
  });

  it('resolves P3 codes by their third character', () => {
    // From memory (c): P3000-P33FF manufacturer, P3400-P3FFF generic
    expect(expectOk(parseDtc('P3000')).scope).toBe('manufacturer');
    expect(expectOk(parseDtc('P33FF')).scope).toBe('manufacturer');
    expect(expectOk(parseDtc('P3400')).scope).toBe('generic');
    expect(expectOk(parseDtc('P3A00')).scope).toBe('generic');
  });

  it('gives the scope of parsed codes', () => {
    // From memory (c), as above
    expect(expectOk(parseDtc('P0A80')).scope).toBe('generic');
    expect(expectOk(parseDtc('P1234')).scope).toBe('manufacturer');
    expect(expectOk(parseDtc('P2000')).scope).toBe('generic');
    expect(expectOk(parseDtc('B2000')).scope).toBe('manufacturer');
    expect(expectOk(parseDtc('C1000')).scope).toBe('manufacturer');
    expect(expectOk(parseDtc('U0100')).scope).toBe('generic');
    expect(expectOk(parseDtc('U3000')).scope).toBe('generic');
  });
});

describe('failure-type byte', () => {
  it('names the category by high nibble', () => {
    // REFERENCES.md section 7: 0x-7x (a, secondary); 8x Bus Signal/Message, 9x Component (a, secondary)
    const expected: ReadonlyArray<readonly [string, string]> = [
      ['05', 'General'],
      ['1A', 'General Electrical'],
      ['23', 'General Signal'],
      ['31', 'FM/PWM'],
      ['4B', 'System Internal'],
      ['51', 'System Programming'],
      ['64', 'Algorithm-Based'],
      ['71', 'Mechanical'],
      ['87', 'Bus Signal/Message'],
      ['96', 'Component'],
    ];
    for (const [ftb, category] of expected) {
      expect(expectOk(parseDtc(`B1234-${ftb}`)).failureTypeCategory).toBe(category);
    }
    // From memory (c) of SAE J2012-DA: A-E reserved, F manufacturer-specific
    expect(expectOk(parseDtc('B1234-A0')).failureTypeCategory).toBe('Reserved');
    expect(expectOk(parseDtc('B1234-F0')).failureTypeCategory).toBe('Manufacturer-specific');
    expect(Object.keys(FAILURE_TYPE_CATEGORIES)).toHaveLength(16);
  });

  it('gives the meanings of the listed sub-types', () => {
    // REFERENCES.md section 7 FTB sub-types (a, secondary); 0x00 "no sub-type" from the 012700 = P0127 example (a, secondary)
    const expected: ReadonlyArray<readonly [string, string]> = [
      ['00', 'no sub-type information'],
      ['11', 'circuit short to ground'],
      ['12', 'circuit short to battery'],
      ['13', 'circuit open'],
      ['14', 'circuit short to ground or open'],
      ['15', 'circuit short to battery or open'],
      ['16', 'circuit voltage below threshold'],
      ['17', 'circuit voltage above threshold'],
      ['1F', 'circuit intermittent'],
      ['29', 'signal invalid'],
      ['4B', 'over temperature'],
      ['71', 'actuator stuck'], // (c) from memory
      ['87', 'missing message'], // (c) from memory
      ['96', 'component internal failure'], // (c) from memory
    ];
    for (const [ftb, meaning] of expected) {
      expect(expectOk(parseDtc(`C0031-${ftb}`)).failureTypeMeaning).toBe(meaning);
    }
    expect(Object.keys(FAILURE_TYPE_MEANINGS)).toHaveLength(expected.length);
  });

  it('has no meaning for unlisted sub-types', () => {
    const parsed = expectOk(parseDtc('C0031-23'));
    expect(parsed.failureTypeMeaning).toBeNull();
    // REFERENCES.md section 7: 2x General Signal (a, secondary)
    expect(parsed.failureTypeCategory).toBe('General Signal');
  });
});

describe('parseDtcList', () => {
  it('gives an empty list for empty or blank text', () => {
    expect(parseDtcList('')).toEqual({ ok: true, codes: [] });
    expect(parseDtcList('  , ')).toEqual({ ok: true, codes: [] });
  });

  it('splits on spaces, commas, semicolons and runs of whitespace', () => {
    const result = parseDtcList(' B1234-13  p0300,U0100 ;\tC0035 ');
    expect(result.ok).toBe(true);
    if (result.ok) expect(result.codes.map((c) => c.display)).toEqual(['B1234-13', 'P0300', 'U0100', 'C0035']);
  });

  it('collapses duplicates by display form, keeping the first', () => {
    const result = parseDtcList('B1234 b1234 B1234-13 B1234-13 P0300 B1234');
    expect(result.ok).toBe(true);
    if (result.ok) expect(result.codes.map((c) => c.display)).toEqual(['B1234', 'B1234-13', 'P0300']);
  });

  it('reports every bad token once with its message', () => {
    expect(parseDtcList('B1234 B12G4')).toEqual({
      ok: false,
      message: '"B12G4" is not a fault code: the last three characters must be hex digits (0-9, A-F)',
      bad: ['B12G4'],
    });
    expect(parseDtcList('X1234, B1234, B4123 X1234')).toEqual({
      ok: false,
      message:
        '"X1234" is not a fault code: the first character must be P, C, B or U; "B4123" is not a fault code: the second character must be 0, 1, 2 or 3',
      bad: ['X1234', 'B4123'],
    });
  });
});

describe('describeDtc', () => {
  it('describes system, scope and failure type', () => {
    // REFERENCES.md section 7: 0x13 circuit open, 1x General Electrical (a, secondary); scope from memory (c)
    expect(describeDtc(expectOk(parseDtc('B1234-13')))).toBe(
      'Body, manufacturer-specific · failure type 13: circuit open (General Electrical)',
    );
    expect(describeDtc(expectOk(parseDtc('P0300')))).toBe('Powertrain, generic');
    expect(describeDtc(expectOk(parseDtc('U0100-87')))).toBe(
      'Network, generic · failure type 87: missing message (Bus Signal/Message)',
    );
    // REFERENCES.md section 7: 2x General Signal (a, secondary); 0x23 has no listed meaning
    expect(describeDtc(expectOk(parseDtc('C1031-23')))).toBe('Chassis, manufacturer-specific · failure type 23 (General Signal)');
  });
});
