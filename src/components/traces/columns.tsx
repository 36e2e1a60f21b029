/**
 * Columns of the trace list: wide (one fact a column) and compact (for a tablet in portrait). Sort fields are
 * TRACE_SORT_FIELDS of the API; a trace on a defect was stored at that defect's depot, so its time is shown in the
 * depot's zone with the zone's abbreviation (the trace page does the same); one without a depot in the viewer's zone.
 */
import type { ColumnDef } from '@tanstack/react-table';
import { POSITION_LABELS } from '@/components/labels';
import { formatDepotInstant, formatInstant } from '@/components/defects/format';
import type { TraceRecord } from '@/lib/contracts/traces';
import { verdictBadge, verdictLabel } from './labels';

/** Below this container width (CSS px) the list uses the compact columns. */
export const TRACE_WIDE_MIN_PX = 900;

const traceHref = (t: TraceRecord) => `/traces/${encodeURIComponent(t.id)}`;
/** The page a trace row opens when tapped anywhere (DataTable `rowHref`). */
export const traceRowHref = traceHref;

/** When a trace was stored, by the one rule for times (src/components/defects/format.ts). */
export function storedAt(t: Pick<TraceRecord, 'createdAt' | 'depotCode' | 'depotTimeZone'>): string {
  return t.depotCode ? formatDepotInstant(t.createdAt, t.depotTimeZone) : formatInstant(t.createdAt);
}
const fileLabel = (t: TraceRecord) => t.fileName ?? `Capture ${t.id}`;

function Verdict({ t }: { t: TraceRecord }) {
  return <span className={verdictBadge(t.verdict)}>{verdictLabel(t.verdict)}</span>;
}

function DefectLink({ t }: { t: TraceRecord }) {
  return t.defectId !== null && t.defectRef ? (
    <a className="link mono" href={`/defects/${t.defectId}`}>
      {t.defectRef}
    </a>
  ) : (
    <span className="text-ink-500">Not on a defect</span>
  );
}

function VehicleDoor({ t }: { t: TraceRecord }) {
  if (!t.vin) return <span className="text-ink-500">–</span>;
  return (
    <div className="leading-tight">
      <a className="hover:text-estuary-700 hover:underline" href={`/vehicles/${encodeURIComponent(t.vin)}`}>
        {t.fleetNumber ?? t.vin}
      </a>
      {t.position && <div className="text-xs text-ink-500">{POSITION_LABELS[t.position] ?? t.position} door</div>}
    </div>
  );
}

export const traceColumns: ColumnDef<TraceRecord>[] = [
  { id: 'verdict', header: 'Verdict', meta: { sortField: 'verdict' }, cell: ({ row }) => <Verdict t={row.original} /> },
  {
    id: 'file',
    header: 'Capture',
    meta: { sortField: 'fileName' },
    cell: ({ row }) => (
      <a className="link break-all" href={traceHref(row.original)}>
        {fileLabel(row.original)}
      </a>
    ),
  },
  { id: 'defect', header: 'Defect', meta: { sortField: 'defect', className: 'whitespace-nowrap' }, cell: ({ row }) => <DefectLink t={row.original} /> },
  { id: 'vehicle', header: 'Vehicle / door', cell: ({ row }) => <VehicleDoor t={row.original} /> },
  { id: 'depot', header: 'Depot', meta: { sortField: 'depot' }, cell: ({ row }) => row.original.depotCode ?? '–' },
  { id: 'when', header: 'Stored', meta: { sortField: 'createdAt', className: 'whitespace-nowrap' }, cell: ({ row }) => storedAt(row.original) },
  { id: 'who', header: 'By', meta: { sortField: 'createdBy' }, cell: ({ row }) => row.original.createdBy ?? '–' },
];

export const traceColumnsCompact: ColumnDef<TraceRecord>[] = [
  {
    id: 'capture',
    header: 'Capture · stored',
    meta: { sortField: 'createdAt' },
    cell: ({ row }) => {
      const t = row.original;
      return (
        <div className="space-y-1">
          <Verdict t={t} />
          <div>
            <a className="link break-all" href={traceHref(t)}>
              {fileLabel(t)}
            </a>
          </div>
          <div className="text-xs text-ink-500">
            {storedAt(t)}
            {t.createdBy ? ` · ${t.createdBy}` : ''}
          </div>
        </div>
      );
    },
  },
  {
    id: 'defect',
    header: 'Defect / vehicle',
    meta: { sortField: 'defect' },
    cell: ({ row }) => (
      <div className="space-y-1">
        <DefectLink t={row.original} />
        <VehicleDoor t={row.original} />
      </div>
    ),
  },
];
