/** Columns of the module catalogue table: wide (one fact a column) and compact (tablet portrait). */
import type { ColumnDef } from '@tanstack/react-table';
import { Pencil, Trash2 } from 'lucide-react';
import { FUNCTION_LABELS } from '@/components/labels';
import type { ModuleType } from './queries';

type Actions = { canWrite: boolean; onEdit: (m: ModuleType) => void; onDelete: (m: ModuleType) => void };

/** Container width (CSS px) from which the one-fact-per-column layout fits; below it related facts share a cell. */
export const MODULE_WIDE_MIN_PX = 900;

const dash = <span className="text-ink-400">—</span>;

function CodeCell({ m, canWrite, onEdit }: { m: ModuleType; canWrite: boolean; onEdit: (m: ModuleType) => void }) {
  return canWrite ? (
    <button type="button" className="link mono -my-2 min-h-10 text-left" onClick={() => onEdit(m)} title={`Edit module type ${m.code}`}>
      {m.code}
    </button>
  ) : (
    <span className="mono font-semibold">{m.code}</span>
  );
}

function DefectsLink({ m }: { m: ModuleType }) {
  return m.defects > 0 ? (
    <a className="link" href={`/defects?module=${encodeURIComponent(m.code)}`} aria-label={`${m.code}: ${m.defects} defects`}>
      {m.defects.toLocaleString('en-GB')}
    </a>
  ) : (
    <span className="text-ink-500">0</span>
  );
}

function OpenLink({ m }: { m: ModuleType }) {
  return m.openDefects > 0 ? (
    <a className="link" href={`/defects?module=${encodeURIComponent(m.code)}&open=1`} aria-label={`${m.code}: ${m.openDefects} open`}>
      {m.openDefects.toLocaleString('en-GB')}
    </a>
  ) : (
    <span className="text-ink-500">0</span>
  );
}

const functionBadge = (m: ModuleType) => <span className="badge-neutral">{FUNCTION_LABELS[m.function] ?? m.function}</span>;

function actionsColumn({ onEdit, onDelete }: Actions): ColumnDef<ModuleType> {
  return {
    id: 'actions',
    header: () => <span className="sr-only">Actions</span>,
    cell: ({ row }) => (
      <div className="-my-1.5 flex justify-end gap-1">
        <button type="button" className="btn-ghost px-2.5" onClick={() => onEdit(row.original)} aria-label={`Edit module type ${row.original.code}`} title="Edit">
          <Pencil size={16} aria-hidden="true" />
        </button>
        <button
          type="button"
          className="btn-ghost px-2.5 text-brick-700 hover:bg-brick-50"
          onClick={() => onDelete(row.original)}
          aria-label={`Delete module type ${row.original.code}`}
          title="Delete"
        >
          <Trash2 size={16} aria-hidden="true" />
        </button>
      </div>
    ),
    meta: { align: 'right', className: 'whitespace-nowrap' },
  };
}

/** The catalogue's columns; the actions column appears only for roles that may change the catalogue. */
export function moduleColumns(a: Actions, compact = false): ColumnDef<ModuleType>[] {
  const { canWrite, onEdit } = a;
  const cols: ColumnDef<ModuleType>[] = compact
    ? [
        {
          id: 'module',
          header: 'Module type',
          cell: ({ row }) => (
            <div className="min-w-40 leading-tight">
              <CodeCell m={row.original} canWrite={canWrite} onEdit={onEdit} />
              <div className="text-ink-900">{row.original.name}</div>
            </div>
          ),
          meta: { sortField: 'code' },
        },
        {
          id: 'part',
          header: 'Function · part',
          cell: ({ row }) => (
            <div className="space-y-1 leading-tight">
              {functionBadge(row.original)}
              <div className="text-xs text-ink-600">
                {row.original.partNumber ? <span className="mono">{row.original.partNumber}</span> : 'No part number'}
                {row.original.supplier && <span> · {row.original.supplier}</span>}
              </div>
            </div>
          ),
          meta: { sortField: 'function' },
        },
        {
          id: 'counts',
          header: 'Defects · open',
          cell: ({ row }) => (
            <div className="leading-tight whitespace-nowrap">
              <div>
                <DefectsLink m={row.original} /> <span className="text-xs text-ink-500">defects</span>
              </div>
              <div className="mt-1">
                <OpenLink m={row.original} /> <span className="text-xs text-ink-500">open</span>
              </div>
            </div>
          ),
          meta: { align: 'right' },
        },
      ]
    : [
        {
          id: 'code',
          header: 'Code',
          cell: ({ row }) => <CodeCell m={row.original} canWrite={canWrite} onEdit={onEdit} />,
          meta: { sortField: 'code', className: 'font-semibold mono whitespace-nowrap' },
        },
        { id: 'name', header: 'Name', accessorKey: 'name', meta: { sortField: 'name', className: 'min-w-48' } },
        { id: 'function', header: 'Function', cell: ({ row }) => functionBadge(row.original), meta: { sortField: 'function' } },
        {
          id: 'partNumber',
          header: 'Part number',
          cell: ({ row }) => (row.original.partNumber ? <span className="mono">{row.original.partNumber}</span> : dash),
          meta: { sortField: 'partNumber', className: 'whitespace-nowrap' },
        },
        { id: 'supplier', header: 'Supplier', cell: ({ row }) => row.original.supplier ?? dash, meta: { sortField: 'supplier' } },
        { id: 'defects', header: 'Defects', cell: ({ row }) => <DefectsLink m={row.original} />, meta: { align: 'right' } },
        { id: 'open', header: 'Open', cell: ({ row }) => <OpenLink m={row.original} />, meta: { align: 'right' } },
      ];
  if (canWrite) cols.push(actionsColumn(a));
  return cols;
}
