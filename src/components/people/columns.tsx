/** Columns of the people and API-token tables, and the client-side sort both use. */
import type { ColumnDef } from '@tanstack/react-table';
import { KeyRound, Pencil } from 'lucide-react';
import { ROLE_LABELS } from '@/lib/auth/permissions';
import type { ApiToken, Person } from './queries';

/** "12 Mar 2026, 08:31" in the browser's time zone. */
export function formatDateTime(iso: string | null): string {
  if (!iso) return '';
  return new Date(iso).toLocaleString('en-GB', { day: '2-digit', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' });
}

const ROLE_BADGE: Record<string, string> = {
  admin: 'badge-brand',
  manager: 'badge-brand',
  supervisor: 'badge-seep',
  technician: 'badge-seep',
  viewer: 'badge-neutral',
};

/** Sort rows by a field (`-field` for descending); nulls last. */
export function sortRows<T>(rows: T[], sort: string, get: (row: T, field: string) => string | number | boolean | null): T[] {
  const desc = sort.startsWith('-');
  const field = desc ? sort.slice(1) : sort;
  return [...rows].sort((a, b) => {
    const x = get(a, field);
    const y = get(b, field);
    if (x === y) return 0;
    if (x === null) return 1;
    if (y === null) return -1;
    const c = typeof x === 'string' && typeof y === 'string' ? x.localeCompare(y, 'en-GB', { sensitivity: 'base' }) : x < y ? -1 : 1;
    return desc ? -c : c;
  });
}

/** Sort keys of a person row. */
export function personSortValue(p: Person, field: string): string | number | boolean | null {
  switch (field) {
    case 'email':
      return p.email;
    case 'role':
      return ROLE_LABELS[p.role];
    case 'active':
      return p.active ? 0 : 1;
    case 'lastSignInAt':
      return p.lastSignInAt;
    case 'activeTokens':
      return p.activeTokens;
    default:
      return p.name;
  }
}

type PersonActions = { meId: number; onEdit: (p: Person) => void; onPassword: (p: Person) => void };

/** Container width (CSS px) from which the one-fact-per-column layout fits; below it related facts share a cell. */
export const PEOPLE_WIDE_MIN_PX = 900;

const roleCell = (p: Person) => <span className={ROLE_BADGE[p.role] ?? 'badge-neutral'}>{ROLE_LABELS[p.role]}</span>;

function depotsCell(p: Person) {
  if (p.allDepots) return <span className="whitespace-nowrap text-ink-700">All depots</span>;
  if (!p.depots.length) return <span className="text-brick-700">None</span>;
  return (
    <span className="flex flex-wrap gap-x-2 gap-y-0.5 mono text-ink-700">
      {p.depots.map((d) => (
        <span key={d}>{d}</span>
      ))}
    </span>
  );
}

const activeCell = (p: Person) => (p.active ? <span className="badge-moss">Active</span> : <span className="badge-neutral">Deactivated</span>);
const signInCell = (p: Person) => (p.lastSignInAt ? formatDateTime(p.lastSignInAt) : <span className="text-ink-400">Never</span>);

/** The people table's columns; `compact` (tablet portrait) puts role with depots and status with the last sign-in. */
export function personColumns({ meId, onEdit, onPassword }: PersonActions, compact = false): ColumnDef<Person>[] {
  const name: ColumnDef<Person> = {
    id: 'name',
    header: 'Name · e-mail',
    cell: ({ row }) => (
      <div className="min-w-40">
        <button
          type="button"
          className={`-my-1 min-h-8 text-left font-semibold hover:underline ${row.original.active ? 'text-ink-900' : 'text-ink-500'}`}
          onClick={() => onEdit(row.original)}
        >
          {row.original.name}
          {row.original.id === meId && <span className="ml-1.5 text-xs font-normal text-ink-500">(you)</span>}
        </button>
        <div className="text-xs text-ink-500">{row.original.email}</div>
      </div>
    ),
    meta: { sortField: 'name' },
  };
  const tokens: ColumnDef<Person> = {
    id: 'activeTokens',
    header: 'Tokens',
    cell: ({ row }) => (row.original.activeTokens ? row.original.activeTokens : <span className="text-ink-400">0</span>),
    meta: { sortField: 'activeTokens', align: 'right' },
  };
  const actions: ColumnDef<Person> = {
    id: 'actions',
    header: () => <span className="sr-only">Actions</span>,
    cell: ({ row }) => (
      <div className="-my-1.5 flex justify-end gap-1">
        <button type="button" className="btn-ghost px-2.5" onClick={() => onEdit(row.original)} aria-label={`Edit ${row.original.name}`} title="Edit role, depots, active">
          <Pencil size={16} aria-hidden="true" />
        </button>
        <button
          type="button"
          className="btn-ghost px-2.5"
          onClick={() => onPassword(row.original)}
          aria-label={`Reset password of ${row.original.name}`}
          title="Reset password"
        >
          <KeyRound size={16} aria-hidden="true" />
        </button>
      </div>
    ),
    meta: { align: 'right', className: 'whitespace-nowrap' },
  };
  if (compact) {
    return [
      name,
      {
        id: 'roleDepots',
        header: 'Role · depots',
        cell: ({ row }) => (
          <div className="space-y-1">
            {roleCell(row.original)}
            <div className="text-sm">{depotsCell(row.original)}</div>
          </div>
        ),
        meta: { sortField: 'role' },
      },
      {
        id: 'activeSignIn',
        header: 'Status · last sign-in',
        cell: ({ row }) => (
          <div className="space-y-1">
            {activeCell(row.original)}
            <div className="text-xs whitespace-nowrap text-ink-600">{signInCell(row.original)}</div>
          </div>
        ),
        meta: { sortField: 'lastSignInAt' },
      },
      tokens,
      actions,
    ];
  }
  return [
    name,
    { id: 'role', header: 'Role', cell: ({ row }) => roleCell(row.original), meta: { sortField: 'role' } },
    { id: 'depots', header: 'Depots', cell: ({ row }) => depotsCell(row.original) },
    { id: 'active', header: 'Active', cell: ({ row }) => activeCell(row.original), meta: { sortField: 'active' } },
    { id: 'lastSignInAt', header: 'Last sign-in', cell: ({ row }) => signInCell(row.original), meta: { sortField: 'lastSignInAt', className: 'whitespace-nowrap' } },
    tokens,
    actions,
  ];
}

/** Sort keys of a token row. */
export function tokenSortValue(t: ApiToken, field: string): string | number | boolean | null {
  switch (field) {
    case 'label':
      return t.label;
    case 'name':
      return t.name;
    case 'lastUsedAt':
      return t.lastUsedAt;
    default:
      return t.createdAt;
  }
}

/** The API-token table's columns. */
export function tokenColumns({ onRevoke }: { onRevoke: (t: ApiToken) => void }): ColumnDef<ApiToken>[] {
  return [
    { id: 'label', header: 'Label', cell: ({ row }) => <span className="font-semibold text-ink-900">{row.original.label}</span>, meta: { sortField: 'label' } },
    {
      id: 'name',
      header: 'Acts as',
      cell: ({ row }) => (
        <span>
          {row.original.name} <span className="text-ink-500">{row.original.email}</span>
        </span>
      ),
      meta: { sortField: 'name' },
    },
    {
      id: 'prefix',
      header: 'Token',
      cell: ({ row }) => <span className="mono text-ink-600">{row.original.prefix}…</span>,
      meta: { className: 'whitespace-nowrap' },
    },
    {
      id: 'createdAt',
      header: 'Created · last used',
      cell: ({ row }) => (
        <div className="whitespace-nowrap">
          <div>{formatDateTime(row.original.createdAt)}</div>
          <div className="text-xs text-ink-500">{row.original.lastUsedAt ? `used ${formatDateTime(row.original.lastUsedAt)}` : 'never used'}</div>
        </div>
      ),
      meta: { sortField: 'createdAt' },
    },
    {
      id: 'status',
      header: 'Status',
      cell: ({ row }) =>
        row.original.revokedAt ? (
          <span className="badge-neutral" title={`Revoked ${formatDateTime(row.original.revokedAt)}`}>
            Revoked
          </span>
        ) : (
          <div className="-my-1.5 flex items-center gap-2">
            <span className="badge-moss">Active</span>
            <button
              type="button"
              className="btn-ghost text-brick-700 hover:bg-brick-50"
              onClick={() => onRevoke(row.original)}
              aria-label={`Revoke token ${row.original.label}`}
            >
              Revoke
            </button>
          </div>
        ),
      meta: { className: 'whitespace-nowrap' },
    },
  ];
}
