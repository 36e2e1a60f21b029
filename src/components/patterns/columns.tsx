/**
 * Columns of the Patterns table (one row per cohort of the report), evidence first; sort fields are the keys of
 * COHORT_SORTERS. A compact set folds the evidence into fewer columns for tablets.
 */
import type { ColumnDef } from '@tanstack/react-table';
import type { PatternsReportCohort } from '@/lib/contracts/patterns';
import { formatProbability, formatRatio, formatShare } from '@/lib/patterns/explain';
import { formatBuildRange } from '@/lib/patterns/records';
import { BAND_LABELS, PATTERN_STATUS_BADGE, PATTERN_STATUS_LABELS, VERDICT_BADGE, VERDICT_LABELS } from './labels';

type Row = PatternsReportCohort;

/** Table width below which the compact columns are used. */
export const PATTERNS_WIDE_MIN_PX = 960;

/** Client-side sorters by sort field (ascending). */
export const COHORT_SORTERS: Record<string, (a: Row, b: Row) => number> = {
  qValue: (a, b) => a.qValue - b.qValue || a.pValue - b.pValue || b.scanLlr - a.scanLlr,
  rateRatio: (a, b) => (a.rateRatio ?? Infinity) - (b.rateRatio ?? Infinity),
  failures: (a, b) => a.failures - b.failures,
  excess: (a, b) => a.failures - a.expected - (b.failures - b.expected),
  moistureShare: (a, b) => a.moistureShare - b.moistureShare,
  repeatVehicles: (a, b) => a.repeatVehicles - b.repeatVehicles,
  module: (a, b) => a.moduleCode.localeCompare(b.moduleCode) || a.exposureBand.localeCompare(b.exposureBand),
  buildFrom: (a, b) => a.buildFrom.localeCompare(b.buildFrom),
  band: (a, b) => ['low', 'medium', 'high'].indexOf(a.exposureBand) - ['low', 'medium', 'high'].indexOf(b.exposureBand),
};

/** Sort rows by `field` or `-field` (unknown fields sort by q). */
export function sortCohorts(rows: Row[], sort: string): Row[] {
  const desc = sort.startsWith('-');
  const cmp = COHORT_SORTERS[sort.replace(/^-/, '')] ?? COHORT_SORTERS.qValue!;
  return [...rows].sort((a, b) => (desc ? -cmp(a, b) : cmp(a, b)) || a.id.localeCompare(b.id));
}

const recordHref = (r: Row) => (r.record ? `/patterns/${r.record.id}` : null);

function PatternName({ row, stacked = false }: { row: Row; stacked?: boolean }) {
  const href = recordHref(row);
  const band = `${BAND_LABELS[row.exposureBand]} exposure`;
  const name = href ? (
    <a className="link whitespace-nowrap" href={href} aria-label={`${row.moduleCode}, ${band.toLowerCase()}, built ${formatBuildRange(row)}`}>
      {row.moduleCode}
    </a>
  ) : (
    <span className="font-semibold whitespace-nowrap text-ink-800">{row.moduleCode}</span>
  );
  return stacked ? (
    <span>
      {name} <span className="whitespace-nowrap text-ink-600">· {band}</span>
    </span>
  ) : (
    <div className="leading-tight">
      {name}
      <div className="text-xs whitespace-nowrap text-ink-500">{band}</div>
    </div>
  );
}

function Ratio({ row }: { row: Row }) {
  return (
    <div className="leading-tight whitespace-nowrap">
      <div className="font-semibold text-ink-900">{formatRatio(row.rateRatio)}×</div>
      <div className="text-xs text-ink-500">
        95% {formatRatio(row.ciLow)}–{row.ciHigh === null ? '∞' : formatRatio(row.ciHigh)}
      </div>
    </div>
  );
}

function FailuresVsExpected({ row }: { row: Row }) {
  return (
    <div className="leading-tight whitespace-nowrap">
      <span className="font-semibold text-ink-900">{row.failures}</span>
      <span className="text-ink-500"> vs {row.expected.toFixed(1)}</span>
    </div>
  );
}

function Moisture({ row }: { row: Row }) {
  if (row.diagnosedFailures === 0) return <span className="text-ink-500">none diagnosed</span>;
  return (
    <div className="leading-tight whitespace-nowrap">
      <div className={row.moistureShare >= 0.5 ? 'font-semibold text-seep-700' : 'text-ink-800'}>{formatShare(row.moistureShare)} wet</div>
      <div className="text-xs text-ink-500">rest {formatShare(row.moistureShareRest)}</div>
    </div>
  );
}

function Verdict({ row }: { row: Row }) {
  return <span className={VERDICT_BADGE[row.verdict]}>{VERDICT_LABELS[row.verdict]}</span>;
}

function Status({ row }: { row: Row }) {
  if (!row.record) return <span className="text-xs text-ink-500">{row.significant ? 'Not yet recorded' : 'No record'}</span>;
  return (
    <div className="flex flex-col items-start gap-1">
      <span className={PATTERN_STATUS_BADGE[row.record.status]}>{PATTERN_STATUS_LABELS[row.record.status]}</span>
      {row.record.changed && (
        <span className="badge-amber" title={row.record.changes.join('; ')}>
          Changed
        </span>
      )}
    </div>
  );
}

const pattern: ColumnDef<Row> = { id: 'pattern', header: 'Pattern', meta: { sortField: 'module' }, cell: ({ row }) => <PatternName row={row.original} /> };
const range: ColumnDef<Row> = {
  id: 'range',
  header: 'Build range',
  meta: { sortField: 'buildFrom', className: 'whitespace-nowrap' },
  cell: ({ row }) => (
    <div className="leading-tight">
      <div>{formatBuildRange(row.original)}</div>
      <div className="text-xs text-ink-500">{row.original.vehicles} vehicles</div>
    </div>
  ),
};
const ratio: ColumnDef<Row> = { id: 'rateRatio', header: 'Rate ratio', meta: { sortField: 'rateRatio', align: 'right' }, cell: ({ row }) => <Ratio row={row.original} /> };
const failures: ColumnDef<Row> = { id: 'failures', header: 'Failures vs exp.', meta: { sortField: 'failures', align: 'right' }, cell: ({ row }) => <FailuresVsExpected row={row.original} /> };
const q: ColumnDef<Row> = {
  id: 'qValue',
  header: 'q-value',
  meta: { sortField: 'qValue', align: 'right', className: 'whitespace-nowrap' },
  cell: ({ row }) => <span title={`q = ${row.original.qValue}; scan p = ${row.original.pValue}`}>{formatProbability(row.original.qValue)}</span>,
};
const moisture: ColumnDef<Row> = { id: 'moisture', header: 'Moisture', meta: { sortField: 'moistureShare' }, cell: ({ row }) => <Moisture row={row.original} /> };
const repeats: ColumnDef<Row> = { id: 'repeats', header: 'Repeats', meta: { sortField: 'repeatVehicles', align: 'right' }, cell: ({ row }) => row.original.repeatVehicles };
const verdict: ColumnDef<Row> = { id: 'verdict', header: 'Verdict', cell: ({ row }) => <Verdict row={row.original} /> };
const status: ColumnDef<Row> = { id: 'status', header: 'Status', cell: ({ row }) => <Status row={row.original} /> };

/** All columns, for a wide screen. */
export const patternColumns: ColumnDef<Row, any>[] = [pattern, range, ratio, failures, q, moisture, repeats, verdict, status];

/** Fewer, stacked columns for a tablet. */
export const patternColumnsCompact: ColumnDef<Row, any>[] = [
  {
    id: 'pattern',
    header: 'Pattern',
    meta: { sortField: 'module' },
    cell: ({ row }) => (
      <div className="leading-tight">
        <PatternName row={row.original} stacked />
        <div className="mt-0.5 text-xs text-ink-500">
          Built {formatBuildRange(row.original)} · {row.original.vehicles} vehicles
        </div>
        <div className="mt-1">
          <Verdict row={row.original} />
        </div>
      </div>
    ),
  },
  {
    id: 'evidence',
    header: 'Rate ratio · q',
    meta: { sortField: 'rateRatio', align: 'right' },
    cell: ({ row }) => (
      <div className="leading-tight whitespace-nowrap">
        <Ratio row={row.original} />
        <div className="mt-0.5 text-xs text-ink-500">q {formatProbability(row.original.qValue)}</div>
      </div>
    ),
  },
  {
    id: 'failures',
    header: 'Failures',
    meta: { sortField: 'failures', align: 'right' },
    cell: ({ row }) => (
      <div className="leading-tight">
        <FailuresVsExpected row={row.original} />
        <div className="text-xs text-ink-500">{row.original.repeatVehicles} repeat</div>
      </div>
    ),
  },
  moisture,
  status,
];
