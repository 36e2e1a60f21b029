/**
 * Server-driven table (TanStack Table with manual paging and sorting): the island owns the URL state and the
 * query; this renders the header with sort buttons, the rows, and the pager.
 */
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef } from '@tanstack/react-table';

declare module '@tanstack/react-table' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData, TValue> {
    /** The API's sort field for this column (omit for unsortable columns). */
    sortField?: string;
    align?: 'left' | 'right';
    className?: string;
  }
}

type Props<T> = {
  columns: ColumnDef<T, any>[];
  data: T[];
  total: number;
  page: number;
  pageSize: number;
  sort: string | undefined;
  onSort: (sort: string) => void;
  onPage: (page: number) => void;
  loading?: boolean;
  error?: string | null;
  emptyText?: string;
  caption: string;
  /** The record a row opens: the whole row becomes tappable (its own link stays, see src/lib/client/row-links.ts). */
  rowHref?: (row: T) => string | null | undefined;
};

/** A dense, sortable, paged table. */
export function DataTable<T>({ columns, data, total, page, pageSize, sort, onSort, onPage, loading, error, emptyText = 'Nothing matches these filters.', caption, rowHref }: Props<T>) {
  const table = useReactTable({ data, columns, getCoreRowModel: getCoreRowModel(), manualPagination: true, manualSorting: true });
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const from = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const to = Math.min(total, page * pageSize);
  const sortField = sort?.replace(/^-/, '');
  const desc = sort?.startsWith('-') ?? false;
  return (
    <div className="card overflow-hidden">
      <div className="table-wrap max-h-[70vh]">
        <table className="data-table" aria-busy={loading ? 'true' : 'false'}>
          <caption className="sr-only">{caption}</caption>
          <thead>
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const meta = h.column.columnDef.meta;
                  const active = meta?.sortField && meta.sortField === sortField;
                  return (
                    <th key={h.id} scope="col" className={meta?.align === 'right' ? 'text-right' : ''} aria-sort={active ? (desc ? 'descending' : 'ascending') : undefined}>
                      {meta?.sortField ? (
                        <button
                          type="button"
                          className="inline-flex min-h-10 items-center gap-1 uppercase hover:text-ink-900"
                          onClick={() => onSort(active && !desc ? `-${meta.sortField}` : meta.sortField!)}
                        >
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          <span aria-hidden="true" className={active ? 'text-estuary-700' : 'text-ink-300'}>
                            {active ? (desc ? '▼' : '▲') : '↕'}
                          </span>
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody className={loading ? 'opacity-60' : ''}>
            {table.getRowModel().rows.map((r) => (
              <tr key={r.id} data-row-href={rowHref?.(r.original) ?? undefined}>
                {r.getVisibleCells().map((c) => {
                  const meta = c.column.columnDef.meta;
                  return (
                    <td key={c.id} className={[meta?.align === 'right' ? 'text-right tabular-nums' : '', meta?.className ?? ''].join(' ')}>
                      {flexRender(c.column.columnDef.cell, c.getContext())}
                    </td>
                  );
                })}
              </tr>
            ))}
            {!loading && data.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="py-8 text-center text-ink-500">
                  {error ?? emptyText}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      {/* An empty table says so once, in its body; the pager appears only when there are rows to page through. */}
      {(loading || total > 0) && (
        <div className="flex flex-wrap items-center justify-between gap-2 border-t border-ink-200 bg-ink-50 px-3 py-2 text-sm">
          <span className="text-ink-600" aria-live="polite">
            {loading ? 'Loading…' : `${from.toLocaleString('en-GB')}–${to.toLocaleString('en-GB')} of ${total.toLocaleString('en-GB')}`}
          </span>
          <div className="flex items-center gap-1">
            <button type="button" className="btn-ghost min-h-10 px-2.5" disabled={page <= 1} onClick={() => onPage(1)} aria-label="First page">«</button>
            <button type="button" className="btn-ghost min-h-10 px-2.5" disabled={page <= 1} onClick={() => onPage(page - 1)}>Previous</button>
            <span className="px-2 text-ink-600">Page {page} of {pages.toLocaleString('en-GB')}</span>
            <button type="button" className="btn-ghost min-h-10 px-2.5" disabled={page >= pages} onClick={() => onPage(page + 1)}>Next</button>
            <button type="button" className="btn-ghost min-h-10 px-2.5" disabled={page >= pages} onClick={() => onPage(pages)} aria-label="Last page">»</button>
          </div>
        </div>
      )}
    </div>
  );
}
