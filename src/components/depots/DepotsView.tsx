/** Depots: the list with climate bars, search and sort in the URL; admins and managers add, change and delete. */
import { useEffect, useMemo, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { Plus, Search } from 'lucide-react';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { useUrlState } from '@/lib/client/url-state';
import { can, type Role } from '@/lib/auth/permissions';
import { DataTable } from '@/components/ui/DataTable';
import { ConfirmDialog, Dialog } from '@/components/ui/Dialog';
import { useContainerWidth } from '@/components/defects/use-container-width';
import { DepotForm } from './DepotForm';
import { DEPOT_WIDE_MIN_PX, depotColumns } from './columns';
import { depotDeleteBlocker } from './delete-blocker';
import { useDeleteDepot, useDepots, type Depot } from './queries';

type Props = { role: Role; initialParams?: Record<string, string> };

/** Island root of /depots. */
export default function DepotsView(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <Depots {...props} />
    </QueryClientProvider>
  );
}

const PAGE_SIZE = 50;

function Depots({ role, initialParams = {} }: Props) {
  const canWrite = can(role, 'depot:write');
  const [params, setParams] = useUrlState(initialParams);
  const [search, setSearch] = useState(params.q ?? '');
  useEffect(() => {
    const t = setTimeout(() => {
      if ((params.q ?? '') !== search.trim()) setParams({ q: search.trim() });
    }, 250);
    return () => clearTimeout(t);
  }, [search, params.q, setParams]);

  const query = { q: params.q, sort: params.sort ?? 'code', page: params.page, pageSize: String(PAGE_SIZE) };
  const { data, isFetching, error } = useDepots(query);
  const [editing, setEditing] = useState<Depot | 'new' | null>(null);
  const [deleting, setDeleting] = useState<Depot | null>(null);
  const [busy, setBusy] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);
  const remove = useDeleteDepot();
  const [boxRef, width] = useContainerWidth<HTMLDivElement>();
  const compact = width !== null && width < DEPOT_WIDE_MIN_PX;
  const columns = useMemo(() => depotColumns({ canWrite, onEdit: setEditing, onDelete: setDeleting }, compact), [canWrite, compact]);
  const formId = 'depot-form';
  const total = data?.total ?? 0;

  return (
    <div ref={boxRef}>
      <div className="mb-4 flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>Depots</h1>
          <p className="text-sm text-ink-500">
            {data ? `${total} depot${total === 1 ? '' : 's'}` : 'Depots'} · climate and washing feed each vehicle's moisture exposure
          </p>
        </div>
        {canWrite && (
          <button type="button" className="btn-primary" onClick={() => setEditing('new')}>
            <Plus size={18} aria-hidden="true" /> Add depot
          </button>
        )}
      </div>

      {notice && (
        <div
          role="status"
          className="mb-3 flex items-center justify-between gap-3 rounded-md border border-moss-100 bg-moss-50 px-3 py-2 text-sm text-moss-700"
        >
          <span>{notice}</span>
          <button type="button" className="btn-ghost min-h-9 px-2 text-moss-700" onClick={() => setNotice(null)}>
            Dismiss
          </button>
        </div>
      )}

      <div className="mb-3 flex flex-wrap items-center gap-3">
        <label className="relative w-full max-w-sm">
          <span className="sr-only">Search depots</span>
          <Search size={16} className="pointer-events-none absolute top-1/2 left-3 -translate-y-1/2 text-ink-400" aria-hidden="true" />
          <input type="search" className="input pl-9" placeholder="Code, name or region" value={search} onChange={(e) => setSearch(e.target.value)} />
        </label>
      </div>

      <DataTable
        caption="Depots"
        columns={columns}
        data={data?.items ?? []}
        total={total}
        page={data?.page ?? 1}
        pageSize={PAGE_SIZE}
        sort={query.sort}
        onSort={(s) => setParams({ sort: s })}
        onPage={(p) => setParams({ page: String(p) }, false)}
        loading={isFetching && !data}
        error={error ? error.message : null}
        emptyText={params.q ? 'No depot matches this search.' : 'No depots yet.'}
      />
      <p className="mt-2 flex flex-wrap items-center gap-x-4 gap-y-1 text-xs text-ink-500">
        <span>Climate: rain days a year and mean relative humidity. Bar shade:</span>
        <span className="inline-flex items-center gap-1.5">
          <span className="inline-block h-1.5 w-5 rounded bg-seep-700" aria-hidden="true" /> 2 exposure points
        </span>
        <span className="inline-flex items-center gap-1.5">
          <span className="inline-block h-1.5 w-5 rounded bg-seep-500/60" aria-hidden="true" /> 1 point
        </span>
        <span className="inline-flex items-center gap-1.5">
          <span className="inline-block h-1.5 w-5 rounded bg-ink-300" aria-hidden="true" /> none
        </span>
        <span>(rain ≥ 100 / ≥ 150 days, humidity ≥ 70 / ≥ 80 %; a coastal depot adds 2).</span>
      </p>

      {canWrite && (
        <>
          <Dialog
            open={editing !== null}
            onClose={() => setEditing(null)}
            title={editing === 'new' ? 'Add depot' : `Edit depot ${editing?.code ?? ''}`}
            size="lg"
            footer={
              <>
                <button type="button" className="btn-secondary" onClick={() => setEditing(null)}>
                  Cancel
                </button>
                <button type="submit" form={formId} className="btn-primary" disabled={busy}>
                  {busy ? 'Saving…' : editing === 'new' ? 'Add depot' : 'Save changes'}
                </button>
              </>
            }
          >
            <DepotForm
              formId={formId}
              depot={editing === 'new' ? null : editing}
              onBusy={setBusy}
              onSaved={(d) => {
                setNotice(editing === 'new' ? `Depot ${d.code} added.` : `Depot ${d.code} saved.`);
                setEditing(null);
              }}
            />
          </Dialog>
          <ConfirmDialog
            open={deleting !== null}
            onClose={() => setDeleting(null)}
            title={`Delete depot ${deleting?.code ?? ''}?`}
            confirmLabel="Delete depot"
            blockedReason={depotDeleteBlocker(deleting?.usage)}
            onConfirm={async () => {
              const code = deleting!.code;
              await remove.mutateAsync(code);
              setNotice(`Depot ${code} deleted.`);
            }}
          >
            <p>
              <strong>{deleting?.name}</strong> will be removed. A depot that still holds vehicles, defects or people cannot be deleted; move them first.
            </p>
          </ConfirmDialog>
        </>
      )}
    </div>
  );
}
