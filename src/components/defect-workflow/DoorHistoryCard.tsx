/**
 * "History of this door" on the defect page (island): the defects on this door of this vehicle, newest first,
 * refreshed with the record (the same query as the door map), so a status changed on the page shows here too.
 */
import { QueryClientProvider } from '@tanstack/react-query';
import { useIslandQueryClient } from '@/components/defect-workflow/island-client';
import type { DefectRecord } from '@/lib/contracts/defects';
import type { DefectRow } from '@/components/defects/queries';
import { POSITION_LABELS } from '@/components/labels';
import { plural } from '@/components/defects/format';
import { DefectHistoryRows } from './DefectHistoryRows';
import { useDefect, useVehicleDefectRows } from './queries';

type Props = { initial: DefectRecord; rows: DefectRow[]; timeZone: string | null };

function DoorHistory({ initial, rows, timeZone }: Props) {
  const { data: r } = useDefect(initial);
  const list = useVehicleDefectRows(r, { version: initial.version, items: rows });
  const sameDoor = (list.data ?? rows).filter((d) => d.position === r.position);
  const door = POSITION_LABELS[r.position] ?? r.position;
  const vehicle = r.fleetNumber ?? r.vin;
  return (
    <section className="card" aria-labelledby="h-door-history" data-testid="door-history" aria-busy={list.isFetching || undefined}>
      <div className="flex flex-wrap items-baseline justify-between gap-2 border-b border-ink-200 px-4 py-3">
        <h2 id="h-door-history">History of this door</h2>
        <span className="text-sm text-ink-500">
          {door} of {vehicle}: {plural(sameDoor.length, 'defect')}
        </span>
      </div>
      <DefectHistoryRows items={sameDoor} caption={`Defects on the ${door} door of ${vehicle}`} showDoor={false} currentId={r.id} timeZone={timeZone} />
    </section>
  );
}

/** Island root. */
export default function DoorHistoryCard(props: Props) {
  const client = useIslandQueryClient();
  return (
    <QueryClientProvider client={client}>
      <DoorHistory {...props} />
    </QueryClientProvider>
  );
}
