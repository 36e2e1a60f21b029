/** Columns of the vehicle list (sort fields are the API's VEHICLE_SORT keys). */
import type { ColumnDef } from '@tanstack/react-table';
import { PARKING_LABELS } from '@/components/labels';
import { daysSince, formatBuildMonth, formatCalendarDate, formatDepotDate, formatDepotInstant } from '@/components/defects/format';
import type { VehicleRow, VehicleStatus } from './queries';

export const VEHICLE_STATUS_LABELS: Record<VehicleStatus, string> = {
  active: 'In service',
  off_road: 'Off road',
  retired: 'Retired',
};
export const VEHICLE_STATUS_BADGE: Record<VehicleStatus, string> = {
  active: 'badge-moss',
  off_road: 'badge-amber',
  retired: 'badge-neutral',
};

const vehicleHref = (vin: string) => `/vehicles/${encodeURIComponent(vin)}`;
/** The page a vehicle row opens when tapped anywhere (DataTable `rowHref`). */
export const vehicleRowHref = (v: VehicleRow) => vehicleHref(v.vin);

/**
 * The status, and for a vehicle off road how long and why: since when (the depot's day, the time in a tooltip),
 * the reason written down, and the open defects keeping it off road (those still needing the release
 * verification marked).
 */
function StatusCell({ v }: { v: VehicleRow }) {
  const badge = <span className={VEHICLE_STATUS_BADGE[v.status]}>{VEHICLE_STATUS_LABELS[v.status]}</span>;
  if (v.status !== 'off_road' || !v.offRoadSince) return badge;
  const days = daysSince(v.offRoadSince, Date.now());
  return (
    <div className="w-[10.5rem] space-y-1 leading-tight">
      {badge}
      <div className="text-xs text-ink-600" title={`Off road since ${formatDepotInstant(v.offRoadSince, v.depotTimeZone)}`}>
        since {formatDepotDate(v.offRoadSince, v.depotTimeZone)}
        {days !== null && <span className="font-semibold text-ink-800"> · {days} d</span>}
      </div>
      {v.offRoadReason && (
        <div className="line-clamp-2 text-xs text-ink-600" title={v.offRoadReason}>
          {v.offRoadReason}
        </div>
      )}
      {(v.offRoadDefects ?? []).length > 0 && (
        <ul className="flex flex-wrap gap-x-2 gap-y-0.5 text-xs">
          {(v.offRoadDefects ?? []).map((d) => (
            <li key={d.id}>
              <a
                className={d.needsVerification ? 'font-semibold text-brick-700 hover:underline' : 'link font-normal'}
                href={`/defects/${d.id}`}
                title={`${d.position} door, ${d.moduleName}${d.needsVerification ? ': still needs the release verification' : ''}`}
              >
                <span className="mono">{d.ref}</span>
                {d.needsVerification && <span aria-hidden="true"> ⚠</span>}
                <span className="sr-only">{d.needsVerification ? ' (needs the release verification)' : ''}</span>
              </a>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

const fleetNo: ColumnDef<VehicleRow> = {
  id: 'fleetNumber',
  header: 'Fleet no.',
  meta: { sortField: 'fleetNumber', className: 'whitespace-nowrap' },
  cell: ({ row }) => (
    <a className="link" href={vehicleHref(row.original.vin)}>
      {row.original.fleetNumber ?? '(no number)'}
    </a>
  ),
};

const vin: ColumnDef<VehicleRow> = {
  id: 'vin',
  header: 'VIN',
  meta: { sortField: 'vin' },
  cell: ({ row }) => (
    <a className="mono text-ink-700 hover:text-estuary-700 hover:underline" href={vehicleHref(row.original.vin)}>
      {row.original.vin}
    </a>
  ),
};

const registration: ColumnDef<VehicleRow> = {
  id: 'registration',
  header: 'Reg. no.',
  meta: { sortField: 'registration', className: 'whitespace-nowrap' },
  cell: ({ row }) => row.original.registration ?? '–',
};

const makeModel: ColumnDef<VehicleRow> = {
  id: 'makeModel',
  header: 'Make / model',
  meta: { sortField: 'make' },
  cell: ({ row }) => (
    <div className="leading-tight whitespace-nowrap">
      <div>{row.original.make ?? '–'}</div>
      <div className="text-xs text-ink-500">{row.original.model ?? ''}</div>
    </div>
  ),
};

const built: ColumnDef<VehicleRow> = {
  id: 'buildMonth',
  header: 'Built',
  meta: { sortField: 'buildDate', className: 'whitespace-nowrap' },
  cell: ({ row }) => formatBuildMonth(row.original.buildMonth),
};

const inService: ColumnDef<VehicleRow> = {
  id: 'inServiceDate',
  header: 'In service',
  meta: { sortField: 'inServiceDate', className: 'whitespace-nowrap' },
  cell: ({ row }) => formatCalendarDate(row.original.inServiceDate),
};

const depot: ColumnDef<VehicleRow> = {
  id: 'depot',
  header: 'Depot',
  meta: { sortField: 'depot' },
  cell: ({ row }) => <span title={row.original.depotName}>{row.original.depotCode}</span>,
};

const parking: ColumnDef<VehicleRow> = {
  id: 'parking',
  header: 'Parking',
  meta: { sortField: 'parking' },
  cell: ({ row }) => PARKING_LABELS[row.original.parking] ?? row.original.parking,
};

const washes: ColumnDef<VehicleRow> = {
  id: 'washesPerMonth',
  header: 'Washes / mo',
  meta: { sortField: 'washesPerMonth', align: 'right' },
  cell: ({ row }) => row.original.washesPerMonth,
};

const openDefects: ColumnDef<VehicleRow> = {
  id: 'openDefects',
  header: 'Open defects',
  meta: { sortField: 'openDefects', align: 'right' },
  cell: ({ row }) => {
    const n = row.original.openDefects;
    return n > 0 ? (
      <a
        className="badge-amber hover:underline"
        href={`/defects?vin=${encodeURIComponent(row.original.vin)}&open=1`}
        title={`${n} open of ${row.original.defects} recorded`}
      >
        {n}
      </a>
    ) : (
      <span className="text-ink-400" title={`${row.original.defects} recorded, none open`}>
        0
      </span>
    );
  },
};

const status: ColumnDef<VehicleRow> = {
  id: 'status',
  header: 'Status',
  meta: { sortField: 'offRoadSince' },
  cell: ({ row }) => <StatusCell v={row.original} />,
};

/** One column per field, for wide screens. */
export const vehicleColumns: ColumnDef<VehicleRow>[] = [fleetNo, vin, registration, makeModel, built, inService, depot, parking, washes, openDefects, status];

/** Narrow screens (tablet portrait, or a laptop with the side navigation): related fields share a cell. */
export const vehicleColumnsCompact: ColumnDef<VehicleRow>[] = [
  {
    id: 'vehicle',
    header: 'Vehicle',
    meta: { sortField: 'fleetNumber' },
    cell: ({ row }) => {
      const v = row.original;
      return (
        <div className="leading-tight whitespace-nowrap">
          <a className="link" href={vehicleHref(v.vin)}>
            {v.fleetNumber ?? '(no number)'}
          </a>
          {v.registration && <span className="ml-2 text-ink-600">{" "}{v.registration}</span>}
          <div className="mono mt-0.5 text-xs text-ink-500">{v.vin}</div>
        </div>
      );
    },
  },
  makeModel,
  {
    id: 'built',
    header: 'Built / in service',
    meta: { sortField: 'buildDate' },
    cell: ({ row }) => (
      <div className="leading-tight whitespace-nowrap">
        <div>{formatBuildMonth(row.original.buildMonth)}</div>
        <div className="text-xs text-ink-500">{formatCalendarDate(row.original.inServiceDate)}</div>
      </div>
    ),
  },
  {
    id: 'depotParking',
    header: 'Depot / parking',
    meta: { sortField: 'depot' },
    cell: ({ row }) => (
      <div className="leading-tight whitespace-nowrap">
        <div title={row.original.depotName}>{row.original.depotCode}</div>
        <div className="text-xs text-ink-500">{PARKING_LABELS[row.original.parking] ?? row.original.parking}</div>
      </div>
    ),
  },
  { ...washes, header: 'Washes' },
  { ...openDefects, header: 'Open' },
  status,
];

/** Container width (px) from which the one-field-per-column layout fits. */
export const VEHICLE_WIDE_MIN_PX = 1060;
