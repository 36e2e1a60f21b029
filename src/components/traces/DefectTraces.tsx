/**
 * The defect page's traces island: the scope captures stored on this defect with their verdicts, and (for
 * people who may add traces in the defect's depot) the upload zone that stores a new one on the defect. The
 * person stays on the defect page (work typed in its forms is kept): the new trace appears in the list with
 * its verdict and a link to open it. Leaving the page while a capture uploads asks first.
 */
import { useState } from 'react';
import { QueryClientProvider, useQueryClient } from '@tanstack/react-query';
import { Activity, Check, Plus } from 'lucide-react';
import type { TraceRecord } from '@/lib/contracts/traces';
import { defectKey } from '@/components/defect-workflow/queries';
import { useUnsavedChanges } from '@/components/defect-fields/unsaved';
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
  const [added, setAdded] = useState<{ trace: TraceRecord; name: string } | null>(null);
  const [uploading, setUploading] = useState(false);
  const qc = useQueryClient();
  useUnsavedChanges(`trace-upload-${defectId}`, 'the scope capture being uploaded', uploading);
  const showZone = canUpload && (adding || (list.data !== undefined && items.length === 0 && !added));

  const onUploaded = (trace: TraceRecord, file: File) => {
    setAdded({ trace, name: trace.fileName ?? file.name });
    setAdding(false);
    // The list shows it; the defect's audit trail shows the upload.
    void qc.invalidateQueries({ queryKey: ['traces', 'list'] });
    void qc.invalidateQueries({ queryKey: defectKey(defectId) });
  };

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
      {added && (
        <p className="flex flex-wrap items-center gap-x-2 gap-y-1 rounded-md border border-moss-600 bg-moss-50 px-3 py-2 text-sm text-moss-700" role="status" data-testid="trace-added">
          <Check size={16} aria-hidden="true" />
          <span>
            Added <span className="font-semibold wrap-anywhere">{added.name}</span>: <span className="font-semibold">{verdictLabel(added.trace.verdict)}</span>.
          </span>
          <a className="link" href={`/traces/${encodeURIComponent(added.trace.id)}`}>
            Open the trace
          </a>
        </p>
      )}
      {items.length > 0 && (
        <ul className="divide-y divide-ink-100 rounded-md border border-ink-200" aria-label="Traces on this defect">
          {items.map((t) => (
            <li key={t.id} className={`flex flex-wrap items-center gap-x-3 gap-y-1 px-3 py-2.5 ${added?.trace.id === t.id ? 'bg-moss-50/60' : ''}`}>
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
          <UploadZone defectId={defectId} compact onUploaded={onUploaded} onBusyChange={setUploading} />
        </div>
      )}
    </div>
  );
}
