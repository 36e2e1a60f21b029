/**
 * Columns of the Patterns table (one row per group of the report), evidence first; sort fields are the keys of
 * COHORT_SORTERS. Every row opens a page: the pattern record (today's view) or the read-only group page (groups
 * without a record, and every row of a past as-of view, which carries its day). A compact set folds the evidence
 * into fewer columns for tablets.
 */
import type { ColumnDef } from '@tanstack/react-table';
import type { PatternsReportCohort } from '@/lib/contracts/patterns';
import { formatCount, formatExpected, formatProbability, formatRatio, formatShare, formatTimes } from '@/lib/patterns/explain';
import { formatBuildRange } from '@/lib/patterns/records';
import { WetShare } from './CohortSections';
import { BAND_LABELS, PATTERN_STATUS_BADGE, PATTERN_STATUS_LABELS, VERDICT_BADGE, VERDICT_LABELS } from './labels';

type Row = PatternsReportCohort;

/** Where the rows lead: the as-of day of the view (empty = today). */
export type ColumnContext = { asOf: string };

/** Table width below which the compact columns are used. */
export const PATTERNS_WIDE_MIN_PX = 960;

/** What the two ratios mean (header tooltips and "How to read"). */
export const RATIO_HELP = {
  rateRatio: 'Rate ratio against the rest: how many times as often these vehicles fail as every vehicle outside the group, per vehicle-year, with its 95% interval.',
  expected: "Failures against expected: the group's failures against what the fleet's rate for the module (which includes the group's own failures) gives for its vehicle-years.",
  repeat:
    'Vehicles of the group with two or more failures of this module. Not the same as repeat repairs on the Defects list, which count a second failure of the same door within the repeat window after a repair.',
};

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

/** The read-only group page of a row, as of a day (empty = today). */
export function groupHref(row: Pick<Row, 'moduleCode' | 'exposureBand'>, asOf: string): string {
  const q = new URLSearchParams({ module: row.moduleCode, band: row.exposureBand });
  if (asOf) q.set('asOf', asOf);
  return `/patterns/group?${q.toString()}`;
}

/** Where a row leads: today, its pattern record (or its group page without one); on a past day, its group that day. */
export function rowHref(row: Row, ctx: ColumnContext): string {
  if (!ctx.asOf && row.record) return `/patterns/${row.record.id}`;
  return groupHref(row, ctx.asOf);
}

function PatternName({ row, ctx, stacked = false }: { row: Row; ctx: ColumnContext; stacked?: boolean }) {
  const band = `${BAND_LABELS[row.exposureBand]} exposure`;
  const name = (
    <a className="link whitespace-nowrap" href={rowHref(row, ctx)} aria-label={`${row.moduleCode}, ${band.toLowerCase()}, built ${formatBuildRange(row)}`}>
      {row.moduleCode}
    </a>
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
      <div className="font-semibold text-ink-900">{row.rateRatio === null ? '–' : formatTimes(row.rateRatio)}</div>
      <div className="text-xs text-ink-500">
        95% {formatRatio(row.ciLow)}–{row.ciHigh === null ? '∞' : formatRatio(row.ciHigh)}
      </div>
    </div>
  );
}

function FailuresVsExpected({ row }: { row: Row }) {
  return (
    <div className="leading-tight whitespace-nowrap">
      <div>
        <span className="font-semibold text-ink-900">{row.failures}</span>
        <span className="text-ink-500"> vs {formatExpected(row.expected)}</span>
      </div>
      {row.ratioToFleet !== null && <div className="text-xs text-ink-500">{formatTimes(row.ratioToFleet)} expected</div>}
    </div>
  );
}

function Moisture({ row }: { row: Row }) {
  if (row.diagnosedFailures === 0) return <span className="text-ink-500">none diagnosed</span>;
  return (
    <div className="leading-tight whitespace-nowrap">
      <div className={row.moistureShare >= 0.5 ? 'font-semibold text-ink-900' : 'text-ink-800'}>
        <WetShare share={row.moistureShare} /> wet
      </div>
      <div className="text-xs text-ink-500">rest {formatShare(row.moistureShareRest)}</div>
    </div>
  );
}

function Verdict({ row }: { row: Row }) {
  return <span className={VERDICT_BADGE[row.verdict]}>{VERDICT_LABELS[row.verdict]}</span>;
}

function Status({ row, ctx }: { row: Row; ctx: ColumnContext }) {
  if (!row.record) return <span className="text-xs text-ink-500">{row.significant ? (ctx.asOf ? 'No record' : 'Not yet recorded') : 'No record'}</span>;
  return (
    <div className="flex flex-col items-start gap-1">
      <span className={PATTERN_STATUS_BADGE[row.record.status]} title={ctx.asOf ? 'Today’s status of the pattern record this group belongs to' : undefined}>
        {ctx.asOf ? 'Today: ' : ''}
        {PATTERN_STATUS_LABELS[row.record.status]}
      </span>
      {row.record.overdue && <span className="badge-brick">Campaign overdue</span>}
      {row.record.changed && (
        <span className="badge-amber" title={row.record.changes.join('; ')}>
          Changed
        </span>
      )}
    </div>
  );
}

const Head = ({ text, help }: { text: string; help: string }) => <span title={help}>{text}</span>;

/** All columns, for a wide screen. */
export function patternColumns(ctx: ColumnContext): ColumnDef<Row, any>[] {
  return [
    { id: 'pattern', header: 'Pattern', meta: { sortField: 'module' }, cell: ({ row }) => <PatternName row={row.original} ctx={ctx} /> },
    {
      id: 'range',
      header: 'Build range',
      meta: { sortField: 'buildFrom', className: 'whitespace-nowrap' },
      cell: ({ row }) => (
        <div className="leading-tight">
          <div>{formatBuildRange(row.original)}</div>
          <div className="text-xs text-ink-500">{formatCount(row.original.vehicles, 'vehicle')}</div>
        </div>
      ),
    },
    { id: 'rateRatio', header: () => <Head text="Rate vs rest" help={RATIO_HELP.rateRatio} />, meta: { sortField: 'rateRatio', align: 'right' }, cell: ({ row }) => <Ratio row={row.original} /> },
    { id: 'failures', header: () => <Head text="Failures vs expected" help={RATIO_HELP.expected} />, meta: { sortField: 'failures', align: 'right' }, cell: ({ row }) => <FailuresVsExpected row={row.original} /> },
    {
      id: 'qValue',
      header: () => <Head text="q‑value" help="The chance-finding probability after allowing for every build range searched and every group tested; below 0.05 is flagged." />,
      meta: { sortField: 'qValue', align: 'right', className: 'whitespace-nowrap' },
      cell: ({ row }) => <span title={`q = ${row.original.qValue}; scan p = ${row.original.pValue}`}>{formatProbability(row.original.qValue)}</span>,
    },
    { id: 'moisture', header: 'Water found', meta: { sortField: 'moistureShare' }, cell: ({ row }) => <Moisture row={row.original} /> },
    {
      id: 'repeats',
      header: () => <Head text="Vehicles failing twice or more" help={RATIO_HELP.repeat} />,
      meta: { sortField: 'repeatVehicles', align: 'right' },
      cell: ({ row }) => row.original.repeatVehicles,
    },
    { id: 'verdict', header: 'Verdict', cell: ({ row }) => <Verdict row={row.original} /> },
    { id: 'status', header: ctx.asOf ? 'Status today' : 'Status', cell: ({ row }) => <Status row={row.original} ctx={ctx} /> },
  ];
}

/** Fewer, stacked columns for a tablet. */
export function patternColumnsCompact(ctx: ColumnContext): ColumnDef<Row, any>[] {
  return [
    {
      id: 'pattern',
      header: 'Pattern',
      meta: { sortField: 'module' },
      cell: ({ row }) => (
        <div className="leading-tight">
          <PatternName row={row.original} ctx={ctx} stacked />
          <div className="mt-0.5 text-xs text-ink-500">
            Built {formatBuildRange(row.original)} · {formatCount(row.original.vehicles, 'vehicle')}
          </div>
          <div className="mt-1">
            <Verdict row={row.original} />
          </div>
        </div>
      ),
    },
    {
      id: 'evidence',
      header: () => <Head text="Rate vs rest · q" help={RATIO_HELP.rateRatio} />,
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
      header: () => <Head text="Failures vs expected" help={RATIO_HELP.expected} />,
      meta: { sortField: 'failures', align: 'right' },
      cell: ({ row }) => (
        <div className="leading-tight">
          <FailuresVsExpected row={row.original} />
          <div className="text-xs text-ink-500" title={RATIO_HELP.repeat}>
            {row.original.repeatVehicles} failing twice+
          </div>
        </div>
      ),
    },
    { id: 'moisture', header: 'Water found', meta: { sortField: 'moistureShare' }, cell: ({ row }) => <Moisture row={row.original} /> },
    { id: 'status', header: ctx.asOf ? 'Status today' : 'Status', cell: ({ row }) => <Status row={row.original} ctx={ctx} /> },
  ];
}
