/**
 * What was reported (island): the symptom, the fault codes decoded, odometer, who reported it and when, door
 * and module type — with an edit mode for people who may change the record (version-checked like the
 * diagnosis form, with the same field-by-field conflict view, the same unsaved-changes guard, and saved
 * first by a lifecycle step).
 */
import { useCallback, useId, useState } from 'react';
import { QueryClientProvider, useQueryClient } from '@tanstack/react-query';
import { Controller, useForm, useWatch, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { Pencil } from 'lucide-react';
import { parseDtc } from '@/lib/dtc/dtc';
import { dtcWords } from '@/lib/defects/dtc-entry';
import { useIslandQueryClient } from '@/components/defect-workflow/island-client';
import { DefectCreateSchema, FormOdometerField, FormSymptomField, TEXT_LIMITS, type DefectRecord } from '@/lib/contracts/defects';
import { canEditRecord, type WorkflowRole } from '@/lib/defects/transitions';
import { FUNCTION_LABELS, POSITION_LABELS } from '@/components/labels';
import { formatInstant } from '@/components/defects/format';
import { applyServerIssues, fieldAria, FormError, FormField } from '@/components/ui/FormField';
import { DoorPicker } from '@/components/defect-fields/DoorPicker';
import { DtcDecoded } from '@/components/defect-fields/DtcField';
import { defectKey, staleRecord, useDefect, useSaveDefect } from './queries';
import { useVersionedForm } from './use-versioned-form';
import { ConflictPanel } from './ConflictPanel';
import { useHydrated } from '@/components/defect-fields/use-hydrated';
import { CountedField, INPUT } from '@/components/defect-fields/CountedField';
import { useUnsavedChanges, type FlushResult } from '@/components/defect-fields/unsaved';

type Values = { symptom: string; dtcs: string; odometerKm: string; reporterName: string; position: string; moduleCode: string };
const FIELDS = ['symptom', 'dtcs', 'odometerKm', 'reporterName', 'position', 'moduleCode'] as const;
type Field = (typeof FIELDS)[number];

const ReportEditSchema = DefectCreateSchema.pick({ position: true, moduleCode: true, dtcs: true, reporterName: true }).extend({
  symptom: FormSymptomField,
  odometerKm: FormOdometerField,
});
type Output = z.output<typeof ReportEditSchema>;

function fromRecord(r: DefectRecord): Values {
  return {
    symptom: r.symptom ?? '',
    dtcs: r.dtcs.join(' '),
    odometerKm: r.odometerKm === null ? '' : String(r.odometerKm),
    reporterName: r.reporterName ?? '',
    position: r.position,
    moduleCode: r.moduleCode,
  };
}
const display = (f: Field, v: unknown) => {
  const s = String(v ?? '');
  if (!s) return '–';
  if (f === 'position') return `${POSITION_LABELS[s] ?? s} (${s})`;
  if (f === 'odometerKm') return `${Number(s).toLocaleString('en-GB')} km`;
  return s;
};

export type ModuleOption = { code: string; name: string; function: string };
type Props = { initial: DefectRecord; role: WorkflowRole; timeZone: string | null; modules: ModuleOption[] };

function Report({ initial, role, timeZone, modules }: Props) {
  const { data: r } = useDefect(initial);
  const [editing, setEditing] = useState(false);
  const editable = canEditRecord(r.status, role);
  const hydrated = useHydrated();
  return (
    <section className="card" aria-labelledby="h-report">
      <div className="flex items-center justify-between gap-2 border-b border-ink-200 px-4 py-3 sm:px-5">
        <h2 id="h-report">Report</h2>
        {editable && !editing && (
          <button type="button" className="btn-ghost" disabled={!hydrated} onClick={() => setEditing(true)}>
            <Pencil size={16} aria-hidden="true" /> Edit report
          </button>
        )}
      </div>
      <div className="px-4 py-4 sm:px-5">
        {editing ? <ReportForm r={r} timeZone={timeZone} modules={modules} onDone={() => setEditing(false)} /> : <ReportView r={r} timeZone={timeZone} />}
      </div>
      {!editing && <CodesTable r={r} />}
    </section>
  );
}

function ReportView({ r, timeZone }: { r: DefectRecord; timeZone: string | null }) {
  return (
    <>
      <p className="mb-3 text-[17px] wrap-anywhere text-ink-900" data-testid="symptom">
        {r.symptom ?? <span className="text-ink-500">No symptom written down.</span>}
      </p>
      <dl className="dl-grid">
        <dt>Reported</dt>
        <dd>
          {formatInstant(r.reportedAt, timeZone)}
          {(r.reporterName ?? r.reportedBy) && <span className="wrap-anywhere text-ink-600"> by {r.reporterName ?? r.reportedBy}</span>}
          {r.reporterName && r.reportedBy && r.reporterName !== r.reportedBy && <span className="text-ink-500"> (entered by {r.reportedBy})</span>}
        </dd>
        <dt>Odometer</dt>
        <dd>{r.odometerKm === null ? <span className="text-ink-500">Not recorded</span> : `${r.odometerKm.toLocaleString('en-GB')} km`}</dd>
      </dl>
    </>
  );
}

function CodesTable({ r }: { r: DefectRecord }) {
  return (
    <div className="border-t border-ink-200">
      <h3 className="px-4 pt-3 sm:px-5">Fault codes</h3>
      {r.codes.length === 0 ? (
        <p className="px-4 py-3 text-sm text-ink-500 sm:px-5">No fault codes recorded.</p>
      ) : (
        <div className="table-wrap mt-2">
          <table className="data-table">
            <caption className="sr-only">Fault codes of {r.ref}, decoded</caption>
            <thead>
              <tr>
                <th scope="col">Code</th>
                <th scope="col">What it is</th>
                <th scope="col">Failure type</th>
              </tr>
            </thead>
            <tbody>
              {r.codes.map((c) => {
                // Decoded once, in three plain parts: the system and who defines the code, then the failure type.
                const p = parseDtc(c.display);
                const w = p.ok ? dtcWords(p) : null;
                return (
                  <tr key={c.display}>
                    <td className="mono font-semibold whitespace-nowrap">{c.display}</td>
                    <td>{w ? `${w.system}, ${w.definedBy}` : c.description}</td>
                    <td>{w?.failure ? w.failure.replace(/^Failure type /, '') : <span className="text-ink-500">none given</span>}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}

function ReportForm({ r, timeZone, modules, onDone }: { r: DefectRecord; timeZone: string | null; modules: ModuleOption[]; onDone: () => void }) {
  const uid = useId();
  const id = (f: string) => `${uid}-${f}`;
  const qc = useQueryClient();
  const save = useSaveDefect(r.id);
  const form = useForm<Values, unknown, Output>({ resolver: zodResolver(ReportEditSchema) as unknown as Resolver<Values, unknown, Output>, defaultValues: fromRecord(r) });
  const { register, control, handleSubmit, setError, formState } = form;
  const vf = useVersionedForm<Values, Field>({ record: r, fields: FIELDS, fromRecord, form });
  const [formError, setFormError] = useState<string | null>(null);
  const [dtcText, symptom] = useWatch({ control, name: ['dtcs', 'symptom'] });
  const watched = useWatch({ control }) as Values;
  const dirty = vf.changed(watched as unknown as Record<Field, unknown>).length > 0;
  const e = formState.errors;

  /** Save the changed fields; true when saved (or nothing to save). */
  const submit = useCallback(
    async (out: Output, fromStep = false): Promise<boolean> => {
      setFormError(null);
      const changed = vf.changed();
      if (changed.length === 0) {
        onDone();
        return true;
      }
      const patch: Record<string, unknown> = { version: vf.baseVersion() };
      for (const f of changed) patch[f] = out[f] ?? null;
      try {
        const saved = await save.mutateAsync(patch);
        vf.saved(saved);
        // The door or module type are shown in the page header (server-rendered): show them fresh — unless a
        // step is saving these edits first, which a reload would cut short (the cards update by themselves).
        if (!fromStep && (changed.includes('position') || changed.includes('moduleCode'))) window.location.reload();
        else onDone();
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
    [vf, save, qc, setError, onDone],
  );
  const onSubmit = handleSubmit(async (out) => {
    await submit(out);
  });
  const flush = useCallback(
    () =>
      new Promise<FlushResult>((resolve) => {
        if (vf.conflict) return resolve('failed');
        if (vf.changed().length === 0) return resolve('clean');
        void handleSubmit(
          async (out) => resolve((await submit(out, true)) ? 'saved' : 'failed'),
          () => resolve('failed'),
        )();
      }),
    [vf, handleSubmit, submit],
  );
  useUnsavedChanges(`report-${r.id}`, 'the report', dirty || !!vf.conflict, { flush });
  const byFunction = new Map<string, ModuleOption[]>();
  for (const m of modules) byFunction.set(m.function, [...(byFunction.get(m.function) ?? []), m]);

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Edit the report">
      {vf.conflict && (
        <ConflictPanel
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
      <CountedField id={id('symptom')} label="Symptom" required error={e.symptom?.message} length={(symptom ?? '').trim().length} max={TEXT_LIMITS.symptom}>
        <textarea rows={2} className={INPUT} {...fieldAria(id('symptom'), e.symptom?.message)} {...register('symptom')} />
      </CountedField>
      <div>
        <label htmlFor={id('dtcs')} className="field-label">
          Fault codes
        </label>
        <input
          id={id('dtcs')}
          className={`${INPUT} mono uppercase`}
          autoComplete="off"
          spellCheck={false}
          aria-invalid={e.dtcs ? true : undefined}
          aria-describedby={`${id('dtcs')}-hint ${id('dtcs')}-decoded`}
          {...register('dtcs')}
        />
        <p id={`${id('dtcs')}-hint`} className={`mt-1 text-xs ${e.dtcs ? 'font-semibold text-brick-700' : 'text-ink-500'}`}>
          {e.dtcs ? 'Fix the code marked below, or remove it' : 'SAE J2012 form, separated by spaces: B1A21 or B1A21-29.'}
        </p>
        <DtcDecoded text={dtcText ?? ''} id={`${id('dtcs')}-decoded`} />
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <FormField id={id('odometerKm')} label="Odometer, km" error={e.odometerKm?.message}>
          <input className={`${INPUT} tabular-nums`} inputMode="numeric" autoComplete="off" {...fieldAria(id('odometerKm'), e.odometerKm?.message)} {...register('odometerKm')} />
        </FormField>
        <FormField id={id('reporterName')} label="Reported by" error={e.reporterName?.message}>
          <input className={INPUT} {...fieldAria(id('reporterName'), e.reporterName?.message)} {...register('reporterName')} />
        </FormField>
      </div>
      <div>
        <span id={id('door')} className="field-label">
          Door
        </span>
        <Controller control={control} name="position" render={({ field }) => <DoorPicker value={field.value} onChange={field.onChange} labelledBy={id('door')} />} />
      </div>
      <FormField id={id('moduleCode')} label="Module type" error={e.moduleCode?.message}>
        <select className={INPUT} {...fieldAria(id('moduleCode'), e.moduleCode?.message)} {...register('moduleCode')}>
          {[...byFunction.entries()].map(([fn, ms]) => (
            <optgroup key={fn} label={FUNCTION_LABELS[fn] ?? fn}>
              {ms.map((m) => (
                <option key={m.code} value={m.code}>
                  {m.code} · {m.name}
                </option>
              ))}
            </optgroup>
          ))}
        </select>
      </FormField>
      <div className="flex flex-wrap gap-2">
        <button type="submit" className="btn-primary" disabled={save.isPending || !!vf.conflict}>
          {save.isPending ? 'Saving…' : 'Save report'}
        </button>
        <button
          type="button"
          className="btn-secondary"
          onClick={() => {
            vf.revert();
            onDone();
          }}
        >
          Cancel
        </button>
      </div>
    </form>
  );
}

/** Island root. */
export default function ReportCard(props: Props) {
  const client = useIslandQueryClient();
  return (
    <QueryClientProvider client={client}>
      <Report {...props} />
    </QueryClientProvider>
  );
}
