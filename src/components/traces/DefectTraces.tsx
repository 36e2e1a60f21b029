/**
 * The defect page's traces island: the scope captures stored on this defect with their verdicts, and (for
 * people who may add traces in the defect's depot) the upload zone that stores a new one on the defect and
 * opens its result.
 */
import { useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { Activity, Plus } from 'lucide-react';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { storedAt } from './columns';
import { DIRECTION_LABELS, verdictBadge, verdictLabel } from './labels';
import { formatDeg, formatHz } from './format';
import { useTraces } from './queries';
import { UploadZone } from './UploadZone';

type Props = {
  defectId: number;
  /** The caller may add traces here (trace:write, and the defect is in their depots). */
  canUpload: boolean;
};

/** Island root. */
export default function DefectTraces(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <TraceListForDefect {...props} />
    </QueryClientProvider>
  );
}

function TraceListForDefect({ defectId, canUpload }: Props) {
  const list = useTraces({ defectId: String(defectId), pageSize: '50' });
  const items = list.data?.items ?? [];
  const [adding, setAdding] = useState(false);
  const showZone = canUpload && (adding || (list.data !== undefined && items.length === 0));

  return (
    <div className="space-y-3">
      {list.isLoading && <p className="text-sm text-ink-500">Loading the traces…</p>}
      {list.error && (
        <p role="alert" className="text-sm font-semibold text-brick-700">
          The traces could not be loaded: {list.error.message}
        </p>
      )}
      {list.data && items.length === 0 && (
        <p className="text-sm text-ink-600">
          No scope captures on this defect yet.{canUpload ? ' Back-probe both hall-sensor signals at the door harness connector with the motor running, save the capture as CSV and add it here.' : ''}
        </p>
      )}
      {items.length > 0 && (
        <ul className="divide-y divide-ink-100 rounded-md border border-ink-200" aria-label="Traces on this defect">
          {items.map((t) => (
            <li key={t.id} className="flex flex-wrap items-center gap-x-3 gap-y-1 px-3 py-2.5">
              <span className={verdictBadge(t.verdict)}>{verdictLabel(t.verdict)}</span>
              <a className="link min-w-0 flex-1 break-all" href={`/traces/${encodeURIComponent(t.id)}`}>
                {t.fileName ?? `Capture ${t.id}`}
              </a>
              <span className="text-xs text-ink-600 tabular-nums">
                {t.direction !== 'none' ? `${formatDeg(t.phaseDeg)} · ${DIRECTION_LABELS[t.direction]} · ` : ''}
                {formatHz(Math.max(t.channels.a.freqHz, t.channels.b.freqHz))}
              </span>
              <span className="w-full text-xs text-ink-500 sm:w-auto">
                {storedAt(t)}
                {t.createdBy ? ` · ${t.createdBy}` : ''}
              </span>
            </li>
          ))}
        </ul>
      )}
      {canUpload && !showZone && list.data && (
        <button type="button" className="btn-secondary" onClick={() => setAdding(true)}>
          <Plus size={16} aria-hidden="true" /> Add a scope capture
        </button>
      )}
      {showZone && (
        <div className="rounded-md border border-ink-200 p-3">
          <h3 className="mb-2 flex items-center gap-2 text-[15px]">
            <Activity size={16} className="text-estuary-700" aria-hidden="true" /> Add a scope capture to this defect
          </h3>
          <UploadZone defectId={defectId} compact />
        </div>
      )}
    </div>
  );
}
