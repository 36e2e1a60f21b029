/** People (admin only): who may sign in, their role and depots, password resets, and API tokens. */
import { useMemo, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { Plus, Search } from 'lucide-react';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { ROLE_LABELS, ROLE_VALUES } from '@/lib/auth/permissions';
import { DataTable } from '@/components/ui/DataTable';
import { Dialog } from '@/components/ui/Dialog';
import { CheckRow } from '@/components/ui/FormField';
import { useContainerWidth } from '@/components/defects/use-container-width';
import { PEOPLE_WIDE_MIN_PX, personColumns, personSortValue, sortRows } from './columns';
import { PasswordForm, PersonForm } from './PersonForm';
import { TokensSection } from './TokensSection';
import { usePeople, type Person } from './queries';

type Props = { meId: number };

/** Island root of /people. */
export default function PeopleView(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <People {...props} />
    </QueryClientProvider>
  );
}

function People({ meId }: Props) {
  const { data, isFetching, error } = usePeople();
  const [sort, setSort] = useState('name');
  const [q, setQ] = useState('');
  const [role, setRole] = useState('');
  const [showInactive, setShowInactive] = useState(true);
  const [editing, setEditing] = useState<Person | 'new' | null>(null);
  const [pwFor, setPwFor] = useState<Person | null>(null);
  const [busy, setBusy] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);
  const [boxRef, width] = useContainerWidth<HTMLDivElement>();
  const compact = width !== null && width < PEOPLE_WIDE_MIN_PX;
  const columns = useMemo(() => personColumns({ meId, onEdit: setEditing, onPassword: setPwFor }, compact), [meId, compact]);
  const people = data ?? [];
  const needle = q.trim().toLowerCase();
  const rows = sortRows(
    people.filter(
      (p) =>
        (!needle || p.name.toLowerCase().includes(needle) || p.email.toLowerCase().includes(needle) || p.depots.some((d) => d.toLowerCase() === needle)) &&
        (!role || p.role === role) &&
        (showInactive || p.active),
    ),
    sort,
    personSortValue,
  );
  const inactive = people.filter((p) => !p.active).length;

  return (
    <div ref={boxRef}>
      <div className="mb-4 flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>People</h1>
          <p className="text-sm text-ink-500">
            {data ? `${people.length} people${inactive ? `, ${inactive} deactivated` : ''}` : 'People'} · roles decide what they may do, depots what they see
          </p>
        </div>
        <button type="button" className="btn-primary" onClick={() => setEditing('new')}>
          <Plus size={18} aria-hidden="true" /> Add person
        </button>
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
        <label className="relative w-full max-w-xs">
          <span className="sr-only">Search people</span>
          <Search size={16} className="pointer-events-none absolute top-1/2 left-3 -translate-y-1/2 text-ink-400" aria-hidden="true" />
          <input type="search" className="input pl-9" placeholder="Name, e-mail or depot code" value={q} onChange={(e) => setQ(e.target.value)} />
        </label>
        <label className="flex items-center gap-2">
          <span className="text-sm font-semibold text-ink-700">Role</span>
          <select className="input w-auto min-w-44" value={role} onChange={(e) => setRole(e.target.value)}>
            <option value="">All roles</option>
            {ROLE_VALUES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </select>
        </label>
        {inactive > 0 && (
          <CheckRow checked={showInactive} onChange={(e) => setShowInactive(e.target.checked)}>
            Show deactivated
          </CheckRow>
        )}
      </div>

      <DataTable
        caption="People"
        columns={columns}
        data={rows}
        total={rows.length}
        page={1}
        pageSize={Math.max(1, rows.length)}
        sort={sort}
        onSort={setSort}
        onPage={() => undefined}
        loading={isFetching && !data}
        error={error ? error.message : null}
        emptyText={people.length ? 'Nobody matches these filters.' : 'Nobody yet.'}
      />

      <TokensSection people={people} />

      <Dialog
        open={editing !== null}
        onClose={() => setEditing(null)}
        title={editing === 'new' ? 'Add person' : `Edit ${editing?.name ?? ''}`}
        size="lg"
        footer={
          <>
            {editing !== null && editing !== 'new' && (
              <button
                type="button"
                className="btn-ghost mr-auto"
                onClick={() => {
                  setPwFor(editing);
                  setEditing(null);
                }}
              >
                Reset password…
              </button>
            )}
            <button type="button" className="btn-secondary" onClick={() => setEditing(null)}>
              Cancel
            </button>
            <button type="submit" form="person-form" className="btn-primary" disabled={busy}>
              {busy ? 'Saving…' : editing === 'new' ? 'Add person' : 'Save changes'}
            </button>
          </>
        }
      >
        <PersonForm
          formId="person-form"
          person={editing === 'new' ? null : editing}
          meId={meId}
          onBusy={setBusy}
          onSaved={(_p, message) => {
            setNotice(message);
            setEditing(null);
          }}
        />
      </Dialog>

      <Dialog
        open={pwFor !== null}
        onClose={() => setPwFor(null)}
        title={`Reset password: ${pwFor?.name ?? ''}`}
        size="md"
        footer={
          <>
            <button type="button" className="btn-secondary" onClick={() => setPwFor(null)}>
              Cancel
            </button>
            <button type="submit" form="password-form" className="btn-primary" disabled={busy}>
              {busy ? 'Saving…' : 'Set new password'}
            </button>
          </>
        }
      >
        {pwFor && (
          <PasswordForm
            formId="password-form"
            person={pwFor}
            onBusy={setBusy}
            onSaved={(message) => {
              setNotice(message);
              setPwFor(null);
            }}
          />
        )}
      </Dialog>
    </div>
  );
}
