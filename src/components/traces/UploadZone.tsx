/**
 * Drop or tap to choose a scope capture; it is uploaded at once (with progress) together with the optional
 * pulses per revolution and sensor supply, measured by the server, and the browser goes straight to the
 * trace page with the verdict. Used on the Traces page and, with a defect id, on the defect page — where
 * `onUploaded` keeps the person on the page (unsaved diagnosis work stays), and the card lists the result.
 */
import { useId, useRef, useState } from 'react';
import { useDropzone, type FileRejection } from 'react-dropzone';
import { FileText, Upload } from 'lucide-react';
import type { ApiError } from '@/lib/client/api-client';
import type { TraceRecord } from '@/lib/contracts/traces';
import { MAX_CAPTURE_UPLOAD_BYTES, uploadTrace, type TraceUploadPhase } from './upload';
import { formatBytes } from './format';

type Props = {
  /** Store the capture on this defect. */
  defectId?: number;
  /** Fewer words (the defect page card). */
  compact?: boolean;
  /** Stay on the page and hand the stored trace over, instead of opening the trace page. */
  onUploaded?: (trace: TraceRecord, file: File) => void;
  /** Hears whether an upload is under way (to hold the page while it is). */
  onBusyChange?: (busy: boolean) => void;
};

type State =
  | { state: 'idle' }
  | { state: 'sending'; file: File; phase: TraceUploadPhase }
  | { state: 'done'; file: File; id: string }
  | { state: 'failed'; file: File | null; message: string };

/** An optional positive number field's value: undefined when empty, NaN when not a valid number. */
function optionalNumber(text: string): number | undefined {
  const t = text.trim().replace(',', '.');
  if (t === '') return undefined;
  const n = Number(t);
  return /^\d+(\.\d+)?$/.test(t) && n > 0 && n <= 1000 ? n : NaN;
}

/** The upload zone with its two options. */
export function UploadZone({ defectId, compact = false, onUploaded, onBusyChange }: Props) {
  const uid = useId();
  const [pulses, setPulses] = useState('');
  const [supply, setSupply] = useState('');
  const [run, setRun] = useState<State>({ state: 'idle' });
  const abortRef = useRef<(() => void) | null>(null);
  const sending = run.state === 'sending' || run.state === 'done';
  const pulsesValue = optionalNumber(pulses);
  const supplyValue = optionalNumber(supply);
  const optionsBad = Number.isNaN(pulsesValue) || Number.isNaN(supplyValue);

  const start = (file: File) => {
    if (optionsBad) {
      setRun({ state: 'failed', file, message: 'Fix the options first: pulses per revolution and sensor supply are positive numbers up to 1000, or empty.' });
      return;
    }
    setRun({ state: 'sending', file, phase: { phase: 'uploading', percent: 0, loaded: 0, total: file.size } });
    onBusyChange?.(true);
    const { promise, abort } = uploadTrace(file, { defectId, pulsesPerRev: pulsesValue, supplyV: supplyValue }, (phase) =>
      setRun((r) => (r.state === 'sending' ? { ...r, phase } : r)),
    );
    abortRef.current = abort;
    promise
      .then((trace) => {
        if (onUploaded) {
          setRun({ state: 'idle' });
          onUploaded(trace, file);
          return;
        }
        setRun({ state: 'done', file, id: trace.id });
        window.location.assign(`/traces/${encodeURIComponent(trace.id)}`);
      })
      .catch((e: ApiError) => setRun({ state: 'failed', file, message: e.message }))
      .finally(() => {
        abortRef.current = null;
        onBusyChange?.(false);
      });
  };

  const onDrop = (accepted: File[], rejected: FileRejection[]) => {
    const first = rejected[0];
    if (first) {
      const code = first.errors[0]?.code;
      const message =
        code === 'file-too-large'
          ? `${first.file.name} is ${formatBytes(first.file.size)}; captures up to ${formatBytes(MAX_CAPTURE_UPLOAD_BYTES)} (2,000,000 samples) are measured.`
          : code === 'too-many-files'
            ? 'Drop one capture at a time.'
            : `${first.file.name} is not a text capture: save it from the scope as CSV (.csv or .txt).`;
      setRun({ state: 'failed', file: first.file, message });
      return;
    }
    const file = accepted[0];
    if (!file) return;
    if (file.size === 0) {
      setRun({ state: 'failed', file, message: `${file.name} is empty.` });
      return;
    }
    start(file);
  };

  const { getRootProps, getInputProps, isDragActive } = useDropzone({
    onDrop,
    multiple: false,
    maxSize: MAX_CAPTURE_UPLOAD_BYTES,
    disabled: sending,
    accept: { 'text/csv': ['.csv', '.txt', '.tsv', '.dat'], 'text/plain': ['.csv', '.txt', '.tsv', '.dat'], 'application/vnd.ms-excel': ['.csv'] },
  });

  return (
    <div className="space-y-3">
      <div className="grid grid-cols-2 gap-3">
        <div>
          <label htmlFor={`${uid}-ppr`} className="field-label">
            Pulses per revolution
          </label>
          <input
            id={`${uid}-ppr`}
            className="input"
            inputMode="decimal"
            placeholder="e.g. 2"
            value={pulses}
            disabled={sending}
            aria-invalid={Number.isNaN(pulsesValue)}
            aria-describedby={`${uid}-ppr-help`}
            onChange={(e) => setPulses(e.target.value)}
          />
          <p id={`${uid}-ppr-help`} className={`mt-1 text-xs ${Number.isNaN(pulsesValue) ? 'font-semibold text-brick-700' : 'text-ink-500'}`}>
            {Number.isNaN(pulsesValue) ? 'A positive number up to 1000.' : 'Optional, per channel: gives the motor speed in rpm.'}
          </p>
        </div>
        <div>
          <label htmlFor={`${uid}-supply`} className="field-label">
            Sensor supply (V)
          </label>
          <input
            id={`${uid}-supply`}
            className="input"
            inputMode="decimal"
            placeholder="5 or 12"
            value={supply}
            disabled={sending}
            aria-invalid={Number.isNaN(supplyValue)}
            aria-describedby={`${uid}-supply-help`}
            onChange={(e) => setSupply(e.target.value)}
          />
          <p id={`${uid}-supply-help`} className={`mt-1 text-xs ${Number.isNaN(supplyValue) ? 'font-semibold text-brick-700' : 'text-ink-500'}`}>
            {Number.isNaN(supplyValue) ? 'A positive number of volts up to 1000.' : 'Optional: judges a weak high level (5 or 12 V assumed).'}
          </p>
        </div>
      </div>

      <div
        {...getRootProps({
          role: 'button',
          'aria-label': 'Capture file: drop it here or tap to choose',
          'aria-describedby': `${uid}-zone-help`,
        })}
        className={`flex min-h-32 cursor-pointer flex-col items-center justify-center gap-2 rounded-lg border-2 border-dashed px-4 py-6 text-center transition-colors ${
          isDragActive ? 'border-estuary-500 bg-estuary-50' : 'border-ink-300 bg-ink-50 hover:border-estuary-400 hover:bg-estuary-50/40'
        } ${sending ? 'cursor-progress opacity-70' : ''}`}
      >
        <input {...getInputProps({ 'aria-label': 'Capture file' })} />
        <Upload size={26} className="text-ink-400" aria-hidden="true" />
        <p className="text-[15px] font-semibold text-ink-800">{isDragActive ? 'Drop the capture to measure it' : compact ? 'Drop a capture here, or tap to choose' : 'Drop a scope capture here, or tap to choose one'}</p>
        <p id={`${uid}-zone-help`} className="text-xs text-ink-500">
          CSV or text from the scope: time, channel A, channel B; up to 2,000,000 samples. It is measured as soon as it is chosen.
        </p>
      </div>

      {run.state === 'sending' && <Progress file={run.file} phase={run.phase} onCancel={() => abortRef.current?.()} />}
      {run.state === 'done' && (
        <p className="flex items-center gap-2 text-sm font-semibold text-moss-700" role="status">
          <FileText size={16} aria-hidden="true" /> Measured {run.file.name}; opening the result…
        </p>
      )}
      {run.state === 'failed' && (
        <div role="alert" className="rounded-md border border-brick-100 bg-brick-50 px-3 py-2 text-sm text-brick-700">
          <p className="font-semibold">{run.file ? `${run.file.name} could not be measured.` : 'The capture could not be measured.'}</p>
          <p className="mt-0.5">{run.message}</p>
        </div>
      )}
    </div>
  );
}

/** The upload progress bar, then an indeterminate "measuring" state. */
function Progress({ file, phase, onCancel }: { file: File; phase: TraceUploadPhase; onCancel: () => void }) {
  const uploading = phase.phase === 'uploading';
  return (
    <div className="rounded-md border border-ink-200 bg-white px-3 py-2.5">
      <div className="mb-1.5 flex items-center gap-2 text-sm">
        <FileText size={16} className="shrink-0 text-estuary-700" aria-hidden="true" />
        <span className="min-w-0 flex-1 truncate font-semibold text-ink-900">{file.name}</span>
        <span className="shrink-0 text-ink-600 tabular-nums" aria-live="polite">
          {uploading ? `Uploading ${phase.percent}% of ${formatBytes(file.size)}` : 'Measuring…'}
        </span>
      </div>
      <div
        role="progressbar"
        aria-label={`Uploading ${file.name}`}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={uploading ? phase.percent : undefined}
        aria-valuetext={uploading ? `${phase.percent}% uploaded` : 'Uploaded; measuring'}
        className="h-2.5 overflow-hidden rounded-full bg-ink-100"
      >
        <div className={`h-full rounded-full bg-estuary-600 transition-[width] ${uploading ? '' : 'animate-pulse'}`} style={{ width: `${uploading ? phase.percent : 100}%` }} />
      </div>
      {uploading && (
        <button type="button" className="btn-ghost mt-1.5 -ml-2 text-sm" onClick={onCancel}>
          Cancel upload
        </button>
      )}
    </div>
  );
}
