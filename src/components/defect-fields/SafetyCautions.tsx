/** The safety cautions inside an island (the same text as SafetyCautions.astro). */
import { useId } from 'react';
import { CAUTION_HEADINGS, SAFETY_CAUTIONS } from './cautions';

/** The cautions box for the diagnosis or the closing step. */
export function SafetyCautions({ step = 'diagnosis' }: { step?: keyof typeof CAUTION_HEADINGS }) {
  const id = useId();
  return (
    <aside className="caution" aria-labelledby={id} data-testid="safety-cautions">
      <h3 id={id} className="mb-1.5 text-sm font-bold text-amber-800">
        {CAUTION_HEADINGS[step]}
      </h3>
      <ul className="list-disc space-y-1 pl-5">
        {SAFETY_CAUTIONS.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </aside>
  );
}
