/**
 * Settings an admin can change (GET/PATCH /api/settings). Only settings that change what the product does:
 * the repeat-repair window, the hourly labour rate of repair costs and the currency every amount is in. Edit
 * together with src/server/settings.ts when adding one.
 */
import { z } from 'zod';
import { isMoneyCurrency } from '../money/currency';

/** Bounds of the repeat-repair window, in days (one day to ten years). */
export const REPEAT_WINDOW_MIN_DAYS = 1;
/** Upper bound of the repeat-repair window, in days. */
export const REPEAT_WINDOW_MAX_DAYS = 3650;

/** Upper bound of the labour rate, in minor units per hour (100,000.00 an hour). */
export const LABOUR_RATE_MAX_MINOR = 10_000_000;

/** Body of PATCH /api/settings: the fields to change, at least one (unknown keys are refused). */
export const SettingsPatchSchema = z
  .strictObject({
    repeatWindowDays: z
      .number('repeatWindowDays must be a number of days')
      .int('repeatWindowDays must be a whole number of days')
      .min(REPEAT_WINDOW_MIN_DAYS, `repeatWindowDays must be at least ${REPEAT_WINDOW_MIN_DAYS}`)
      .max(REPEAT_WINDOW_MAX_DAYS, `repeatWindowDays must be at most ${REPEAT_WINDOW_MAX_DAYS}`)
      .optional(),
    /** Minor currency units per hour; null removes the rate (labour then adds nothing to a cost). */
    labourRateMinorPerHour: z
      .number('labourRateMinorPerHour must be a number of minor currency units (cents) per hour')
      .int('labourRateMinorPerHour must be a whole number of minor units (cents)')
      .min(0, 'labourRateMinorPerHour cannot be negative')
      .max(LABOUR_RATE_MAX_MINOR, `labourRateMinorPerHour must be at most ${LABOUR_RATE_MAX_MINOR}`)
      .nullable()
      .optional(),
    /** ISO 4217 code of every amount (costs, labour rate); two minor digits, since amounts are kept in hundredths. */
    currency: z
      .string('currency must be an ISO 4217 code such as GBP or EUR')
      .trim()
      .transform((c) => c.toUpperCase())
      .refine(isMoneyCurrency, 'currency must be an ISO 4217 code with two minor digits, such as GBP, EUR or USD')
      .optional(),
  })
  .refine((p) => p.repeatWindowDays !== undefined || p.labourRateMinorPerHour !== undefined || p.currency !== undefined, {
    message: 'Send repeatWindowDays, labourRateMinorPerHour or currency.',
    path: ['repeatWindowDays'],
  });
/** A validated settings change. */
export type SettingsPatch = z.infer<typeof SettingsPatchSchema>;

/** Query of PATCH /api/settings: `dryRun=1` works out the effect and writes nothing. */
export const SettingsPatchQuery = z.object({ dryRun: z.enum(['1', '0', 'true', 'false'], 'dryRun must be 1 or 0').optional() });

/** The settings in force. */
export type Settings = { repeatWindowDays: number; labourRateMinorPerHour: number | null; currency: string };

/** Answer of PATCH /api/settings: the settings and what the repeat recompute changed. */
export type SettingsChangeResult = {
  settings: Settings;
  dryRun: boolean;
  recompute: {
    /** Defects whose repeat link was set, cleared or moved to another earlier defect. */
    defectsChanged: number;
    /** Repeats before and after. */
    repeatsBefore: number;
    repeatsAfter: number;
    vehiclesChecked: number;
  };
};
