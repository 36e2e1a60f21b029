/**
 * Fault codes typed as text ("B1A21-29 B1A22") with live SAE J2012 validation and decoding under the field,
 * using the same pure decoder as the server (src/lib/dtc/dtc.ts), so the person sees at once what each code
 * means and which one is mistyped.
 */
import { useMemo } from 'react';
import { describeDtc, parseDtc } from '@/lib/dtc/dtc';

/** The decoded list for the text typed so far (one row per code). */
export function DtcDecoded({ text, id }: { text: string; id?: string }) {
  const rows = useMemo(
    () =>
      text
        .split(/[\s,;]+/)
        .filter(Boolean)
        .slice(0, 20)
        .map((token) => ({ token, parsed: parseDtc(token) })),
    [text],
  );
  if (rows.length === 0) return null;
  return (
    <ul id={id} className="mt-2 space-y-1 text-sm" aria-live="polite" aria-label="Fault codes decoded">
      {rows.map(({ token, parsed }, i) =>
        parsed.ok ? (
          <li key={`${token}-${i}`} className="flex flex-wrap items-baseline gap-x-2">
            <span className="mono font-semibold text-ink-900">{parsed.display}</span>
            <span className="text-ink-600">{describeDtc(parsed)}</span>
          </li>
        ) : (
          <li key={`${token}-${i}`} className="font-semibold text-brick-700">
            {parsed.message}
          </li>
        ),
      )}
    </ul>
  );
}
