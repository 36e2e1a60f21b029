/**
 * "Defects by door" on the defect page (island): a plan of the vehicle with one tile per door — its defects,
 * open ones, repeats and water findings — refreshed with the record, so a step taken on the page shows here
 * at once. Each tile opens the Defects list for that door. Looks like the vehicle page's DoorMap.astro.
 */
import { QueryClientProvider } from '@tanstack/react-query';
import { useIslandQueryClient } from '@/components/defect-workflow/island-client';
import type { DefectRecord } from '@/lib/contracts/defects';
import type { DefectRow } from '@/components/defects/queries';
import { POSITION_LABELS } from '@/components/labels';
import { countByDoor, DOOR_ORDER } from '@/lib/defects/doors';
import { useDefect, useVehicleDefectRows } from './queries';

type Props = { initial: DefectRecord; rows: DefectRow[] };

const PLACE: Record<string, string> = {
  FL: 'col-start-1 row-start-1',
  FR: 'col-start-3 row-start-1',
  SL: 'col-start-1 row-start-2',
  SR: 'col-start-3 row-start-2',
  RL: 'col-start-1 row-start-3',
  RR: 'col-start-3 row-start-3',
  TG: 'col-start-2 row-start-4',
};
const n = (k: number, one: string, many = `${one}s`) => `${k} ${k === 1 ? one : many}`;

function DoorMap({ initial, rows }: Props) {
  const { data: r } = useDefect(initial);
  const list = useVehicleDefectRows(r, { version: initial.version, items: rows });
  const counts = countByDoor(list.data ?? rows);
  const vin = encodeURIComponent(r.vin);
  return (
    <section className="card card-pad" aria-labelledby="h-doors" data-testid="door-map">
      <h2 id="h-doors" className="mb-3">
        Defects by door
      </h2>
      <div className="flex flex-col gap-3 md:flex-row md:items-start xl:flex-col">
        <div className="w-full max-w-sm">
          <div className="grid grid-cols-[1fr_5.5rem_1fr] grid-rows-[repeat(4,auto)] gap-1.5" role="list" aria-label="Defects by door" aria-busy={list.isFetching || undefined}>
            <div
              className="col-start-2 row-span-3 row-start-1 flex flex-col items-center justify-between rounded-t-[2.5rem] rounded-b-lg border-2 border-ink-300 bg-ink-50 py-3 text-xs font-semibold tracking-wide text-ink-500 uppercase"
              aria-hidden="true"
            >
              <span>Front</span>
              <svg width="18" height="18" viewBox="0 0 24 24" fill="none" stroke="currentColor" strokeWidth="2">
                <path d="M12 19V5M6 11l6-6 6 6" />
              </svg>
              <span>Rear</span>
            </div>
            {DOOR_ORDER.map((p) => {
              const c = counts[p] ?? { total: 0, open: 0, repeats: 0, water: 0 };
              return (
                <a
                  key={p}
                  role="listitem"
                  href={`/defects?vin=${vin}&position=${p}`}
                  data-door={p}
                  className={[
                    PLACE[p],
                    'flex min-h-14 flex-col justify-center rounded-md border px-2.5 py-1.5 text-sm hover:border-estuary-500',
                    c.repeats > 0 ? 'border-brick-600 bg-brick-50' : c.total > 0 ? 'border-ink-300 bg-white' : 'border-dashed border-ink-200 bg-white text-ink-400',
                    r.position === p ? 'ring-2 ring-estuary-500 ring-offset-1' : '',
                  ].join(' ')}
                  aria-label={`${POSITION_LABELS[p]}: ${n(c.total, 'defect')}, ${c.open} open, ${n(c.repeats, 'repeat')}`}
                >
                  <span className="flex items-baseline justify-between gap-2">
                    <span className="font-semibold text-ink-800">{p}</span>
                    <span className={`text-lg leading-none font-bold tabular-nums ${c.total ? 'text-ink-900' : 'text-ink-300'}`}>{c.total}</span>
                  </span>
                  <span className="text-xs leading-tight text-ink-500">{POSITION_LABELS[p]}</span>
                  {(c.open > 0 || c.repeats > 0 || c.water > 0) && (
                    <span className="mt-0.5 flex flex-wrap gap-1 text-[11px] leading-tight">
                      {c.open > 0 && <span className="font-semibold text-amber-800">{c.open} open</span>}
                      {c.repeats > 0 && <span className="font-semibold text-brick-700">{n(c.repeats, 'repeat')}</span>}
                      {c.water > 0 && <span className="font-semibold text-seep-700">{c.water} water</span>}
                    </span>
                  )}
                </a>
              );
            })}
          </div>
        </div>
        <p className="text-xs text-ink-500 md:max-w-[16rem] xl:max-w-none">
          This vehicle's defects by door; the outlined tile is this defect's door. A red outline marks a door with a repeat repair; "water" counts defects where moisture was found.
        </p>
      </div>
    </section>
  );
}

/** Island root. */
export default function DoorMapCard(props: Props) {
  const client = useIslandQueryClient();
  return (
    <QueryClientProvider client={client}>
      <DoorMap {...props} />
    </QueryClientProvider>
  );
}
