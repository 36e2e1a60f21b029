/**
 * Edit part of a versioned defect record without losing anyone's work. The form remembers the record it
 * started from (its base values and version). When the record in the shared cache moves on (the person's own
 * step in another island, or a 409 carrying the current record), edits rebase onto it by themselves where
 * they do not overlap; otherwise — and always after a 409 — the conflict is shown field by field, theirs
 * against yours, and the person chooses what to re-apply. Rules in src/lib/defects/record-diff.ts.
 */
import { useCallback, useEffect, useRef, useState } from 'react';
import type { FieldValues, UseFormReturn } from 'react-hook-form';
import type { DefectRecord } from '@/lib/contracts/defects';
import { changedFields, diffRecord, rebase, resolve, type Choices, type FieldDiff } from '@/lib/defects/record-diff';

/** A conflict to show: what changed on each side since the form's base. */
export type Conflict<K extends string> = {
  /** `stale`: the server refused a save (409); `moved`: the record changed under unsaved, overlapping edits. */
  kind: 'stale' | 'moved';
  diffs: FieldDiff<K>[];
  mine: Record<K, unknown>;
  theirs: Record<K, unknown>;
  record: DefectRecord;
};

type Options<V extends FieldValues, K extends keyof V & string> = {
  record: DefectRecord;
  fields: readonly K[];
  fromRecord: (r: DefectRecord) => V;
  form: UseFormReturn<V, unknown, any>;
};

/** The base-tracking, rebasing and conflict state of a versioned form. */
export function useVersionedForm<V extends FieldValues, K extends keyof V & string>({ record, fields, fromRecord, form }: Options<V, K>) {
  const base = useRef<{ values: V; version: number }>({ values: fromRecord(record), version: record.version });
  const [conflict, setConflict] = useState<Conflict<K> | null>(null);
  const conflictOpen = useRef(false);
  conflictOpen.current = conflict !== null;

  const mineNow = useCallback(() => form.getValues() as unknown as Record<K, unknown>, [form]);

  useEffect(() => {
    if (record.version === base.current.version || conflictOpen.current) return;
    const theirs = fromRecord(record) as unknown as Record<K, unknown>;
    const b = base.current.values as unknown as Record<K, unknown>;
    const mine = mineNow();
    const r = rebase(fields, b, mine, theirs);
    if (r.conflicts.length === 0) {
      base.current = { values: theirs as unknown as V, version: record.version };
      form.reset(r.mine as unknown as V);
    } else {
      setConflict({ kind: 'moved', diffs: diffRecord(fields, b, mine, theirs), mine, theirs, record });
    }
  }, [record, fields, fromRecord, form, mineNow]);

  /** Fields changed against the base (what a save sends). */
  const changed = useCallback((values: Record<K, unknown> = mineNow()) => changedFields(fields, base.current.values as unknown as Record<K, unknown>, values), [fields, mineNow]);

  /** The version the form's edits are based on. */
  const baseVersion = () => base.current.version;

  /** After a 409: show theirs against yours. */
  const onStale = (current: DefectRecord) => {
    const theirs = fromRecord(current) as unknown as Record<K, unknown>;
    const mine = mineNow();
    setConflict({ kind: 'stale', diffs: diffRecord(fields, base.current.values as unknown as Record<K, unknown>, mine, theirs), mine, theirs, record: current });
  };

  /** Take the chosen values on top of theirs; returns the values to save (the form shows them). */
  const apply = (choices: Choices<K>): Record<K, unknown> | null => {
    if (!conflict) return null;
    const values = resolve(fields, conflict.mine, conflict.theirs, choices);
    base.current = { values: conflict.theirs as unknown as V, version: conflict.record.version };
    form.reset(values as unknown as V);
    setConflict(null);
    return values;
  };

  /** Drop the person's edits and show the record as saved now. */
  const discard = () => {
    if (!conflict) return;
    base.current = { values: conflict.theirs as unknown as V, version: conflict.record.version };
    form.reset(conflict.theirs as unknown as V);
    setConflict(null);
  };

  /** After a successful save. */
  const saved = (r: DefectRecord) => {
    base.current = { values: fromRecord(r), version: r.version };
    form.reset(fromRecord(r));
  };

  /** Back to the record as saved (cancel editing). */
  const revert = () => form.reset(base.current.values);

  return { conflict, changed, baseVersion, onStale, apply, discard, saved, revert };
}
