/** Columns of the defect list (sort fields are the API's DEFECT_SORT keys). */
import type { ColumnDef } from '@tanstack/react-table';
import { MOISTURE_LABELS, POSITION_LABELS, STATUS_BADGE, STATUS_LABELS } from '@/components/labels';
import { MOISTURE_BADGE } from './badges';
import { formatDepotDate, formatDepotInstant } from './format';
import type { DefectRow } from './queries';

const defectHref = (id: number) => `/defects/${id}`;
/** The page a defect row opens when tapped anywhere (DataTable `rowHref`). */
export const defectRowHref = (d: DefectRow) => defectHref(d.id);

/** The day a defect was reported, in its depot's zone, with the time and zone in a tooltip. */
function ReportedDate({ d }: { d: DefectRow }) {
  return <span title={`Reported ${formatDepotInstant(d.reportedAt, d.depotTimeZone)}`}>{formatDepotDate(d.reportedAt, d.depotTimeZone)}</span>;
}
const vehicleHref = (vin: string) => `/vehicles/${encodeURIComponent(vin)}`;

/** Up to two fault codes, then "+n". */
export function CodesCell({ codes }: { codes: string[] }) {
  if (codes.length === 0) return <span className="text-ink-400">–</span>;
  const shown = codes.slice(0, 2);
  return (
    <span className="mono whitespace-nowrap" title={codes.join(' ')}>
      {shown.join(' ')}
      {codes.length > 2 && <span className="ml-1 font-sans text-xs font-semibold text-ink-500">+{codes.length - 2}</span>}
    </span>
  );
}

/** Moisture finding as a badge (seep blue for any water evidence). */
export function MoistureBadge({ value }: { value: string | null }) {
  if (!value)
    return (
      <span className="text-ink-400" title="Not recorded">
        –
      </span>
    );
  return <span className={MOISTURE_BADGE[value] ?? 'badge-neutral'}>{MOISTURE_LABELS[value] ?? value}</span>;
}

/** "Repeat" linking to the earlier defect it repeats. */
export function RepeatBadge({ d, withRef = false }: { d: Pick<DefectRow, 'repeat' | 'repeatOfId' | 'repeatOfRef'>; withRef?: boolean }) {
  if (!d.repeat || d.repeatOfId === null) return null;
  return (
    <a
      className="badge-brick hover:underline"
      href={defectHref(d.repeatOfId)}
      aria-label={`Repeat of ${d.repeatOfRef ?? 'an earlier defect'}`}
      title={`Repeat of ${d.repeatOfRef ?? 'an earlier defect'}`}
    >
      Repeat
      {withRef && d.repeatOfRef ? <span className="mono font-normal">of {d.repeatOfRef}</span> : null}
    </a>
  );
}

/** The repeat mark with the earlier defect's ref under it, both linking to the earlier defect (wide layout). */
export function RepeatCell({ d }: { d: Pick<DefectRow, 'repeat' | 'repeatOfId' | 'repeatOfRef'> }) {
  if (!d.repeat || d.repeatOfId === null) return null;
  return (
    <div className="leading-tight whitespace-nowrap">
      <RepeatBadge d={d} />
      {d.repeatOfRef && (
        <div className="mt-0.5 text-xs text-ink-500">
          of{' '}
          <a className="mono hover:text-estuary-700 hover:underline" href={defectHref(d.repeatOfId)} tabIndex={-1} aria-hidden="true">
            {d.repeatOfRef}
          </a>
        </div>
      )}
    </div>
  );
}

const ref: ColumnDef<DefectRow> = {
  id: 'ref',
  header: 'Ref',
  meta: { sortField: 'ref', className: 'whitespace-nowrap' },
  cell: ({ row }) => (
    <a className="link mono" href={defectHref(row.original.id)}>
      {row.original.ref}
    </a>
  ),
};

const reported: ColumnDef<DefectRow> = {
  id: 'reportedAt',
  header: 'Reported',
  meta: { sortField: 'reportedAt', className: 'whitespace-nowrap' },
  cell: ({ row }) => <ReportedDate d={row.original} />,
};

const vehicle: ColumnDef<DefectRow> = {
  id: 'vehicle',
  header: 'Vehicle',
  meta: { sortField: 'fleetNumber' },
  cell: ({ row }) => {
    const d = row.original;
    return (
      <div className="leading-tight whitespace-nowrap">
        <a className="link" href={vehicleHref(d.vin)}>
          {d.fleetNumber ?? d.registration ?? 'Vehicle'}
        </a>
        <div>
          <a className="mono text-xs text-ink-500 hover:text-estuary-700 hover:underline" href={vehicleHref(d.vin)}>
            {d.vin}
          </a>
        </div>
      </div>
    );
  },
};

const depot: ColumnDef<DefectRow> = {
  id: 'depot',
  header: 'Depot',
  meta: { sortField: 'depot' },
  cell: ({ row }) => row.original.depotCode,
};

const door: ColumnDef<DefectRow> = {
  id: 'position',
  header: 'Door',
  meta: { sortField: 'position' },
  cell: ({ row }) => (
    <abbr className="no-underline" title={POSITION_LABELS[row.original.position]}>
      {row.original.position}
    </abbr>
  ),
};

const moduleCol: ColumnDef<DefectRow> = {
  id: 'module',
  header: 'Module',
  meta: { sortField: 'module', className: 'whitespace-nowrap' },
  cell: ({ row }) => <span title={row.original.moduleName}>{row.original.moduleCode}</span>,
};

const symptom = (maxWidth: string): ColumnDef<DefectRow> => ({
  id: 'symptom',
  header: 'Symptom',
  cell: ({ row }) => (
    <div className={`${maxWidth} truncate`} title={row.original.symptom ?? undefined}>
      {row.original.symptom ?? <span className="text-ink-400">–</span>}
    </div>
  ),
});

const codes: ColumnDef<DefectRow> = {
  id: 'codes',
  header: 'Codes',
  cell: ({ row }) => <CodesCell codes={row.original.dtcs} />,
};

const moisture: ColumnDef<DefectRow> = {
  id: 'moisture',
  header: 'Moisture',
  meta: { sortField: 'moisture' },
  cell: ({ row }) => <MoistureBadge value={row.original.moisture} />,
};

const repeat: ColumnDef<DefectRow> = {
  id: 'repeat',
  header: 'Repeat',
  cell: ({ row }) => <RepeatCell d={row.original} />,
};

/** A defect status as its badge. */
export function statusBadge(s: string) {
  return <span className={STATUS_BADGE[s] ?? 'badge-neutral'}>{STATUS_LABELS[s] ?? s}</span>;
}

const status: ColumnDef<DefectRow> = {
  id: 'status',
  header: 'Status',
  meta: { sortField: 'status' },
  cell: ({ row }) => statusBadge(row.original.status),
};

/** One field per column, for wide screens. */
export const defectColumns: ColumnDef<DefectRow>[] = [
  ref,
  reported,
  vehicle,
  depot,
  door,
  moduleCol,
  symptom('max-w-[16rem]'),
  codes,
  moisture,
  repeat,
  status,
];

const defectCell = (withStatus: boolean): ColumnDef<DefectRow> => ({
  id: 'defect',
  header: 'Defect',
  meta: { sortField: 'reportedAt' },
  cell: ({ row }) => (
    <div className="leading-tight whitespace-nowrap">
      <a className="link mono" href={defectHref(row.original.id)}>
        {row.original.ref}
      </a>
      <div className="text-xs text-ink-500">
        <ReportedDate d={row.original} />
      </div>
      {withStatus && <div className="mt-1">{statusBadge(row.original.status)}</div>}
      {row.original.repeat && (
        <div className="mt-1">
          <RepeatBadge d={row.original} withRef />
        </div>
      )}
    </div>
  ),
});

const vehicleDepot: ColumnDef<DefectRow> = {
  ...vehicle,
  header: 'Vehicle / depot',
  cell: ({ row }) => {
    const d = row.original;
    return (
      <div className="leading-tight whitespace-nowrap">
        <a className="link" href={vehicleHref(d.vin)}>
          {d.fleetNumber ?? d.registration ?? 'Vehicle'}
        </a>
        <span className="ml-2 text-ink-600">{d.depotCode}</span>
        <div>
          <a className="mono text-xs text-ink-500 hover:text-estuary-700 hover:underline" href={vehicleHref(d.vin)}>
            {d.vin}
          </a>
        </div>
      </div>
    );
  },
};

const doorModule: ColumnDef<DefectRow> = {
  id: 'doorModule',
  header: 'Door / module',
  meta: { sortField: 'position' },
  cell: ({ row }) => (
    <div className="leading-tight whitespace-nowrap">
      <div title={POSITION_LABELS[row.original.position]}>{row.original.position}</div>
      <div className="text-xs text-ink-500" title={row.original.moduleName}>
        {row.original.moduleCode}
      </div>
    </div>
  ),
};

/** Narrower screens: ref with its date and its repeat mark ("Repeat of DF-…"), vehicle with its depot, door with its module. */
export const defectColumnsCompact: ColumnDef<DefectRow>[] = [defectCell(false), vehicleDepot, doorModule, symptom('max-w-[13rem]'), codes, moisture, status];

/** Tablet portrait: as compact, with the status under the ref and the codes under the symptom. */
export const defectColumnsNarrow: ColumnDef<DefectRow>[] = [
  defectCell(true),
  vehicleDepot,
  doorModule,
  {
    id: 'symptomCodes',
    header: 'Symptom / codes',
    cell: ({ row }) => (
      <div className="max-w-[12rem] leading-tight">
        <div className="truncate" title={row.original.symptom ?? undefined}>
          {row.original.symptom ?? <span className="text-ink-400">–</span>}
        </div>
        {row.original.dtcs.length > 0 && (
          <div className="mt-0.5 text-xs">
            <CodesCell codes={row.original.dtcs} />
          </div>
        )}
      </div>
    ),
  },
  moisture,
];

/** Container width (px) from which the one-field-per-column layout fits. */
export const DEFECT_WIDE_MIN_PX = 1300;
/** Container width (px) below which the narrow (tablet portrait) layout is used. */
export const DEFECT_NARROW_MAX_PX = 880;
