/** Columns of the depots table; the climate cells draw small bars against the exposure-index thresholds. */
import type { ColumnDef } from '@tanstack/react-table';
import { Pencil, Trash2 } from 'lucide-react';
import { EXPOSURE_THRESHOLDS } from '@/lib/patterns/exposure';
import type { Depot } from './queries';

/** Bar colour by how many exposure points the value earns (0, 1 or 2). */
function pointsOf(value: number, limits: readonly [number, number]): 0 | 1 | 2 {
  return value >= limits[1] ? 2 : value >= limits[0] ? 1 : 0;
}
const BAR_TONE = ['bg-ink-300', 'bg-seep-500/60', 'bg-seep-700'] as const;

function ClimateBar({ value, max, limits, label, title }: { value: number; max: number; limits: readonly [number, number]; label: string; title: string }) {
  const pts = pointsOf(value, limits);
  const pct = Math.max(3, Math.min(100, (value / max) * 100));
  return (
    <div className="flex items-center gap-2 whitespace-nowrap" title={`${title}: ${pts} of 2 moisture-exposure points (≥ ${limits[0]}: 1, ≥ ${limits[1]}: 2)`}>
      <div className="h-1.5 w-12 shrink-0 rounded bg-ink-100" aria-hidden="true">
        <div className={`h-1.5 rounded ${BAR_TONE[pts]}`} style={{ width: `${pct}%` }} />
      </div>
      <span className="w-8 text-right font-semibold tabular-nums text-ink-900">{value.toLocaleString('en-GB', { maximumFractionDigits: 1 })}</span>
      <span className="text-xs text-ink-500">{label}</span>
    </div>
  );
}

type Actions = { canWrite: boolean; onEdit: (d: Depot) => void; onDelete: (d: Depot) => void };

/** The depots table's columns; the actions column appears only for roles that may change depots. */
export function depotColumns({ canWrite, onEdit, onDelete }: Actions): ColumnDef<Depot>[] {
  const cols: ColumnDef<Depot>[] = [
    {
      id: 'code',
      header: 'Code',
      cell: ({ row }) =>
        canWrite ? (
          <button type="button" className="link mono -my-1 min-h-8 text-left" onClick={() => onEdit(row.original)} title={`Edit depot ${row.original.code}`}>
            {row.original.code}
          </button>
        ) : (
          row.original.code
        ),
      meta: { sortField: 'code', className: 'font-semibold mono whitespace-nowrap' },
    },
    {
      id: 'name',
      header: 'Name · region',
      cell: ({ row }) => (
        <div className="min-w-32">
          <div className="font-semibold text-ink-900">{row.original.name}</div>
          <div className="text-xs text-ink-500">{row.original.region ?? 'No region'}</div>
        </div>
      ),
      meta: { sortField: 'name' },
    },
    {
      id: 'coastal',
      header: 'Coastal',
      cell: ({ row }) => (row.original.coastal ? <span className="badge-seep">Coastal</span> : <span className="text-ink-500">Inland</span>),
      meta: { sortField: 'coastal' },
    },
    {
      id: 'climate',
      header: 'Climate',
      cell: ({ row }) => (
        <div className="space-y-1">
          <ClimateBar value={row.original.rainDaysPerYear} max={250} limits={EXPOSURE_THRESHOLDS.rainDaysPerYear} label="days" title="Rain days a year" />
          <ClimateBar value={row.original.meanRhPct} max={100} limits={EXPOSURE_THRESHOLDS.meanRhPct} label="% RH" title="Mean relative humidity" />
        </div>
      ),
      meta: { sortField: 'rainDaysPerYear' },
    },
    {
      id: 'washBay',
      header: 'Wash bay',
      cell: ({ row }) =>
        row.original.washBay ? (
          <span className="badge-neutral" title="Pressure washing on site: washes count 1.5× in the exposure index">
            Yes
          </span>
        ) : (
          <span className="text-ink-500">No</span>
        ),
    },
    {
      id: 'slots',
      header: 'Slots/day',
      cell: ({ row }) => row.original.inspectionSlotsPerDay ?? <span className="text-ink-400">—</span>,
      meta: { align: 'right' },
    },
    {
      id: 'timezone',
      header: 'Time zone',
      cell: ({ row }) => row.original.timezone ?? <span className="text-ink-400">—</span>,
      meta: { className: 'whitespace-nowrap text-ink-600' },
    },
    {
      id: 'vehicles',
      header: 'Vehicles',
      cell: ({ row }) => (
        <a className="link" href={`/vehicles?depot=${encodeURIComponent(row.original.code)}`}>
          {row.original.vehicles.toLocaleString('en-GB')}
        </a>
      ),
      meta: { align: 'right' },
    },
    {
      id: 'open',
      header: 'Open defects',
      cell: ({ row }) =>
        row.original.openDefects > 0 ? (
          <a className="link" href={`/defects?depot=${encodeURIComponent(row.original.code)}&open=1`}>
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
          <button type="button" className="btn-ghost px-2.5" onClick={() => onEdit(row.original)} aria-label={`Edit depot ${row.original.code}`} title="Edit">
            <Pencil size={16} aria-hidden="true" />
          </button>
          <button
            type="button"
            className="btn-ghost px-2.5 text-brick-700 hover:bg-brick-50"
            onClick={() => onDelete(row.original)}
            aria-label={`Delete depot ${row.original.code}`}
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
