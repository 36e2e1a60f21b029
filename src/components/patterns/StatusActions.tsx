/**
 * The actions on a pattern for fleet managers and admins: one button per allowed status move, each opening a
 * dialog that asks for what the move needs (a campaign's kind, note and target date; a reason to dismiss; an
 * optional note otherwise). The server checks the move again and answers 409 when someone else moved it first.
 */
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { CAMPAIGN_KIND_VALUES, CampaignSchema, PATTERN_NOTE_MAX, type PatternRecordDetail, type PatternStatusValue } from '@/lib/contracts/patterns';
import { Dialog } from '@/components/ui/Dialog';
import { FormError, FormField, fieldAria } from '@/components/ui/FormField';
import { ApiError } from '@/lib/client/api-client';
import { formatDay } from '@/lib/patterns/records';

import { CAMPAIGN_KIND_LABELS, PATTERN_STATUS_LABELS, STATUS_ACTION_LABELS } from './labels';
import { useChangeStatus } from './queries';

type Move = Exclude<PatternStatusValue, 'new'>;

const FormSchema = z.object({
  kind: z.string(),
  campaignNote: z.string(),
  targetDate: z.string(),
  text: z.string().max(PATTERN_NOTE_MAX, `At most ${PATTERN_NOTE_MAX} characters`),
});
type FormValues = z.infer<typeof FormSchema>;

function actionLabel(from: PatternStatusValue, to: Move): string {
  if (to === 'acknowledged' && (from === 'resolved' || from === 'dismissed')) return 'Reopen';
  if (to === 'campaign_planned' && from === 'campaign_planned') return 'Change the campaign';
  return STATUS_ACTION_LABELS[to];
}

/** Today (UTC, as the server judges target dates), `YYYY-MM-DD`. */
const todayUtc = () => new Date().toISOString().slice(0, 10);

function StatusDialog({ record, move, onClose }: { record: PatternRecordDetail; move: Move; onClose: () => void }) {
  const change = useChangeStatus(record.id);
  const [formError, setFormError] = useState<string | null>(null);
  const campaign = record.campaign;
  const isCampaign = move === 'campaign_planned';
  const revising = isCampaign && record.status === 'campaign_planned';
  const today = todayUtc();
  const schema = FormSchema.superRefine((v, ctx) => {
    if (isCampaign) {
      const r = CampaignSchema.safeParse({ kind: v.kind, note: v.campaignNote, targetDate: v.targetDate });
      if (!r.success) {
        for (const i of r.error.issues) {
          const field = i.path[0] === 'note' ? 'campaignNote' : String(i.path[0]);
          // The schema's messages name API values; the form speaks to people.
          const message = field === 'kind' ? 'Choose what the campaign is' : field === 'targetDate' && !v.targetDate ? 'Choose a target date' : i.message;
          ctx.addIssue({ code: 'custom', path: [field], message });
        }
      } else if (v.targetDate < today) {
        ctx.addIssue({ code: 'custom', path: ['targetDate'], message: `The target date must be today (${formatDay(today)}) or later` });
      }
      if (revising && campaign && v.kind === campaign.kind && v.campaignNote.trim() === campaign.note && v.targetDate === campaign.targetDate && !v.text.trim()) {
        ctx.addIssue({ code: 'custom', path: ['kind'], message: 'Nothing changed: change what the campaign is, what it does or its target date' });
      }
    }
    if (move === 'dismissed' && v.text.trim().length < 3) ctx.addIssue({ code: 'custom', path: ['text'], message: 'Give the reason for dismissing (at least 3 characters)' });
  });
  const form = useForm<FormValues>({
    resolver: zodResolver(schema),
    defaultValues: {
      kind: campaign?.kind ?? '',
      campaignNote: campaign?.note ?? '',
      targetDate: campaign?.targetDate ?? '',
      text: '',
    },
  });
  const errors = form.formState.errors;
  const submit = form.handleSubmit(async (v) => {
    setFormError(null);
    const note = v.text.trim() || undefined;
    const body =
      move === 'campaign_planned'
        ? { status: move, campaign: { kind: v.kind as (typeof CAMPAIGN_KIND_VALUES)[number], note: v.campaignNote.trim(), targetDate: v.targetDate }, note, version: record.version }
        : move === 'dismissed'
          ? { status: move, reason: v.text.trim(), version: record.version }
          : { status: move, note, version: record.version };
    try {
      await change.mutateAsync(body);
      onClose();
    } catch (e) {
      // The server's word on a field goes next to the field (a target date judged on the server's day, for one).
      if (e instanceof ApiError && e.status === 400 && e.issues?.some((i) => i.path === 'campaign.targetDate')) {
        form.setError('targetDate', { message: e.issues.find((i) => i.path === 'campaign.targetDate')!.message });
      }
      setFormError(e instanceof ApiError && e.status === 409 ? `${e.message} Close this dialog and reload the page to see the current state.` : e instanceof Error ? e.message : 'That did not work; try again.');
    }
  });
  const title = `${actionLabel(record.status, move)}: ${record.moduleCode} ${record.exposureBand} exposure`;
  const textLabel = move === 'dismissed' ? 'Reason for dismissing' : isCampaign ? 'Anything else to record (optional)' : 'Note (optional)';
  return (
    <Dialog
      open
      onClose={onClose}
      title={title}
      description={
        revising
          ? 'Only what you change is recorded, with your name and the time, as one “campaign revised” entry.'
          : `${PATTERN_STATUS_LABELS[record.status]} → ${PATTERN_STATUS_LABELS[move]}, recorded with your name and the time.`
      }
      footer={
        <>
          <button type="button" className="btn-secondary" onClick={onClose}>
            Cancel
          </button>
          <button type="submit" form="pattern-status-form" className="btn-primary" disabled={change.isPending}>
            {change.isPending ? 'Saving…' : revising ? 'Save the changes' : isCampaign ? 'Save the campaign' : actionLabel(record.status, move)}
          </button>
        </>
      }
    >
      <form id="pattern-status-form" className="space-y-4" onSubmit={submit} noValidate>
        <FormError message={formError} />
        {isCampaign && (
          <>
            <FormField id="campaign-kind" label="Campaign" required error={errors.kind?.message}>
              <select className="input" {...fieldAria('campaign-kind', errors.kind?.message)} {...form.register('kind')}>
                <option value="">Choose what to do…</option>
                {CAMPAIGN_KIND_VALUES.map((k) => (
                  <option key={k} value={k}>
                    {CAMPAIGN_KIND_LABELS[k]}
                  </option>
                ))}
              </select>
            </FormField>
            <FormField id="campaign-note" label="What the campaign does" required error={errors.campaignNote?.message} hint="Which vehicles, which doors, what is checked or replaced, who does it.">
              <textarea rows={3} className="input" {...fieldAria('campaign-note', errors.campaignNote?.message, true)} {...form.register('campaignNote')} />
            </FormField>
            <FormField id="campaign-target" label="Target date" required error={errors.targetDate?.message} hint="Today or later.">
              <input type="date" className="input" min={today} {...fieldAria('campaign-target', errors.targetDate?.message, true)} {...form.register('targetDate')} />
            </FormField>
          </>
        )}
        <FormField id="status-text" label={textLabel} required={move === 'dismissed'} error={errors.text?.message}>
          <textarea rows={3} className="input" {...fieldAria('status-text', errors.text?.message)} {...form.register('text')} />
        </FormField>
        {isCampaign && (
          <p className="caution">
            Campaign work opens doors that can hold airbag and side-impact sensor wiring: follow the vehicle maker's procedure, back-probe connectors
            rather than piercing insulation, and after window-lifter or door-module work re-initialise the window and check that it reverses on an
            obstruction before release.
          </p>
        )}
      </form>
    </Dialog>
  );
}

/** The status panel's buttons and their dialogs. */
export function StatusActions({ record }: { record: PatternRecordDetail }) {
  const [move, setMove] = useState<Move | null>(null);
  const moves = record.allowedStatuses.filter((s): s is Move => s !== 'new');
  if (moves.length === 0) return null;
  return (
    <div className="flex flex-wrap gap-2">
      {moves.map((m) => (
        <button key={m} type="button" className={m === 'campaign_planned' ? 'btn-primary' : m === 'dismissed' ? 'btn-ghost' : 'btn-secondary'} onClick={() => setMove(m)}>
          {actionLabel(record.status, m)}
        </button>
      ))}
      {move && <StatusDialog record={record} move={move} onClose={() => setMove(null)} />}
    </div>
  );
}
