/** Columns of the module catalogue table. */
import type { ColumnDef } from '@tanstack/react-table';
import { Pencil, Trash2 } from 'lucide-react';
import { FUNCTION_LABELS } from '@/components/labels';
import type { ModuleType } from './queries';

type Actions = { canWrite: boolean; onEdit: (m: ModuleType) => void; onDelete: (m: ModuleType) => void };

const dash = <span className="text-ink-400">—</span>;

/** The catalogue's columns; the actions column appears only for roles that may change the catalogue. */
export function moduleColumns({ canWrite, onEdit, onDelete }: Actions): ColumnDef<ModuleType>[] {
  const cols: ColumnDef<ModuleType>[] = [
    {
      id: 'code',
      header: 'Code',
      cell: ({ row }) =>
        canWrite ? (
          <button
            type="button"
            className="link mono -my-1 min-h-8 text-left"
            onClick={() => onEdit(row.original)}
            title={`Edit module type ${row.original.code}`}
          >
            {row.original.code}
          </button>
        ) : (
          row.original.code
        ),
      meta: { sortField: 'code', className: 'font-semibold mono whitespace-nowrap' },
    },
    { id: 'name', header: 'Name', accessorKey: 'name', meta: { sortField: 'name', className: 'min-w-48' } },
    {
      id: 'function',
      header: 'Function',
      cell: ({ row }) => <span className="badge-neutral">{FUNCTION_LABELS[row.original.function] ?? row.original.function}</span>,
      meta: { sortField: 'function' },
    },
    {
      id: 'partNumber',
      header: 'Part number',
      cell: ({ row }) => (row.original.partNumber ? <span className="mono">{row.original.partNumber}</span> : dash),
      meta: { sortField: 'partNumber', className: 'whitespace-nowrap' },
    },
    { id: 'supplier', header: 'Supplier', cell: ({ row }) => row.original.supplier ?? dash, meta: { sortField: 'supplier' } },
    {
      id: 'defects',
      header: 'Defects',
      cell: ({ row }) =>
        row.original.defects > 0 ? (
          <a className="link" href={`/defects?module=${encodeURIComponent(row.original.code)}`}>
            {row.original.defects.toLocaleString('en-GB')}
          </a>
        ) : (
          <span className="text-ink-500">0</span>
        ),
      meta: { align: 'right' },
    },
    {
      id: 'open',
      header: 'Open',
      cell: ({ row }) =>
        row.original.openDefects > 0 ? (
          <a className="link" href={`/defects?module=${encodeURIComponent(row.original.code)}&open=1`}>
            {row.original.openDefects.toLocaleString('en-GB')}
          </a>
        ) : (
          <span className="text-ink-500">0</span>
        ),
      meta: { align: 'right' },
    },
  ];
  if (canWrite) {
    cols.push({
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      cell: ({ row }) => (
        <div className="-my-1.5 flex justify-end gap-1">
          <button
            type="button"
            className="btn-ghost px-2.5"
            onClick={() => onEdit(row.original)}
            aria-label={`Edit module type ${row.original.code}`}
            title="Edit"
          >
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
    });
  }
  return cols;
}
