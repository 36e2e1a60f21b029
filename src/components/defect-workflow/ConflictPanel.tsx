/**
 * Shown when someone else saved the defect while the person was editing: each field that moved, with the
 * value saved now ("theirs") beside the person's own ("yours") and a choice per field. Nothing is overwritten
 * until the person re-applies.
 */
import { useEffect, useId, useMemo, useRef, useState, type Ref } from 'react';
import { defaultChoices, type Choices, type FieldDiff } from '@/lib/defects/record-diff';
import type { DefectRecord } from '@/lib/contracts/defects';
import { formatInstant } from '@/components/defects/format';
import { FIELD_LABELS } from '@/components/defect-fields/labels';
import type { Conflict } from './use-versioned-form';

type Props<K extends string> = {
  conflict: Conflict<K>;
  /** A field's value in words. */
  display: (field: K, value: unknown) => string;
  onApply: (choices: Choices<K>) => void;
  onDiscard: () => void;
  busy?: boolean;
  timeZone: string | null;
  /** Scroll the panel into view and focus it when it appears (after the person pressed Save). */
  bringIntoView?: boolean;
  ref?: Ref<HTMLElement | null>;
};

/** Who last changed the record, from its audit trail. */
function lastChange(r: DefectRecord, timeZone: string | null): string {
  const a = r.audit[0];
  return a ? `${a.userName ?? a.who}, ${formatInstant(a.at, timeZone)}` : 'someone else';
}

/** The field-by-field conflict view. */
export function ConflictPanel<K extends string>({ conflict, display, onApply, onDiscard, busy, timeZone, bringIntoView, ref }: Props<K>) {
  const initial = useMemo(() => defaultChoices(conflict.diffs), [conflict]);
  const [choices, setChoices] = useState<Choices<K>>(initial);
  const name = (f: string) => FIELD_LABELS[f] ?? f;
  const titleId = useId();
  const own = useRef<HTMLElement | null>(null);
  // The Save button is at the bottom of a long form: the panel appears above the fold, so bring it to the
  // person (and their screen reader) instead of leaving them at a greyed-out button.
  useEffect(() => {
    if (!bringIntoView || !own.current) return;
    own.current.scrollIntoView({ block: 'start' });
    own.current.focus({ preventScroll: true });
  }, [bringIntoView, conflict]);
  const setRef = (el: HTMLElement | null) => {
    own.current = el;
    if (typeof ref === 'function') ref(el);
    else if (ref) (ref as { current: HTMLElement | null }).current = el;
  };
  return (
    <section
      ref={setRef}
      tabIndex={-1}
      role="alert"
      aria-labelledby={titleId}
      data-testid="conflict-panel"
      className="scroll-mt-4 rounded-md border border-amber-600 bg-amber-50 p-3 text-sm text-ink-800 outline-none focus-visible:ring-2 focus-visible:ring-amber-600"
    >
      <h3 id={titleId} className="font-bold text-amber-800">
        {conflict.kind === 'stale' ? 'Not saved: this defect was changed while you were editing' : 'This defect was changed while you were editing'}
      </h3>
      <p className="mt-1 text-ink-700">
        Last change by {lastChange(conflict.record, timeZone)}. {conflict.diffs.length === 0 ? 'None of the fields here differ; save again to keep yours.' : 'Choose, field by field, what to keep; nothing is overwritten until you re-apply.'}
      </p>
      {conflict.diffs.length > 0 && (
        <div className="table-wrap mt-2 rounded border border-amber-100 bg-white">
          <table className="data-table">
            <caption className="sr-only">Changes: saved now against yours</caption>
            <thead>
              <tr>
                <th scope="col">Field</th>
                <th scope="col">Saved now (theirs)</th>
                <th scope="col">Yours</th>
                <th scope="col">Keep</th>
              </tr>
            </thead>
            <tbody>
              {conflict.diffs.map((d: FieldDiff<K>) => (
                <tr key={d.field} data-field={d.field}>
                  <th scope="row" className="!static !border-ink-100 !bg-white !text-sm !font-semibold !normal-case !tracking-normal text-ink-800">
                    {name(d.field)}
                    {d.conflict && <> <span className="badge-amber ml-1">both changed</span></>}
                  </th>
                  <td className={`wrap-anywhere ${d.changedByThem ? 'font-semibold' : 'text-ink-500'}`}>{display(d.field, d.theirs)}</td>
                  <td className={`wrap-anywhere ${d.changedByMe ? 'font-semibold' : 'text-ink-500'}`}>{display(d.field, d.mine)}</td>
                  <td>
                    <fieldset className="flex flex-wrap gap-x-3">
                      <legend className="sr-only">Keep for {name(d.field)}</legend>
                      {(['theirs', 'mine'] as const).map((side) => (
                        <label key={side} className="flex min-h-10 items-center gap-1.5">
                          <input
                            type="radio"
                            name={`keep-${d.field}`}
                            className="h-4 w-4 accent-estuary-700"
                            checked={choices[d.field] === side}
                            onChange={() => setChoices((c) => ({ ...c, [d.field]: side }))}
                          />
                          {side === 'theirs' ? 'Theirs' : 'Yours'}
                        </label>
                      ))}
                    </fieldset>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <div className="mt-3 flex flex-wrap gap-2">
        <button type="button" className="btn-primary" disabled={busy} onClick={() => onApply(choices)}>
          {busy ? 'Saving…' : 'Re-apply my choices'}
        </button>
        <button type="button" className="btn-secondary" disabled={busy} onClick={onDiscard}>
          Discard my changes
        </button>
      </div>
    </section>
  );
}
