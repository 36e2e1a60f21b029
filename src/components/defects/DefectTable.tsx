/**
 * The Defects list island: server-side paging, sorting, search and filters over the caller's depots, kept
 * in the URL, and a CSV download of the whole filtered view in the defects import format.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { ChevronDown, ChevronUp, Download, X } from 'lucide-react';
import { queryClient } from '@/lib/client/query-client';
import { useUrlState } from '@/lib/client/url-state';
import { DataTable } from '@/components/ui/DataTable';
import { MOISTURE_LABELS, POSITION_LABELS, STATUS_LABELS } from '@/components/labels';
import { useDepotOptions } from '@/components/vehicles/queries';
import { ChipGroup, PageSizeSelect, SearchBox, SelectField, Toggle, pageOf, pageSizeOf, splitList } from './FilterControls';
import { DEFECT_NARROW_MAX_PX, DEFECT_WIDE_MIN_PX, defectColumns, defectColumnsCompact, defectColumnsNarrow } from './columns';
import { buildDefectsCsv, defectsCsvFileName } from './csv-export';
import { formatCount } from './format';
import { EXPORT_MAX_ROWS, fetchAllDefects, pickDefectParams, useDefects, useModuleOptions } from './queries';
import { useContainerWidth } from './use-container-width';

type Props = {
  /** The page's query string at render time, so the server render and hydration agree. */
  initialParams: Record<string, string>;
  /** Show the "My defects" filter (people who report and work defects). */
  showMine: boolean;
};

const FILTER_KEYS = ['q', 'depot', 'vin', 'status', 'module', 'position', 'moisture', 'repeat', 'open', 'mine', 'reportedFrom', 'reportedTo'] as const;
const STATUS_OPTIONS = Object.entries(STATUS_LABELS).map(([value, label]) => ({ value, label }));
const POSITION_OPTIONS = Object.entries(POSITION_LABELS).map(([value, label]) => ({ value, label: value, title: label }));
const MOISTURE_OPTIONS = Object.entries(MOISTURE_LABELS).map(([value, label]) => ({ value, label }));

type ExportState =
  | { phase: 'idle' }
  | { phase: 'running'; done: number; total: number }
  | { phase: 'done'; rows: number; truncated: boolean; total: number }
  | { phase: 'error'; message: string };

function DefectList({ initialParams, showMine }: Props) {
  const [state, update] = useUrlState(initialParams);
  const page = pageOf(state.page);
  const pageSize = pageSizeOf(state.pageSize);
  const sort = state.sort || '-reportedAt';
  const params = useMemo(() => pickDefectParams({ ...state, page: String(page), pageSize: String(pageSize), sort }), [state, page, pageSize, sort]);
  const list = useDefects(params);
  const depots = useDepotOptions();
  const modules = useModuleOptions();
  const [boxRef, width] = useContainerWidth<HTMLDivElement>();
  const columns = width === null || width >= DEFECT_WIDE_MIN_PX ? defectColumns : width < DEFECT_NARROW_MAX_PX ? defectColumnsNarrow : defectColumnsCompact;

  // A page past the end (a shared link after the list shrank): go to the last page instead of showing nothing.
  const lastPage = list.data ? Math.max(1, Math.ceil(list.data.total / pageSize)) : 1;
  useEffect(() => {
    if (list.data && !list.isPlaceholderData && list.data.items.length === 0 && list.data.total > 0 && page > lastPage)
      update({ page: String(lastPage) }, false);
  }, [list.data, list.isPlaceholderData, page, lastPage, update]);

  const onSearch = useCallback((q: string) => update({ q }), [update]);
  const set = (k: string) => (v: string) => update({ [k]: v });
  const flag = (k: string) => (on: boolean) => update({ [k]: on ? '1' : undefined });
  const filtered = FILTER_KEYS.some((k) => state[k]);
  const total = list.data?.total ?? 0;
  const depotOptions = (depots.data ?? []).map((d) => ({ value: d.code, label: `${d.code} · ${d.name}` }));
  const moduleOptions = (modules.data ?? []).map((m) => ({ value: m.code, label: `${m.code} · ${m.name}` }));

  const chipCount = ['status', 'position', 'moisture'].reduce((n, k) => n + splitList(state[k]).length, 0);
  const [moreOpen, setMoreOpen] = useState(chipCount > 0);

  const [exp, setExp] = useState<ExportState>({ phase: 'idle' });
  const abortRef = useRef<AbortController | null>(null);
  const download = async () => {
    abortRef.current?.abort();
    const ac = new AbortController();
    abortRef.current = ac;
    setExp({ phase: 'running', done: 0, total: Math.min(total, EXPORT_MAX_ROWS) });
    try {
      const r = await fetchAllDefects(params, (done, t) => setExp({ phase: 'running', done, total: t }), ac.signal);
      const blob = new Blob([buildDefectsCsv(r.rows)], { type: 'text/csv;charset=utf-8' });
      const url = URL.createObjectURL(blob);
      const a = document.createElement('a');
      a.href = url;
      a.download = defectsCsvFileName(new Date());
      document.body.appendChild(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
      setExp({ phase: 'done', rows: r.rows.length, truncated: r.truncated, total: r.total });
    } catch (e) {
      if (ac.signal.aborted) setExp({ phase: 'idle' });
      else setExp({ phase: 'error', message: e instanceof Error ? e.message : 'The download failed.' });
    }
  };

  return (
    <div className="space-y-3" ref={boxRef}>
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>Defects</h1>
          <p className="text-sm text-ink-500" aria-live="polite">
            {list.data
              ? `${formatCount(total)} ${total === 1 ? 'defect' : 'defects'}${filtered ? (total === 1 ? ' matches these filters' : ' match these filters') : ' in your depots'}`
              : 'Loading defects…'}
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <PageSizeSelect value={pageSize} onChange={(n) => update({ pageSize: String(n) })} />
          {exp.phase === 'running' ? (
            <button type="button" className="btn-secondary" onClick={() => abortRef.current?.abort()}>
              <X size={16} aria-hidden="true" /> Stop ({formatCount(exp.done)} of {formatCount(exp.total)})
            </button>
          ) : (
            <button
              type="button"
              className="btn-secondary"
              onClick={download}
              disabled={!list.data || total === 0}
              title="Every defect of this filtered view, in the defects import format"
            >
              <Download size={16} aria-hidden="true" /> Download CSV
            </button>
          )}
        </div>
      </div>
      {exp.phase === 'done' && (
        <p role="status" className="text-sm text-ink-600">
          Downloaded {formatCount(exp.rows)} {exp.rows === 1 ? 'defect' : 'defects'}.
          {exp.truncated &&
            ` The download stops at ${formatCount(EXPORT_MAX_ROWS)} of ${formatCount(exp.total)}; narrow the filters (for example by dates) and download the rest separately.`}
        </p>
      )}
      {exp.phase === 'error' && (
        <p role="alert" className="text-sm text-brick-700">
          The download failed: {exp.message}
        </p>
      )}

      <form className="card card-pad space-y-3" role="search" aria-label="Filter defects" onSubmit={(e) => e.preventDefault()}>
        <div className="flex flex-wrap items-end gap-3">
          <SearchBox label="Search" placeholder="Ref, VIN, fleet no., symptom, code" value={state.q ?? ''} onChange={onSearch} />
          {depotOptions.length > 1 && (
            <SelectField
              label="Depot"
              value={state.depot ?? ''}
              onChange={set('depot')}
              options={depotOptions}
              anyLabel="All depots"
              className="min-w-[11rem] flex-[1_1_11rem]"
            />
          )}
          <SelectField
            label="Module"
            value={state.module ?? ''}
            onChange={set('module')}
            options={moduleOptions}
            anyLabel="All modules"
            className="min-w-[11rem] flex-[1_1_12rem]"
          />
          <DateField label="Reported from" value={state.reportedFrom ?? ''} onChange={set('reportedFrom')} max={state.reportedTo} />
          <DateField label="Reported to" value={state.reportedTo ?? ''} onChange={set('reportedTo')} min={state.reportedFrom} />
        </div>
        <div className="flex flex-wrap items-center gap-2">
          <Toggle label="Open only" checked={state.open === '1'} onChange={flag('open')} />
          <Toggle label="Repeats only" checked={state.repeat === '1'} onChange={flag('repeat')} />
          {showMine && <Toggle label="My defects" checked={state.mine === '1'} onChange={flag('mine')} />}
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
          {filtered && (
            <button type="button" className="btn-ghost ml-auto" onClick={() => update(Object.fromEntries(FILTER_KEYS.map((k) => [k, undefined])))}>
              Clear filters
            </button>
          )}
        </div>
        {moreOpen && (
          <div id="defect-more-filters" className="flex flex-wrap gap-x-6 gap-y-3 border-t border-ink-100 pt-3">
            <ChipGroup label="Status" value={state.status ?? ''} onChange={set('status')} options={STATUS_OPTIONS} />
            <ChipGroup label="Door" value={state.position ?? ''} onChange={set('position')} options={POSITION_OPTIONS} />
            <ChipGroup label="Moisture found" value={state.moisture ?? ''} onChange={set('moisture')} options={MOISTURE_OPTIONS} />
          </div>
        )}
      </form>

      <DataTable
        caption="Defects"
        columns={columns}
        data={list.data?.items ?? []}
        total={total}
        page={page}
        pageSize={pageSize}
        sort={sort}
        onSort={(s) => update({ sort: s })}
        onPage={(p) => update({ page: String(p) }, false)}
        loading={list.isPending || list.isPlaceholderData}
        error={list.error ? list.error.message : null}
        emptyText={filtered ? 'No defects match these filters.' : 'No defects recorded in your depots yet.'}
      />
    </div>
  );
}

function DateField({ label, value, onChange, min, max }: { label: string; value: string; onChange: (v: string) => void; min?: string; max?: string }) {
  const id = `df-${label.replace(/\s+/g, '-').toLowerCase()}`;
  return (
    <div className="w-[9.75rem] flex-none">
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <input id={id} type="date" className="input" value={value} min={min} max={max} onChange={(e) => onChange(e.target.value)} />
    </div>
  );
}

/** Island root. */
export default function DefectTable(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <DefectList {...props} />
    </QueryClientProvider>
  );
}
