/**
 * Request schemas and response types of the trace endpoints (CONTRACT.md "Traces" plus the list, record,
 * samples and file routes), shared by the API routes and the trace islands. Edit when a trace endpoint
 * gains a parameter or a field.
 */
import { z } from 'zod';
import type { TraceAnalysis } from '../traces/analyze';
import type { Verdict } from '../traces/verdict';
import { MAX_PLOT_COLUMNS, type PlotWindow } from '../traces/plot-window';
import { MAX_PAGE_SIZE } from './lists';

/** The verdicts, in precedence order (CONTRACT.md). */
export const TRACE_VERDICTS = ['channel_stuck', 'channels_shorted', 'low_amplitude', 'intermittent', 'phase_error', 'healthy'] as const satisfies readonly Verdict[];

/** Pixel columns a samples request gets when it names none. */
export const DEFAULT_PLOT_COLUMNS = 1000;

const wholeNumber = (name: string, min: number, max: number) =>
  z
    .string()
    .trim()
    .regex(/^\d+$/, `${name} must be a whole number`)
    .transform(Number)
    .pipe(z.number().int().min(min, `${name} must be at least ${min}`).max(max, `${name} must be at most ${max}`));

const seconds = (name: string) =>
  z
    .string()
    .trim()
    .regex(/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/, `${name} must be a time in seconds, e.g. 0.0125`)
    .transform(Number)
    .pipe(z.number(`${name} must be a finite number of seconds`));

/** GET /api/traces/{id}/samples?from=&to=&columns= (seconds, seconds, pixel columns). */
export const TraceSamplesQuery = z
  .object({
    from: seconds('from').optional(),
    to: seconds('to').optional(),
    columns: wholeNumber('columns', 1, MAX_PLOT_COLUMNS).optional(),
  })
  .refine((q) => q.from === undefined || q.to === undefined || q.to > q.from, { message: 'to must be later than from', path: ['to'] });
export type TraceSamplesQuery = z.infer<typeof TraceSamplesQuery>;

/** GET /api/traces?defectId=&verdict=&depot=&page=&pageSize= */
export const TraceListQuery = z.object({
  defectId: wholeNumber('defectId', 1, Number.MAX_SAFE_INTEGER).optional(),
  verdict: z.enum(TRACE_VERDICTS, `verdict must be one of ${TRACE_VERDICTS.join(', ')}`).optional(),
  depot: z.string().trim().max(32).optional(),
  page: wholeNumber('page', 1, 1_000_000).optional(),
  pageSize: wholeNumber('pageSize', 1, MAX_PAGE_SIZE).optional(),
  /** `field` or `-field` of TRACE_SORT_FIELDS; newest first (`-createdAt`) when absent. */
  sort: z
    .string()
    .trim()
    .regex(/^-?[A-Za-z][A-Za-z0-9_]*$/, 'sort must be a field name, optionally with a leading "-"')
    .optional(),
});
/** Fields the trace list sorts by. */
export const TRACE_SORT_FIELDS = ['createdAt', 'verdict', 'fileName', 'defect', 'depot', 'createdBy'] as const;
export type TraceListQuery = z.infer<typeof TraceListQuery>;

/** A stored trace as GET /api/traces and GET /api/traces/{id} answer it. */
export type TraceRecord = TraceAnalysis & {
  id: string;
  defectId: number | null;
  defectRef: string | null;
  /** Door position of the defect (FL, FR, ...). */
  position: string | null;
  vin: string | null;
  fleetNumber: string | null;
  registration: string | null;
  depotCode: string | null;
  fileName: string | null;
  bytes: number;
  createdAt: string | null;
  createdBy: string | null;
  /** The depot's IANA time zone (times are shown in it), null for a trace not attached to a defect. */
  depotTimeZone: string | null;
  pulsesPerRev: number | null;
};

/** GET /api/traces/{id}/samples answers a plot window of the capture. */
export type TraceSamples = PlotWindow & { id: string };
