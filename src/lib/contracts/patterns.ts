/**
 * Request schemas of the pattern-record routes (status changes, the records list), shared by the API and the
 * Patterns islands. Edit when a status move needs another field or a campaign kind is added.
 */
import { z } from 'zod';

/** Campaign kinds: what a fleet manager decides for a cohort. */
export const CAMPAIGN_KIND_VALUES = ['inspect_cohort', 'washing_practice', 'new_membranes', 'reseal_connectors', 'replace_module', 'other'] as const;
export type CampaignKind = (typeof CAMPAIGN_KIND_VALUES)[number];

/** Pattern statuses (see src/lib/patterns/records.ts for the allowed moves). */
export const PATTERN_STATUS_ENUM = ['new', 'acknowledged', 'campaign_planned', 'resolved', 'dismissed'] as const;

/** Longest note or reason kept with a status change. */
export const PATTERN_NOTE_MAX = 2000;

const note = z.string().trim().max(PATTERN_NOTE_MAX, `At most ${PATTERN_NOTE_MAX} characters`);
/** True for a real calendar day written `YYYY-MM-DD`. */
export function isCalendarDate(v: string): boolean {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(v);
  if (!m) return false;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return d.toISOString().slice(0, 10) === v;
}

const calendarDate = z
  .string()
  .trim()
  .refine(isCalendarDate, 'A date YYYY-MM-DD')
  .refine((v) => v >= '2000-01-01' && v <= '2100-12-31', 'A date between 2000 and 2100');

/** The campaign recorded with the "campaign planned" status. */
export const CampaignSchema = z.object({
  kind: z.enum(CAMPAIGN_KIND_VALUES, `kind must be one of ${CAMPAIGN_KIND_VALUES.join(', ')}`),
  note: note.min(3, 'Say what the campaign does (at least 3 characters)'),
  targetDate: calendarDate,
});
export type Campaign = z.infer<typeof CampaignSchema>;

const version = z.number().int().positive().optional();

/** Body of `POST /api/patterns/{id}/status`. `version`, when sent, must match the record's (else 409). */
export const PatternStatusChangeSchema = z.discriminatedUnion(
  'status',
  [
    z.object({ status: z.literal('acknowledged'), note: note.optional(), version }),
    z.object({ status: z.literal('campaign_planned'), campaign: CampaignSchema, note: note.optional(), version }),
    z.object({ status: z.literal('resolved'), note: note.optional(), version }),
    z.object({ status: z.literal('dismissed'), reason: note.min(3, 'Give the reason for dismissing (at least 3 characters)'), version }),
  ],
  'status must be acknowledged, campaign_planned, resolved or dismissed',
);
export type PatternStatusChange = z.infer<typeof PatternStatusChangeSchema>;

const list = (allowed: readonly string[], name: string) =>
  z
    .string()
    .max(200)
    .transform((v) => v.split(',').map((s) => s.trim()).filter(Boolean))
    .refine((vs) => vs.every((v) => allowed.includes(v)), `${name} must be among ${allowed.join(', ')}`);

/** Query of `GET /api/patterns/records`. */
export const PatternRecordsQuerySchema = z.object({
  status: list(PATTERN_STATUS_ENUM, 'status').optional(),
  module: z.string().trim().max(32).optional(),
  water: z.enum(['1', '0', 'true', 'false'], 'water must be 1 or 0').optional(),
  changed: z.enum(['1', '0', 'true', 'false'], 'changed must be 1 or 0').optional(),
});
export type PatternRecordsQuery = z.infer<typeof PatternRecordsQuerySchema>;
