/**
 * The Vehicles list island: server-side paging, sorting and search over the caller's depots, with the
 * filters kept in the URL so a filtered view can be shared or reloaded.
 */
import { useCallback, useEffect, useMemo, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { useUrlState } from '@/lib/client/url-state';
import { DataTable } from '@/components/ui/DataTable';
import { PARKING_LABELS } from '@/components/labels';
import { PageSizeSelect, SearchBox, SelectField, pageOf, pageSizeOf } from '@/components/defects/FilterControls';
import { formatCount } from '@/components/defects/format';
import { useContainerWidth } from '@/components/defects/use-container-width';
import { VEHICLE_STATUS_LABELS, VEHICLE_WIDE_MIN_PX, vehicleColumns, vehicleColumnsCompact, vehicleRowHref } from './columns';
import { pickVehicleParams, useDepotOptions, useVehicles } from './queries';

type Props = {
  /** The page's query string at render time, so the server render and hydration agree. */
  initialParams: Record<string, string>;
};

const FILTER_KEYS = ['q', 'depot', 'parking', 'status', 'make'] as const;

function VehicleList({ initialParams }: Props) {
  const [state, update] = useUrlState(initialParams);
  const page = pageOf(state.page);
  const pageSize = pageSizeOf(state.pageSize);
  const sort = state.sort || 'fleetNumber';
  const params = useMemo(() => pickVehicleParams({ ...state, page: String(page), pageSize: String(pageSize), sort }), [state, page, pageSize, sort]);
  const list = useVehicles(params);
  const depots = useDepotOptions();
  const [boxRef, width] = useContainerWidth<HTMLDivElement>();
  const columns = width !== null && width < VEHICLE_WIDE_MIN_PX ? vehicleColumnsCompact : vehicleColumns;

  // The API has no list of makes; gather the ones seen so far (and keep the chosen one) for the picker.
  const [makesSeen, setMakesSeen] = useState<string[]>(() => (state.make ? [state.make] : []));
  const items = list.data?.items;
  useEffect(() => {
    if (!items) return;
    setMakesSeen((prev) => {
      const add = items.map((v) => v.make).filter((m): m is string => !!m && !prev.includes(m));
      return add.length ? [...new Set([...prev, ...add])].sort((a, b) => a.localeCompare(b)) : prev;
    });
  }, [items]);

  // A page past the end (a shared link after the list shrank): go to the last page instead of showing nothing.
  const lastPage = list.data ? Math.max(1, Math.ceil(list.data.total / pageSize)) : 1;
  useEffect(() => {
    if (list.data && !list.isPlaceholderData && list.data.items.length === 0 && list.data.total > 0 && page > lastPage)
      update({ page: String(lastPage) }, false, { replace: true });
  }, [list.data, list.isPlaceholderData, page, lastPage, update]);

  const onSearch = useCallback((q: string) => update({ q }), [update]);
  const filtered = FILTER_KEYS.some((k) => state[k]);
  const total = list.data?.total ?? 0;
  const depotOptions = (depots.data ?? []).map((d) => ({ value: d.code, label: `${d.code} · ${d.name}` }));

  return (
    <div className="space-y-3" ref={boxRef}>
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>Vehicles</h1>
          <p className="text-sm text-ink-500" aria-live="polite">
            {list.data
              ? `${formatCount(total)} ${total === 1 ? 'vehicle' : 'vehicles'}${filtered ? (total === 1 ? ' matches these filters' : ' match these filters') : ' in your depots'}`
              : 'Loading vehicles…'}
          </p>
        </div>
        <PageSizeSelect value={pageSize} onChange={(n) => update({ pageSize: String(n) })} />
      </div>

      <form className="card card-pad flex flex-wrap items-end gap-3" role="search" aria-label="Filter vehicles" onSubmit={(e) => e.preventDefault()}>
        <SearchBox label="Search" placeholder="Fleet no., VIN, registration, make" value={state.q ?? ''} onChange={onSearch} />
        {depotOptions.length > 1 && (
          <SelectField
            label="Depot"
            value={state.depot ?? ''}
            onChange={(depot) => update({ depot })}
            options={depotOptions}
            anyLabel="All depots"
            className="min-w-[11rem] flex-[1_1_11rem]"
          />
        )}
        <SelectField
          label="Status"
          value={state.status ?? ''}
          onChange={(status) => update({ status })}
          options={(['active', 'off_road', 'retired'] as const).map((s) => ({
            value: s,
            label: s === 'active' ? 'In service (incl. off road)' : VEHICLE_STATUS_LABELS[s],
          }))}
        />
        <SelectField
          label="Parking"
          value={state.parking ?? ''}
          onChange={(parking) => update({ parking })}
          options={Object.entries(PARKING_LABELS).map(([value, label]) => ({ value, label }))}
        />
        <SelectField label="Make" value={state.make ?? ''} onChange={(make) => update({ make })} options={makesSeen.map((m) => ({ value: m, label: m }))} />
        {filtered && (
          <button type="button" className="btn-ghost" onClick={() => update(Object.fromEntries(FILTER_KEYS.map((k) => [k, undefined])))}>
            Clear filters
          </button>
        )}
      </form>

      <DataTable
        caption="Vehicles"
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
        emptyText={filtered ? 'No vehicles match these filters.' : 'No vehicles in your depots yet.'}
        rowHref={vehicleRowHref}
      />
    </div>
  );
}

/** Island root. */
export default function VehicleTable(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <VehicleList {...props} />
    </QueryClientProvider>
  );
}
