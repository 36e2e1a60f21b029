/**
 * The vehicle's road status with the "Off road" switch for supervisors, fleet managers and admins. Sends
 * the version the page was rendered with, so a change made meanwhile by someone else is refused (409) and
 * the person is asked to reload instead of overwriting it.
 */
import { useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { ApiError } from '@/lib/client/api-client';
import { formatInstant } from '@/components/defects/format';
import { VEHICLE_STATUS_BADGE, VEHICLE_STATUS_LABELS } from './columns';
import { useSetOffRoad, type VehicleStatus } from './queries';

type Props = {
  vin: string;
  version: number;
  status: VehicleStatus;
  offRoadSince: string | null;
  /** Depot time zone for the "since" time. */
  timeZone: string | null;
};

function Toggle({ vin, version: version0, status: status0, offRoadSince: since0, timeZone }: Props) {
  const [v, setV] = useState({ version: version0, status: status0, offRoadSince: since0 });
  const [error, setError] = useState<{ message: string; stale: boolean } | null>(null);
  const m = useSetOffRoad(vin);
  const off = v.status === 'off_road';

  const change = () => {
    setError(null);
    m.mutate(
      { offRoad: !off, version: v.version },
      {
        onSuccess: (r) => setV({ version: r.version, status: r.status, offRoadSince: r.offRoadSince }),
        onError: (e) => {
          if (e instanceof ApiError && e.status === 409) {
            setError({
              message: 'Someone else changed this vehicle after you opened this page. Reload to see the current record, then try again.',
              stale: true,
            });
          } else {
            setError({ message: e instanceof Error ? e.message : 'The change was not saved.', stale: false });
          }
        },
      },
    );
  };

  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-center gap-3">
        <span className={VEHICLE_STATUS_BADGE[v.status]} data-testid="vehicle-status">
          {VEHICLE_STATUS_LABELS[v.status]}
        </span>
        {off && v.offRoadSince && <span className="text-sm text-ink-600">since {formatInstant(v.offRoadSince, timeZone)}</span>}
        {v.status !== 'retired' && (
          <button type="button" role="switch" aria-checked={off} className="btn-secondary" onClick={change} disabled={m.isPending || error?.stale === true}>
            <span
              aria-hidden="true"
              className={['relative inline-block h-5 w-9 rounded-full transition-colors', off ? 'bg-amber-600' : 'bg-ink-300'].join(' ')}
            >
              <span className={['absolute top-0.5 h-4 w-4 rounded-full bg-white shadow transition-all', off ? 'left-4.5' : 'left-0.5'].join(' ')} />
            </span>
            {m.isPending ? 'Saving…' : 'Off road'}
          </button>
        )}
      </div>
      {error && (
        <div
          role="alert"
          className="flex max-w-md flex-wrap items-center gap-3 rounded-md border border-brick-100 bg-brick-50 px-3 py-2 text-sm text-brick-700"
        >
          <span>{error.message}</span>
          {error.stale && (
            <button type="button" className="btn-secondary" onClick={() => window.location.reload()}>
              Reload
            </button>
          )}
        </div>
      )}
    </div>
  );
}

/** Island root. */
export default function OffRoadToggle(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <Toggle {...props} />
    </QueryClientProvider>
  );
}
