/**
 * "Report a defect" (island): the vehicle (type-ahead), the door on a plan of the vehicle, the module type,
 * what is wrong, fault codes decoded as they are typed, odometer, who reported it and when. Right under the
 * door and module — before the Report button — it says when that door already has an open defect of the same
 * kind (the person chooses: open that one, or report a new one anyway) or when this report will count as a
 * repeat repair; the door's earlier defects are listed beside the form. Validation is the API's zod schema
 * plus the chosen vehicle's build month; a refused submit focuses the first field to fix, in form order.
 * Typed work is guarded: leaving the page with unsaved input asks first (../defect-fields/unsaved.ts).
 */
import { useEffect, useId, useMemo, useRef, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { Controller, useForm, useWatch, type FieldErrors, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { AlertTriangle, Repeat } from 'lucide-react';
import { useIslandQueryClient } from '@/components/defect-workflow/island-client';
import { reportFormSchema, TEXT_LIMITS, type DefectReportForm } from '@/lib/contracts/defects';
import { monthWords } from '@/lib/defects/times';
import { FUNCTION_LABELS, POSITION_LABELS, STATUS_BADGE, STATUS_LABELS } from '@/components/labels';
import { formatInstantDate } from '@/components/defects/format';
import { applyServerIssues, fieldAria, FormError, FormField } from '@/components/ui/FormField';
import { DoorPicker } from '@/components/defect-fields/DoorPicker';
import { DtcDecoded } from '@/components/defect-fields/DtcField';
import { CountedField, INPUT } from '@/components/defect-fields/CountedField';
import { LeavePrompt } from '@/components/defect-fields/LeavePrompt';
import { allowLeave, useUnsavedChanges } from '@/components/defect-fields/unsaved';
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
/** The order a person meets the fields in (and `duplicate`, the open-defect choice under the module type). */
const FORM_ORDER = ['vin', 'position', 'moduleCode', 'duplicate', 'symptom', 'dtcs', 'odometerKm', 'reporterName', 'reportedAt'] as const;
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
  // The resolver reads the chosen vehicle's build month at validation time (the schema refuses earlier dates).
  const buildMonth = useRef<string | null>(initialVehicle?.buildMonth ?? null);
  buildMonth.current = vehicle?.buildMonth ?? null;
  const resolver = useMemo<Resolver<Values, unknown, DefectReportForm>>(
    () => (values, ctx, opts) => (zodResolver(reportFormSchema({ buildMonth: buildMonth.current })) as unknown as Resolver<Values, unknown, DefectReportForm>)(values, ctx, opts),
    [],
  );
  const { register, control, handleSubmit, setValue, setError, getValues, trigger, resetField, formState } = useForm<Values, unknown, DefectReportForm>({
    resolver,
    // Focus is moved by hand to the first field to fix in form order: the vehicle and the door are not plain inputs.
    shouldFocusError: false,
    defaultValues: { vin: initialVehicle?.vin ?? '', position: '', moduleCode: '', symptom: '', dtcs: '', odometerKm: '', reporterName, reportedAt: '' },
  });
  const e = formState.errors;
  const hydrated = useHydrated();
  // The clock is read in the browser only (the server's would differ, and so would the rendered form).
  const [latest, setLatest] = useState<string | undefined>(undefined);
  useEffect(() => {
    const now = localNow();
    setLatest(now);
    // The time is filled in for the person, so it is the form's starting value (not an unsaved edit).
    if (!getValues('reportedAt')) resetField('reportedAt', { defaultValue: now });
  }, [getValues, resetField]);
  const [position, moduleCode, dtcText, symptom] = useWatch({ control, name: ['position', 'moduleCode', 'dtcs', 'symptom'] });
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

  // The open-defect question: answered per open defect (another door or module asks again).
  const [reportAnywayFor, setReportAnywayFor] = useState<number | null>(null);
  const [dupError, setDupError] = useState(false);
  const duplicateOpen = !!openSame && reportAnywayFor !== openSame.id;
  useEffect(() => setDupError(false), [openSame?.id]);

  const dirty = formState.isDirty || (vehicle?.vin ?? null) !== (initialVehicle?.vin ?? null);
  useUnsavedChanges('report-defect', 'the report', dirty && !send.isSuccess);

  const byFunction = useMemo(() => {
    const m = new Map<string, ModuleOption[]>();
    for (const x of modules) m.set(x.function, [...(m.get(x.function) ?? []), x]);
    return [...m.entries()];
  }, [modules]);

  /** Focus the first thing to fix, in the order the form shows it. */
  const focusFirst = (errors: FieldErrors<Values>, duplicate: boolean) => {
    const first = FORM_ORDER.find((k) => (k === 'duplicate' ? duplicate : !!errors[k]));
    let el: HTMLElement | null = null;
    if (first === 'vin') el = document.getElementById(id('vin')) ?? document.querySelector<HTMLElement>('[data-testid="chosen-vehicle"] button');
    else if (first === 'position') el = document.querySelector<HTMLElement>(`[aria-labelledby="${id('door')}"] [tabindex="0"]`);
    else if (first === 'duplicate') el = document.getElementById(id('duplicate'));
    else if (first) el = document.getElementById(id(first));
    el?.focus();
    el?.scrollIntoView({ block: 'center' });
  };

  const onSubmit = handleSubmit(
    async (v) => {
      setFormError(null);
      if (duplicateOpen) {
        setDupError(true);
        focusFirst({}, true);
        return;
      }
      try {
        const created = await send.mutateAsync({ ...v });
        allowLeave();
        window.location.assign(`/defects/${created.id}`);
      } catch (err) {
        setFormError(applyServerIssues(err, setError, FIELDS));
      }
    },
    (errors) => {
      if (duplicateOpen) setDupError(true);
      focusFirst(errors, duplicateOpen);
    },
  );

  const addSymptom = (s: string) => {
    const cur = getValues('symptom').trim();
    setValue('symptom', cur ? `${cur.replace(/[.;]\s*$/, '')}; ${s.charAt(0).toLowerCase()}${s.slice(1)}` : s, { shouldValidate: formState.isSubmitted, shouldDirty: true });
  };

  const minReportedAt = vehicle ? `${vehicle.buildMonth}-01T00:00` : undefined;

  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_22rem]" aria-label="Report a defect">
      <LeavePrompt />
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
                setReportAnywayFor(null);
                buildMonth.current = v?.buildMonth ?? null;
                setValue('vin', v?.vin ?? '', { shouldDirty: true });
                if (formState.isSubmitted) void trigger(['vin', 'reportedAt']);
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
                Choose the door
              </p>
            )}
          </div>
          <FormField id={id('moduleCode')} label="Module type" required error={e.moduleCode?.message} hint="The part that fails, as in the module catalogue.">
            <select className={INPUT} {...fieldAria(id('moduleCode'), e.moduleCode?.message, true)} {...register('moduleCode')}>
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
          {openSame && (
            <div
              id={id('duplicate')}
              tabIndex={-1}
              role="group"
              aria-labelledby={id('duplicate-title')}
              data-testid="open-defect-choice"
              className={`rounded-md border px-3 py-3 text-sm outline-none focus-visible:ring-2 focus-visible:ring-estuary-300 ${dupError ? 'border-brick-600 bg-brick-50' : 'border-amber-600 bg-amber-50'}`}
            >
              <p id={id('duplicate-title')} className="flex items-start gap-2 font-semibold text-amber-800">
                <AlertTriangle size={18} className="mt-0.5 shrink-0" aria-hidden="true" />
                <span>
                  This door already has an open defect of this kind: <span className="mono">{openSame.ref}</span> ({STATUS_LABELS[openSame.status]?.toLowerCase()}, reported{' '}
                  {formatInstantDate(openSame.reportedAt)}).
                </span>
              </p>
              {openSame.symptom && <p className="mt-1 pl-[26px] wrap-anywhere text-ink-700">“{openSame.symptom}”</p>}
              <p className="mt-1 pl-[26px] text-ink-700">If it is the same fault, add to that defect instead of reporting it twice.</p>
              <div className="mt-2 flex flex-wrap gap-2 pl-[26px]">
                <a
                  className="btn-primary"
                  href={`/defects/${openSame.id}`}
                  onClick={() => {
                    // The person chose to go there: what they typed here is not wanted.
                    allowLeave();
                  }}
                >
                  Open {openSame.ref}
                </a>
                <label className={`btn-secondary cursor-pointer ${reportAnywayFor === openSame.id ? 'border-estuary-700 bg-estuary-50' : ''}`}>
                  <input
                    type="checkbox"
                    className="h-4 w-4 accent-estuary-700"
                    checked={reportAnywayFor === openSame.id}
                    onChange={(ev) => {
                      setReportAnywayFor(ev.target.checked ? openSame.id : null);
                      setDupError(false);
                    }}
                  />
                  It is another fault: report a new defect
                </label>
              </div>
              {dupError && (
                <p className="mt-2 pl-[26px] font-semibold text-brick-700" role="alert">
                  Choose first: open {openSame.ref}, or tick that this is another fault.
                </p>
              )}
            </div>
          )}
          {repeatOf && (
            <p className="flex items-start gap-2 rounded-md border border-brick-100 bg-brick-50 px-3 py-2 text-sm text-brick-700" role="status" data-testid="repeat-notice">
              <Repeat size={18} className="mt-0.5 shrink-0" aria-hidden="true" />
              <span>
                This will count as a repeat repair of{' '}
                <a className="link mono" href={`/defects/${repeatOf.id}`}>
                  {repeatOf.ref}
                </a>
                , closed {formatInstantDate(repeatOf.closedAt)} (within {repeatWindowDays} days, same door and {FUNCTION_LABELS[fn ?? '']?.toLowerCase() ?? 'module function'}).
              </span>
            </p>
          )}
        </section>

        <section className="card card-pad space-y-4" aria-labelledby={id('h-what')}>
          <h2 id={id('h-what')}>3. What is wrong</h2>
          <CountedField id={id('symptom')} label="Symptom" required error={e.symptom?.message} hint="What the driver or you noticed, in plain words." length={(symptom ?? '').trim().length} max={TEXT_LIMITS.symptom}>
            <textarea rows={3} className={INPUT} {...fieldAria(id('symptom'), e.symptom?.message, true)} {...register('symptom')} />
          </CountedField>
          <div className="-mt-2 flex flex-wrap gap-1.5" role="group" aria-label="Common symptoms">
            {QUICK_SYMPTOMS.map((s) => (
              <button key={s} type="button" className="min-h-10 rounded-full border border-ink-300 bg-white px-3 text-sm text-ink-700 hover:border-estuary-500 hover:bg-estuary-50" onClick={() => addSymptom(s)}>
                + {s}
              </button>
            ))}
          </div>
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
            {/* A mistyped code is said once, in the decoded list under the field (not again here). */}
            <p id={`${id('dtcs')}-hint`} className={`mt-1 text-xs ${e.dtcs ? 'font-semibold text-brick-700' : 'text-ink-500'}`}>
              {e.dtcs ? 'Fix the code marked below, or remove it' : 'As the scan tool shows them, separated by spaces: B1A21 or B1A21-29 (with the failure type).'}
            </p>
            <DtcDecoded text={dtcText ?? ''} id={`${id('dtcs')}-decoded`} />
          </div>
        </section>

        <section className="card card-pad" aria-labelledby={id('h-details')}>
          <h2 id={id('h-details')} className="mb-3">
            4. Details
          </h2>
          <div className="grid gap-4 sm:grid-cols-3">
            <FormField id={id('odometerKm')} label="Odometer, km" error={e.odometerKm?.message}>
              <input className={`${INPUT} tabular-nums`} inputMode="numeric" autoComplete="off" {...fieldAria(id('odometerKm'), e.odometerKm?.message)} {...register('odometerKm')} />
            </FormField>
            <FormField id={id('reporterName')} label="Reported by" error={e.reporterName?.message} hint="You, or the driver who noticed it.">
              <input className={INPUT} defaultValue={reporterName} {...fieldAria(id('reporterName'), e.reporterName?.message, true)} {...register('reporterName')} />
            </FormField>
            <FormField id={id('reportedAt')} label="Reported at" required error={e.reportedAt?.message} hint={vehicle ? `Not before the vehicle was built (${monthWords(vehicle.buildMonth)}).` : undefined}>
              <input type="datetime-local" className={INPUT} min={minReportedAt} max={latest} {...fieldAria(id('reportedAt'), e.reportedAt?.message, !!vehicle)} {...register('reportedAt')} />
            </FormField>
          </div>
        </section>

        <div className="flex flex-wrap items-center gap-2">
          <button type="submit" className="btn-primary" disabled={send.isPending}>
            {send.isPending ? 'Reporting…' : 'Report defect'}
          </button>
          <a className="btn-secondary" href={vehicle ? `/vehicles/${encodeURIComponent(vehicle.vin)}` : '/defects'}>
            Cancel
          </a>
        </div>
      </fieldset>

      <aside className="space-y-4" aria-label="This door's history">
        <DoorHistory vehicle={vehicle} position={position} door={door} loading={earlier.isLoading} />
      </aside>
    </form>
  );
}

type HistoryProps = {
  vehicle: VehicleOption | null;
  position: string;
  door: EarlierDefect[];
  loading: boolean;
};

function DoorHistory({ vehicle, position, door, loading }: HistoryProps) {
  return (
    <section className="card card-pad" aria-labelledby="h-door-history">
      <h2 id="h-door-history" className="mb-2">
        This door before
      </h2>
      {!vehicle || !position ? (
        <p className="text-sm text-ink-500">Choose the vehicle and the door to see the door's earlier defects.</p>
      ) : loading ? (
        <p className="text-sm text-ink-500">Loading…</p>
      ) : door.length === 0 ? (
        <p className="text-sm text-ink-600">
          No earlier defects on the {POSITION_LABELS[position]?.toLowerCase()} door of {vehicle.fleetNumber ?? vehicle.vin}.
        </p>
      ) : (
        <ul className="divide-y divide-ink-100 text-sm" aria-label={`Earlier defects on the ${POSITION_LABELS[position]} door`}>
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
