// Decoding values come from the SAE J2012 rules of src/lib/dtc/dtc.ts (REFERENCES.md section 7).
import { describe, expect, it } from 'vitest';
import { parseDtc, type DtcOk } from '../dtc/dtc';
import { dtcWords, readTypedCodes } from './dtc-entry';

const ok = (t: string) => parseDtc(t) as DtcOk;

describe('readTypedCodes', () => {
  it('reads each token once: decoded, mistyped, or a repeat of an earlier code', () => {
    const rows = readTypedCodes('B1A21-29 X123 b1a22 U0140-00 b1a21-29');
    expect(rows.map((r) => [r.kind, r.token])).toEqual([
      ['ok', 'B1A21-29'],
      ['bad', 'X123'],
      ['ok', 'b1a22'],
      ['ok', 'U0140-00'],
      ['duplicate', 'b1a21-29'],
    ]);
    expect(rows[1]).toMatchObject({ message: '"X123" is not a fault code: a fault code has five characters (such as B1234), optionally followed by a failure type (B1234-13)' });
    expect(rows[4]).toMatchObject({ display: 'B1A21-29' });
  });
  it('treats the same code with another failure type as another code', () => {
    expect(readTypedCodes('B1A21-29, B1A21-13; B1A21').map((r) => r.kind)).toEqual(['ok', 'ok', 'ok']);
  });
  it('is empty for blank text', () => {
    expect(readTypedCodes('  ,; ')).toEqual([]);
  });
});

describe('dtcWords', () => {
  it('says the system, who defines the code and the failure type once each', () => {
    expect(dtcWords(ok('B1A21-29'))).toEqual({ system: 'Body', definedBy: "vehicle maker's own code", failure: 'Failure type 29: signal invalid (General Signal)' });
    expect(dtcWords(ok('U0140-00'))).toEqual({ system: 'Network (bus communication)', definedBy: 'generic code (SAE)', failure: 'Failure type 00: no sub-type information (General)' });
    expect(dtcWords(ok('B1A22'))).toEqual({ system: 'Body', definedBy: "vehicle maker's own code", failure: null });
    // 0x3A has a category (FM/PWM) but no general meaning.
    expect(dtcWords(ok('C0035-3A')).failure).toBe('Failure type 3A: no general meaning (FM/PWM)');
  });
});
