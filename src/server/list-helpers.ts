/** Small helpers shared by the list services: paging, sorting and depot scope conditions. */
import { asc, desc, inArray, sql, type SQL, type Column } from 'drizzle-orm';
import { DEFAULT_PAGE_SIZE, parseSort, SortFieldError } from '@/lib/contracts/lists';
import type { SessionUser } from './auth';
import { invalid } from './http';

/** Page and page size with defaults. */
export function paging(q: { page?: number; pageSize?: number }): { page: number; pageSize: number; offset: number } {
  const page = q.page ?? 1;
  const pageSize = q.pageSize ?? DEFAULT_PAGE_SIZE;
  return { page, pageSize, offset: (page - 1) * pageSize };
}

/** ORDER BY for an allowed sort field (400 for any other), with a stable tie-breaker. */
export function orderBy(sort: string | undefined, columns: Record<string, Column | SQL>, fallback: string, tie: Column): SQL[] {
  try {
    const { field, desc: d } = parseSort(sort, Object.keys(columns), fallback);
    const col = columns[field]!;
    return [d ? desc(col) : asc(col), d ? desc(tie) : asc(tie)];
  } catch (e) {
    if (e instanceof SortFieldError) throw invalid(e.message, [{ path: 'sort', message: e.message }]);
    throw e;
  }
}

/** Depot condition for the caller, or undefined when they see every depot. An empty scope matches nothing. */
export function depotScope(user: SessionUser, column: Column): SQL | undefined {
  if (user.depotIds === null) return undefined;
  if (user.depotIds.length === 0) return sql`0`;
  return inArray(column, user.depotIds);
}

/** Escape LIKE wildcards in user search text. */
export function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => '\\' + c)}%`;
}

/** Characters people put between the parts of a registration or fleet number ("GHQ-4941-J", "LV 1016", "AB.12"). */
const SEPARATORS = ['-', ' ', '.', '/', '_'];

/**
 * The LIKE pattern of search text with its separators removed (`"ghq 4941"` → `%GHQ4941%`), for matching
 * registrations and fleet numbers however the dashes and spaces were typed; null when fewer than two characters
 * are left.
 */
export function separatorFreePattern(q: string): string | null {
  const bare = q.trim().toUpperCase().replace(/[-\s./_]+/g, '');
  if (bare.length < 2) return null;
  return likePattern(bare);
}

/**
 * `column`, stripped of separators, LIKE `pattern` (from separatorFreePattern). The search is a contains-match,
 * so it scans the rows the other conditions leave either way; the depot and sort indexes still apply
 * (docs/benchmarks.md, bench:fleet).
 */
export function separatorFreeLike(column: Column, pattern: string): SQL {
  // LIKE ignores ASCII case, so no upper() is needed on the column.
  let expr: SQL = sql`${column}`;
  for (const c of SEPARATORS) expr = sql`replace(${expr}, ${c}, '')`;
  return sql`${expr} like ${pattern} escape '\\'`;
}

/** Comma-separated filter values (`status=reported,diagnosing`). */
export function listParam(v: string | undefined): string[] {
  return v ? v.split(',').map((s) => s.trim()).filter(Boolean) : [];
}

/** ISO text of an epoch-ms value. */
export function iso(ms: number | null | undefined): string | null {
  return ms == null ? null : new Date(ms).toISOString();
}
