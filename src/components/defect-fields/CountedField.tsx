/**
 * A labelled text field with a live character count against its limit, for the defect forms' free texts
 * (symptom, action, notes): the person sees the limit while typing, not after pressing Report or Save.
 * Markup as FormField (src/components/ui/FormField.tsx): label, control, then the error or the hint, with the
 * count on the same line at the right.
 */
import type { ReactNode } from 'react';

type Props = {
  id: string;
  label: string;
  required?: boolean;
  error?: string | undefined;
  hint?: ReactNode;
  /** Characters typed so far. */
  length: number;
  max: number;
  className?: string;
  children: ReactNode;
};

/** Class of the defect forms' inputs: the shared look, plus a red border when the value is refused. */
export const INPUT = 'input aria-[invalid=true]:border-brick-600';

/** The field with its counter. */
export function CountedField({ id, label, required, error, hint, length, max, className, children }: Props) {
  const over = length > max;
  const near = !over && length >= max * 0.9;
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
        {required && (
          <span className="ml-0.5 text-brick-600" aria-hidden="true">
            *
          </span>
        )}
      </label>
      {children}
      <div className="mt-1 flex items-start justify-between gap-3 text-xs">
        {error ? (
          <p id={`${id}-error`} className="font-semibold text-brick-700">
            {error}
          </p>
        ) : hint ? (
          <p id={`${id}-hint`} className="text-ink-500">
            {hint}
          </p>
        ) : (
          <span />
        )}
        <span id={`${id}-count`} className={`shrink-0 tabular-nums ${over ? 'font-semibold text-brick-700' : near ? 'font-semibold text-amber-800' : 'text-ink-500'}`} aria-live={near || over ? 'polite' : 'off'}>
          {length.toLocaleString('en-GB')} / {max.toLocaleString('en-GB')}
          {over && ` · ${(length - max).toLocaleString('en-GB')} too many`}
        </span>
      </div>
    </div>
  );
}
