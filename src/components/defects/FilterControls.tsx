/**
 * Small filter controls shared by the Vehicles and Defects lists: a debounced search box, a labelled
 * select, a group of toggle chips (multi-value, comma-joined in the URL), a checkbox toggle and the
 * page-size picker. Every control is at least 40 px tall for tablets.
 */
import { useEffect, useId, useRef, useState } from 'react';
import { Search, X } from 'lucide-react';

export const PAGE_SIZES = [25, 50, 100, 200] as const;
export const SEARCH_DEBOUNCE_MS = 250;

/** Search text that reports changes after the user pauses typing. */
export function SearchBox({ value, onChange, label, placeholder }: { value: string; onChange: (v: string) => void; label: string; placeholder: string }) {
  const id = useId();
  const [text, setText] = useState(value);
  const last = useRef(value);
  const report = useRef(onChange);
  report.current = onChange;
  // Follow outside changes (e.g. "Clear filters") without fighting the user's typing.
  useEffect(() => {
    if (value !== last.current) {
      last.current = value;
      setText(value);
    }
  }, [value]);
  useEffect(() => {
    const trimmed = text.trim();
    if (trimmed === last.current) return;
    const t = setTimeout(() => {
      last.current = trimmed;
      report.current(trimmed);
    }, SEARCH_DEBOUNCE_MS);
    return () => clearTimeout(t);
  }, [text]);
  return (
    <div className="min-w-[14rem] flex-[2_1_14rem]">
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <div className="relative">
        <Search aria-hidden="true" size={16} className="pointer-events-none absolute top-1/2 left-3 -translate-y-1/2 text-ink-400" />
        <input
          id={id}
          type="search"
          className="input pr-9 pl-9"
          placeholder={placeholder}
          value={text}
          onChange={(e) => setText(e.target.value)}
          autoComplete="off"
          spellCheck={false}
        />
        {text && (
          <button
            type="button"
            className="absolute top-0 right-0 flex h-10 w-10 items-center justify-center text-ink-400 hover:text-ink-700"
            aria-label="Clear search"
            onClick={() => {
              last.current = '';
              setText('');
              onChange('');
            }}
          >
            <X size={16} aria-hidden="true" />
          </button>
        )}
      </div>
    </div>
  );
}

/** A labelled select; the empty option means "any". */
export function SelectField({
  label,
  value,
  onChange,
  options,
  anyLabel = 'Any',
  className = 'min-w-[9rem] flex-[1_1_9rem]',
}: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  options: { value: string; label: string }[];
  anyLabel?: string;
  className?: string;
}) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select id={id} className="input pr-8" value={value} onChange={(e) => onChange(e.target.value)}>
        <option value="">{anyLabel}</option>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );
}

/** Parse a comma-joined URL value into a list. */
export function splitList(v: string | undefined): string[] {
  return v ? v.split(',').filter(Boolean) : [];
}

/** Toggle chips for a multi-value filter; `value` is comma-joined. */
export function ChipGroup({
  label,
  value,
  onChange,
  options,
  disabled,
  disabledTitle,
}: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  options: { value: string; label: string; title?: string }[];
  /** Values offered but not selectable in this view (shown greyed, with `disabledTitle`). */
  disabled?: readonly string[];
  disabledTitle?: string;
}) {
  const selected = new Set(splitList(value));
  const off = new Set(disabled ?? []);
  const toggle = (v: string) => {
    const next = new Set(selected);
    if (next.has(v)) next.delete(v);
    else next.add(v);
    // Keep the option order, so the URL (and the query key) does not depend on click order.
    onChange(
      options
        .filter((o) => next.has(o.value))
        .map((o) => o.value)
        .join(','),
    );
  };
  return (
    <fieldset className="min-w-0">
      <legend className="field-label">{label}</legend>
      <div className="flex flex-wrap gap-1.5">
        {options.map((o) => {
          const on = selected.has(o.value);
          return (
            <button
              key={o.value}
              type="button"
              aria-pressed={on}
              title={off.has(o.value) ? disabledTitle : o.title}
              disabled={off.has(o.value)}
              onClick={() => toggle(o.value)}
              className={[
                'min-h-10 rounded-md border px-3 text-sm font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-40',
                on ? 'border-estuary-600 bg-estuary-700 text-white' : 'border-ink-300 bg-white text-ink-700 hover:bg-ink-100',
              ].join(' ')}
            >
              {o.label}
            </button>
          );
        })}
      </div>
    </fieldset>
  );
}

/** A checkbox with a 40 px tap area (`disabled` with a `title` saying why). */
export function Toggle({
  label,
  checked,
  onChange,
  disabled = false,
  title,
}: {
  label: string;
  checked: boolean;
  onChange: (v: boolean) => void;
  disabled?: boolean;
  title?: string;
}) {
  return (
    <label
      title={title}
      className={`inline-flex min-h-10 items-center gap-2 rounded-md border border-ink-300 bg-white px-3 text-sm font-semibold text-ink-700 select-none ${disabled ? 'cursor-not-allowed opacity-60' : 'cursor-pointer hover:bg-ink-100'}`}
    >
      <input type="checkbox" className="h-4 w-4 accent-estuary-700" checked={checked} disabled={disabled} onChange={(e) => onChange(e.target.checked)} />
      {label}
    </label>
  );
}

/** Rows per page. */
export function PageSizeSelect({ value, onChange }: { value: number; onChange: (n: number) => void }) {
  const id = useId();
  return (
    <div className="flex items-center gap-2 text-sm">
      <label htmlFor={id} className="text-ink-600">
        Rows per page
      </label>
      <select id={id} className="input w-auto pr-8" value={value} onChange={(e) => onChange(Number(e.target.value))}>
        {PAGE_SIZES.map((n) => (
          <option key={n} value={n}>
            {n}
          </option>
        ))}
      </select>
    </div>
  );
}

/** The page size from the URL, limited to the offered sizes. */
export function pageSizeOf(v: string | undefined, fallback = 50): number {
  const n = Number(v);
  return (PAGE_SIZES as readonly number[]).includes(n) ? n : fallback;
}

/** The page number from the URL (1 when missing or not a positive whole number). */
export function pageOf(v: string | undefined): number {
  const n = Number(v);
  return Number.isInteger(n) && n >= 1 ? n : 1;
}
