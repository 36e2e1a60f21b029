/**
 * Small form parts shared by the Depots, Modules and People forms: a labelled field with hint and error, a
 * 40 px checkbox row, the form-level error box, and mapping of the API's 422 issues onto form fields.
 */
import type { InputHTMLAttributes, ReactNode } from 'react';
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError } from '@/lib/client/api-client';

type FieldProps = {
  id: string;
  label: string;
  error?: string | undefined;
  hint?: ReactNode;
  required?: boolean;
  className?: string;
  children: ReactNode;
};

/** A label, the control, then a hint or the error under it. */
export function FormField({ id, label, error, hint, required, className, children }: FieldProps) {
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
      {error ? (
        <p id={`${id}-error`} className="mt-1 text-xs font-semibold text-brick-700">
          {error}
        </p>
      ) : hint ? (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-500">
          {hint}
        </p>
      ) : null}
    </div>
  );
}

/** aria attributes for a control inside FormField. */
export function fieldAria(id: string, error: string | undefined, hasHint = false) {
  return {
    id,
    'aria-invalid': error ? (true as const) : undefined,
    'aria-describedby': error ? `${id}-error` : hasHint ? `${id}-hint` : undefined,
  };
}

/** A checkbox with its label, tall enough to tap. */
export function CheckRow({ children, hint, ...input }: InputHTMLAttributes<HTMLInputElement> & { hint?: ReactNode }) {
  return (
    <label className={`flex min-h-10 items-start gap-2.5 py-2 text-[15px] ${input.disabled ? 'text-ink-400' : 'text-ink-800'}`}>
      <input type="checkbox" className="mt-0.5 h-5 w-5 shrink-0 accent-estuary-700" {...input} />
      <span>
        {children}
        {hint && <span className="block text-xs text-ink-500">{hint}</span>}
      </span>
    </label>
  );
}

/** The form-level error box (for what does not belong to one field). */
export function FormError({ message }: { message: string | null }) {
  if (!message) return null;
  return (
    <div role="alert" className="rounded-md border border-brick-100 bg-brick-50 px-3 py-2 text-sm text-brick-700">
      {message}
    </div>
  );
}

const camel = (s: string) => s.replace(/_([a-z])/g, (_, c: string) => c.toUpperCase());

/**
 * Put an API error's issues on the matching form fields (issue paths may be snake_case column names);
 * returns the message for the form-level box, or null when every issue found its field.
 */
export function applyServerIssues<T extends FieldValues>(
  err: unknown,
  setError: UseFormSetError<T>,
  fields: readonly string[],
  options: { conflictField?: string } = {},
): string | null {
  if (!(err instanceof ApiError)) return err instanceof Error ? err.message : 'Saving did not work; try again.';
  if (err.status === 409 && options.conflictField && fields.includes(options.conflictField)) {
    setError(options.conflictField as Path<T>, { type: 'server', message: err.message });
    return null;
  }
  let unplaced = err.issues.length === 0;
  const seen = new Set<string>();
  for (const issue of err.issues) {
    const key = issue.path ? camel(issue.path.split('.')[0] ?? '') : '';
    if (key && fields.includes(key)) {
      if (!seen.has(key)) setError(key as Path<T>, { type: 'server', message: issue.message });
      seen.add(key);
    } else unplaced = true;
  }
  return unplaced ? err.message : null;
}
