/** Columns of the vehicle list (sort fields are the API's VEHICLE_SORT keys). */
import type { ColumnDef } from '@tanstack/react-table';
import { PARKING_LABELS } from '@/components/labels';
import { formatBuildMonth, formatCalendarDate } from '@/components/defects/format';
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

export const vehicleColumns: ColumnDef<VehicleRow>[] = [
  {
    id: 'fleetNumber',
    header: 'Fleet no.',
    meta: { sortField: 'fleetNumber', className: 'whitespace-nowrap' },
    cell: ({ row }) => (
      <a className="link inline-block py-1" href={vehicleHref(row.original.vin)}>
        {row.original.fleetNumber ?? '(no number)'}
      </a>
    ),
  },
  {
    id: 'vin',
    header: 'VIN',
    meta: { sortField: 'vin' },
    cell: ({ row }) => (
      <a className="mono text-ink-700 hover:text-estuary-700 hover:underline" href={vehicleHref(row.original.vin)}>
        {row.original.vin}
      </a>
    ),
  },
  {
    id: 'registration',
    header: 'Registration',
    meta: { sortField: 'registration', className: 'whitespace-nowrap' },
    cell: ({ row }) => row.original.registration ?? '–',
  },
  {
    id: 'makeModel',
    header: 'Make / model',
    meta: { sortField: 'make' },
    cell: ({ row }) => {
      const v = row.original;
      return (
        <span className="whitespace-nowrap">
          {v.make ?? '–'} <span className="text-ink-500">{v.model ?? ''}</span>
        </span>
      );
    },
  },
  {
    id: 'buildMonth',
    header: 'Built',
    meta: { sortField: 'buildDate', className: 'whitespace-nowrap' },
    cell: ({ row }) => formatBuildMonth(row.original.buildMonth),
  },
  {
    id: 'inServiceDate',
    header: 'In service',
    meta: { sortField: 'inServiceDate', className: 'whitespace-nowrap' },
    cell: ({ row }) => formatCalendarDate(row.original.inServiceDate),
  },
  {
    id: 'depot',
    header: 'Depot',
    meta: { sortField: 'depot' },
    cell: ({ row }) => <span title={row.original.depotName}>{row.original.depotCode}</span>,
  },
  {
    id: 'parking',
    header: 'Parking',
    meta: { sortField: 'parking' },
    cell: ({ row }) => PARKING_LABELS[row.original.parking] ?? row.original.parking,
  },
  {
    id: 'washesPerMonth',
    header: 'Washes / mo',
    meta: { sortField: 'washesPerMonth', align: 'right' },
    cell: ({ row }) => row.original.washesPerMonth,
  },
  {
    id: 'openDefects',
    header: 'Open defects',
    meta: { sortField: 'openDefects', align: 'right' },
    cell: ({ row }) => {
      const n = row.original.openDefects;
      return n > 0 ? (
        <a className="badge-amber hover:underline" href={`/defects?vin=${encodeURIComponent(row.original.vin)}&open=1`} title={`${n} open of ${row.original.defects} recorded`}>
          {n}
        </a>
      ) : (
        <span className="text-ink-400" title={`${row.original.defects} recorded, none open`}>0</span>
      );
    },
  },
  {
    id: 'status',
    header: 'Status',
    cell: ({ row }) => <span className={VEHICLE_STATUS_BADGE[row.original.status]}>{VEHICLE_STATUS_LABELS[row.original.status]}</span>,
  },
];
