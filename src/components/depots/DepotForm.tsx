/** Create or change a depot (react-hook-form + zod); the server's 422 issues land on their fields. */
import { useId, useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { applyServerIssues, CheckRow, fieldAria, FormError, FormField } from '@/components/ui/FormField';
import { useSaveDepot, type Depot, type DepotInput } from './queries';

/** A number typed as text: optional or required, within [min, max], whole when `integer`. */
function numberText(label: string, min: number, max: number, opts: { integer?: boolean; required?: boolean }) {
  return z
    .string()
    .trim()
    .superRefine((v, ctx) => {
      if (v === '') {
        if (opts.required) ctx.addIssue({ code: 'custom', message: `${label} is required.` });
        return;
      }
      const n = Number(v.replace(',', '.'));
      if (!Number.isFinite(n)) ctx.addIssue({ code: 'custom', message: `${label} must be a number.` });
      else if (opts.integer && !Number.isInteger(n)) ctx.addIssue({ code: 'custom', message: `${label} must be a whole number.` });
      else if (n < min || n > max) ctx.addIssue({ code: 'custom', message: `${label} must be between ${min} and ${max}.` });
    });
}

function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat('en-GB', { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

const DepotFormSchema = z.object({
  code: z
    .string()
    .trim()
    .min(1, 'Code is required.')
    .max(16, 'Code is at most 16 characters.')
    .regex(/^[A-Za-z0-9_-]+$/, 'Code may hold letters, digits, "-" and "_" only.'),
  name: z.string().trim().min(1, 'Name is required.').max(200, 'Name is at most 200 characters.'),
  region: z.string().trim().max(200, 'Region is at most 200 characters.'),
  coastal: z.boolean(),
  rainDaysPerYear: numberText('Rain days a year', 0, 366, { integer: true, required: true }),
  meanRhPct: numberText('Mean relative humidity', 0, 100, { required: true }),
  washBay: z.boolean(),
  inspectionSlotsPerDay: numberText('Seal-inspection bay slots per day', 0, 100, { integer: true }),
  timezone: z
    .string()
    .trim()
    .max(64)
    .refine((v) => v === '' || isTimeZone(v), 'Not an IANA time zone (for example Europe/London).'),
});
type DepotFormValues = z.infer<typeof DepotFormSchema>;
const FIELDS = Object.keys(DepotFormSchema.shape);

const num = (v: string) => Number(v.trim().replace(',', '.'));

function toInput(v: DepotFormValues): DepotInput {
  return {
    code: v.code.trim().toUpperCase(),
    name: v.name.trim(),
    region: v.region.trim() || null,
    coastal: v.coastal,
    rainDaysPerYear: num(v.rainDaysPerYear),
    meanRhPct: num(v.meanRhPct),
    washBay: v.washBay,
    inspectionSlotsPerDay: v.inspectionSlotsPerDay.trim() === '' ? null : num(v.inspectionSlotsPerDay),
    timezone: v.timezone.trim() || null,
  };
}

/** The browser's own time zone, a sensible first guess for a new depot. */
function browserTimeZone(): string {
  try {
    return Intl.DateTimeFormat().resolvedOptions().timeZone ?? '';
  } catch {
    return '';
  }
}

function defaults(d: Depot | null): DepotFormValues {
  return {
    code: d?.code ?? '',
    name: d?.name ?? '',
    region: d?.region ?? '',
    coastal: d?.coastal ?? false,
    rainDaysPerYear: d ? String(d.rainDaysPerYear) : '',
    meanRhPct: d ? String(d.meanRhPct) : '',
    washBay: d?.washBay ?? false,
    inspectionSlotsPerDay: d?.inspectionSlotsPerDay == null ? '' : String(d.inspectionSlotsPerDay),
    timezone: d ? (d.timezone ?? '') : browserTimeZone(),
  };
}

type Props = { formId: string; depot: Depot | null; onSaved: (d: Depot) => void; onBusy: (busy: boolean) => void };

/** The depot form; the dialog footer's submit button targets it through `formId`. */
export function DepotForm({ formId, depot, onSaved, onBusy }: Props) {
  const uid = useId();
  const id = (f: string) => `${uid}-${f}`;
  const save = useSaveDepot();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<DepotFormValues>({
    resolver: zodResolver(DepotFormSchema),
    defaultValues: defaults(depot),
  });
  const e = formState.errors;
  const zones = useMemo(() => {
    try {
      return (Intl as unknown as { supportedValuesOf?: (k: string) => string[] }).supportedValuesOf?.('timeZone') ?? [];
    } catch {
      return [];
    }
  }, []);

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    onBusy(true);
    try {
      const saved = await save.mutateAsync({ code: depot?.code ?? null, body: toInput(values) });
      onSaved(saved);
    } catch (err) {
      setFormError(applyServerIssues(err, setError, FIELDS, { conflictField: depot ? undefined : 'code' }));
    } finally {
      onBusy(false);
    }
  });

  return (
    <form id={formId} onSubmit={onSubmit} noValidate className="space-y-4">
      <FormError message={formError} />
      <div className="grid gap-4 sm:grid-cols-[10rem_1fr]">
        <FormField id={id('code')} label="Code" required error={e.code?.message} hint={depot ? 'The code cannot be changed.' : 'Short and unique, e.g. GHQ.'}>
          <input
            className="input mono uppercase read-only:bg-ink-50 read-only:text-ink-600"
            {...fieldAria(id('code'), e.code?.message, true)}
            {...register('code')}
            readOnly={!!depot}
            autoComplete="off"
          />
        </FormField>
        <FormField id={id('name')} label="Name" required error={e.name?.message}>
          <input className="input" {...fieldAria(id('name'), e.name?.message)} {...register('name')} autoComplete="off" />
        </FormField>
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <FormField id={id('region')} label="Region" error={e.region?.message}>
          <input className="input" {...fieldAria(id('region'), e.region?.message)} {...register('region')} autoComplete="off" />
        </FormField>
        <FormField id={id('timezone')} label="Time zone" error={e.timezone?.message} hint="IANA name; local times in imports are read in it.">
          <input className="input" list={id('zones')} {...fieldAria(id('timezone'), e.timezone?.message, true)} {...register('timezone')} autoComplete="off" />
          <datalist id={id('zones')}>
            {zones.map((z) => (
              <option key={z} value={z} />
            ))}
          </datalist>
        </FormField>
      </div>
      <fieldset className="rounded-md border border-ink-200 px-4 pt-2 pb-4">
        <legend className="px-1 text-sm font-semibold text-ink-700">Climate and washing</legend>
        <p className="mb-3 text-xs text-ink-500">
          These feed each vehicle's moisture-exposure index: coastal, rain days (≥ 100 / ≥ 150), humidity (≥ 70 / ≥ 80 %), and on-site pressure washing.
        </p>
        <div className="grid gap-x-4 sm:grid-cols-2">
          <CheckRow {...register('coastal')}>Coastal depot</CheckRow>
          <CheckRow {...register('washBay')} hint="Pressure washing on site">
            Wash bay
          </CheckRow>
        </div>
        <div className="mt-2 grid gap-4 sm:grid-cols-2">
          <FormField id={id('rainDaysPerYear')} label="Rain days a year" required error={e.rainDaysPerYear?.message} hint="0–366">
            <input
              className="input tabular-nums"
              inputMode="numeric"
              {...fieldAria(id('rainDaysPerYear'), e.rainDaysPerYear?.message, true)}
              {...register('rainDaysPerYear')}
            />
          </FormField>
          <FormField id={id('meanRhPct')} label="Mean relative humidity, %" required error={e.meanRhPct?.message} hint="0–100">
            <input className="input tabular-nums" inputMode="decimal" {...fieldAria(id('meanRhPct'), e.meanRhPct?.message, true)} {...register('meanRhPct')} />
          </FormField>
        </div>
      </fieldset>
      <FormField
        id={id('inspectionSlotsPerDay')}
        label="Seal-inspection bay slots per day"
        error={e.inspectionSlotsPerDay?.message}
        hint="How many vehicles the bay can take for a seal inspection in a day; recorded for reference (0–100)."
        className="sm:w-1/2 sm:pr-2"
      >
        <input
          className="input tabular-nums"
          inputMode="numeric"
          {...fieldAria(id('inspectionSlotsPerDay'), e.inspectionSlotsPerDay?.message, true)}
          {...register('inspectionSlotsPerDay')}
        />
      </FormField>
    </form>
  );
}
