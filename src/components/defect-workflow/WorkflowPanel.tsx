/**
 * Where a defect stands and what comes next (island): status, the steps so far with who and when, the next
 * step as the obvious button, the release verification, repeat links, and the dialogs for verifying, closing,
 * cancelling and re-opening. Offers only the steps the lifecycle engine allows this person; the server checks
 * again and its refusal (for example closing a window lifter without the verification) is shown here.
 * A step first saves the edits still pending in the page's forms (a technician who typed the action and
 * pressed "Mark repaired" expects both; docs/decisions/014), and the latest reason given for a re-open,
 * cancel or restore is shown at the top, where the person working the defect looks first.
 */
import { useId, useMemo, useState, type ReactNode } from 'react';
import { QueryClientProvider, useQueryClient } from '@tanstack/react-query';
import { Check, CircleDot, MessageSquareWarning } from 'lucide-react';
import { useIslandQueryClient } from '@/components/defect-workflow/island-client';
import { ApiError } from '@/lib/client/api-client';
import type { DefectRecord } from '@/lib/contracts/defects';
import { nextSteps, type NextStep, type WorkflowRole } from '@/lib/defects/transitions';
import { FUNCTION_LABELS, ROOT_CAUSE_LABELS, STATUS_BADGE, STATUS_LABELS } from '@/components/labels';
import { formatInstant, formatInstantDate } from '@/components/defects/format';
import { Dialog } from '@/components/ui/Dialog';
import { SafetyCautions } from '@/components/defect-fields/SafetyCautions';
import { defectKey, staleRecord, useDefect, useStep, type StepInput } from './queries';
import { useHydrated } from '@/components/defect-fields/use-hydrated';
import { LeavePrompt, listWords } from '@/components/defect-fields/LeavePrompt';
import { flushUnsaved, useUnsavedSnapshot } from '@/components/defect-fields/unsaved';
import { checkVerificationTime } from '@/lib/defects/times';
import { latestReason } from '@/lib/defects/status-reason';

type Props = { initial: DefectRecord; role: WorkflowRole; timeZone: string | null };

const MAIN = ['reported', 'diagnosing', 'awaiting_parts', 'repaired', 'verified', 'closed'] as const;

/** What to do next, in words, for a status. */
function guidance(r: DefectRecord, canWork: boolean, timeZone: string | null): string {
  const fn = FUNCTION_LABELS[r.moduleFunction]?.toLowerCase() ?? r.moduleFunction;
  switch (r.status) {
    case 'reported':
      return canWork ? 'Next: start the diagnosis — read the fault codes, look inside the door, and record what you find below.' : 'Waiting for a technician to start the diagnosis.';
    case 'diagnosing':
      return 'Next: record the findings and the action below, then mark it repaired — or set it waiting for parts.';
    case 'awaiting_parts':
      return 'Waiting for parts. When they are fitted, write down the action and mark it repaired.';
    case 'repaired':
      return r.safetyVerificationRequired
        ? `Next: re-initialise the window as the maker's procedure says, check that automatic closing reverses on an obstruction, and record that verification. A ${fn} cannot be closed without it.`
        : 'Next: check the repair works, then mark it verified or close it with its root cause.';
    case 'verified':
      return 'Next: close the defect; the vehicle can then be released.';
    case 'closed':
      return `Closed${r.closedAt ? ` on ${formatInstantDate(r.closedAt, timeZone)}` : ''}. Re-opening is for supervisors, fleet managers and admins.`;
    case 'cancelled':
      return 'Cancelled. Supervisors, fleet managers and admins can restore it.';
  }
}

/** Words for what a step does, to say it was not done ("Not marked repaired: …"). */
const NOT_DONE: Record<string, string> = {
  start_diagnosis: 'Diagnosis not started',
  await_parts: 'Not set to wait for parts',
  resume_diagnosis: 'Not moved back to diagnosis',
  mark_repaired: 'Not marked repaired',
  reject_repair: 'Not moved back to diagnosis',
  verify: 'Verification not recorded',
  close: 'Not closed',
  reopen_work: 'Not moved back to diagnosis',
  cancel: 'Not cancelled',
  reopen: 'Not re-opened',
  restore: 'Not restored',
};

function Panel({ initial, role, timeZone }: Props) {
  const { data: r } = useDefect(initial);
  const qc = useQueryClient();
  const step = useStep(r.id);
  const [alert, setAlert] = useState<string | null>(null);
  const [saving, setSaving] = useState(false);
  const [dialog, setDialog] = useState<NextStep | null>(null);
  const canWork = role !== 'viewer';
  const hydrated = useHydrated();
  const unsaved = useUnsavedSnapshot();
  const pendingAction = typeof unsaved.pending.action === 'string' && unsaved.pending.action.trim() !== '';
  const pendingRootCause = typeof unsaved.pending.rootCause === 'string' && unsaved.pending.rootCause !== '';
  const steps = useMemo(
    () =>
      nextSteps(r.status, {
        role,
        moduleFunction: r.moduleFunction,
        // What the forms hold unsaved counts too: the step saves it first.
        hasAction: !!r.action?.trim() || pendingAction,
        hasRootCause: r.rootCause !== null || pendingRootCause,
        verification: r.verification ? { reinitialised: r.verification.reinitialised, reversalVerified: r.verification.reversalVerified, byUserId: r.verification.byId, atMs: r.verification.at ? Date.parse(r.verification.at) : null } : null,
        reason: null,
      }),
    [r, role, pendingAction, pendingRootCause],
  );

  /** Take a step; returns the error message, or null when it went through. */
  const take = async (input: Omit<StepInput, 'version'>): Promise<string | null> => {
    setAlert(null);
    try {
      // The newest version in the page's cache: a save of pending edits just before the step moved it on.
      const version = qc.getQueryData<DefectRecord>(defectKey(r.id))?.version ?? r.version;
      await step.mutateAsync({ ...input, version });
      return null;
    } catch (e) {
      const current = staleRecord(e);
      if (current) return `Someone else changed this defect meanwhile (it is now ${STATUS_LABELS[current.status]?.toLowerCase()}). Check the page, then try again.`;
      return e instanceof ApiError || e instanceof Error ? e.message : 'That did not work; try again.';
    }
  };

  const onStep = async (s: NextStep) => {
    const k = s.rule.key;
    setAlert(null);
    if (unsaved.savableLabels.length > 0) {
      // Save what the person typed before the step, so the step sees it (and nothing typed is lost).
      setSaving(true);
      const saved = await flushUnsaved().finally(() => setSaving(false));
      if (!saved.ok) {
        setAlert(`${NOT_DONE[k] ?? 'Not done'}: your changes to ${saved.label} could not be saved first. Fix what is marked there (or compare the changes someone else made), then try again.`);
        return;
      }
    }
    if (k === 'close' || k === 'cancel' || k === 'reopen' || k === 'restore' || (k === 'verify' && r.safetyVerificationRequired)) {
      setAlert(null);
      setDialog(s);
      return;
    }
    const msg = await take({ to: s.rule.to });
    if (msg) setAlert(msg);
  };

  const lastAt = (status: string) => {
    if (status === 'reported') return { at: r.reportedAt, by: r.reporterName ?? r.reportedBy };
    const t = [...r.timeline].reverse().find((x) => x.to === status);
    return t ? { at: t.at, by: t.by } : null;
  };
  const visited = new Set(r.timeline.map((t) => t.to));
  const shown = MAIN.filter((s) => s !== 'awaiting_parts' || visited.has(s) || r.status === s);
  const currentIndex = shown.indexOf(r.status as (typeof MAIN)[number]);
  const primary = steps.find((s) => s.rule.forward);
  const why = latestReason(r.timeline);

  return (
    <section className="card" aria-labelledby="h-status" data-testid="workflow-panel">
      <LeavePrompt />
      <div className="flex flex-wrap items-center gap-x-3 gap-y-2 border-b border-ink-200 px-4 py-3 sm:px-5">
        <h2 id="h-status">Status</h2>
        <span className={`${STATUS_BADGE[r.status] ?? 'badge-neutral'} text-sm`} data-testid="defect-status" aria-live="polite">
          {STATUS_LABELS[r.status] ?? r.status}
        </span>
        {r.repeatOf && (
          <a className="badge-brick text-sm hover:underline" href={`/defects/${r.repeatOf.id}`} data-testid="repeat-badge">
            Repeat of <span className="mono">{r.repeatOf.ref}</span>
          </a>
        )}
        <span className="ml-auto text-sm text-ink-600">
          {r.assignedTo ? (
            <>
              Assigned to <span className="font-semibold text-ink-800">{r.assignedTo}</span>
            </>
          ) : r.open ? (
            'Not assigned yet; starting the diagnosis takes it on'
          ) : null}
        </span>
      </div>

      <div className="px-4 py-4 sm:px-5">
        {why && r.status !== 'cancelled' && (
          <div className="mb-4 flex items-start gap-2.5 rounded-md border-l-4 border-amber-600 bg-amber-50 px-3 py-2.5 text-[15px] text-ink-800" data-testid="status-reason">
            <MessageSquareWarning size={18} className="mt-0.5 shrink-0 text-amber-800" aria-hidden="true" />
            <p className="min-w-0">
              <span className="font-semibold text-amber-800">
                {why.kind === 'reopened' ? 'Re-opened' : why.kind === 'restored' ? 'Restored' : 'Cancelled'} {formatInstant(why.at, timeZone)}
                {why.by ? ` by ${why.by}` : ''}:
              </span>{' '}
              <span className="wrap-anywhere">“{why.reason}”</span>
            </p>
          </div>
        )}
        {r.status === 'cancelled' ? (
          <p className="rounded-md border-l-4 border-ink-400 bg-ink-100 px-3 py-2.5 text-[15px] text-ink-800" data-testid="status-reason">
            <span className="font-semibold">
              Cancelled{lastAt('cancelled') ? ` ${formatInstant(lastAt('cancelled')!.at, timeZone)} by ${lastAt('cancelled')!.by ?? 'someone'}` : ''}
            </span>
            {why?.reason ? (
              <>
                : <span className="wrap-anywhere">“{why.reason}”</span>
              </>
            ) : (
              '.'
            )}
          </p>
        ) : (
          <ol className="grid gap-2 sm:auto-cols-fr sm:grid-flow-col sm:gap-0" aria-label="Steps">
            {shown.map((s, i) => {
              const done = i < currentIndex;
              const current = i === currentIndex;
              const when = done || current ? lastAt(s) : null;
              return (
                <li key={s} className="flex items-start gap-2 sm:flex-col sm:gap-1 sm:border-t-4 sm:pt-2 sm:pr-2" style={{ borderColor: done || current ? 'var(--color-estuary-600)' : 'var(--color-ink-200)' }} aria-current={current ? 'step' : undefined}>
                  <span className={`flex items-center gap-1.5 text-sm font-semibold ${current ? 'text-estuary-800' : done ? 'text-ink-800' : 'text-ink-400'}`}>
                    {done ? <Check size={16} aria-hidden="true" /> : current ? <CircleDot size={16} aria-hidden="true" /> : <span className="inline-block h-4 w-4 rounded-full border-2 border-ink-300" aria-hidden="true" />}
                    {STATUS_LABELS[s]}
                    <span className="sr-only">{done ? '(done)' : current ? '(now)' : '(to do)'}</span>
                  </span>
                  {when && (
                    <span className="text-xs text-ink-500">
                      {formatInstant(when.at, timeZone)}
                      {when.by ? ` · ${when.by}` : ''}
                    </span>
                  )}
                </li>
              );
            })}
          </ol>
        )}

        <p className="mt-4 text-[15px] text-ink-800" data-testid="next-step">
          {guidance(r, canWork, timeZone)}
        </p>

        {steps.length > 0 && (
          <div className="mt-3 flex flex-wrap gap-2" role="group" aria-label="Next steps">
            {steps.map((s) => (
              <StepButton key={`${s.rule.key}-${s.rule.to}`} s={s} primary={s === primary} busy={step.isPending || saving || !hydrated} onClick={() => void onStep(s)} />
            ))}
          </div>
        )}
        {steps.length > 0 && unsaved.savableLabels.length > 0 && (
          <p className="mt-2 text-sm text-ink-700" data-testid="unsaved-note">
            {saving ? (
              `Saving your changes to ${listWords(unsaved.savableLabels)}…`
            ) : (
              <>
                <span className="font-semibold text-amber-800">Unsaved changes to {listWords(unsaved.savableLabels)}.</span> A step saves them first.
              </>
            )}
          </p>
        )}
        {alert && (
          <p role="alert" className="mt-3 rounded-md border border-brick-100 bg-brick-50 px-3 py-2 text-sm text-brick-700" data-testid="step-refusal">
            {alert}
          </p>
        )}

        <div className="mt-4 grid gap-3 lg:grid-cols-2">
          <VerificationSummary r={r} timeZone={timeZone} />
          <RepeatSummary r={r} timeZone={timeZone} />
        </div>

        {r.timeline.length > 0 && (
          <details className="mt-4 text-sm">
            <summary className="flex min-h-10 cursor-pointer items-center font-semibold text-estuary-700">All status changes ({r.timeline.length})</summary>
            <ol className="mt-1 space-y-1.5 border-l-2 border-ink-200 pl-4" aria-label="Status changes, oldest first">
              {r.timeline.map((t, i) => (
                <li key={`${t.at}-${i}`}>
                  <span className="text-ink-500">{formatInstant(t.at, timeZone)}</span> · {STATUS_LABELS[t.from] ?? t.from} → <span className="font-semibold">{STATUS_LABELS[t.to] ?? t.to}</span>
                  {t.by && <span className="text-ink-600"> · {t.by}</span>}
                  {t.reason && <span className="block wrap-anywhere text-ink-600">“{t.reason}”</span>}
                </li>
              ))}
            </ol>
          </details>
        )}
      </div>

      {dialog && (
        <StepDialog
          key={`${dialog.rule.key}-${dialog.rule.to}`}
          r={r}
          s={dialog}
          timeZone={timeZone}
          onClose={() => setDialog(null)}
          take={take}
          busy={step.isPending}
          onVerifyFirst={steps.find((x) => x.rule.key === 'verify') ? () => setDialog(steps.find((x) => x.rule.key === 'verify')!) : undefined}
        />
      )}
    </section>
  );
}

const HINTS: Record<string, string> = {
  action: 'needs the action written down',
  root_cause: 'needs the root cause',
  safety_verification: 'needs the release verification',
};

function StepButton({ s, primary, busy, onClick }: { s: NextStep; primary: boolean; busy: boolean; onClick: () => void }) {
  const danger = s.rule.key === 'cancel';
  const blockers = s.missing.filter((m) => m !== 'reason' && !(s.rule.key === 'verify' && m === 'safety_verification'));
  const hintId = useId();
  return (
    <span className="inline-flex flex-col">
      <button
        type="button"
        className={primary ? 'btn-primary' : danger ? 'btn-secondary text-brick-700' : 'btn-secondary'}
        disabled={busy}
        onClick={onClick}
        aria-describedby={blockers.length ? hintId : undefined}
      >
        {s.rule.label}
      </button>
      {blockers.length > 0 && (
        <span id={hintId} className="mt-0.5 max-w-[14rem] text-xs text-ink-500">
          {blockers.map((b) => HINTS[b] ?? b).join('; ')}
        </span>
      )}
    </span>
  );
}

function VerificationSummary({ r, timeZone }: { r: DefectRecord; timeZone: string | null }) {
  const v = r.verification;
  const fn = FUNCTION_LABELS[r.moduleFunction]?.toLowerCase() ?? r.moduleFunction;
  return (
    <div className="rounded-md border border-ink-200 px-3 py-2.5 text-sm" data-testid="verification">
      <h3 className="mb-1 text-sm">Release verification</h3>
      {v && v.reinitialised && v.reversalVerified ? (
        <>
          <p className="text-moss-700">
            <Check size={15} className="mr-1 inline" aria-hidden="true" />
            Window re-initialised and automatic closing seen to reverse on an obstruction.
          </p>
          <p className="text-ink-600">
            Recorded by <span className="font-semibold text-ink-800">{v.by ?? 'unknown'}</span>
            {v.at && <> for {formatInstant(v.at, timeZone)}</>}
            {v.note && <>: “{v.note}”</>}
          </p>
        </>
      ) : r.safetyVerificationRequired ? (
        <p className="text-ink-700">
          {r.status === 'closed'
            ? 'Closed without a verification recorded in Seepline (an imported or historic record).'
            : `Required before this ${fn} is verified or closed: the window re-initialised per the maker's procedure, and automatic closing seen to reverse on an obstruction.`}
        </p>
      ) : (
        <p className="text-ink-600">Not needed for a {fn}: only window lifters, door control modules and door harnesses are verified before release.</p>
      )}
      <p className="mt-1 text-xs text-ink-500">Seepline records this check; it certifies nothing.</p>
    </div>
  );
}

function RepeatSummary({ r, timeZone }: { r: DefectRecord; timeZone: string | null }) {
  if (!r.repeatOf && r.repeatedBy.length === 0) {
    return (
      <div className="rounded-md border border-ink-200 px-3 py-2.5 text-sm text-ink-600">
        <h3 className="mb-1 text-sm text-ink-900">Repeat repairs</h3>
        Not a repeat: no repair of this door's {FUNCTION_LABELS[r.moduleFunction]?.toLowerCase() ?? r.moduleFunction} was closed in the {r.repeatWindowDays} days before this report.
      </div>
    );
  }
  return (
    <div className="rounded-md border border-brick-100 bg-brick-50 px-3 py-2.5 text-sm text-ink-800" data-testid="repeat-summary">
      <h3 className="mb-1 text-sm text-brick-700">Repeat repair</h3>
      {r.repeatOf && (
        <p>
          The same door and module function was repaired in{' '}
          <a className="link mono" href={`/defects/${r.repeatOf.id}`}>
            {r.repeatOf.ref}
          </a>
          {r.repeatOf.closedAt && <>, closed {formatInstantDate(r.repeatOf.closedAt, timeZone)}</>}
          {r.repeatOf.daysAfterClose !== null && <> — this came back {r.repeatOf.daysAfterClose} days later</>} (window: {r.repeatWindowDays} days).
        </p>
      )}
      {r.repeatedBy.length > 0 && (
        <p className={r.repeatOf ? 'mt-1' : ''}>
          Came back as{' '}
          {r.repeatedBy.map((x, i) => (
            <span key={x.id}>
              {i > 0 && ', '}
              <a className="link mono" href={`/defects/${x.id}`}>
                {x.ref}
              </a>{' '}
              ({formatInstantDate(x.reportedAt, timeZone)})
            </span>
          ))}
          .
        </p>
      )}
    </div>
  );
}

type DialogProps = {
  r: DefectRecord;
  s: NextStep;
  timeZone: string | null;
  onClose: () => void;
  take: (input: Omit<StepInput, 'version'>) => Promise<string | null>;
  busy: boolean;
  /** Switch to recording the verification (offered when closing is refused for the lack of it). */
  onVerifyFirst?: () => void;
};

/** An instant as a local date-time for <input type="datetime-local"> (the browser's zone), to the minute. */
function toLocalInput(ms: number): string {
  const d = new Date(ms);
  d.setSeconds(0, 0);
  return new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);
}
/** The browser's local date-time now. */
const localNow = () => toLocalInput(Date.now());
/** The earliest a verification may be dated: the latest step to repaired (its minute), else the report. */
function earliestCheck(r: DefectRecord): number {
  const repaired = [...r.timeline].reverse().find((t) => t.to === 'repaired');
  return Date.parse(repaired?.at ?? r.reportedAt);
}
/** Same allowance for a drifting tablet clock as the server's. */
const CLOCK_SKEW_MS = 5 * 60_000;

function StepDialog({ r, s, timeZone, onClose, take, busy, onVerifyFirst }: DialogProps) {
  const uid = useId();
  const [error, setError] = useState<string | null>(null);
  const [reason, setReason] = useState('');
  const [reinit, setReinit] = useState(false);
  const [reversal, setReversal] = useState(false);
  const [at, setAt] = useState(localNow);
  const [note, setNote] = useState('');
  const key = s.rule.key;
  const verifying = key === 'verify';
  const needsReason = key === 'cancel' || key === 'reopen' || key === 'restore';

  const submit = async () => {
    setError(null);
    if (needsReason && !reason.trim()) return setError('Say why.');
    if (verifying && !(reinit && reversal)) return setError('Tick both checks once they are done; if the window does not reverse, it is not fixed — use "Fault not cleared".');
    if (verifying) {
      const atMs = new Date(at).getTime();
      if (Number.isNaN(atMs)) return setError('Give the date and time the checks were done.');
      const repaired = [...r.timeline].reverse().find((t) => t.to === 'repaired');
      const problem = checkVerificationTime({ atMs, nowMs: Date.now(), reportedAtMs: Date.parse(r.reportedAt), repairedAtMs: repaired ? Date.parse(repaired.at) : null, skewMs: CLOCK_SKEW_MS });
      if (problem) return setError(problem.code === 'before_repair' ? `${problem.message} The repair was recorded ${formatInstant(repaired!.at, timeZone)}.` : problem.message);
    }
    const input: Omit<StepInput, 'version'> = { to: s.rule.to };
    if (needsReason) input.reason = reason.trim();
    if (verifying) input.verification = { reinitialised: true, reversalVerified: true, at: new Date(at).toISOString(), note: note.trim() || null };
    const msg = await take(input);
    if (msg) setError(msg);
    else onClose();
  };

  const title = verifying ? 'Record the release verification' : key === 'close' ? `Close ${r.ref}` : key === 'cancel' ? `Cancel ${r.ref}?` : `${s.rule.label}: ${r.ref}`;
  let body: ReactNode;
  if (verifying) {
    body = (
      <div className="space-y-3">
        <SafetyCautions step="closing" />
        <fieldset className="space-y-1">
          <legend className="field-label">Checks done on the vehicle</legend>
          <label className="flex min-h-10 items-start gap-2.5 py-1 text-[15px]">
            <input type="checkbox" className="mt-0.5 h-5 w-5 accent-estuary-700" checked={reinit} onChange={(e) => setReinit(e.target.checked)} />
            <span>The window has been re-initialised as the vehicle maker's procedure says</span>
          </label>
          <label className="flex min-h-10 items-start gap-2.5 py-1 text-[15px]">
            <input type="checkbox" className="mt-0.5 h-5 w-5 accent-estuary-700" checked={reversal} onChange={(e) => setReversal(e.target.checked)} />
            <span>Automatic closing reverses on an obstruction</span>
          </label>
        </fieldset>
        <div className="grid gap-3 sm:grid-cols-2">
          <div>
            <label htmlFor={`${uid}-at`} className="field-label">
              Checked at
            </label>
            <input id={`${uid}-at`} type="datetime-local" className="input" value={at} min={toLocalInput(earliestCheck(r))} max={localNow()} onChange={(e) => setAt(e.target.value)} />
            <p className="mt-1 text-xs text-ink-500">Not before the repair was recorded, not in the future.</p>
          </div>
          <div>
            <label htmlFor={`${uid}-note`} className="field-label">
              How it was checked <span className="font-normal text-ink-500">(optional)</span>
            </label>
            <input id={`${uid}-note`} className="input" maxLength={300} placeholder="e.g. test rod at the top of travel" value={note} onChange={(e) => setNote(e.target.value)} />
          </div>
        </div>
        <p className="text-xs text-ink-500">You are recorded as the person who did the checks. Seepline records them; it certifies nothing.</p>
      </div>
    );
  } else if (key === 'close') {
    body = (
      <div className="space-y-3">
        <SafetyCautions step="closing" />
        <dl className="dl-grid">
          <dt>Root cause</dt>
          <dd>{r.rootCause ? ROOT_CAUSE_LABELS[r.rootCause] : <span className="text-brick-700">Not recorded yet</span>}</dd>
          <dt>Action</dt>
          <dd>{r.action ?? <span className="text-ink-500">Not recorded</span>}</dd>
          <dt>Verification</dt>
          <dd>
            {r.verification?.reinitialised && r.verification.reversalVerified
              ? `Recorded by ${r.verification.by ?? 'unknown'}${r.verification.at ? `, ${formatInstant(r.verification.at, timeZone)}` : ''}`
              : r.safetyVerificationRequired
                ? <span className="font-semibold text-brick-700">Not recorded — required for this module</span>
                : 'Not needed for this module'}
          </dd>
        </dl>
        <p className="text-sm text-ink-700">Closing releases the defect; re-opening it later is for supervisors.</p>
      </div>
    );
  } else {
    body = (
      <div>
        <label htmlFor={`${uid}-reason`} className="field-label">
          Reason <span className="text-brick-600">*</span>
        </label>
        <textarea id={`${uid}-reason`} rows={3} className="input" maxLength={500} value={reason} onChange={(e) => setReason(e.target.value)} />
        <p className="mt-1 text-xs text-ink-500">Kept on the timeline and in the audit trail.</p>
      </div>
    );
  }
  return (
    <Dialog
      open
      onClose={onClose}
      title={title}
      size="md"
      footer={
        <>
          {/* The labels never change with an error; "Keep the defect" so that two buttons never both say "Cancel". */}
          <button type="button" className="btn-secondary" onClick={onClose}>
            {key === 'cancel' ? 'Keep the defect' : 'Cancel'}
          </button>
          <button type="button" className={key === 'cancel' ? 'btn-danger' : 'btn-primary'} disabled={busy} onClick={() => void submit()}>
            {busy ? 'Working…' : verifying ? 'Record verification' : key === 'close' ? 'Close defect' : key === 'cancel' ? 'Cancel the defect' : s.rule.label}
          </button>
        </>
      }
    >
      {body}
      {error && (
        <div role="alert" className="mt-3 rounded-md border border-brick-100 bg-brick-50 px-3 py-2 text-sm text-brick-700" data-testid="dialog-refusal">
          <p>{error}</p>
          {key === 'close' && onVerifyFirst && /release verification/.test(error) && (
            <button type="button" className="btn-secondary mt-2" onClick={onVerifyFirst}>
              Record the verification now
            </button>
          )}
        </div>
      )}
    </Dialog>
  );
}

/** Island root. */
export default function WorkflowPanel(props: Props) {
  const client = useIslandQueryClient();
  return (
    <QueryClientProvider client={client}>
      <Panel {...props} />
    </QueryClientProvider>
  );
}
