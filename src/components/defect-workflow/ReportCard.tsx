/**
 * What was reported (island): the symptom, the fault codes decoded, odometer, who reported it and when, door
 * and module type — with an edit mode for people who may change the record (version-checked like the
 * diagnosis form, with the same field-by-field conflict view).
 */
import { useId, useState } from 'react';
import { QueryClientProvider, useQueryClient } from '@tanstack/react-query';
import { Controller, useForm, useWatch, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { Pencil } from 'lucide-react';
import { useIslandQueryClient } from '@/components/defect-workflow/island-client';
import { DefectCreateSchema, TEXT_LIMITS, type DefectRecord } from '@/lib/contracts/defects';
import { canEditRecord, type WorkflowRole } from '@/lib/defects/transitions';
import { POSITION_LABELS } from '@/components/labels';
import { formatInstant } from '@/components/defects/format';
import { applyServerIssues, fieldAria, FormError, FormField } from '@/components/ui/FormField';
import { DoorPicker } from '@/components/defect-fields/DoorPicker';
import { DtcDecoded } from '@/components/defect-fields/DtcField';
import { defectKey, staleRecord, useDefect, useSaveDefect } from './queries';
import { useVersionedForm } from './use-versioned-form';
import { ConflictPanel } from './ConflictPanel';
import { useHydrated } from '@/components/defect-fields/use-hydrated';

type Values = { symptom: string; dtcs: string; odometerKm: string; reporterName: string; position: string; moduleCode: string };
const FIELDS = ['symptom', 'dtcs', 'odometerKm', 'reporterName', 'position', 'moduleCode'] as const;
type Field = (typeof FIELDS)[number];

const ReportEditSchema = DefectCreateSchema.pick({ position: true, moduleCode: true, dtcs: true, odometerKm: true, reporterName: true }).extend({
  symptom: z.string().trim().min(3, 'Say what is wrong (at least a few words)').max(TEXT_LIMITS.symptom, `At most ${TEXT_LIMITS.symptom} characters`),
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
      <p className="mb-3 text-[17px] text-ink-900" data-testid="symptom">
        {r.symptom ?? <span className="text-ink-500">No symptom written down.</span>}
      </p>
      <dl className="dl-grid">
        <dt>Reported</dt>
        <dd>
          {formatInstant(r.reportedAt, timeZone)}
          {(r.reporterName ?? r.reportedBy) && <span className="text-ink-600"> by {r.reporterName ?? r.reportedBy}</span>}
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
                <th scope="col">System</th>
                <th scope="col">Defined by</th>
                <th scope="col">Meaning</th>
              </tr>
            </thead>
            <tbody>
              {r.codes.map((c) => (
                <tr key={c.display}>
                  <td className="mono font-semibold whitespace-nowrap">{c.display}</td>
                  <td className="capitalize">{c.system ?? '–'}</td>
                  <td>{c.scope === 'manufacturer' ? 'Vehicle maker' : c.scope === 'generic' ? 'SAE (generic)' : '–'}</td>
                  <td>{c.description}</td>
                </tr>
              ))}
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
  const dtcText = useWatch({ control, name: 'dtcs' });
  const e = formState.errors;

  const onSubmit = handleSubmit(async (out) => {
    setFormError(null);
    const changed = vf.changed();
    if (changed.length === 0) return onDone();
    const patch: Record<string, unknown> = { version: vf.baseVersion() };
    for (const f of changed) patch[f] = out[f] ?? null;
    try {
      const saved = await save.mutateAsync(patch);
      vf.saved(saved);
      // The door or module type are shown outside this card (header, door map): show them fresh.
      if (changed.includes('position') || changed.includes('moduleCode')) window.location.reload();
      else onDone();
    } catch (err) {
      const current = staleRecord(err);
      if (current) {
        vf.onStale(current);
        qc.setQueryData(defectKey(current.id), current);
        return;
      }
      setFormError(applyServerIssues(err, setError, FIELDS as unknown as string[]));
    }
  });
  const byFunction = new Map<string, ModuleOption[]>();
  for (const m of modules) byFunction.set(m.function, [...(byFunction.get(m.function) ?? []), m]);

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Edit the report">
      {vf.conflict && (
        <ConflictPanel
          conflict={vf.conflict}
          display={display}
          timeZone={timeZone}
          busy={save.isPending}
          onDiscard={vf.discard}
          onApply={(choices) => {
            if (vf.apply(choices)) void onSubmit();
          }}
        />
      )}
      <FormError message={formError} />
      <FormField id={id('symptom')} label="Symptom" required error={e.symptom?.message}>
        <textarea rows={2} className="input" {...fieldAria(id('symptom'), e.symptom?.message)} {...register('symptom')} />
      </FormField>
      <FormField id={id('dtcs')} label="Fault codes" error={e.dtcs?.message} hint="SAE J2012 form, separated by spaces: B1A21 or B1A21-29.">
        <input className="input mono uppercase" autoComplete="off" {...fieldAria(id('dtcs'), e.dtcs?.message, true)} {...register('dtcs')} />
      </FormField>
      <DtcDecoded text={dtcText ?? ''} />
      <div className="grid gap-4 sm:grid-cols-2">
        <FormField id={id('odometerKm')} label="Odometer, km" error={e.odometerKm?.message}>
          <input className="input tabular-nums" inputMode="numeric" {...fieldAria(id('odometerKm'), e.odometerKm?.message)} {...register('odometerKm')} />
        </FormField>
        <FormField id={id('reporterName')} label="Reported by" error={e.reporterName?.message}>
          <input className="input" {...fieldAria(id('reporterName'), e.reporterName?.message)} {...register('reporterName')} />
        </FormField>
      </div>
      <div>
        <span id={id('door')} className="field-label">
          Door
        </span>
        <Controller control={control} name="position" render={({ field }) => <DoorPicker value={field.value} onChange={field.onChange} labelledBy={id('door')} />} />
      </div>
      <FormField id={id('moduleCode')} label="Module type" error={e.moduleCode?.message}>
        <select className="input" {...fieldAria(id('moduleCode'), e.moduleCode?.message)} {...register('moduleCode')}>
          {[...byFunction.entries()].map(([fn, ms]) => (
            <optgroup key={fn} label={fn.replace(/_/g, ' ')}>
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
