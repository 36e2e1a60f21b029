/**
 * A table of defects (a vehicle's history, or the earlier work on one door). One React component serves the
 * server-rendered vehicle page (through DefectHistoryTable.astro, no JavaScript shipped) and the defect
 * page's door history island, which refreshes it whenever the defect moves on.
 */
import { MOISTURE_LABELS, POSITION_LABELS, ROOT_CAUSE_LABELS, STATUS_BADGE, STATUS_LABELS } from '@/components/labels';
import { MOISTURE_BADGE } from '@/components/defects/badges';
import { formatDepotDate, formatDepotInstant } from '@/components/defects/format';
import type { DefectRow } from '@/components/defects/queries';

/** The row fields the table shows. */
export type HistoryRow = Pick<DefectRow, 'id' | 'ref' | 'reportedAt' | 'position' | 'moduleCode' | 'moduleName' | 'symptom' | 'dtcs' | 'moisture' | 'rootCause' | 'status' | 'repeat' | 'repeatOfId' | 'repeatOfRef'>;

type Props = {
  items: HistoryRow[];
  caption: string;
  /** Show the door column (off when every row is the same door). */
  showDoor?: boolean;
  /** Row to mark as "this defect". */
  currentId?: number;
  timeZone?: string | null;
  emptyText?: string;
};

/** The history table. */
export function DefectHistoryRows({ items, caption, showDoor = true, currentId, timeZone, emptyText = 'No defects recorded.' }: Props) {
  const cols = showDoor ? 9 : 8;
  return (
    <div className="table-wrap">
      <table className="data-table">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr>
            <th scope="col">Ref</th>
            <th scope="col" className="hidden lg:table-cell">
              Reported
            </th>
            {showDoor && <th scope="col">Door</th>}
            <th scope="col" className="hidden lg:table-cell">
              Module
            </th>
            <th scope="col">Symptom</th>
            <th scope="col" className="hidden 2xl:table-cell">
              Codes
            </th>
            <th scope="col">
              Moisture<span className="2xl:hidden"> / cause</span>
            </th>
            <th scope="col" className="hidden 2xl:table-cell">
              Root cause
            </th>
            <th scope="col">Status</th>
          </tr>
        </thead>
        <tbody>
          {items.map((d) => (
            <tr key={d.id} className={d.id === currentId ? 'bg-estuary-50' : undefined} data-row-href={d.id === currentId ? undefined : `/defects/${d.id}`}>
              <td className="whitespace-nowrap">
                {d.id === currentId ? (
                  <span className="mono font-semibold" aria-current="true">
                    {d.ref}
                  </span>
                ) : (
                  <a className="link mono" href={`/defects/${d.id}`}>
                    {d.ref}
                  </a>
                )}
                {d.repeat && d.repeatOfId !== null && (
                  <a className="badge-brick ml-1 hover:underline" href={`/defects/${d.repeatOfId}`} aria-label={`Repeat of ${d.repeatOfRef ?? 'an earlier defect'}`}>
                    Repeat
                  </a>
                )}
                <div className="text-xs text-ink-500 lg:hidden" title={`Reported ${formatDepotInstant(d.reportedAt, timeZone)}`}>{formatDepotDate(d.reportedAt, timeZone)}</div>
                {d.id === currentId && <div className="text-xs text-ink-500">this defect</div>}
              </td>
              <td className="hidden whitespace-nowrap lg:table-cell" title={`Reported ${formatDepotInstant(d.reportedAt, timeZone)}`}>{formatDepotDate(d.reportedAt, timeZone)}</td>
              {showDoor && (
                <td className="whitespace-nowrap">
                  <abbr className="no-underline" title={POSITION_LABELS[d.position]}>
                    {d.position}
                  </abbr>
                  <div className="text-xs text-ink-500 lg:hidden" title={d.moduleName}>
                    {d.moduleCode}
                  </div>
                </td>
              )}
              <td className="hidden whitespace-nowrap lg:table-cell">
                <span title={d.moduleName}>{d.moduleCode}</span>
              </td>
              <td>
                <div className="max-w-[12rem] truncate lg:max-w-[16rem]" title={d.symptom ?? undefined}>
                  {d.symptom ?? '–'}
                </div>
                {!showDoor && <div className="text-xs text-ink-500 lg:hidden">{d.moduleCode}</div>}
                {d.dtcs.length > 0 && (
                  <div className="mono text-xs text-ink-600 2xl:hidden" title={d.dtcs.join(' ')}>
                    {d.dtcs.slice(0, 2).join(' ')}
                    {d.dtcs.length > 2 && ` +${d.dtcs.length - 2}`}
                  </div>
                )}
              </td>
              <td className="mono hidden whitespace-nowrap 2xl:table-cell" title={d.dtcs.join(' ')}>
                {d.dtcs.length ? d.dtcs.slice(0, 2).join(' ') : <span className="font-sans text-ink-400">–</span>}
                {d.dtcs.length > 2 && <span className="ml-1 font-sans text-xs font-semibold text-ink-500">+{d.dtcs.length - 2}</span>}
              </td>
              <td>
                {d.moisture ? <span className={MOISTURE_BADGE[d.moisture]}>{MOISTURE_LABELS[d.moisture]}</span> : <span className="text-ink-400">–</span>}
                {d.rootCause && <div className="mt-0.5 text-xs whitespace-nowrap text-ink-600 2xl:hidden">{ROOT_CAUSE_LABELS[d.rootCause]}</div>}
              </td>
              <td className="hidden whitespace-nowrap 2xl:table-cell">{d.rootCause ? ROOT_CAUSE_LABELS[d.rootCause] : <span className="text-ink-400">–</span>}</td>
              <td>
                <span className={STATUS_BADGE[d.status] ?? 'badge-neutral'}>{STATUS_LABELS[d.status] ?? d.status}</span>
              </td>
            </tr>
          ))}
          {items.length === 0 && (
            <tr>
              <td colSpan={cols} className="py-6 text-center text-ink-500">
                {emptyText}
              </td>
            </tr>
          )}
        </tbody>
      </table>
    </div>
  );
}
