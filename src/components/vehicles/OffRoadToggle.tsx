/**
 * The vehicle's road status on its page, with "Take off road…" and "Return to service…" for supervisors, fleet
 * managers and admins. Either way a dialog asks first: a reason (optional going off road, required coming back),
 * and, when an open defect on the vehicle still needs the release verification (window re-initialised, automatic
 * closing reverses on an obstruction), a clear warning and an explicit confirmation before the vehicle is released.
 * The server applies the same rules (src/lib/vehicles/off-road.ts) and records who, when and why; the page then
 * reloads to show the new state and the off-road history. Sends the version the page was rendered with, so a
 * change made meanwhile is refused (409) instead of overwritten.
 */
import { useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { ApiError } from '@/lib/client/api-client';
import { OFF_ROAD_REASON_MAX, OFF_ROAD_REASON_MIN } from '@/lib/vehicles/off-road';
import { Dialog } from '@/components/ui/Dialog';
import { FormField, fieldAria } from '@/components/ui/FormField';
import { STATUS_LABELS } from '@/components/labels';
import { daysSince, formatDepotInstant } from '@/components/defects/format';
import { VEHICLE_STATUS_BADGE, VEHICLE_STATUS_LABELS } from './columns';
import { useSetOffRoad, type OffRoadDefectRow, type VehicleStatus } from './queries';

type Props = {
  vin: string;
  label: string;
  version: number;
  status: VehicleStatus;
  offRoadSince: string | null;
  offRoadReason: string | null;
  /** Depot time zone for the "since" time. */
  timeZone: string | null;
  /** The vehicle's open defects (that the person may see), oldest first. */
  openDefects: OffRoadDefectRow[];
  /** Server time of the render, for "for N days" (so the server render and hydration agree). */
  nowMs: number;
  /** May take the vehicle off road and back (vehicle:write). */
  canWrite: boolean;
};

function Panel({ vin, label, version, status, offRoadSince, offRoadReason, timeZone, openDefects, nowMs, canWrite }: Props) {
  const [open, setOpen] = useState(false);
  const off = status === 'off_road';
  const days = off ? daysSince(offRoadSince, nowMs) : null;
  return (
    <div className="space-y-1.5">
      <div className="flex flex-wrap items-center gap-3">
        <span className={VEHICLE_STATUS_BADGE[status]} data-testid="vehicle-status">
          {VEHICLE_STATUS_LABELS[status]}
        </span>
        {canWrite && status !== 'retired' && (
          <button type="button" className={off ? 'btn-primary' : 'btn-secondary'} onClick={() => setOpen(true)}>
            {off ? 'Return to service…' : 'Take off road…'}
          </button>
        )}
      </div>
      {off && offRoadSince && (
        <p className="text-sm text-ink-700" data-testid="off-road-since">
          Off road since {formatDepotInstant(offRoadSince, timeZone)}
          {days !== null && <span className="text-ink-500"> · {days === 1 ? '1 day' : `${days} days`}</span>}
        </p>
      )}
      {off && offRoadReason && <p className="max-w-md text-sm text-ink-600">Why: {offRoadReason}</p>}
      {canWrite && open && (
        <OffRoadDialog vin={vin} label={label} version={version} off={off} openDefects={openDefects} onClose={() => setOpen(false)} />
      )}
    </div>
  );
}

function OffRoadDialog({ vin, label, version, off, openDefects, onClose }: { vin: string; label: string; version: number; off: boolean; openDefects: OffRoadDefectRow[]; onClose: () => void }) {
  const m = useSetOffRoad(vin);
  const [reason, setReason] = useState('');
  const [confirmed, setConfirmed] = useState(false);
  const [fieldError, setFieldError] = useState<string | undefined>();
  const [error, setError] = useState<{ message: string; stale: boolean } | null>(null);
  const unverified = openDefects.filter((d) => d.needsVerification);
  const returning = off;
  const id = 'off-road-reason';

  const submit = () => {
    const text = reason.trim();
    if (returning && text.length < OFF_ROAD_REASON_MIN) {
      setFieldError('Say in a few words why the vehicle can go back into service.');
      return;
    }
    setFieldError(undefined);
    setError(null);
    m.mutate(
      { offRoad: !returning, version, offRoadReason: text || undefined, confirmUnverified: returning && unverified.length > 0 ? confirmed : undefined },
      {
        onSuccess: () => window.location.reload(),
        onError: (e) => {
          const stale = e instanceof ApiError && e.status === 409 && !(e.body as { unverified?: unknown } | null)?.unverified;
          if (stale) setError({ message: 'Someone else changed this vehicle after you opened this page. Reload to see the current record, then try again.', stale: true });
          else if (e instanceof ApiError && e.issues[0]?.path === 'offRoadReason') setFieldError(e.issues[0].message);
          else setError({ message: e instanceof Error ? e.message : 'The change was not saved.', stale: false });
        },
      },
    );
  };

  const blocked = returning && unverified.length > 0 && !confirmed;
  return (
    <Dialog
      open
      onClose={onClose}
      title={returning ? `Return ${label} to service?` : `Take ${label} off road?`}
      footer={
        <>
          <button type="button" className="btn-secondary" onClick={onClose}>
            Keep it {returning ? 'off road' : 'in service'}
          </button>
          {error?.stale ? (
            <button type="button" className="btn-primary" onClick={() => window.location.reload()}>
              Reload
            </button>
          ) : (
            <button type="button" className={returning && unverified.length ? 'btn-danger' : 'btn-primary'} onClick={submit} disabled={m.isPending || blocked}>
              {m.isPending ? 'Saving…' : returning ? 'Return to service' : 'Take off road'}
            </button>
          )}
        </>
      }
    >
      <div className="space-y-4 text-sm">
        {returning && unverified.length > 0 && (
          <div className="rounded-md border-l-4 border-brick-600 bg-brick-50 px-4 py-3 text-brick-700" role="alert">
            <p className="font-semibold">
              {unverified.length === 1 ? 'An open defect still needs' : `${unverified.length} open defects still need`} the release verification.
            </p>
            <p className="mt-1">
              The window has not been recorded as re-initialised with automatic closing reversing on an obstruction. Release the vehicle only if that
              door cannot be operated (for example the window is secured shut) and the people using it are told.
            </p>
            <ul className="mt-2 space-y-1">
              {unverified.map((d) => (
                <li key={d.id}>
                  <a className="font-semibold underline" href={`/defects/${d.id}`}>
                    {d.ref}
                  </a>{' '}
                  · {d.position} door · {d.moduleCode} · {STATUS_LABELS[d.status] ?? d.status}
                </li>
              ))}
            </ul>
          </div>
        )}
        {returning && openDefects.length > unverified.length && (
          <p className="text-ink-600">
            Also open:{' '}
            {openDefects
              .filter((d) => !d.needsVerification)
              .map((d) => `${d.ref} (${d.position}, ${d.moduleCode})`)
              .join(', ')}
            .
          </p>
        )}
        {returning && openDefects.length === 0 && <p className="text-ink-600">No open defects on this vehicle.</p>}
        {!returning && (
          <p className="text-ink-600">
            It will show as off road on the Overview and the Vehicles list from now until someone returns it to service.
            {openDefects.length > 0 && ` Open defects: ${openDefects.map((d) => d.ref).join(', ')}.`}
          </p>
        )}
        <FormField id={id} label={returning ? 'Why it can go back into service' : 'Why it is off road (optional)'} required={returning} error={fieldError} hint={`Up to ${OFF_ROAD_REASON_MAX} characters; kept in the vehicle's history.`}>
          <textarea
            {...fieldAria(id, fieldError, true)}
            className="input min-h-20"
            maxLength={OFF_ROAD_REASON_MAX}
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            placeholder={returning ? 'e.g. Repaired and road-tested' : 'e.g. Front right window stuck open'}
          />
        </FormField>
        {returning && unverified.length > 0 && (
          <label className="flex min-h-10 items-start gap-2.5 text-[15px] text-ink-800">
            <input type="checkbox" className="mt-0.5 h-5 w-5 shrink-0 accent-brick-600" checked={confirmed} onChange={(e) => setConfirmed(e.target.checked)} />
            <span>
              I confirm that {label} goes back into service with {unverified.map((d) => d.ref).join(', ')} not verified.
            </span>
          </label>
        )}
        {error && (
          <p role="alert" className="rounded-md border border-brick-100 bg-brick-50 px-3 py-2 text-brick-700">
            {error.message}
          </p>
        )}
      </div>
    </Dialog>
  );
}

/** Island root. */
export default function OffRoadToggle(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <Panel {...props} />
    </QueryClientProvider>
  );
}
