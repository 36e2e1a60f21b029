/**
 * Pure mappers between the Defects list's state and its URL: which keys belong to the list, their canonical
 * order (so equal views have equal URLs and query keys), the technician's default view, the "My open defects"
 * tab, clearing filters, and the CSV export link of the current view. No React, no window: unit-tested.
 */
import { DEFECT_AGE_DAYS } from '@/lib/contracts/lists';
import { OPEN_STATUSES } from '@/lib/contracts/overview';

/** The list's URL parameters, in the order they are written. */
export const DEFECT_PARAM_KEYS = [
  'mine',
  'open',
  'q',
  'depot',
  'status',
  'module',
  'position',
  'moisture',
  'repeat',
  'olderThanDays',
  'reportedFrom',
  'reportedTo',
  'vin',
  'sort',
  'page',
  'pageSize',
] as const;
export type DefectParamKey = (typeof DEFECT_PARAM_KEYS)[number];
export type DefectListState = Partial<Record<DefectParamKey, string>>;

/** Keys that narrow the view ("Clear filters" removes them; the tab, sort and page size stay). */
export const DEFECT_FILTER_KEYS = [
  'open',
  'q',
  'depot',
  'status',
  'module',
  'position',
  'moisture',
  'repeat',
  'olderThanDays',
  'reportedFrom',
  'reportedTo',
  'vin',
] as const satisfies readonly DefectParamKey[];

/** Default sort of the list (newest first). */
export const DEFAULT_DEFECT_SORT = '-reportedAt';

const KEY_SET = new Set<string>(DEFECT_PARAM_KEYS);

/** Only the list's keys with non-empty (trimmed) values, in canonical order. */
export function pickDefectState(params: Record<string, string | undefined>): DefectListState {
  const out: DefectListState = {};
  for (const k of DEFECT_PARAM_KEYS) {
    const v = params[k]?.trim();
    if (v) out[k] = v;
  }
  return out;
}

/** The list state of a query string (`?a=1&b=2` or `a=1&b=2`); unknown keys are dropped. */
export function searchToDefectState(search: string): DefectListState {
  const raw: Record<string, string> = {};
  for (const [k, v] of new URLSearchParams(search)) if (KEY_SET.has(k)) raw[k] = v;
  return normaliseDefectState(pickDefectState(raw));
}

const OPEN_SET = new Set<string>(OPEN_STATUSES);
const isMine = (state: DefectListState) => state.mine === '1' || state.mine === 'true';

/**
 * "My open defects" keeps its own constraint: with `mine` on, the view is always open defects only (`open=1`), and
 * a status filter keeps only open statuses. So no filter change, "Clear filters" or shared link can show closed or
 * cancelled defects under that tab.
 */
export function normaliseDefectState(state: DefectListState): DefectListState {
  if (!isMine(state)) return state;
  const next: DefectListState = { ...state, mine: '1', open: '1' };
  if (state.status) {
    const open = state.status.split(',').filter((s) => OPEN_SET.has(s));
    if (open.length) next.status = open.join(',');
    else delete next.status;
  }
  return pickDefectState(next);
}

/** Statuses the "My open defects" tab cannot show (offered disabled in the status filter). */
export const CLOSED_STATUSES = ['closed', 'cancelled'] as const;

/**
 * The problem with the reported-date range, in the screen's words, or null: a "from" after the "to" would match
 * nothing (the API refuses it), so the list asks for a change instead of loading.
 */
export function dateRangeProblem(state: DefectListState): string | null {
  const from = state.reportedFrom;
  const to = state.reportedTo;
  if (!from || !to || !/^\d{4}-\d{2}-\d{2}$/.test(from) || !/^\d{4}-\d{2}-\d{2}$/.test(to)) return null;
  return from > to ? '"Reported from" is after "Reported to". Change one of the dates to see the list.' : null;
}

/** The query string of a state (with a leading `?`, or '' when empty), keys in canonical order. */
export function defectStateToSearch(state: DefectListState): string {
  const sp = new URLSearchParams();
  for (const [k, v] of Object.entries(pickDefectState(state))) sp.set(k, v);
  const s = sp.toString();
  return s ? `?${s}` : '';
}

/**
 * The state a visit starts from. A technician who opens the list with no list parameters lands on their own
 * open defects; any explicit parameter (including `mine=0`, the "All defects" tab) is kept as given.
 */
export function initialDefectState(params: Record<string, string | undefined>, myOpenByDefault: boolean): DefectListState {
  const state = pickDefectState(params);
  if (myOpenByDefault && Object.keys(state).length === 0) return { mine: '1', open: '1' };
  return normaliseDefectState(state);
}

/** Which tab a state shows. */
export function defectTab(state: DefectListState): 'mine' | 'all' {
  return state.mine === '1' || state.mine === 'true' ? 'mine' : 'all';
}

/**
 * The patch that switches tabs: "My open defects" sets mine and open; "All defects" drops both and, where the
 * person's default is their own work, writes `mine=0` so that a reload or shared link stays on "All".
 */
export function tabPatch(tab: 'mine' | 'all', myOpenByDefault: boolean): Record<string, string | undefined> {
  return tab === 'mine' ? { mine: '1', open: '1' } : { mine: myOpenByDefault ? '0' : undefined, open: undefined };
}

/** The patch that clears every filter (the tab, sort and page size stay). */
export function clearFiltersPatch(): Record<string, undefined> {
  return Object.fromEntries(DEFECT_FILTER_KEYS.map((k) => [k, undefined]));
}

/** How many filters narrow the view (a multi-value filter counts once per value; "open" is part of the "mine" tab). */
export function activeFilterCount(state: DefectListState): number {
  let n = 0;
  const mine = isMine(state);
  for (const k of DEFECT_FILTER_KEYS) {
    const v = state[k];
    if (!v) continue;
    if (k === 'open' && mine) continue;
    if (k === 'status' || k === 'position' || k === 'moisture' || k === 'module' || k === 'depot') n += v.split(',').filter(Boolean).length;
    else if ((k === 'open' || k === 'repeat') && (v === '0' || v === 'false')) n += 1;
    else n += 1;
  }
  return n;
}

/** The state with a patch applied (undefined or '' removes a key); any change but paging goes back to page 1. */
export function applyDefectPatch(state: DefectListState, patch: Record<string, string | undefined>, resetPage = true): DefectListState {
  const next: Record<string, string | undefined> = { ...state };
  for (const [k, v] of Object.entries(patch)) {
    if (!KEY_SET.has(k)) continue;
    next[k] = v === undefined || v.trim() === '' ? undefined : v;
  }
  if (resetPage && !('page' in patch)) delete next.page;
  return normaliseDefectState(pickDefectState(next));
}

/** Link of the CSV download of a view: the same filters and sort, without paging. */
export function defectExportHref(state: DefectListState): string {
  const { page: _p, pageSize: _s, ...rest } = pickDefectState(state);
  return `/api/defects/export${defectStateToSearch(rest)}`;
}

/** The age choices offered, as select options. */
export const AGE_OPTIONS = DEFECT_AGE_DAYS.map((d) => ({ value: String(d), label: `Older than ${d} days` }));
