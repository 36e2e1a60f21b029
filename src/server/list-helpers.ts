/** Small helpers shared by the list services: paging, sorting and depot scope conditions. */
import { asc, desc, inArray, sql, type SQL, type Column } from 'drizzle-orm';
import { DEFAULT_PAGE_SIZE, parseSort, SortFieldError } from '@/lib/contracts/lists';
import { stripSeparators } from '@/lib/vehicles/search-key';
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

/**
 * The LIKE pattern of search text without separators (`"ghq 4941"` → `%GHQ4941%`), for `vehicles.search_key` (the
 * registration and fleet number stored without separators, src/lib/vehicles/search-key.ts); null when fewer than two
 * characters are left.
 */
export function separatorFreePattern(q: string): string | null {
  const bare = stripSeparators(q.trim());
  if (bare.length < 2) return null;
  return likePattern(bare);
}

/** Comma-separated filter values (`status=reported,diagnosing`). */
export function listParam(v: string | undefined): string[] {
  return v ? v.split(',').map((s) => s.trim()).filter(Boolean) : [];
}

/** ISO text of an epoch-ms value. */
export function iso(ms: number | null | undefined): string | null {
  return ms == null ? null : new Date(ms).toISOString();
}
