/**
 * Fault codes typed as text ("B1A21-29 B1A22") with live SAE J2012 validation and decoding under the field,
 * using the same pure decoder as the server (src/lib/dtc/dtc.ts via src/lib/defects/dtc-entry.ts), so the
 * person sees at once what each code means, which one is mistyped (said here once, not again under the
 * field), and which one was typed twice (the record keeps each code once).
 */
import { useMemo } from 'react';
import { dtcWords, readTypedCodes } from '@/lib/defects/dtc-entry';

/** The decoded list for the text typed so far (one row per token). */
export function DtcDecoded({ text, id }: { text: string; id?: string }) {
  const rows = useMemo(() => readTypedCodes(text), [text]);
  if (rows.length === 0) return null;
  return (
    <ul id={id} className="mt-2 space-y-1 text-sm" aria-live="polite" aria-label="Fault codes decoded">
      {rows.map((r, i) => {
        if (r.kind === 'bad') {
          return (
            <li key={`${r.token}-${i}`} className="font-semibold wrap-anywhere text-brick-700">
              {r.message}
            </li>
          );
        }
        if (r.kind === 'duplicate') {
          return (
            <li key={`${r.token}-${i}`} className="flex flex-wrap items-baseline gap-x-2 text-amber-800">
              <span className="mono font-semibold">{r.display}</span>
              <span>typed twice: it is kept once.</span>
            </li>
          );
        }
        const w = dtcWords(r.code);
        return (
          <li key={`${r.token}-${i}`} className="flex flex-wrap items-baseline gap-x-2">
            <span className="mono font-semibold text-ink-900">{r.code.display}</span>
            <span className="text-ink-700">
              {w.system}, {w.definedBy}
              {w.failure && <span className="text-ink-600"> · {w.failure}</span>}
            </span>
          </li>
        );
      })}
    </ul>
  );
}
