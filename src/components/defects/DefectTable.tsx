/**
 * The Defects list island: server-side paging, sorting, search and filters over the caller's depots, kept
 * in the URL with history (Back/Forward and shared links work), "My open defects" / "All defects" tabs, and a
 * CSV download of the whole filtered view (every page) in the defects import format.
 */
import { useCallback, useEffect, useMemo, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { ChevronDown, ChevronUp, Download, Plus, X } from 'lucide-react';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { DataTable } from '@/components/ui/DataTable';
import { MOISTURE_LABELS, POSITION_LABELS, STATUS_LABELS } from '@/components/labels';
import { useDepotOptions } from '@/components/vehicles/queries';
import { ChipGroup, PageSizeSelect, SearchBox, SelectField, Toggle, pageOf, pageSizeOf, splitList } from './FilterControls';
import { DEFECT_NARROW_MAX_PX, DEFECT_WIDE_MIN_PX, defectColumns, defectColumnsCompact, defectColumnsNarrow, defectRowHref } from './columns';
import { formatCount } from './format';
import {
  AGE_OPTIONS,
  activeFilterCount,
  clearFiltersPatch,
  CLOSED_STATUSES,
  dateRangeProblem,
  DEFAULT_DEFECT_SORT,
  defectExportHref,
  defectTab,
  initialDefectState,
  pickDefectState,
  tabPatch,
} from './list-state';
import { useDefects, useModuleOptions } from './queries';
import { useContainerWidth } from './use-container-width';
import { useDefectListUrl } from './use-list-url';

type Props = {
  /** The page's query string at render time, so the server render and hydration agree. */
  initialParams: Record<string, string>;
  /** Show the "My open defects" / "All defects" tabs (people who report and work defects). */
  showMine: boolean;
  /** Land on "My open defects" when the URL names no view (technicians). */
  myOpenByDefault: boolean;
  /** Show "Report a defect" (roles with defect:write). */
  canReport: boolean;
};

const STATUS_OPTIONS = Object.entries(STATUS_LABELS).map(([value, label]) => ({ value, label }));
const POSITION_OPTIONS = Object.entries(POSITION_LABELS).map(([value, label]) => ({ value, label: value, title: label }));
const MOISTURE_OPTIONS = Object.entries(MOISTURE_LABELS).map(([value, label]) => ({ value, label }));

function DefectList({ initialParams, showMine, myOpenByDefault, canReport }: Props) {
  const [state, update] = useDefectListUrl(useMemo(() => initialDefectState(initialParams, myOpenByDefault), [initialParams, myOpenByDefault]));
  const page = pageOf(state.page);
  const pageSize = pageSizeOf(state.pageSize);
  const sort = state.sort || DEFAULT_DEFECT_SORT;
  const params = useMemo(() => pickDefectState({ ...state, page: String(page), pageSize: String(pageSize), sort }), [state, page, pageSize, sort]);
  // An impossible date range is caught here, in the screen's words, and nothing is asked of the server.
  const dateProblem = dateRangeProblem(state);
  const list = useDefects(params, dateProblem === null);
  const depots = useDepotOptions();
  const modules = useModuleOptions();
  const [boxRef, width] = useContainerWidth<HTMLDivElement>();
  const columns = width === null || width >= DEFECT_WIDE_MIN_PX ? defectColumns : width < DEFECT_NARROW_MAX_PX ? defectColumnsNarrow : defectColumnsCompact;

  // A page past the end (a shared link after the list shrank): go to the last page instead of showing nothing.
  const lastPage = list.data ? Math.max(1, Math.ceil(list.data.total / pageSize)) : 1;
  useEffect(() => {
    if (list.data && !list.isPlaceholderData && list.data.items.length === 0 && list.data.total > 0 && page > lastPage)
      update({ page: String(lastPage) }, { push: false });
  }, [list.data, list.isPlaceholderData, page, lastPage, update]);

  const onSearch = useCallback((q: string) => update({ q }), [update]);
  const set = (k: string) => (v: string) => update({ [k]: v });
  const flag = (k: string) => (on: boolean) => update({ [k]: on ? '1' : undefined });
  const filterCount = activeFilterCount(state);
  const tab = defectTab(state);
  const narrowed = filterCount > 0 || tab === 'mine';
  const total = list.data?.total ?? 0;
  const countLine = dateProblem
    ? 'No list for this date range.'
    : list.error
      ? 'The list could not be loaded.'
      : list.data
        ? `${formatCount(total)} ${total === 1 ? 'defect' : 'defects'}${narrowed ? (total === 1 ? ' matches this view' : ' match this view') : ' in your depots'}`
        : 'Loading defects…';
  const canDownload = !!list.data && total > 0 && !dateProblem && !list.error && !list.isPlaceholderData;
  const depotOptions = (depots.data ?? []).map((d) => ({ value: d.code, label: `${d.code} · ${d.name}` }));
  const moduleOptions = (modules.data ?? []).map((m) => ({ value: m.code, label: `${m.code} · ${m.name}` }));
  // A value from a shared link that the pickers do not offer (e.g. two depots) still shows, so it can be cleared.
  const withCurrent = (opts: { value: string; label: string }[], v: string | undefined) => (v && !opts.some((o) => o.value === v) ? [...opts, { value: v, label: v }] : opts);
  const ageOptions = withCurrent(AGE_OPTIONS, state.olderThanDays);

  const chipCount = ['status', 'position', 'moisture'].reduce((n, k) => n + splitList(state[k as 'status']).length, 0);
  const [moreOpen, setMoreOpen] = useState(chipCount > 0);
  useEffect(() => {
    if (chipCount > 0) setMoreOpen(true);
  }, [chipCount]);

  return (
    <div className="space-y-3" ref={boxRef}>
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>Defects</h1>
          <p className="text-sm text-ink-500" aria-live="polite" data-testid="defect-count">
            {countLine}
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <PageSizeSelect value={pageSize} onChange={(n) => update({ pageSize: String(n) })} />
          <a
            className={`btn-secondary${canDownload ? '' : ' pointer-events-none opacity-50'}`}
            href={defectExportHref(params)}
            download
            aria-disabled={!canDownload}
            tabIndex={canDownload ? undefined : -1}
            onClick={(e) => {
              if (!canDownload) e.preventDefault();
            }}
            title={
              canDownload
                ? 'Every defect of this view (all pages): the defects import columns, then status, depot, findings, parts, labour and cost'
                : dateProblem
                  ? 'Fix the date range first'
                  : 'Nothing to download in this view'
            }
          >
            <Download size={16} aria-hidden="true" /> Download CSV
          </a>
          {canReport && (
            <a className="btn-primary" href="/defects/new">
              <Plus size={16} aria-hidden="true" /> Report a defect
            </a>
          )}
        </div>
      </div>

      {showMine && (
        <div role="tablist" aria-label="Which defects" className="flex gap-1 border-b border-ink-200">
          {(['mine', 'all'] as const).map((t) => (
            <button
              key={t}
              type="button"
              role="tab"
              aria-selected={tab === t}
              onClick={() => tab !== t && update(tabPatch(t, myOpenByDefault))}
              className={[
                '-mb-px min-h-10 border-b-2 px-4 text-[15px] font-semibold',
                tab === t ? 'border-estuary-700 text-estuary-800' : 'border-transparent text-ink-600 hover:text-ink-900',
              ].join(' ')}
            >
              {t === 'mine' ? 'My open defects' : 'All defects'}
            </button>
          ))}
        </div>
      )}

      <form className="card card-pad space-y-3" role="search" aria-label="Filter defects" onSubmit={(e) => e.preventDefault()}>
        <div className="flex flex-wrap items-end gap-3">
          <SearchBox label="Search" placeholder="Ref, VIN, fleet no., symptom, code" value={state.q ?? ''} onChange={onSearch} />
          {(depotOptions.length > 1 || state.depot) && (
            <SelectField
              label="Depot"
              value={state.depot ?? ''}
              onChange={set('depot')}
              options={withCurrent(depotOptions, state.depot)}
              anyLabel="All depots"
              className="min-w-[11rem] flex-[1_1_11rem]"
            />
          )}
          <SelectField
            label="Module type"
            value={state.module ?? ''}
            onChange={set('module')}
            options={withCurrent(moduleOptions, state.module)}
            anyLabel="All module types"
            className="min-w-[11rem] flex-[1_1_12rem]"
          />
          <SelectField label="Age" value={state.olderThanDays ?? ''} onChange={set('olderThanDays')} options={ageOptions} anyLabel="Any age" className="min-w-[10rem] flex-[1_1_10rem]" />
          <DateField label="Reported from" value={state.reportedFrom ?? ''} onChange={set('reportedFrom')} max={state.reportedTo} invalid={!!dateProblem} />
          <DateField label="Reported to" value={state.reportedTo ?? ''} onChange={set('reportedTo')} min={state.reportedFrom} invalid={!!dateProblem} />
        </div>
        {dateProblem && (
          <p id="df-date-problem" role="alert" className="text-sm font-semibold text-brick-700">
            {dateProblem}
          </p>
        )}
        <div className="flex flex-wrap items-center gap-2">
          <Toggle
            label="Open only"
            checked={state.open === '1'}
            onChange={flag('open')}
            disabled={tab === 'mine'}
            title={tab === 'mine' ? '"My open defects" shows open defects only; choose "All defects" to see closed ones' : undefined}
          />
          <Toggle label="Repeats only" checked={state.repeat === '1'} onChange={flag('repeat')} />
          <button type="button" className="btn-ghost" aria-expanded={moreOpen} aria-controls="defect-more-filters" onClick={() => setMoreOpen((o) => !o)}>
            {moreOpen ? <ChevronUp size={16} aria-hidden="true" /> : <ChevronDown size={16} aria-hidden="true" />}
            Status, door, moisture
            {chipCount > 0 && <span className="badge-brand">{chipCount}</span>}
          </button>
          {state.vin && (
            <span className="inline-flex min-h-10 items-center gap-1 rounded-md border border-estuary-300 bg-estuary-50 pl-3 text-sm text-estuary-800">
              Vehicle <span className="mono">{state.vin}</span>
              <button
                type="button"
                className="flex h-10 w-10 items-center justify-center hover:text-ink-900"
                aria-label="Show all vehicles"
                onClick={() => update({ vin: undefined })}
              >
                <X size={16} aria-hidden="true" />
              </button>
            </span>
          )}
          {filterCount > 0 && (
            <button type="button" className="btn-ghost ml-auto" onClick={() => update(clearFiltersPatch())}>
              Clear filters ({filterCount})
            </button>
          )}
        </div>
        {moreOpen && (
          <div id="defect-more-filters" className="flex flex-wrap gap-x-6 gap-y-3 border-t border-ink-100 pt-3">
            <ChipGroup
              label="Status"
              value={state.status ?? ''}
              onChange={set('status')}
              options={STATUS_OPTIONS}
              disabled={tab === 'mine' ? CLOSED_STATUSES : undefined}
              disabledTitle={'"My open defects" shows open defects only'}
            />
            <ChipGroup label="Door" value={state.position ?? ''} onChange={set('position')} options={POSITION_OPTIONS} />
            <ChipGroup label="Moisture found" value={state.moisture ?? ''} onChange={set('moisture')} options={MOISTURE_OPTIONS} />
          </div>
        )}
      </form>

      <DataTable
        caption="Defects"
        columns={columns}
        data={dateProblem ? [] : (list.data?.items ?? [])}
        total={dateProblem ? 0 : total}
        page={page}
        pageSize={pageSize}
        sort={sort}
        onSort={(s) => update({ sort: s })}
        onPage={(p) => update({ page: String(p) }, { resetPage: false })}
        loading={!dateProblem && (list.isPending || list.isPlaceholderData)}
        error={dateProblem ?? (list.error ? `The list could not be loaded: ${list.error.message}` : null)}
        emptyText={tab === 'mine' && filterCount === 0 ? 'Nothing open is assigned to you or reported by you.' : narrowed ? 'No defects match this view.' : 'No defects recorded in your depots yet.'}
        rowHref={defectRowHref}
      />
    </div>
  );
}

function DateField({
  label,
  value,
  onChange,
  min,
  max,
  invalid = false,
}: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  min?: string;
  max?: string;
  invalid?: boolean;
}) {
  const id = `df-${label.replace(/\s+/g, '-').toLowerCase()}`;
  return (
    <div className="w-[9.75rem] flex-none">
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <input
        id={id}
        type="date"
        className={`input${invalid ? ' border-brick-600 ring-1 ring-brick-600' : ''}`}
        value={value}
        min={min}
        max={max}
        aria-invalid={invalid || undefined}
        aria-describedby={invalid ? 'df-date-problem' : undefined}
        onChange={(e) => onChange(e.target.value)}
      />
    </div>
  );
}

/** Island root. */
export default function DefectTable(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <DefectList {...props} />
    </QueryClientProvider>
  );
}
