/**
 * Field-by-field comparison for editing a versioned record without losing anyone's work. A form keeps the
 * record it started from (`base`); when the saved record moves on (`theirs`, from a 409 or from the person's
 * own other actions), each field is either untouched by both, changed by one side only, or changed by both to
 * different values (a conflict). Pure, so that the form and its tests share the same rules.
 */

/** One comparable value (text, number, flag, null, or a list/object such as the parts list). */
export type FieldValue = unknown;

/** Equality of field values: null and undefined are the same; arrays and objects compare by content. */
export function sameValue(a: FieldValue, b: FieldValue): boolean {
  return canonical(a) === canonical(b);
}

function canonical(v: FieldValue): string {
  if (v === undefined || v === null) return 'null';
  if (Array.isArray(v)) return `[${v.map(canonical).join(',')}]`;
  if (typeof v === 'object') {
    const o = v as Record<string, unknown>;
    return `{${Object.keys(o)
      .filter((k) => o[k] !== undefined)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical(o[k])}`)
      .join(',')}}`;
  }
  return JSON.stringify(v);
}

/** The fields whose value in `mine` differs from `base` (what the person changed). */
export function changedFields<K extends string>(fields: readonly K[], base: Record<K, FieldValue>, mine: Record<K, FieldValue>): K[] {
  return fields.filter((f) => !sameValue(base[f], mine[f]));
}

/** A field that differs between the saved record and the person's form. */
export interface FieldDiff<K extends string> {
  field: K;
  base: FieldValue;
  mine: FieldValue;
  theirs: FieldValue;
  changedByMe: boolean;
  changedByThem: boolean;
  /** Both sides changed it, to different values. */
  conflict: boolean;
}

/**
 * The fields where `mine` and `theirs` now differ and at least one side changed it since `base`. Fields
 * only they changed are listed too, so that the person sees everything that moved under them.
 */
export function diffRecord<K extends string>(
  fields: readonly K[],
  base: Record<K, FieldValue>,
  mine: Record<K, FieldValue>,
  theirs: Record<K, FieldValue>,
): FieldDiff<K>[] {
  const out: FieldDiff<K>[] = [];
  for (const field of fields) {
    const changedByMe = !sameValue(base[field], mine[field]);
    const changedByThem = !sameValue(base[field], theirs[field]);
    if (!changedByMe && !changedByThem) continue;
    if (sameValue(mine[field], theirs[field])) continue;
    out.push({ field, base: base[field], mine: mine[field], theirs: theirs[field], changedByMe, changedByThem, conflict: changedByMe && changedByThem });
  }
  return out;
}

/** The result of moving a form onto a newer saved record. */
export interface Rebased<K extends string> {
  /** The form's values on top of the newer record: their changes taken where the person had not touched the field. */
  mine: Record<K, FieldValue>;
  /** Fields both sides changed to different values; the person must choose. */
  conflicts: K[];
}

/** Move the person's edits from `base` onto `theirs` (like a rebase): non-overlapping changes merge by themselves. */
export function rebase<K extends string>(
  fields: readonly K[],
  base: Record<K, FieldValue>,
  mine: Record<K, FieldValue>,
  theirs: Record<K, FieldValue>,
): Rebased<K> {
  const next = { ...mine };
  const conflicts: K[] = [];
  for (const f of fields) {
    if (sameValue(base[f], theirs[f])) continue;
    if (sameValue(base[f], mine[f])) next[f] = theirs[f];
    else if (!sameValue(mine[f], theirs[f])) conflicts.push(f);
  }
  return { mine: next, conflicts };
}

/** Which side to keep for each listed field. */
export type Choices<K extends string> = Partial<Record<K, 'mine' | 'theirs'>>;

/** The default choice per diff row: keep what the person changed, else take theirs. */
export function defaultChoices<K extends string>(diffs: readonly FieldDiff<K>[]): Choices<K> {
  const out: Choices<K> = {};
  for (const d of diffs) out[d.field] = d.changedByMe ? 'mine' : 'theirs';
  return out;
}

/** The values to re-apply: theirs everywhere, except the fields where the person chose their own value. */
export function resolve<K extends string>(
  fields: readonly K[],
  mine: Record<K, FieldValue>,
  theirs: Record<K, FieldValue>,
  choices: Choices<K>,
): Record<K, FieldValue> {
  const out = { ...theirs };
  for (const f of fields) if (choices[f] === 'mine') out[f] = mine[f];
  return out;
}
