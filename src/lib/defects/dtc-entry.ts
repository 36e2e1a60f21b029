/**
 * Fault codes as a person types them on a defect form, read token by token with the SAE J2012 decoder of
 * src/lib/dtc/dtc.ts: each token is a decoded code, a mistyped one (with the decoder's message), or a repeat
 * of a code already typed (the record keeps each code once, as the import does, and the form says so
 * instead of merging silently). Also the words a code is shown with: its system, who defines it, and the
 * failure type, each said once.
 */
import { parseDtc, type DtcOk } from '../dtc/dtc';

/** Most tokens read (the field takes at most 400 characters anyway). */
export const MAX_TYPED_CODES = 40;

/** One typed token. */
export type TypedCode =
  | { kind: 'ok'; token: string; code: DtcOk }
  | { kind: 'bad'; token: string; message: string }
  | { kind: 'duplicate'; token: string; display: string };

/** Read typed fault codes (separated by spaces, commas or semicolons), in the order typed. */
export function readTypedCodes(text: string): TypedCode[] {
  const seen = new Set<string>();
  return text
    .split(/[\s,;]+/)
    .filter(Boolean)
    .slice(0, MAX_TYPED_CODES)
    .map((token): TypedCode => {
      const p = parseDtc(token);
      if (!p.ok) return { kind: 'bad', token, message: p.message };
      if (seen.has(p.display)) return { kind: 'duplicate', token, display: p.display };
      seen.add(p.display);
      return { kind: 'ok', token, code: p };
    });
}

const SYSTEM_WORDS: Record<DtcOk['system'], string> = { powertrain: 'Powertrain', chassis: 'Chassis', body: 'Body', network: 'Network (bus communication)' };

/** A decoded code in words: the system, who defines it, and the failure type when one was given. */
export function dtcWords(c: DtcOk): { system: string; definedBy: string; failure: string | null } {
  const definedBy = c.scope === 'manufacturer' ? "vehicle maker's own code" : 'generic code (SAE)';
  let failure: string | null = null;
  if (c.failureType !== null) {
    const meaning = c.failureTypeMeaning ?? 'no general meaning';
    failure = `Failure type ${c.failureType}: ${meaning}${c.failureTypeCategory ? ` (${c.failureTypeCategory})` : ''}`;
  }
  return { system: SYSTEM_WORDS[c.system], definedBy, failure };
}
