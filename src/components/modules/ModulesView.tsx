/** Modules: the catalogue with search and function filter in the URL; admins and managers add, change and delete. */
import { useEffect, useMemo, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { Plus, Search } from 'lucide-react';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { useUrlState } from '@/lib/client/url-state';
import { can, type Role } from '@/lib/auth/permissions';
import { FUNCTION_LABELS } from '@/components/labels';
import { DataTable } from '@/components/ui/DataTable';
import { ConfirmDialog, Dialog } from '@/components/ui/Dialog';
import { useContainerWidth } from '@/components/defects/use-container-width';
import { moduleDeleteBlocker } from '@/components/depots/delete-blocker';
import { ModuleForm } from './ModuleForm';
import { MODULE_WIDE_MIN_PX, moduleColumns } from './columns';
import { MODULE_FUNCTIONS, useDeleteModule, useModules, type ModuleType } from './queries';

type Props = { role: Role; initialParams?: Record<string, string> };

/** Island root of /modules. */
export default function ModulesView(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <Modules {...props} />
    </QueryClientProvider>
  );
}

const PAGE_SIZE = 50;

function Modules({ role, initialParams = {} }: Props) {
  const canWrite = can(role, 'module:write');
  const [params, setParams] = useUrlState(initialParams);
  const [search, setSearch] = useState(params.q ?? '');
  useEffect(() => {
    const t = setTimeout(() => {
      if ((params.q ?? '') !== search.trim()) setParams({ q: search.trim() });
    }, 250);
    return () => clearTimeout(t);
  }, [search, params.q, setParams]);

  const fn = params.function && (MODULE_FUNCTIONS as readonly string[]).includes(params.function) ? params.function : undefined;
  const query = { q: params.q, function: fn, sort: params.sort ?? 'code', page: params.page, pageSize: String(PAGE_SIZE) };
  const { data, isFetching, error } = useModules(query);
  const [editing, setEditing] = useState<ModuleType | 'new' | null>(null);
  const [deleting, setDeleting] = useState<ModuleType | null>(null);
  const [busy, setBusy] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);
  const remove = useDeleteModule();
  const [boxRef, width] = useContainerWidth<HTMLDivElement>();
  const compact = width !== null && width < MODULE_WIDE_MIN_PX;
  const columns = useMemo(() => moduleColumns({ canWrite, onEdit: setEditing, onDelete: setDeleting }, compact), [canWrite, compact]);
  const formId = 'module-form';
  const total = data?.total ?? 0;
  const filtered = Boolean(params.q || fn);

  return (
    <div ref={boxRef}>
      <div className="mb-4 flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>Modules</h1>
          <p className="text-sm text-ink-500">
            {data ? `${total} module type${total === 1 ? '' : 's'}` : 'Module types'} · the door body-electrics parts defects are recorded against
          </p>
        </div>
        {canWrite && (
          <button type="button" className="btn-primary" onClick={() => setEditing('new')}>
            <Plus size={18} aria-hidden="true" /> Add module type
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

      <div className="mb-3 flex flex-wrap items-end gap-3">
        <label className="relative w-full max-w-sm">
          <span className="sr-only">Search module types</span>
          <Search size={16} className="pointer-events-none absolute top-1/2 left-3 -translate-y-1/2 text-ink-400" aria-hidden="true" />
          <input
            type="search"
            className="input pl-9"
            placeholder="Code, name, part number or supplier"
            value={search}
            onChange={(e) => setSearch(e.target.value)}
          />
        </label>
        <label className="flex items-center gap-2">
          <span className="text-sm font-semibold text-ink-700">Function</span>
          <select className="input w-auto min-w-48" value={fn ?? ''} onChange={(e) => setParams({ function: e.target.value })}>
            <option value="">All functions</option>
            {MODULE_FUNCTIONS.map((f) => (
              <option key={f} value={f}>
                {FUNCTION_LABELS[f] ?? f}
              </option>
            ))}
          </select>
        </label>
        {filtered && (
          <button
            type="button"
            className="btn-ghost"
            onClick={() => {
              setSearch('');
              setParams({ q: undefined, function: undefined });
            }}
          >
            Clear filters
          </button>
        )}
      </div>

      <DataTable
        caption="Module catalogue"
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
        emptyText={filtered ? 'No module type matches these filters.' : 'The catalogue is empty.'}
      />
      <p className="mt-2 text-xs text-ink-500">Defect counts cover the depots you can see; “Open” is everything not yet closed or cancelled.</p>

      {canWrite && (
        <>
          <Dialog
            open={editing !== null}
            onClose={() => setEditing(null)}
            title={editing === 'new' ? 'Add module type' : `Edit module type ${editing?.code ?? ''}`}
            footer={
              <>
                <button type="button" className="btn-secondary" onClick={() => setEditing(null)}>
                  Cancel
                </button>
                <button type="submit" form={formId} className="btn-primary" disabled={busy}>
                  {busy ? 'Saving…' : editing === 'new' ? 'Add module type' : 'Save changes'}
                </button>
              </>
            }
          >
            <ModuleForm
              formId={formId}
              module={editing === 'new' ? null : editing}
              onBusy={setBusy}
              onSaved={(m) => {
                setNotice(editing === 'new' ? `Module type ${m.code} added.` : `Module type ${m.code} saved.`);
                setEditing(null);
              }}
            />
          </Dialog>
          <ConfirmDialog
            open={deleting !== null}
            onClose={() => setDeleting(null)}
            title={`Delete module type ${deleting?.code ?? ''}?`}
            confirmLabel="Delete module type"
            blockedReason={moduleDeleteBlocker(deleting?.usage)}
            onConfirm={async () => {
              const code = deleting!.code;
              await remove.mutateAsync(code);
              setNotice(`Module type ${code} deleted.`);
            }}
          >
            <p>
              <strong>{deleting?.name}</strong> will be removed from the catalogue. A module type with defects recorded against it cannot be deleted.
            </p>
          </ConfirmDialog>
        </>
      )}
    </div>
  );
}
