/**
 * The diagnosis and repair record of a defect (island): moisture found, the condition of membrane, seal,
 * drain holes and connector, root cause, action, notes, parts and labour. Technicians fill it in on the
 * tablet while the defect is open; saving sends only the changed fields with the version they started from,
 * and a change made meanwhile by someone else is shown field by field instead of being overwritten (the
 * panel is brought into view and focused, and the Save button says why nothing was saved). Unsaved edits
 * are guarded against leaving the page, and a lifecycle step saves them first (../defect-fields/unsaved.ts).
 */
import { useCallback, useId, useRef, useState } from 'react';
import { QueryClientProvider, useQueryClient } from '@tanstack/react-query';
import { useFieldArray, useForm, useWatch, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Plus, Trash2 } from 'lucide-react';
import { useIslandQueryClient } from '@/components/defect-workflow/island-client';
import {
  CONDITION_FIELDS,
  CONDITION_VALUES,
  DiagnosisFormSchema,
  TEXT_LIMITS,
  moneyText,
  parseMoneyText,
  type DefectRecord,
  type DiagnosisFormOutput,
} from '@/lib/contracts/defects';
import { canEditRecord, type WorkflowRole } from '@/lib/defects/transitions';
import { labourCostMinor } from '@/lib/defects/cost';
import { MOISTURE_LABELS, ROOT_CAUSE_LABELS } from '@/components/labels';
import { MOISTURE_BADGE } from '@/components/defects/badges';
import { formatInstant, formatMinutes, formatMoneyMinor } from '@/components/defects/format';
import { fieldAria, FormError, FormField, applyServerIssues } from '@/components/ui/FormField';
import { SafetyCautions } from '@/components/defect-fields/SafetyCautions';
import { CONDITION_FIELD_LABELS, CONDITION_LABELS } from '@/components/defect-fields/labels';
import { defectKey, staleRecord, useDefect, useSaveDefect } from './queries';
import { useVersionedForm } from './use-versioned-form';
import { useHydrated } from '@/components/defect-fields/use-hydrated';
import { ConflictPanel } from './ConflictPanel';
import { CountedField, INPUT } from '@/components/defect-fields/CountedField';
import { useUnsavedChanges, type FlushResult } from '@/components/defect-fields/unsaved';

type PartRow = { partNumber: string; description: string; quantity: string; unitCost: string };
type Values = {
  moisture: string;
  membraneCondition: string;
  sealCondition: string;
  drainCondition: string;
  connectorCondition: string;
  rootCause: string;
  action: string;
  notes: string;
  labourMinutes: string;
  parts: PartRow[];
};
const FIELDS = ['moisture', ...CONDITION_FIELDS, 'rootCause', 'action', 'notes', 'labourMinutes', 'parts'] as const;
type Field = (typeof FIELDS)[number];

function fromRecord(r: DefectRecord): Values {
  return {
    moisture: r.moisture ?? '',
    membraneCondition: r.membraneCondition ?? '',
    sealCondition: r.sealCondition ?? '',
    drainCondition: r.drainCondition ?? '',
    connectorCondition: r.connectorCondition ?? '',
    rootCause: r.rootCause ?? '',
    action: r.action ?? '',
    notes: r.notes ?? '',
    labourMinutes: r.labourMinutes === null ? '' : String(r.labourMinutes),
    parts: r.parts.map((p) => ({ partNumber: p.partNumber, description: p.description ?? '', quantity: String(p.quantity), unitCost: moneyText(p.unitCostMinor) })),
  };
}

/** A field's form value in words (for the conflict view and the read-only view). */
function display(field: Field, v: unknown): string {
  if (field === 'parts') {
    const parts = (v as PartRow[]) ?? [];
    return parts.length ? parts.map((p) => `${p.partNumber || '?'} ×${p.quantity}${p.unitCost ? ` @ ${p.unitCost}` : ''}`).join('; ') : 'No parts';
  }
  const s = String(v ?? '');
  if (s === '') return '–';
  if (field === 'moisture') return MOISTURE_LABELS[s] ?? s;
  if (field === 'rootCause') return ROOT_CAUSE_LABELS[s] ?? s;
  if (field === 'labourMinutes') return /^\d+$/.test(s) ? formatMinutes(Number(s)) : s;
  if ((CONDITION_FIELDS as readonly string[]).includes(field)) return CONDITION_LABELS[field as (typeof CONDITION_FIELDS)[number]][s] ?? s;
  return s.length > 120 ? `${s.slice(0, 120)}…` : s;
}

type Props = { initial: DefectRecord; role: WorkflowRole; timeZone: string | null };

function Diagnosis({ initial, role, timeZone }: Props) {
  const { data: record } = useDefect(initial);
  const editable = canEditRecord(record.status, role);
  return (
    <section className="card card-pad" aria-labelledby="h-diagnosis" data-testid="diagnosis-card">
      <h2 id="h-diagnosis" className="mb-3">
        Diagnosis and repair
      </h2>
      <SafetyCautions step="diagnosis" />
      {editable && !record.open && (
        <p className="mt-3 rounded-md bg-ink-100 px-3 py-2 text-sm text-ink-700">
          This defect is {record.status}. You may still correct its record; every change is kept in the audit trail.
        </p>
      )}
      {editable ? <DiagnosisForm record={record} timeZone={timeZone} /> : <DiagnosisView record={record} />}
    </section>
  );
}

function DiagnosisView({ record }: { record: DefectRecord }) {
  const v = fromRecord(record);
  return (
    <>
      <dl className="dl-grid mt-4">
        <dt>Moisture found</dt>
        <dd>{record.moisture ? <span className={MOISTURE_BADGE[record.moisture]}>{MOISTURE_LABELS[record.moisture]}</span> : <span className="text-ink-500">Not recorded</span>}</dd>
        {CONDITION_FIELDS.map((f) => (
          <Row key={f} label={CONDITION_FIELD_LABELS[f]} value={display(f, v[f])} />
        ))}
        <Row label="Root cause" value={display('rootCause', v.rootCause)} />
        <Row label="Action" value={display('action', v.action)} />
        {record.notes && <Row label="Notes" value={record.notes} />}
        <Row label="Labour" value={display('labourMinutes', v.labourMinutes)} />
        <Row label="Cost" value={record.costMinor === null ? '–' : formatMoneyMinor(record.costMinor, record.currency)} />
      </dl>
      {record.parts.length > 0 && <PartsTable record={record} />}
    </>
  );
}

function Row({ label, value }: { label: string; value: string }) {
  return (
    <>
      <dt>{label}</dt>
      <dd className={value === '–' ? 'text-ink-500' : 'whitespace-pre-line wrap-anywhere'}>{value === '–' ? 'Not recorded' : value}</dd>
    </>
  );
}

function PartsTable({ record }: { record: DefectRecord }) {
  return (
    <div className="table-wrap mt-3">
      <table className="data-table">
        <caption className="sr-only">Parts used</caption>
        <thead>
          <tr>
            <th scope="col">Part</th>
            <th scope="col" className="text-right">
              Qty
            </th>
            <th scope="col" className="text-right">
              Unit cost
            </th>
          </tr>
        </thead>
        <tbody>
          {record.parts.map((p, i) => (
            <tr key={`${p.partNumber}-${i}`}>
              <td>
                <span className="mono">{p.partNumber}</span>
                {p.description && <div className="text-xs text-ink-500">{p.description}</div>}
              </td>
              <td className="text-right tabular-nums">{p.quantity}</td>
              <td className="text-right tabular-nums">{formatMoneyMinor(p.unitCostMinor, record.currency)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

const MOISTURE_OPTIONS = ['none', 'traces', 'corrosion', 'standing_water'] as const;

function DiagnosisForm({ record, timeZone }: { record: DefectRecord; timeZone: string | null }) {
  const uid = useId();
  const id = (f: string) => `${uid}-${f}`;
  const qc = useQueryClient();
  const save = useSaveDefect(record.id);
  const form = useForm<Values, unknown, DiagnosisFormOutput>({
    // NOTE: the schema's inputs are `unknown` where it preprocesses text; the form holds plain strings.
    resolver: zodResolver(DiagnosisFormSchema) as unknown as Resolver<Values, unknown, DiagnosisFormOutput>,
    defaultValues: fromRecord(record),
  });
  const { register, control, handleSubmit, setError, formState } = form;
  const parts = useFieldArray({ control, name: 'parts' });
  const vf = useVersionedForm<Values, Field>({ record, fields: FIELDS, fromRecord, form });
  const [formError, setFormError] = useState<string | null>(null);
  const [note, setNote] = useState<string | null>(null);
  const watched = useWatch({ control }) as Values;
  const dirty = vf.changed(watched as unknown as Record<Field, unknown>).length > 0;
  const e = formState.errors;
  const hydrated = useHydrated();
  // Rendered on the server too: uncontrolled fields carry their saved values in the HTML (react-hook-form only
  // sets them once it runs). Frozen at the first render: later values are react-hook-form's to set, and a changing
  // defaultChecked/defaultValue would fight it.
  const [d] = useState(() => fromRecord(record));

  /** Save the changed fields; true when saved (or nothing to save), false when refused or stale. */
  const submit = useCallback(
    async (out: DiagnosisFormOutput): Promise<boolean> => {
      setFormError(null);
      setNote(null);
      const changed = vf.changed();
      if (changed.length === 0) {
        setNote('Nothing changed since the last save.');
        return true;
      }
      const patch: Record<string, unknown> = { version: vf.baseVersion() };
      for (const f of changed) patch[f] = out[f as keyof DiagnosisFormOutput] ?? null;
      try {
        const r = await save.mutateAsync(patch);
        vf.saved(r);
        setNote(`Saved at ${formatInstant(r.updatedAt, timeZone).split(', ')[1] ?? ''}.`);
        return true;
      } catch (err) {
        const current = staleRecord(err);
        if (current) {
          vf.onStale(current);
          qc.setQueryData(defectKey(current.id), current);
          return false;
        }
        setFormError(applyServerIssues(err, setError, FIELDS as unknown as string[]));
        return false;
      }
    },
    [vf, save, qc, setError, timeZone],
  );
  const onSubmit = handleSubmit(async (out) => {
    await submit(out);
  });

  // A lifecycle step saves these edits first: validate (the first field to fix gets the focus), then save.
  const flush = useCallback(
    () =>
      new Promise<FlushResult>((resolve) => {
        if (vf.conflict) return resolve('failed');
        if (vf.changed().length === 0) return resolve('clean');
        void handleSubmit(
          async (out) => resolve((await submit(out)) ? 'saved' : 'failed'),
          () => resolve('failed'),
        )();
      }),
    [vf, handleSubmit, submit],
  );
  useUnsavedChanges(`diagnosis-${record.id}`, 'the diagnosis and repair record', dirty || !!vf.conflict, {
    flush,
    pending: { action: (watched.action ?? '').trim() || null, rootCause: watched.rootCause || null },
  });
  const panelRef = useRef<HTMLElement | null>(null);
  const showPanel = () => {
    panelRef.current?.scrollIntoView({ block: 'start' });
    panelRef.current?.focus({ preventScroll: true });
  };

  const rate = record.labourRateMinorPerHour;
  const partsTotal = (watched.parts ?? []).reduce((s, p) => {
    const c = parseMoneyText(p?.unitCost ?? '');
    const q = Number(p?.quantity);
    return s + (typeof c === 'number' && Number.isInteger(q) ? c * q : 0);
  }, 0);
  const labour = /^\d+$/.test(watched.labourMinutes ?? '') ? Number(watched.labourMinutes) : null;
  const labourCost = labour !== null && rate !== null ? labourCostMinor(labour, rate) : null;

  return (
    <form onSubmit={onSubmit} noValidate className="mt-4 space-y-5" aria-label="Diagnosis and repair record">
      {vf.conflict && (
        <ConflictPanel
          ref={panelRef}
          conflict={vf.conflict}
          display={display}
          timeZone={timeZone}
          bringIntoView={vf.conflict.kind === 'stale'}
          busy={save.isPending}
          onDiscard={vf.discard}
          onApply={(choices) => {
            if (vf.apply(choices)) void onSubmit();
          }}
        />
      )}
      <FormError message={formError} />
      <fieldset disabled={!hydrated} className="m-0 min-w-0 space-y-5 border-0 p-0">
      <fieldset>
        <legend className="field-label">Moisture found in the door</legend>
        <div className="flex flex-wrap gap-2">
          {MOISTURE_OPTIONS.map((m) => (
            <label
              key={m}
              className="flex min-h-10 cursor-pointer items-center gap-2 rounded-md border border-ink-300 bg-white px-3 py-2 text-[15px] has-checked:border-estuary-700 has-checked:bg-estuary-50 has-checked:font-semibold"
            >
              <input type="radio" value={m} className="h-4 w-4 accent-estuary-700" defaultChecked={d.moisture === m} {...register('moisture')} />
              {MOISTURE_LABELS[m]}
            </label>
          ))}
          <label className="flex min-h-10 cursor-pointer items-center gap-2 rounded-md border border-dashed border-ink-300 px-3 py-2 text-[15px] text-ink-600 has-checked:border-ink-500">
            <input type="radio" value="" className="h-4 w-4 accent-estuary-700" defaultChecked={d.moisture === ''} {...register('moisture')} />
            Not checked yet
          </label>
        </div>
      </fieldset>

      <div className="grid gap-4 sm:grid-cols-2">
        {CONDITION_FIELDS.map((f) => (
          <FormField key={f} id={id(f)} label={CONDITION_FIELD_LABELS[f]} error={e[f]?.message}>
            <select className={INPUT} defaultValue={d[f]} {...fieldAria(id(f), e[f]?.message)} {...register(f)}>
              <option value="">Not checked</option>
              {CONDITION_VALUES[f].map((v) => (
                <option key={v} value={v}>
                  {CONDITION_LABELS[f][v]}
                </option>
              ))}
            </select>
          </FormField>
        ))}
      </div>

      <FormField id={id('rootCause')} label="Root cause" error={e.rootCause?.message} hint="Needed to close the defect.">
        <select className={`${INPUT} sm:max-w-xs`} defaultValue={d.rootCause} {...fieldAria(id('rootCause'), e.rootCause?.message, true)} {...register('rootCause')}>
          <option value="">Not found yet</option>
          {Object.entries(ROOT_CAUSE_LABELS).map(([v, l]) => (
            <option key={v} value={v}>
              {l}
            </option>
          ))}
        </select>
      </FormField>
      <CountedField id={id('action')} label="Action (what was done)" error={e.action?.message} hint="Needed to mark the defect repaired." length={(watched.action ?? '').trim().length} max={TEXT_LIMITS.action}>
        <textarea rows={2} className={INPUT} defaultValue={d.action} {...fieldAria(id('action'), e.action?.message, true)} {...register('action')} />
      </CountedField>
      <CountedField id={id('notes')} label="Notes" error={e.notes?.message} length={(watched.notes ?? '').trim().length} max={TEXT_LIMITS.notes}>
        <textarea rows={3} className={INPUT} defaultValue={d.notes} {...fieldAria(id('notes'), e.notes?.message)} {...register('notes')} />
      </CountedField>

      <fieldset className="rounded-md border border-ink-200 px-3 pt-2 pb-3 sm:px-4">
        <legend className="px-1 text-sm font-semibold text-ink-700">Parts and labour</legend>
        <div className="space-y-3">
          {parts.fields.map((field, i) => {
            const pe = e.parts?.[i];
            return (
              <div key={field.id} className="grid grid-cols-[1fr_4.5rem] gap-2 border-b border-ink-100 pb-3 sm:grid-cols-[9rem_1fr_4.5rem_6.5rem_auto] sm:items-start" data-testid="part-line">
                <FormField id={id(`p${i}-pn`)} label="Part number" error={pe?.partNumber?.message} className="col-span-2 sm:col-span-1">
                  <input className={`${INPUT} mono`} autoComplete="off" defaultValue={field.partNumber} {...fieldAria(id(`p${i}-pn`), pe?.partNumber?.message)} {...register(`parts.${i}.partNumber`)} />
                </FormField>
                <FormField id={id(`p${i}-d`)} label="Description" error={pe?.description?.message} className="col-span-2 sm:col-span-1">
                  <input className={INPUT} defaultValue={field.description} {...fieldAria(id(`p${i}-d`), pe?.description?.message)} {...register(`parts.${i}.description`)} />
                </FormField>
                <FormField id={id(`p${i}-q`)} label="Qty" error={pe?.quantity?.message}>
                  <input className={`${INPUT} tabular-nums`} inputMode="numeric" defaultValue={field.quantity} {...fieldAria(id(`p${i}-q`), pe?.quantity?.message)} {...register(`parts.${i}.quantity`)} />
                </FormField>
                <FormField id={id(`p${i}-c`)} label="Unit cost" error={pe?.unitCost?.message}>
                  <input className={`${INPUT} tabular-nums`} inputMode="decimal" placeholder="0.00" defaultValue={field.unitCost} {...fieldAria(id(`p${i}-c`), pe?.unitCost?.message)} {...register(`parts.${i}.unitCost`)} />
                </FormField>
                <button type="button" className="btn-ghost self-end text-brick-700" aria-label={`Remove part line ${i + 1}`} onClick={() => parts.remove(i)}>
                  <Trash2 size={18} aria-hidden="true" />
                  <span className="sm:hidden">Remove</span>
                </button>
              </div>
            );
          })}
          <button type="button" className="btn-secondary" onClick={() => parts.append({ partNumber: '', description: '', quantity: '1', unitCost: '' })}>
            <Plus size={18} aria-hidden="true" /> Add a part
          </button>
          <div className="grid gap-4 sm:grid-cols-[10rem_1fr] sm:items-end">
            <FormField id={id('labourMinutes')} label="Labour, minutes" error={e.labourMinutes?.message}>
              <input className={`${INPUT} tabular-nums`} inputMode="numeric" defaultValue={d.labourMinutes} {...fieldAria(id('labourMinutes'), e.labourMinutes?.message)} {...register('labourMinutes')} />
            </FormField>
            <p className="text-sm text-ink-600" aria-live="polite">
              Parts <span className="font-semibold tabular-nums text-ink-900">{formatMoneyMinor(partsTotal, record.currency)}</span>
              {labourCost !== null && (
                <>
                  {' '}
                  · labour <span className="font-semibold tabular-nums text-ink-900">{formatMoneyMinor(labourCost, record.currency)}</span> at {formatMoneyMinor(rate, record.currency)} an hour · total{' '}
                  <span className="font-semibold tabular-nums text-ink-900">{formatMoneyMinor(partsTotal + labourCost, record.currency)}</span>
                </>
              )}
              {rate === null && labour !== null && <span className="text-ink-500"> · no labour rate is set, so the cost counts parts only</span>}
            </p>
          </div>
        </div>
      </fieldset>

      </fieldset>
      {/* NOTE: mt-5 here, not space-y on the form: the fieldset above has m-0, which cancels space-y's margin. */}
      <div className="mt-5 flex flex-wrap items-center gap-3">
        <button type="submit" className="btn-primary" disabled={!hydrated || save.isPending || !!vf.conflict}>
          {save.isPending ? 'Saving…' : 'Save diagnosis and repair'}
        </button>
        {vf.conflict && (
          <span className="flex flex-wrap items-center gap-x-2 text-sm font-semibold text-amber-800" role="status" data-testid="save-conflict-note">
            {vf.conflict.kind === 'stale' ? 'Not saved: someone changed this defect while you were editing.' : 'Someone changed this defect while you were editing.'}
            <button type="button" className="btn-ghost text-estuary-700" onClick={showPanel}>
              Compare the changes
            </button>
          </span>
        )}
        {dirty && !vf.conflict && (
          <>
            <span className="text-sm font-semibold text-amber-800">Unsaved changes</span>
            <button type="button" className="btn-ghost" onClick={vf.revert}>
              Undo changes
            </button>
          </>
        )}
        {!dirty && note && (
          <span className="text-sm text-moss-700" role="status">
            {note}
          </span>
        )}
      </div>
    </form>
  );
}

/** Island root. */
export default function DiagnosisCard(props: Props) {
  const client = useIslandQueryClient();
  return (
    <QueryClientProvider client={client}>
      <Diagnosis {...props} />
    </QueryClientProvider>
  );
}
