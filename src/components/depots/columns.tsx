/** Columns of the depots table (wide and compact); the climate cells draw small bars against the exposure-index thresholds. */
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

/** Container width (CSS px) from which the one-fact-per-column layout fits; below it related facts share a cell. */
export const DEPOT_WIDE_MIN_PX = 940;

function CodeCell({ d, canWrite, onEdit }: { d: Depot; canWrite: boolean; onEdit: (d: Depot) => void }) {
  return canWrite ? (
    <button type="button" className="link mono -my-2 min-h-10 text-left" onClick={() => onEdit(d)} title={`Edit depot ${d.code}`}>
      {d.code}
    </button>
  ) : (
    <span className="mono font-semibold">{d.code}</span>
  );
}

function Climate({ d }: { d: Depot }) {
  return (
    <div className="space-y-1">
      <ClimateBar value={d.rainDaysPerYear} max={250} limits={EXPOSURE_THRESHOLDS.rainDaysPerYear} label="days" title="Rain days a year" />
      <ClimateBar value={d.meanRhPct} max={100} limits={EXPOSURE_THRESHOLDS.meanRhPct} label="% RH" title="Mean relative humidity" />
    </div>
  );
}

const WASH_TITLE = 'Pressure washing on site: washes count 1.5× in the exposure index';
const SLOTS_TITLE = 'Seal-inspection bay slots per day (recorded for reference)';
const dash = <span className="text-ink-400">—</span>;

function VehiclesLink({ d }: { d: Depot }) {
  return (
    <a className="link" href={`/vehicles?depot=${encodeURIComponent(d.code)}`} aria-label={`${d.code}: ${d.vehicles} vehicles in service`}>
      {d.vehicles.toLocaleString('en-GB')}
    </a>
  );
}

function OpenLink({ d }: { d: Depot }) {
  return d.openDefects > 0 ? (
    <a className="link" href={`/defects?depot=${encodeURIComponent(d.code)}&open=1`} aria-label={`${d.code}: ${d.openDefects} open defects`}>
      {d.openDefects.toLocaleString('en-GB')}
    </a>
  ) : (
    <span className="text-ink-500">0</span>
  );
}

function actionsColumn({ onEdit, onDelete }: Actions): ColumnDef<Depot> {
  return {
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
  };
}

/** The depots table's columns, wide (one fact a column) or compact (tablet portrait); actions only for roles that may change depots. */
export function depotColumns(a: Actions, compact = false): ColumnDef<Depot>[] {
  const { canWrite, onEdit } = a;
  const cols: ColumnDef<Depot>[] = compact
    ? [
        {
          id: 'depot',
          header: 'Depot',
          cell: ({ row }) => (
            <div className="min-w-32 leading-tight">
              <CodeCell d={row.original} canWrite={canWrite} onEdit={onEdit} />
              <div className="font-semibold text-ink-900">{row.original.name}</div>
              <div className="text-xs text-ink-500">{row.original.region ?? 'No region'}</div>
            </div>
          ),
          meta: { sortField: 'code' },
        },
        {
          id: 'climate',
          header: 'Climate',
          cell: ({ row }) => (
            <div className="space-y-1.5">
              <Climate d={row.original} />
              <div className="flex flex-wrap gap-1">
                {row.original.coastal ? <span className="badge-seep">Coastal</span> : <span className="badge-neutral">Inland</span>}
                {row.original.washBay && (
                  <span className="badge-neutral" title={WASH_TITLE}>
                    Wash bay
                  </span>
                )}
              </div>
            </div>
          ),
          meta: { sortField: 'rainDaysPerYear' },
        },
        {
          id: 'bay',
          header: 'Bay · zone',
          cell: ({ row }) => (
            <div className="leading-tight whitespace-nowrap">
              <div title={SLOTS_TITLE}>{row.original.inspectionSlotsPerDay === null ? dash : `${row.original.inspectionSlotsPerDay} ${row.original.inspectionSlotsPerDay === 1 ? 'slot' : 'slots'}/day`}</div>
              <div className="text-xs text-ink-500">{row.original.timezone ?? 'No time zone'}</div>
            </div>
          ),
        },
        {
          id: 'counts',
          header: 'Vehicles · open',
          cell: ({ row }) => (
            <div className="leading-tight whitespace-nowrap">
              <div>
                <VehiclesLink d={row.original} /> <span className="text-xs text-ink-500">vehicles</span>
              </div>
              <div className="mt-1">
                <OpenLink d={row.original} /> <span className="text-xs text-ink-500">open</span>
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
          cell: ({ row }) => <CodeCell d={row.original} canWrite={canWrite} onEdit={onEdit} />,
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
        { id: 'climate', header: 'Climate', cell: ({ row }) => <Climate d={row.original} />, meta: { sortField: 'rainDaysPerYear' } },
        {
          id: 'washBay',
          header: 'Wash bay',
          cell: ({ row }) =>
            row.original.washBay ? (
              <span className="badge-neutral" title={WASH_TITLE}>
                Yes
              </span>
            ) : (
              <span className="text-ink-500">No</span>
            ),
        },
        {
          id: 'slots',
          header: () => <span title={SLOTS_TITLE}>Bay slots/day</span>,
          cell: ({ row }) => row.original.inspectionSlotsPerDay ?? dash,
          meta: { align: 'right' },
        },
        {
          id: 'timezone',
          header: 'Time zone',
          cell: ({ row }) => row.original.timezone ?? dash,
          meta: { className: 'whitespace-nowrap text-ink-600' },
        },
        { id: 'vehicles', header: 'Vehicles', cell: ({ row }) => <VehiclesLink d={row.original} />, meta: { align: 'right' } },
        { id: 'open', header: 'Open defects', cell: ({ row }) => <OpenLink d={row.original} />, meta: { align: 'right' } },
      ];
  if (canWrite) cols.push(actionsColumn(a));
  return cols;
}
