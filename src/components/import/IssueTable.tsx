/**
 * Row errors or warnings of an import check: sortable by row, column or message, filterable by column and
 * text, paged when long, and downloadable as CSV to work through in the spreadsheet. Each row says both numbers a
 * person needs: the file's data row (from 1, under the header: CONTRACT.md) and the line the spreadsheet shows,
 * with the row's code, VIN or ref.
 */
import { useMemo, useState } from 'react';
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from '@tanstack/react-table';
import { Download } from 'lucide-react';
import { downloadCsv, toCsv } from './formats';
import type { IssueRow, RowIssue } from './upload';

const PAGE_SIZE = 50;
const NO_ROWS: IssueRow[] = [];

/** An issue with where its row sits in the sheet. */
type Located = RowIssue & { line: number | null; record: string | null };

/** "Row 2 (spreadsheet line 3)", or "Header (spreadsheet line 1)". */
export function rowWords(i: Pick<Located, 'row' | 'line'>): string {
  const what = i.row === 0 ? 'Header' : `Row ${i.row.toLocaleString('en-GB')}`;
  return i.line === null ? what : `${what} (spreadsheet line ${i.line.toLocaleString('en-GB')})`;
}

const columns: ColumnDef<Located>[] = [
  {
    id: 'row',
    accessorKey: 'row',
    header: 'Row',
    cell: ({ row }) => {
      const i = row.original;
      return (
        <div className="leading-tight" title={rowWords(i)}>
          <div className="font-semibold text-ink-900">{i.row === 0 ? 'Header' : `Row ${i.row.toLocaleString('en-GB')}`}</div>
          {i.line !== null && <div className="text-xs text-ink-500">line {i.line.toLocaleString('en-GB')} in the sheet</div>}
        </div>
      );
    },
  },
  {
    id: 'record',
    accessorKey: 'record',
    header: 'Record',
    cell: ({ row }) => (row.original.record ? <span className="mono text-xs break-all text-ink-700">{row.original.record}</span> : <span className="text-ink-400">–</span>),
    enableSorting: false,
  },
  {
    id: 'column',
    accessorKey: 'column',
    header: 'Column',
    cell: ({ row }) => (row.original.column ? <code className="mono">{row.original.column}</code> : <span className="text-ink-400">file</span>),
    filterFn: 'equalsString',
  },
  { id: 'message', accessorKey: 'message', header: 'Problem', enableSorting: true },
];

type Props = { issues: RowIssue[]; rows?: IssueRow[]; tone: 'error' | 'warning'; caption: string; fileName: string };

/** A table of row issues. */
export function IssueTable({ issues: raw, rows = NO_ROWS, tone, caption, fileName }: Props) {
  const issues = useMemo<Located[]>(() => {
    const at = new Map(rows.map((r) => [r.row, r]));
    return raw.map((i) => ({ ...i, line: at.get(i.row)?.line ?? null, record: at.get(i.row)?.record ?? null }));
  }, [raw, rows]);
  const [sorting, setSorting] = useState<SortingState>([]);
  const [text, setText] = useState('');
  const [column, setColumn] = useState('');
  const columnCounts = useMemo(() => {
    const m = new Map<string, number>();
    for (const i of issues) m.set(i.column, (m.get(i.column) ?? 0) + 1);
    return [...m.entries()].sort((a, b) => b[1] - a[1]);
  }, [issues]);
  const table = useReactTable({
    data: issues,
    columns,
    state: { sorting, globalFilter: text, columnFilters: column ? [{ id: 'column', value: column }] : [] },
    onSortingChange: setSorting,
    globalFilterFn: (row, _id, value: string) => {
      const v = value.trim().toLowerCase();
      if (!v) return true;
      const r = row.original;
      return String(r.row) === v || String(r.line) === v || r.column.toLowerCase().includes(v) || r.message.toLowerCase().includes(v) || (r.record ?? '').toLowerCase().includes(v);
    },
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageIndex: 0, pageSize: PAGE_SIZE } },
    autoResetPageIndex: true,
  });
  const shown = table.getFilteredRowModel().rows.length;
  const pageCount = table.getPageCount();
  const pageIndex = table.getState().pagination.pageIndex;
  const many = issues.length > 8;

  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center gap-2">
        {many && (
          <>
            <label className="w-full max-w-xs">
              <span className="sr-only">Filter {caption.toLowerCase()}</span>
              <input type="search" className="input" placeholder="Filter: row, line, VIN or words" value={text} onChange={(e) => setText(e.target.value)} />
            </label>
            <label className="flex items-center gap-2">
              <span className="text-sm font-semibold text-ink-700">Column</span>
              <select className="input w-auto min-w-44" value={column} onChange={(e) => setColumn(e.target.value)}>
                <option value="">All columns ({issues.length})</option>
                {columnCounts.map(([c, n]) => (
                  <option key={c} value={c}>
                    {c || 'file'} ({n})
                  </option>
                ))}
              </select>
            </label>
          </>
        )}
        <button
          type="button"
          className="btn-ghost ml-auto"
          onClick={() =>
            downloadCsv(
              fileName,
              toCsv([['row', 'spreadsheet_line', 'record', 'column', 'message'], ...issues.map((i) => [String(i.row), i.line === null ? '' : String(i.line), i.record ?? '', i.column, i.message])]),
            )
          }
        >
          <Download size={16} aria-hidden="true" /> Download as CSV
        </button>
      </div>
      <div className={`card overflow-hidden ${tone === 'error' ? 'border-brick-100' : 'border-amber-100'}`}>
        <div className="table-wrap max-h-[60vh]">
          <table className="data-table">
            <caption className="sr-only">{caption}</caption>
            <thead>
              {table.getHeaderGroups().map((hg) => (
                <tr key={hg.id}>
                  {hg.headers.map((h) => {
                    const dir = h.column.getIsSorted();
                    return (
                      <th
                        key={h.id}
                        scope="col"
                        className={h.id === 'row' ? 'w-28' : h.id === 'column' ? 'w-36' : h.id === 'record' ? 'w-40' : ''}
                        aria-sort={dir ? (dir === 'desc' ? 'descending' : 'ascending') : undefined}
                      >
                        {h.column.getCanSort() ? (
                          <button
                            type="button"
                            className="inline-flex min-h-10 items-center gap-1 uppercase hover:text-ink-900"
                            onClick={h.column.getToggleSortingHandler()}
                          >
                            {flexRender(h.column.columnDef.header, h.getContext())}
                            <span aria-hidden="true" className={dir ? 'text-estuary-700' : 'text-ink-300'}>
                              {dir === 'asc' ? '▲' : dir === 'desc' ? '▼' : '↕'}
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
            <tbody>
              {table.getRowModel().rows.map((r) => (
                <tr key={r.id}>
                  {r.getVisibleCells().map((c) => (
                    <td key={c.id} className={c.column.id === 'row' ? 'tabular-nums whitespace-nowrap' : ''}>
                      {flexRender(c.column.columnDef.cell, c.getContext())}
                    </td>
                  ))}
                </tr>
              ))}
              {shown === 0 && (
                <tr>
                  <td colSpan={4} className="py-6 text-center text-ink-500">
                    Nothing matches this filter.
                  </td>
                </tr>
              )}
            </tbody>
          </table>
        </div>
        {(pageCount > 1 || shown !== issues.length) && (
          <div className="flex flex-wrap items-center justify-between gap-2 border-t border-ink-200 bg-ink-50 px-3 py-2 text-sm">
            <span className="text-ink-600" aria-live="polite">
              {shown === issues.length
                ? `${issues.length.toLocaleString('en-GB')} in all`
                : `${shown.toLocaleString('en-GB')} of ${issues.length.toLocaleString('en-GB')} shown`}
            </span>
            {pageCount > 1 && (
              <div className="flex items-center gap-1">
                <button type="button" className="btn-ghost min-h-9 px-2.5" disabled={!table.getCanPreviousPage()} onClick={() => table.previousPage()}>
                  Previous
                </button>
                <span className="px-2 text-ink-600">
                  Page {pageIndex + 1} of {pageCount}
                </span>
                <button type="button" className="btn-ghost min-h-9 px-2.5" disabled={!table.getCanNextPage()} onClick={() => table.nextPage()}>
                  Next
                </button>
              </div>
            )}
          </div>
        )}
      </div>
    </div>
  );
}
