/**
 * Request schemas and response types of the defect workflow, shared by the API routes and the forms
 * (report, diagnosis and repair record, transitions, verification, photos). Inputs are lenient where clients
 * differ (snake_case keys are normalised by the server; numbers may come as text; empty text means "none"),
 * and strict about values. The import-format rules (VIN form, dates, closed after reported) are applied on top
 * by the server through src/lib/imports/rows.ts, so a JSON write and a CSV row follow the same rules.
 */
import { z } from 'zod';
import { parseDtcList } from '../dtc/dtc';
import { parseInstant } from '../dates/dates';
import { DEFECT_STATUS_VALUES } from '../defects/transitions';
import { DOOR_ORDER } from '../defects/doors';
import { beforeBuildMessage, localBeforeBuild } from '../defects/times';
import { MOISTURE_VALUES, POSITION_VALUES, ROOT_CAUSE_VALUES } from '../imports/rows';

/** The enumerations the schemas use, re-exported for the forms. */
export { DEFECT_STATUS_VALUES, MOISTURE_VALUES, POSITION_VALUES, ROOT_CAUSE_VALUES };

/** What the technician found on each part of the door, worst last. */
export const CONDITION_VALUES = {
  membraneCondition: ['ok', 'loose', 'damaged', 'missing'],
  sealCondition: ['ok', 'worn', 'damaged'],
  drainCondition: ['ok', 'partly_blocked', 'blocked'],
  connectorCondition: ['ok', 'corroded', 'water_inside', 'damaged'],
} as const;
/** The four condition fields. */
export type ConditionField = keyof typeof CONDITION_VALUES;
/** The condition fields in display order. */
export const CONDITION_FIELDS = Object.keys(CONDITION_VALUES) as ConditionField[];

/** Longest texts kept. */
export const TEXT_LIMITS = { symptom: 500, action: 500, notes: 4000, reporterName: 120, reason: 500, caption: 200, verificationNote: 300 } as const;
/** Most part lines on one defect. */
export const MAX_PARTS = 50;

const blankToNull = (v: unknown) => {
  if (typeof v === 'string') {
    const t = v.trim();
    return t === '' ? null : t;
  }
  return v;
};

/** Optional text: trimmed, empty = null, at most `max` characters. */
export const optionalText = (label: string, max: number) =>
  z.preprocess(blankToNull, z.string(`${label} must be text`).max(max, `${label} is at most ${max} characters`).nullable()).optional();

/** Optional whole number within [min, max]; numeric text is accepted, empty = null. */
export const optionalInt = (label: string, min: number, max: number) =>
  z
    .preprocess(
      (v) => {
        const b = blankToNull(v);
        return typeof b === 'string' && /^-?\d+$/.test(b) ? Number(b) : b;
      },
      z
        .number(`${label} must be a whole number`)
        .int(`${label} must be a whole number`)
        .min(min, `${label} must be at least ${min}`)
        .max(max, `${label} must be at most ${max.toLocaleString('en-GB')}`)
        .nullable(),
    )
    .optional();

/** An enumerated value, matched case-insensitively; empty = null. */
export const optionalEnum = <T extends string>(label: string, values: readonly T[], upper = false) =>
  z
    .preprocess(
      (v) => {
        const b = blankToNull(v);
        return typeof b === 'string' ? (upper ? b.toUpperCase() : b.toLowerCase()) : b;
      },
      z.enum(values as [T, ...T[]], `${label} must be one of ${values.join(', ')}`).nullable(),
    )
    .optional();

/** A date or date-time text that the import rules read (YYYY-MM-DD or YYYY-MM-DDTHH:MM[:SS][Z|±hh:mm]). */
export const instantText = (label: string) =>
  z
    .string(`${label} must be a date or date-time`)
    .trim()
    .refine((s) => parseInstant(s) !== null, `${label} must be a date (YYYY-MM-DD) or date-time (YYYY-MM-DDTHH:MM)`);

/** Fault codes as text ("B1A21-29 B1A22") or a list; every code must be of SAE J2012 form. Normalised to one text. */
export const DtcsField = z
  .preprocess(
    (v) => (Array.isArray(v) ? v.map(String).join(' ') : blankToNull(v)),
    z
      .string('Fault codes must be text')
      .max(400, 'At most 400 characters of fault codes')
      .transform((s, ctx) => {
        const r = parseDtcList(s);
        if (!r.ok) {
          ctx.addIssue({ code: 'custom', message: r.message });
          return z.NEVER;
        }
        return r.codes.map((c) => c.display).join(' ') || null;
      })
      .nullable(),
  )
  .optional();

/** Report a defect (POST /api/defects and the "Report a defect" form). */
export const DefectCreateSchema = z.object({
  vin: z.string('Choose the vehicle').trim().min(1, 'Choose the vehicle').max(32, 'A VIN has 17 characters'),
  position: z.preprocess(
    (v) => (typeof v === 'string' ? v.trim().toUpperCase() : v),
    z.enum(POSITION_VALUES, `Door must be one of ${DOOR_ORDER.join(', ')}`),
  ),
  moduleCode: z
    .string('Choose the module type')
    .trim()
    .min(1, 'Choose the module type')
    .max(32)
    .transform((s) => s.toUpperCase()),
  symptom: optionalText('Symptom', TEXT_LIMITS.symptom),
  dtcs: DtcsField,
  odometerKm: optionalInt('Odometer', 0, 5_000_000),
  reporterName: optionalText('Reported by', TEXT_LIMITS.reporterName),
  reportedAt: instantText('Reported at').optional(),
  // Import-format fields: a client may enter a whole record, as in a CSV row.
  ref: optionalText('Ref', 40),
  moisture: optionalEnum('Moisture', MOISTURE_VALUES),
  rootCause: optionalEnum('Root cause', ROOT_CAUSE_VALUES),
  action: optionalText('Action', TEXT_LIMITS.action),
  closedAt: z.preprocess(blankToNull, instantText('Closed at').nullable()).optional(),
});
/** A parsed report. */
export type DefectCreate = z.output<typeof DefectCreateSchema>;

/**
 * An odometer reading as a person types it: digits, optionally grouped in thousands with commas, spaces, points
 * or apostrophes ("84,512", "84 512", "84.512"), as the app itself shows it. Null when empty, undefined when it
 * is not a whole number of km.
 */
export function parseOdometerText(text: string): number | null | undefined {
  const t = text.trim().replace(/\s*km$/i, '');
  if (t === '') return null;
  if (/^\d+$/.test(t)) return Number(t);
  // Thousands groups: one separator kind throughout, groups of exactly three digits.
  const m = /^\d{1,3}(([,.'\u2019 \u00a0\u202f])\d{3})(\2\d{3})*$/.exec(t);
  return m ? Number(t.replace(/[^\d]/g, '')) : undefined;
}

/** The odometer field of the forms: thousands separators allowed, whole km up to 5,000,000. */
export const FormOdometerField = z.preprocess(
  (v) => {
    if (typeof v !== 'string') return v;
    const n = parseOdometerText(v);
    return n === undefined ? v : n;
  },
  z
    .number('Odometer must be a whole number of km, such as 84512 or 84,512')
    .int('Odometer must be a whole number of km, such as 84512 or 84,512')
    .min(0, 'Odometer must be at least 0')
    .max(5_000_000, 'Odometer must be at most 5,000,000')
    .nullable(),
);

/** The symptom as the forms require it (a person reporting always says what is wrong). */
export const FormSymptomField = z
  .string()
  .trim()
  .min(3, 'Say what is wrong (at least a few words)')
  .max(TEXT_LIMITS.symptom, `At most ${TEXT_LIMITS.symptom} characters`);

/**
 * The report form's schema. Its date-time is the browser's local time (<input type="datetime-local">), sent
 * as an ISO instant; with the chosen vehicle's build month ("YYYY-MM") a date before it is refused, as the
 * server does.
 */
export function reportFormSchema(opts: { buildMonth?: string | null } = {}) {
  return DefectCreateSchema.pick({ vin: true, position: true, moduleCode: true, dtcs: true, reporterName: true }).extend({
    symptom: FormSymptomField,
    odometerKm: FormOdometerField,
    reportedAt: z
      .string()
      .refine((s) => !Number.isNaN(new Date(s).getTime()), 'Give the date and time it was reported')
      .refine((s) => new Date(s).getTime() <= Date.now() + 5 * 60_000, 'Reported at cannot be in the future')
      .refine((s) => !opts.buildMonth || !localBeforeBuild(s, opts.buildMonth), { message: beforeBuildMessage(opts.buildMonth ?? '') })
      .transform((s) => new Date(s).toISOString()),
  });
}

/** The report form (without a vehicle's build month). */
export const DefectReportFormSchema = reportFormSchema();
/** What the report form sends. */
export type DefectReportForm = z.output<typeof DefectReportFormSchema>;

/** One part used on a repair. */
export const PartSchema = z.object({
  partNumber: z.string('Part number is required').trim().min(1, 'Part number is required').max(64, 'Part number is at most 64 characters'),
  description: optionalText('Description', 200).transform((v) => v ?? null),
  quantity: z.preprocess((v) => (typeof v === 'string' && /^\d+$/.test(v.trim()) ? Number(v) : v), z.number('Quantity must be a number').int('Quantity must be whole').min(1, 'Quantity is at least 1').max(999, 'Quantity is at most 999')),
  unitCostMinor: optionalInt('Unit cost', 0, 100_000_000).transform((v) => v ?? null),
});
/** A part line as stored and answered. */
export type Part = z.output<typeof PartSchema>;

/** Money typed by a person ("24.50", "24,5", "1200") as minor units; null when empty, undefined when not money. */
export function parseMoneyText(text: string): number | null | undefined {
  const t = text.trim().replace(/\s/g, '');
  if (t === '') return null;
  const m = /^(\d{1,9})(?:[.,](\d{1,2}))?$/.exec(t);
  if (!m) return undefined;
  return Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
}

/** Minor units as the text a person edits ("24.50"); empty for none. */
export function moneyText(minor: number | null): string {
  return minor === null ? '' : (minor / 100).toFixed(2);
}

/** A part line as the form holds it (texts), turned into a Part. */
export const PartFormSchema = z
  .object({
    partNumber: PartSchema.shape.partNumber,
    description: z.string().max(200, 'Description is at most 200 characters'),
    quantity: z.string().trim().regex(/^\d{1,3}$/, 'Quantity must be a whole number').refine((q) => Number(q) >= 1, 'Quantity is at least 1'),
    unitCost: z.string().refine((c) => parseMoneyText(c) !== undefined, 'Unit cost must be an amount such as 24.50'),
  })
  .transform((p): Part => ({
    partNumber: p.partNumber,
    description: p.description.trim() || null,
    quantity: Number(p.quantity),
    unitCostMinor: parseMoneyText(p.unitCost) ?? null,
  }));

/** Fields of the diagnosis and repair record. */
export const DiagnosisFields = {
  moisture: optionalEnum('Moisture', MOISTURE_VALUES),
  membraneCondition: optionalEnum('Membrane', CONDITION_VALUES.membraneCondition),
  sealCondition: optionalEnum('Door seal', CONDITION_VALUES.sealCondition),
  drainCondition: optionalEnum('Drain holes', CONDITION_VALUES.drainCondition),
  connectorCondition: optionalEnum('Connector', CONDITION_VALUES.connectorCondition),
  rootCause: optionalEnum('Root cause', ROOT_CAUSE_VALUES),
  action: optionalText('Action', TEXT_LIMITS.action),
  notes: optionalText('Notes', TEXT_LIMITS.notes),
  labourMinutes: optionalInt('Labour minutes', 0, 10_000),
  parts: z.array(PartSchema, 'Parts must be a list').max(MAX_PARTS, `At most ${MAX_PARTS} part lines`).optional(),
};

/** The diagnosis and repair form: the same fields, with part lines typed as text (amounts in currency units). */
export const DiagnosisFormSchema = z.object({
  ...DiagnosisFields,
  parts: z.array(PartFormSchema).max(MAX_PARTS, `At most ${MAX_PARTS} part lines`),
});
/** What the diagnosis form sends. */
export type DiagnosisFormOutput = z.output<typeof DiagnosisFormSchema>;

/**
 * Change a defect (PATCH /api/defects/{id}): only the fields given change (null clears). `version` makes the
 * write conditional: a stale one is refused with 409 and the current record. `status` (with `reason`) moves
 * it through the lifecycle by the same rules as POST …/transitions; `closedAt` on an open defect records
 * its closing (safety rule applies), `closedAt: null` on a closed one re-opens it.
 */
export const DefectPatchSchema = z.object({
  version: z.preprocess((v) => (typeof v === 'string' && /^\d+$/.test(v) ? Number(v) : v), z.number('version must be a number').int().positive()).optional(),
  ref: optionalText('Ref', 40),
  vin: z.string().trim().min(1).max(32).optional(),
  position: DefectCreateSchema.shape.position.optional(),
  moduleCode: DefectCreateSchema.shape.moduleCode.optional(),
  symptom: optionalText('Symptom', TEXT_LIMITS.symptom),
  dtcs: DtcsField,
  odometerKm: optionalInt('Odometer', 0, 5_000_000),
  reporterName: optionalText('Reported by', TEXT_LIMITS.reporterName),
  reportedAt: instantText('Reported at').optional(),
  ...DiagnosisFields,
  closedAt: z.preprocess(blankToNull, instantText('Closed at').nullable()).optional(),
  status: z.enum(DEFECT_STATUS_VALUES, `status must be one of ${DEFECT_STATUS_VALUES.join(', ')}`).optional(),
  reason: optionalText('Reason', TEXT_LIMITS.reason),
});
/** A parsed change. */
export type DefectPatch = z.output<typeof DefectPatchSchema>;

/** The release verification: both checks done (Seepline records them; it certifies nothing). */
export const VerificationInputSchema = z.object({
  reinitialised: z.literal(true, "Tick it once the window has been re-initialised per the vehicle maker's procedure"),
  reversalVerified: z.literal(true, 'Tick it once automatic closing has been seen to reverse on an obstruction'),
  /** When the check was done (default: now). */
  at: instantText('Checked at').optional(),
  note: optionalText('How it was checked', TEXT_LIMITS.verificationNote),
});
/** A parsed verification. */
export type VerificationInput = z.output<typeof VerificationInputSchema>;

/** Move a defect to another status (POST /api/defects/{id}/transitions). */
export const TransitionRequestSchema = z.object({
  to: z.enum(DEFECT_STATUS_VALUES, `to must be one of ${DEFECT_STATUS_VALUES.join(', ')}`),
  version: z.number('version is required (the version you are looking at)').int().positive(),
  reason: optionalText('Reason', TEXT_LIMITS.reason),
  verification: VerificationInputSchema.optional(),
});
/** A parsed step request. */
export type TransitionRequest = z.output<typeof TransitionRequestSchema>;

/** Photo upload fields besides the file. */
export const PhotoFormSchema = z.object({ caption: optionalText('Caption', TEXT_LIMITS.caption) });

// ------------------------------------------------------------------ responses

/** A decoded fault code on a defect. */
export type DefectCode = { display: string; code: string; failureType: string | null; system: string | null; scope: string | null; description: string };

/** A status change on the timeline. */
export type TimelineEntry = { at: string; from: string; to: string; by: string | null; reason: string | null };

/** A stored photo (URLs are the authenticated, depot-scoped image routes). */
export type DefectPhoto = {
  id: number;
  defectId: number;
  url: string;
  thumbUrl: string;
  mime: string;
  bytes: number;
  width: number | null;
  height: number | null;
  caption: string | null;
  originalName: string | null;
  by: string | null;
  byId: number | null;
  createdAt: string;
};

/** One audit row. */
export type AuditRow = {
  id: number;
  at: string;
  who: string;
  userName: string | null;
  action: string;
  field: string | null;
  oldValue: string | null;
  newValue: string | null;
  /** The record an id value refers to, in words (a person's name, a module code, a ref); null otherwise. */
  oldLabel: string | null;
  newLabel: string | null;
};

/** The release verification as recorded. */
export type VerificationRecord = { reinitialised: boolean | null; reversalVerified: boolean | null; by: string | null; byId: number | null; at: string | null; note: string | null };

/** One defect as GET /api/defects/{id} answers it. */
export type DefectRecord = {
  id: number;
  ref: string;
  vin: string;
  vehicleId: number;
  fleetNumber: string | null;
  registration: string | null;
  make: string | null;
  model: string | null;
  depotCode: string;
  moduleCode: string;
  moduleName: string;
  moduleFunction: string;
  position: string;
  status: (typeof DEFECT_STATUS_VALUES)[number];
  open: boolean;
  reportedAt: string;
  symptom: string | null;
  dtcs: string[];
  moisture: string | null;
  rootCause: string | null;
  action: string | null;
  odometerKm: number | null;
  labourMinutes: number | null;
  costMinor: number | null;
  closedAt: string | null;
  repeat: boolean;
  repeatOfId: number | null;
  repeatOfRef: string | null;
  version: number;
  createdAt: string | null;
  updatedAt: string | null;
  codes: DefectCode[];
  membraneCondition: string | null;
  sealCondition: string | null;
  drainCondition: string | null;
  connectorCondition: string | null;
  notes: string | null;
  reporterName: string | null;
  parts: Part[];
  partsTotalMinor: number;
  labourRateMinorPerHour: number | null;
  /** ISO 4217 code of every amount on the record (the `currency` setting). */
  currency: string;
  reportedBy: string | null;
  reportedById: number | null;
  assignedTo: string | null;
  assignedToId: number | null;
  verification: VerificationRecord | null;
  safetyVerificationRequired: boolean;
  repeatOf: { id: number; ref: string; closedAt: string | null; daysAfterClose: number | null } | null;
  repeatedBy: Array<{ id: number; ref: string; reportedAt: string; status: string }>;
  repeatWindowDays: number;
  timeline: TimelineEntry[];
  photos: DefectPhoto[];
  audit: AuditRow[];
};

/** The 409 body of a stale write: the error and the record as it is now. */
export type StaleWriteBody = { error: { code: 'CONFLICT'; message: string }; current: DefectRecord };
