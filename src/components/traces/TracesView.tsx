/**
 * The Traces page island: the stored hall-sensor captures in the caller's depots (verdict, defect, vehicle
 * and door, file, when, who), filtered by verdict and depot in the URL, and the upload zone for people who
 * may add traces.
 */
import { useCallback, useEffect, useMemo } from 'react';
import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { apiFetch } from '@/lib/client/api-client';
import { useUrlState } from '@/lib/client/url-state';
import type { ListResponse } from '@/lib/contracts/lists';
import { TRACE_VERDICTS } from '@/lib/contracts/traces';
import { DataTable } from '@/components/ui/DataTable';
import { PageSizeSelect, SelectField, pageOf, pageSizeOf } from '@/components/defects/FilterControls';
import { formatCount } from '@/components/defects/format';
import { useContainerWidth } from '@/components/defects/use-container-width';
import { TRACE_WIDE_MIN_PX, traceColumns, traceColumnsCompact, traceRowHref } from './columns';
import { VERDICT_LABELS } from './labels';
import { DEFAULT_TRACE_SORT, pickTraceParams, useTraces } from './queries';
import { UploadZone } from './UploadZone';

type Props = {
  /** The page's query string at render time, so the server render and hydration agree. */
  initialParams: Record<string, string>;
  /** The caller may add traces (trace:write). */
  canUpload: boolean;
};

/** Island root of /traces. */
export default function TracesView(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <TraceList {...props} />
    </QueryClientProvider>
  );
}

function useDepotOptions() {
  return useQuery({
    queryKey: ['depots', 'options'],
    queryFn: ({ signal }) => apiFetch<ListResponse<{ id: number; code: string; name: string }>>('/api/depots?pageSize=200&sort=code', { signal }),
    staleTime: 5 * 60_000,
    select: (r) => r.items.map((d) => ({ value: d.code, label: `${d.code} · ${d.name}` })),
  });
}

function TraceList({ initialParams, canUpload }: Props) {
  const [state, update] = useUrlState(initialParams);
  const page = pageOf(state.page);
  const pageSize = pageSizeOf(state.pageSize, 25);
  const sort = state.sort || DEFAULT_TRACE_SORT;
  const params = useMemo(() => pickTraceParams({ ...state, page: String(page), pageSize: String(pageSize), sort }), [state, page, pageSize, sort]);
  const list = useTraces(params);
  const depots = useDepotOptions();
  const [boxRef, width] = useContainerWidth<HTMLDivElement>();
  const columns = width !== null && width < TRACE_WIDE_MIN_PX ? traceColumnsCompact : traceColumns;
  const total = list.data?.total ?? 0;
  const filtered = !!(state.verdict || state.depot);
  const lastPage = list.data ? Math.max(1, Math.ceil(total / pageSize)) : 1;
  useEffect(() => {
    if (list.data && !list.isPlaceholderData && list.data.items.length === 0 && total > 0 && page > lastPage) update({ page: String(lastPage) }, false, { replace: true });
  }, [list.data, list.isPlaceholderData, total, page, lastPage, update]);
  const onPage = useCallback((p: number) => update({ page: String(p) }), [update]);

  return (
    <div className="space-y-4">
      <div>
        <h1>Traces</h1>
        <p className="text-sm text-ink-500">
          Hall-sensor captures of window-lifter motors, measured and classified: levels, frequency, duty cycle, glitches, the phase between the two
          channels and which way the motor turned.
        </p>
      </div>

      <div className={`grid items-start gap-4 ${canUpload ? 'xl:grid-cols-[minmax(0,24rem)_minmax(0,1fr)]' : ''}`}>
        {canUpload && (
          <section className="card card-pad" aria-labelledby="h-upload">
            <h2 id="h-upload" className="mb-1">
              Measure a capture
            </h2>
            <p className="mb-3 text-sm text-ink-600">
              Back-probe both hall-sensor signals at the door harness connector, save the scope capture as CSV and drop it here. To attach it to a defect,
              upload it from the defect's page.
            </p>
            <UploadZone />
          </section>
        )}

        <section className="min-w-0 space-y-3" aria-labelledby="h-stored" ref={boxRef}>
          <div className="flex flex-wrap items-end justify-between gap-3">
            <div>
              <h2 id="h-stored">Stored traces</h2>
              <p className="text-sm text-ink-500" aria-live="polite">
                {list.data
                  ? `${formatCount(total)} ${total === 1 ? 'trace' : 'traces'}${filtered ? (total === 1 ? ' matches these filters' : ' match these filters') : ' in your depots'}`
                  : 'Loading traces…'}
              </p>
            </div>
            <PageSizeSelect value={pageSize} onChange={(n) => update({ pageSize: String(n) })} />
          </div>
          <form className="card card-pad flex flex-wrap items-end gap-3" aria-label="Filter traces" onSubmit={(e) => e.preventDefault()}>
            <SelectField
              label="Verdict"
              value={state.verdict ?? ''}
              onChange={(verdict) => update({ verdict })}
              options={TRACE_VERDICTS.map((v) => ({ value: v, label: VERDICT_LABELS[v] }))}
              anyLabel="Any verdict"
              className="w-full sm:w-60"
            />
            {(depots.data?.length ?? 0) > 1 && (
              <SelectField label="Depot" value={state.depot ?? ''} onChange={(depot) => update({ depot })} options={depots.data ?? []} anyLabel="All depots" className="w-full sm:w-60" />
            )}
            {filtered && (
              <button type="button" className="btn-ghost" onClick={() => update({ verdict: '', depot: '' })}>
                Clear filters
              </button>
            )}
          </form>
          <DataTable
            columns={columns}
            data={list.data?.items ?? []}
            total={total}
            page={page}
            pageSize={pageSize}
            sort={sort}
            onSort={(s) => update({ sort: s })}
            onPage={onPage}
            loading={list.isLoading || list.isPlaceholderData}
            error={list.error ? list.error.message : null}
            emptyText={filtered ? 'No traces match these filters.' : 'No traces stored yet. Measure a capture to start.'}
            caption="Stored traces"
            rowHref={traceRowHref}
          />
        </section>
      </div>
    </div>
  );
}
