/**
 * The Settings island (admins): the repeat-repair window (a preview says how many defects the new window would
 * change before anything is written; saving recomputes every vehicle's repeat links in one transaction), the
 * hourly labour rate used for repair costs, and the currency every amount is in.
 */
import { useEffect, useMemo, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { ApiError } from '@/lib/client/api-client';
import { FormField, fieldAria } from '@/components/ui/FormField';
import { formatInstant, formatMoneyMinor } from '@/components/defects/format';
import { REPEAT_WINDOW_MAX_DAYS, REPEAT_WINDOW_MIN_DAYS, type SettingsChangeResult } from '@/lib/contracts/settings';
import { moneyCurrencies } from '@/lib/money/currency';
import { useChangeSettings, useSettings } from './queries';
import { checkRate } from './rate';

const fmt = (n: number) => n.toLocaleString('en-GB');

/** The client-side check of the field (the API checks again). */
function checkDays(text: string): { days: number } | { error: string } {
  if (!/^\d+$/.test(text.trim())) return { error: 'Enter a whole number of days.' };
  const days = Number(text.trim());
  if (days < REPEAT_WINDOW_MIN_DAYS || days > REPEAT_WINDOW_MAX_DAYS) return { error: `Between ${REPEAT_WINDOW_MIN_DAYS} and ${fmt(REPEAT_WINDOW_MAX_DAYS)} days.` };
  return { days };
}

const rateText = (minor: number | null | undefined) => (minor === null || minor === undefined ? '' : (minor / 100).toFixed(2));

function CurrencyForm({ current, loading }: { current: string | undefined; loading: boolean }) {
  const change = useChangeSettings();
  const [choice, setChoice] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const [error, setError] = useState<string | undefined>();
  // NOTE: the list comes from the runtime's ICU data, which may differ between the server and the browser; it is
  // built only once the settings have loaded (in the browser), so the server render and hydration agree.
  const options = useMemo(() => (current ? moneyCurrencies() : []), [current]);
  const value = choice ?? current ?? '';
  return (
    <section className="card card-pad space-y-4" aria-labelledby="currency-h">
      <div>
        <h2 id="currency-h">Currency</h2>
        <p className="mt-1 max-w-prose text-sm text-ink-600">
          The currency of every amount in Seepline: part costs, the labour rate, repair costs and the money columns of the defects download. Changing it
          converts nothing; amounts already recorded keep their numbers and are shown in the new currency.
        </p>
      </div>
      <form
        className="flex flex-wrap items-start gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          setError(undefined);
          change.mutate(
            { patch: { currency: value }, dryRun: false },
            {
              onSuccess: (r) => {
                setSaved(r.settings.currency);
                setChoice(null);
              },
              onError: (err) => setError(err instanceof ApiError && err.issues[0] ? err.issues[0].message : err.message),
            },
          );
        }}
      >
        <FormField id="currency" label="Currency (ISO 4217)" error={error} hint={current ? `In force: ${current}` : undefined} className="w-72">
          <select
            {...fieldAria('currency', error, !!current)}
            className="input"
            value={value}
            onChange={(e) => {
              setChoice(e.target.value);
              setSaved(null);
            }}
            disabled={loading}
          >
            {options.map((c) => (
              <option key={c.code} value={c.code}>
                {c.code} · {c.name}
              </option>
            ))}
          </select>
        </FormField>
        <div className="sm:mt-6">
          <button type="submit" className="btn-primary" disabled={change.isPending || loading || !value || value === current}>
            {change.isPending ? 'Saving…' : 'Save the currency'}
          </button>
        </div>
      </form>
      {saved && (
        <p role="status" className="rounded-md border border-moss-600/40 bg-moss-50 px-4 py-3 text-sm text-moss-700">
          <strong>Saved.</strong> Amounts are now shown in {saved} ({formatMoneyMinor(12345, saved)} for example).
        </p>
      )}
    </section>
  );
}

function LabourRateForm({ current, currency, loading }: { current: number | null | undefined; currency: string | undefined; loading: boolean }) {
  const change = useChangeSettings();
  const [text, setText] = useState<string | null>(null);
  const [fieldError, setFieldError] = useState<string | undefined>();
  const [saved, setSaved] = useState<number | null | undefined>(undefined);
  const value = text ?? rateText(current);
  const parsed = checkRate(value);
  const unchanged = 'minor' in parsed && parsed.minor === (current ?? null);
  return (
    <section className="card card-pad space-y-4" aria-labelledby="labour-rate-h">
      <div>
        <h2 id="labour-rate-h">Labour rate</h2>
        <p className="mt-1 max-w-prose text-sm text-ink-600">
          A defect's cost is its parts plus its labour minutes at this hourly rate. The rate applies whenever a defect's parts or labour are saved from now on;
          costs already recorded stay as they are. Leave it empty to count parts only.
        </p>
      </div>
      <form
        className="flex flex-wrap items-start gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          const c = checkRate(value);
          if ('error' in c) {
            setFieldError(c.error);
            return;
          }
          setFieldError(undefined);
          change.mutate(
            { patch: { labourRateMinorPerHour: c.minor }, dryRun: false },
            {
              onSuccess: (r) => {
                setSaved(r.settings.labourRateMinorPerHour);
                setText(null);
              },
              onError: (e) => setFieldError(e instanceof ApiError && e.issues[0] ? e.issues[0].message : e.message),
            },
          );
        }}
      >
        <FormField
          id="labour-rate"
          label={currency ? `Rate per hour (${currency})` : 'Rate per hour'}
          error={fieldError}
          hint={current === undefined ? undefined : current === null ? 'In force: none (parts only)' : `In force: ${formatMoneyMinor(current, currency)} an hour`}
          className="w-56"
        >
          <input
            {...fieldAria('labour-rate', fieldError, current !== undefined)}
            className="input"
            inputMode="decimal"
            value={value}
            onChange={(e) => {
              setText(e.target.value);
              setSaved(undefined);
            }}
            disabled={loading}
          />
        </FormField>
        <div className="sm:mt-6">
          <button type="submit" className="btn-primary" disabled={change.isPending || loading || unchanged}>
            {change.isPending ? 'Saving…' : 'Save the rate'}
          </button>
        </div>
      </form>
      {saved !== undefined && (
        <p role="status" className="rounded-md border border-moss-600/40 bg-moss-50 px-4 py-3 text-sm text-moss-700">
          <strong>Saved.</strong> {saved === null ? 'No labour rate: costs count parts only.' : `Labour is costed at ${formatMoneyMinor(saved, currency)} an hour.`}
        </p>
      )}
    </section>
  );
}

function Outcome({ r }: { r: SettingsChangeResult }) {
  const { defectsChanged, repeatsBefore, repeatsAfter, vehiclesChecked } = r.recompute;
  const what = `${fmt(defectsChanged)} ${defectsChanged === 1 ? 'defect' : 'defects'}`;
  return (
    <div role="status" className={`rounded-md border px-4 py-3 text-sm ${r.dryRun ? 'border-seep-500/40 bg-seep-50 text-seep-700' : 'border-moss-600/40 bg-moss-50 text-moss-700'}`}>
      {r.dryRun ? (
        <p>
          <strong>Preview, nothing saved:</strong> a window of {fmt(r.settings.repeatWindowDays)} days would change the repeat link of {what}; repeats would go
          from {fmt(repeatsBefore)} to {fmt(repeatsAfter)}.
        </p>
      ) : (
        <p>
          <strong>Saved.</strong> The repeat window is now {fmt(r.settings.repeatWindowDays)} days. Repeat links were recomputed on {fmt(vehiclesChecked)} vehicles: {what}{' '}
          changed; repeats went from {fmt(repeatsBefore)} to {fmt(repeatsAfter)}.
        </p>
      )}
    </div>
  );
}

function SettingsForm() {
  const settings = useSettings();
  const change = useChangeSettings();
  const [text, setText] = useState('');
  const [fieldError, setFieldError] = useState<string | undefined>();
  const [result, setResult] = useState<SettingsChangeResult | null>(null);
  const current = settings.data?.repeatWindowDays;

  useEffect(() => {
    if (current !== undefined && text === '') setText(String(current));
  }, [current, text]);

  const run = (dryRun: boolean) => {
    const c = checkDays(text);
    if ('error' in c) {
      setFieldError(c.error);
      return;
    }
    setFieldError(undefined);
    change.mutate(
      { patch: { repeatWindowDays: c.days }, dryRun },
      {
        onSuccess: (r) => setResult(r),
        onError: (e) => {
          setResult(null);
          if (e instanceof ApiError && e.issues[0]) setFieldError(e.issues[0].message);
        },
      },
    );
  };

  const parsed = checkDays(text);
  const unchanged = 'days' in parsed && parsed.days === current;
  const formError = change.error && !(change.error instanceof ApiError && change.error.issues.length) ? change.error.message : null;

  return (
    <div className="space-y-5">
      <section className="card card-pad space-y-4" aria-labelledby="repeat-window-h">
        <div>
          <h2 id="repeat-window-h">Repeat-repair window</h2>
          <p className="mt-1 max-w-prose text-sm text-ink-600">
            A defect is a repeat when the same vehicle had an earlier defect on the same door and module function that was closed no more than this
            many days before the new one was reported. Repeats are flagged on the Defects list and on each defect, and counted on the Overview. Changing the window recomputes the repeat link of
            every defect at once.
          </p>
        </div>
        <form
          className="flex flex-wrap items-start gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            run(false);
          }}
        >
          <FormField id="repeat-window" label="Window in days" error={fieldError} hint={current !== undefined ? `In force: ${current} days (default 90)` : undefined} className="w-56">
            <input
              {...fieldAria('repeat-window', fieldError, current !== undefined)}
              className="input"
              inputMode="numeric"
              value={text}
              onChange={(e) => {
                setText(e.target.value);
                setResult(null);
              }}
              disabled={settings.isPending}
            />
          </FormField>
          <div className="flex flex-wrap gap-3 sm:mt-6">
            <button type="button" className="btn-secondary" disabled={change.isPending || settings.isPending || unchanged} onClick={() => run(true)}>
              Preview the effect
            </button>
            <button type="submit" className="btn-primary" disabled={change.isPending || settings.isPending || unchanged}>
              {change.isPending && !change.variables?.dryRun ? 'Recomputing…' : 'Save and recompute'}
            </button>
          </div>
        </form>
        {result && <Outcome r={result} />}
        {formError && (
          <p role="alert" className="text-sm text-brick-700">
            {formError}
          </p>
        )}
        {settings.error && (
          <p role="alert" className="text-sm text-brick-700">
            The settings could not be loaded: {settings.error.message}
          </p>
        )}
      </section>

      <LabourRateForm current={settings.data?.labourRateMinorPerHour} currency={settings.data?.currency} loading={settings.isPending} />

      <CurrencyForm current={settings.data?.currency} loading={settings.isPending} />

      <section className="card" aria-labelledby="settings-history-h">
        <div className="border-b border-ink-200 px-4 py-3">
          <h2 id="settings-history-h">Recent changes</h2>
        </div>
        <div className="table-wrap">
          <table className="data-table">
            <caption className="sr-only">Recent changes of settings</caption>
            <thead>
              <tr>
                <th>When</th>
                <th>Who</th>
                <th>Change</th>
              </tr>
            </thead>
            <tbody>
              {(settings.data?.changes ?? []).map((c, i) => (
                <tr key={`${c.at}-${i}`}>
                  <td className="whitespace-nowrap">{formatInstant(c.at)}</td>
                  <td>{c.who}</td>
                  <td>
                    {c.action === 'recompute_repeats'
                      ? `Repeat links recomputed: ${c.newValue ?? ''} (was ${c.oldValue ?? '–'})`
                      : c.field === 'labour_rate_minor_per_hour'
                        ? `Labour rate ${c.oldValue === null ? 'none' : formatMoneyMinor(Number(c.oldValue))} → ${c.newValue === null ? 'none' : formatMoneyMinor(Number(c.newValue))} an hour`
                        : c.field === 'currency'
                          ? `Currency ${c.oldValue ?? '–'} → ${c.newValue ?? '–'}`
                          : `Repeat window ${c.oldValue ?? '–'} → ${c.newValue ?? '–'} days`}
                  </td>
                </tr>
              ))}
              {settings.data && (settings.data.changes ?? []).length === 0 && (
                <tr>
                  <td colSpan={3} className="text-ink-500">
                    No changes made here yet.
                  </td>
                </tr>
              )}
            </tbody>
          </table>
        </div>
      </section>
    </div>
  );
}

/** Island root. */
export default function SettingsView() {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <SettingsForm />
    </QueryClientProvider>
  );
}
