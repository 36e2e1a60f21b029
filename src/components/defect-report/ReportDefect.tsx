/**
 * "Report a defect" (island): the vehicle (type-ahead), the door on a plan of the vehicle, the module type,
 * what is wrong, fault codes decoded as they are typed, odometer, who reported it and when. While the person
 * fills it in, the door's earlier defects are shown, with a warning when one is still open (a duplicate?) or
 * when this report will count as a repeat repair. Validation is the same zod schema the API uses.
 */
import { useEffect, useId, useMemo, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { Controller, useForm, useWatch, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useIslandQueryClient } from '@/components/defect-workflow/island-client';
import { DefectReportFormSchema, type DefectReportForm } from '@/lib/contracts/defects';
import { FUNCTION_LABELS, POSITION_LABELS, STATUS_BADGE, STATUS_LABELS } from '@/components/labels';
import { formatInstantDate } from '@/components/defects/format';
import { applyServerIssues, fieldAria, FormError, FormField } from '@/components/ui/FormField';
import { DoorPicker } from '@/components/defect-fields/DoorPicker';
import { DtcDecoded } from '@/components/defect-fields/DtcField';
import { useReportDefect, useVehicleDefects, type EarlierDefect, type VehicleOption } from './queries';
import { VehiclePicker } from './VehiclePicker';
import { useHydrated } from '@/components/defect-fields/use-hydrated';

export type ModuleOption = { code: string; name: string; function: string };
type Props = {
  modules: ModuleOption[];
  reporterName: string;
  initialVehicle: VehicleOption | null;
  repeatWindowDays: number;
};
type Values = { vin: string; position: string; moduleCode: string; symptom: string; dtcs: string; odometerKm: string; reporterName: string; reportedAt: string };
const FIELDS = ['vin', 'position', 'moduleCode', 'symptom', 'dtcs', 'odometerKm', 'reporterName', 'reportedAt'];
const DAY_MS = 86_400_000;

const QUICK_SYMPTOMS = [
  'Window has no automatic travel',
  'Window reverses when closing',
  'Window stops part way',
  'Window does not move',
  'Door will not lock',
  'Door module resets',
  'Mirror will not fold',
];

/** The browser's local date-time now, for <input type="datetime-local">. */
function localNow(): string {
  const d = new Date();
  d.setSeconds(0, 0);
  return new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);
}

function Report({ modules, reporterName, initialVehicle, repeatWindowDays }: Props) {
  const uid = useId();
  const id = (f: string) => `${uid}-${f}`;
  const [vehicle, setVehicle] = useState<VehicleOption | null>(initialVehicle);
  const [formError, setFormError] = useState<string | null>(null);
  const send = useReportDefect();
  const { register, control, handleSubmit, setValue, setError, getValues, formState } = useForm<Values, unknown, DefectReportForm>({
    resolver: zodResolver(DefectReportFormSchema) as unknown as Resolver<Values, unknown, DefectReportForm>,
    defaultValues: { vin: initialVehicle?.vin ?? '', position: '', moduleCode: '', symptom: '', dtcs: '', odometerKm: '', reporterName, reportedAt: '' },
  });
  const e = formState.errors;
  const hydrated = useHydrated();
  // The clock is read in the browser only (the server's would differ, and so would the rendered form).
  const [latest, setLatest] = useState<string | undefined>(undefined);
  useEffect(() => {
    const now = localNow();
    setLatest(now);
    if (!getValues('reportedAt')) setValue('reportedAt', now);
  }, [getValues, setValue]);
  const [position, moduleCode, dtcText] = useWatch({ control, name: ['position', 'moduleCode', 'dtcs'] });
  const earlier = useVehicleDefects(vehicle?.vin ?? null);
  const all = earlier.data?.items ?? [];
  const counts = useMemo(() => {
    const c: Record<string, { total: number; open: number }> = {};
    for (const d of all) {
      const x = (c[d.position] ??= { total: 0, open: 0 });
      x.total++;
      if (d.open) x.open++;
    }
    return c;
  }, [all]);
  const door = position ? all.filter((d) => d.position === position) : [];
  const fn = modules.find((m) => m.code === moduleCode)?.function ?? null;
  const openSame = fn ? door.find((d) => d.open && d.moduleFunction === fn) : undefined;
  const now = Date.now();
  const repeatOf = fn
    ? door.filter((d) => d.moduleFunction === fn && d.status === 'closed' && d.closedAt && now - Date.parse(d.closedAt) <= repeatWindowDays * DAY_MS).sort((a, b) => Date.parse(b.closedAt!) - Date.parse(a.closedAt!))[0]
    : undefined;

  const byFunction = useMemo(() => {
    const m = new Map<string, ModuleOption[]>();
    for (const x of modules) m.set(x.function, [...(m.get(x.function) ?? []), x]);
    return [...m.entries()];
  }, [modules]);

  const onSubmit = handleSubmit(async (v) => {
    setFormError(null);
    try {
      const created = await send.mutateAsync({ ...v });
      window.location.assign(`/defects/${created.id}`);
    } catch (err) {
      setFormError(applyServerIssues(err, setError, FIELDS));
    }
  });

  const addSymptom = (s: string) => {
    const cur = getValues('symptom').trim();
    setValue('symptom', cur ? `${cur.replace(/[.;]\s*$/, '')}; ${s.charAt(0).toLowerCase()}${s.slice(1)}` : s, { shouldValidate: formState.isSubmitted });
  };

  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_22rem]" aria-label="Report a defect">
      <fieldset disabled={!hydrated} className="m-0 min-w-0 space-y-4 border-0 p-0">
        <FormError message={formError} />
        <section className="card card-pad space-y-3" aria-labelledby={id('h-vehicle')}>
          <h2 id={id('h-vehicle')}>1. Vehicle</h2>
          <div>
            <label htmlFor={id('vin')} className="field-label">
              Vehicle <span className="text-brick-600">*</span>
            </label>
            <VehiclePicker
              value={vehicle}
              inputId={id('vin')}
              error={e.vin?.message}
              onChange={(v) => {
                setVehicle(v);
                setValue('vin', v?.vin ?? '', { shouldValidate: formState.isSubmitted });
              }}
            />
            {e.vin?.message ? (
              <p id={`${id('vin')}-error`} className="mt-1 text-xs font-semibold text-brick-700">
                {e.vin.message}
              </p>
            ) : (
              !vehicle && (
                <p id={`${id('vin')}-hint`} className="mt-1 text-xs text-ink-500">
                  Only vehicles of your depots are found.
                </p>
              )
            )}
          </div>
        </section>

        <section className="card card-pad space-y-4" aria-labelledby={id('h-door')}>
          <h2 id={id('h-door')}>2. Door and module</h2>
          <div>
            <span id={id('door')} className="field-label">
              Door <span className="text-brick-600">*</span>
            </span>
            <Controller
              control={control}
              name="position"
              render={({ field }) => (
                <DoorPicker value={field.value} onChange={field.onChange} labelledBy={id('door')} counts={vehicle ? counts : undefined} invalid={!!e.position} describedBy={e.position ? `${id('door')}-error` : undefined} />
              )}
            />
            {e.position && (
              <p id={`${id('door')}-error`} className="mt-1 text-xs font-semibold text-brick-700">
                Choose the door.
              </p>
            )}
          </div>
          <FormField id={id('moduleCode')} label="Module type" required error={e.moduleCode?.message} hint="The part that fails, as in the module catalogue.">
            <select className="input" {...fieldAria(id('moduleCode'), e.moduleCode?.message, true)} {...register('moduleCode')}>
              <option value="">Choose the module type</option>
              {byFunction.map(([f, ms]) => (
                <optgroup key={f} label={FUNCTION_LABELS[f] ?? f}>
                  {ms.map((m) => (
                    <option key={m.code} value={m.code}>
                      {m.code} · {m.name}
                    </option>
                  ))}
                </optgroup>
              ))}
            </select>
          </FormField>
        </section>

        <section className="card card-pad space-y-4" aria-labelledby={id('h-what')}>
          <h2 id={id('h-what')}>3. What is wrong</h2>
          <FormField id={id('symptom')} label="Symptom" required error={e.symptom?.message} hint="What the driver or you noticed, in plain words.">
            <textarea rows={3} className="input" {...fieldAria(id('symptom'), e.symptom?.message, true)} {...register('symptom')} />
          </FormField>
          <div className="-mt-2 flex flex-wrap gap-1.5" role="group" aria-label="Common symptoms">
            {QUICK_SYMPTOMS.map((s) => (
              <button key={s} type="button" className="min-h-10 rounded-full border border-ink-300 bg-white px-3 text-sm text-ink-700 hover:border-estuary-500 hover:bg-estuary-50" onClick={() => addSymptom(s)}>
                + {s}
              </button>
            ))}
          </div>
          <FormField id={id('dtcs')} label="Fault codes" error={e.dtcs?.message} hint="As the scan tool shows them, separated by spaces: B1A21 or B1A21-29 (with the failure type).">
            <input className="input mono uppercase" autoComplete="off" spellCheck={false} {...fieldAria(id('dtcs'), e.dtcs?.message, true)} {...register('dtcs')} />
          </FormField>
          <DtcDecoded text={dtcText ?? ''} />
        </section>

        <section className="card card-pad" aria-labelledby={id('h-details')}>
          <h2 id={id('h-details')} className="mb-3">
            4. Details
          </h2>
          <div className="grid gap-4 sm:grid-cols-3">
            <FormField id={id('odometerKm')} label="Odometer, km" error={e.odometerKm?.message}>
              <input className="input tabular-nums" inputMode="numeric" {...fieldAria(id('odometerKm'), e.odometerKm?.message)} {...register('odometerKm')} />
            </FormField>
            <FormField id={id('reporterName')} label="Reported by" error={e.reporterName?.message} hint="You, or the driver who noticed it.">
              <input className="input" defaultValue={reporterName} {...fieldAria(id('reporterName'), e.reporterName?.message, true)} {...register('reporterName')} />
            </FormField>
            <FormField id={id('reportedAt')} label="Reported at" required error={e.reportedAt?.message}>
              <input type="datetime-local" className="input" max={latest} {...fieldAria(id('reportedAt'), e.reportedAt?.message)} {...register('reportedAt')} />
            </FormField>
          </div>
        </section>

        <div className="flex flex-wrap gap-2">
          <button type="submit" className="btn-primary" disabled={send.isPending}>
            {send.isPending ? 'Reporting…' : 'Report defect'}
          </button>
          <a className="btn-secondary" href={vehicle ? `/vehicles/${encodeURIComponent(vehicle.vin)}` : '/defects'}>
            Cancel
          </a>
        </div>
      </fieldset>

      <aside className="space-y-4" aria-label="This door's history">
        <DoorHistory vehicle={vehicle} position={position} door={door} loading={earlier.isLoading} openSame={openSame} repeatOf={repeatOf} repeatWindowDays={repeatWindowDays} fn={fn} />
      </aside>
    </form>
  );
}

type HistoryProps = {
  vehicle: VehicleOption | null;
  position: string;
  door: EarlierDefect[];
  loading: boolean;
  openSame: EarlierDefect | undefined;
  repeatOf: EarlierDefect | undefined;
  repeatWindowDays: number;
  fn: string | null;
};

function DoorHistory({ vehicle, position, door, loading, openSame, repeatOf, repeatWindowDays, fn }: HistoryProps) {
  return (
    <section className="card card-pad" aria-labelledby="h-door-history">
      <h2 id="h-door-history" className="mb-2">
        This door before
      </h2>
      {!vehicle || !position ? (
        <p className="text-sm text-ink-500">Choose the vehicle and the door to see the door's earlier defects.</p>
      ) : loading ? (
        <p className="text-sm text-ink-500">Loading…</p>
      ) : (
        <div className="space-y-3 text-sm">
          {openSame && (
            <p className="rounded-md border border-amber-600 bg-amber-50 px-3 py-2 text-amber-800" role="status">
              <a className="link mono" href={`/defects/${openSame.id}`}>
                {openSame.ref}
              </a>{' '}
              on this door is still open ({STATUS_LABELS[openSame.status]?.toLowerCase()}). If it is the same fault, add to that defect instead.
            </p>
          )}
          {repeatOf && !openSame && (
            <p className="rounded-md border border-brick-100 bg-brick-50 px-3 py-2 text-brick-700" role="status">
              This will count as a repeat repair of{' '}
              <a className="link mono" href={`/defects/${repeatOf.id}`}>
                {repeatOf.ref}
              </a>
              , closed {formatInstantDate(repeatOf.closedAt)} (within {repeatWindowDays} days, same door and {FUNCTION_LABELS[fn ?? '']?.toLowerCase() ?? 'module function'}).
            </p>
          )}
          {door.length === 0 ? (
            <p className="text-ink-600">No earlier defects on the {POSITION_LABELS[position]?.toLowerCase()} door of {vehicle.fleetNumber ?? vehicle.vin}.</p>
          ) : (
            <ul className="divide-y divide-ink-100" aria-label={`Earlier defects on the ${POSITION_LABELS[position]} door`}>
              {door.slice(0, 8).map((d) => (
                <li key={d.id} className="py-1.5">
                  <div className="flex flex-wrap items-center gap-2">
                    <a className="link mono" href={`/defects/${d.id}`}>
                      {d.ref}
                    </a>
                    <span className={STATUS_BADGE[d.status] ?? 'badge-neutral'}>{STATUS_LABELS[d.status] ?? d.status}</span>
                    <span className="text-xs text-ink-500">{formatInstantDate(d.reportedAt)}</span>
                  </div>
                  <div className="truncate text-ink-600" title={d.symptom ?? undefined}>
                    {d.moduleCode} · {d.symptom ?? 'no symptom written'}
                  </div>
                </li>
              ))}
            </ul>
          )}
        </div>
      )}
    </section>
  );
}

/** Island root. */
export default function ReportDefect(props: Props) {
  const client = useIslandQueryClient();
  return (
    <QueryClientProvider client={client}>
      <Report {...props} />
    </QueryClientProvider>
  );
}
