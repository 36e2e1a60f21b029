/**
 * Request and response schemas for list endpoints (CONTRACT.md "Lists and records"), shared by the API and
 * the islands: page (from 1), pageSize (≤ 200), sort (`field` or `-field`), q, and field filters.
 */
import { z } from 'zod';

export const MAX_PAGE_SIZE = 200;
export const DEFAULT_PAGE_SIZE = 50;

const intParam = (name: string, min: number, max: number) =>
  z
    .string()
    .regex(/^\d+$/, `${name} must be a whole number`)
    .transform(Number)
    .pipe(z.number().int().min(min, `${name} must be at least ${min}`).max(max, `${name} must be at most ${max}`));

/** The paging and search part every list takes. */
export const ListQueryBase = z.object({
  page: intParam('page', 1, 1_000_000).optional(),
  pageSize: intParam('pageSize', 1, MAX_PAGE_SIZE).optional(),
  sort: z
    .string()
    .regex(/^-?[A-Za-z][A-Za-z0-9_]*$/, 'sort must be a field name, optionally with a leading "-"')
    .optional(),
  q: z.string().max(200, 'q is at most 200 characters').optional(),
  depot: z.string().max(32).optional(),
});

/** A page of results. */
export type ListResponse<T> = { items: T[]; total: number; page: number; pageSize: number };

export const VehicleListQuery = ListQueryBase.extend({
  vin: z.string().max(32).optional(),
  parking: z.enum(['indoor', 'outdoor', 'mixed'], 'parking must be indoor, outdoor or mixed').optional(),
  make: z.string().max(64).optional(),
  status: z.enum(['active', 'retired', 'off_road'], 'status must be active, retired or off_road').optional(),
});
export type VehicleListQuery = z.infer<typeof VehicleListQuery>;

const flagParam = (name: string) => z.enum(['1', '0', 'true', 'false'], `${name} must be 1, 0, true or false`);
const dayParam = (name: string) =>
  z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}([T ][0-9:.]+(Z|[+-]\d{2}:?\d{2})?)?$/, `${name} must be a date YYYY-MM-DD (or an ISO date-time)`);

/** Age choices the Defects list offers (days since reported); the API takes any whole number of days 1–3650. */
export const DEFECT_AGE_DAYS = [7, 14, 30, 90] as const;

/**
 * Query of GET /api/defects (and of its CSV export): paging, sort, search and the filters. Multi-value filters
 * (status, position, moisture, module, depot) are comma-separated; `olderThanDays` keeps defects reported more
 * than that many days ago (with `open=1`: open longer than that); `reportedFrom`/`reportedTo` are inclusive UTC days.
 */
export const DefectListQuery = ListQueryBase.extend({
  vin: z.string().max(32).optional(),
  ref: z.string().max(40).optional(),
  status: z.string().max(200).optional(),
  module: z.string().max(200).optional(),
  position: z.string().max(40).optional(),
  moisture: z.string().max(80).optional(),
  repeat: flagParam('repeat').optional(),
  open: flagParam('open').optional(),
  mine: flagParam('mine').optional(),
  vehicleId: z.string().regex(/^\d+$/, 'vehicleId must be a whole number').transform(Number).optional(),
  olderThanDays: intParam('olderThanDays', 1, 3650).optional(),
  reportedFrom: dayParam('reportedFrom').optional(),
  reportedTo: dayParam('reportedTo').optional(),
});
/** A parsed defect list query. */
export type DefectListQuery = z.infer<typeof DefectListQuery>;

export const SimpleListQuery = ListQueryBase;

/** Split `-field` into a field and direction. */
export function parseSort(sort: string | undefined, allowed: readonly string[], fallback: string): { field: string; desc: boolean } {
  const s = sort ?? fallback;
  const desc = s.startsWith('-');
  const field = desc ? s.slice(1) : s;
  if (!allowed.includes(field)) {
    throw new SortFieldError(field, allowed);
  }
  return { field, desc };
}

/** A sort on a field the list does not offer. */
export class SortFieldError extends Error {
  constructor(
    readonly field: string,
    readonly allowed: readonly string[],
  ) {
    super(`Cannot sort by "${field}"; sortable fields: ${allowed.join(', ')}.`);
    this.name = 'SortFieldError';
  }
}
