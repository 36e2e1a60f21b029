/**
 * Import (admins and fleet managers): pick the kind of file, read its format, drop a CSV, check it (a dry
 * run that reports what would change and every row problem), then import it — all or nothing.
 */
import { useEffect, useId, useRef, useState, type DragEvent } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { CheckCircle2, ChevronRight, Download, FileText, Upload, X } from 'lucide-react';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { useUrlState } from '@/lib/client/url-state';
import { IssueTable } from './IssueTable';
import { downloadCsv, IMPORT_FORMATS, IMPORT_KINDS, templateCsv, type ImportKind } from './formats';
import { uploadImport, type ImportResult, type UploadPhase } from './upload';

/** Largest file the server accepts (src/server/imports.ts MAX_IMPORT_BYTES). */
const MAX_FILE_BYTES = 50 * 1024 * 1024;

type Run =
  | { state: 'idle' }
  | { state: 'running'; dryRun: boolean; phase: UploadPhase }
  | { state: 'checked'; result: ImportResult }
  | { state: 'imported'; result: ImportResult }
  | { state: 'failed'; dryRun: boolean; message: string };

const n = (x: number) => x.toLocaleString('en-GB');
const plural = (x: number, one: string, many = `${one}s`) => `${n(x)} ${x === 1 ? one : many}`;

function formatBytes(b: number): string {
  if (b < 1024) return `${b} B`;
  if (b < 1024 * 1024) return `${(b / 1024).toFixed(1)} KB`;
  const mb = b / 1024 / 1024;
  return `${Number.isInteger(mb) ? mb : mb.toFixed(1)} MB`;
}

/** Island root of /import. */
export default function ImportView(props: { initialKind?: string | undefined }) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <Importer {...props} />
    </QueryClientProvider>
  );
}

function Importer({ initialKind }: { initialKind?: string | undefined }) {
  const [params, setParams] = useUrlState(initialKind ? { kind: initialKind } : {});
  const kind: ImportKind = (IMPORT_KINDS as readonly string[]).includes(params.kind ?? '') ? (params.kind as ImportKind) : 'depots';
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [run, setRun] = useState<Run>({ state: 'idle' });
  const [dragging, setDragging] = useState(false);
  const abortRef = useRef<(() => void) | null>(null);
  const inputRef = useRef<HTMLInputElement>(null);
  const uid = useId();
  const format = IMPORT_FORMATS[kind];
  const running = run.state === 'running';

  // A new file or kind makes any earlier check meaningless.
  useEffect(() => {
    setRun({ state: 'idle' });
  }, [file, kind]);

  const pick = (f: File | undefined | null) => {
    setFileError(null);
    if (!f) return;
    if (f.size > MAX_FILE_BYTES) {
      setFileError(`${f.name} is ${formatBytes(f.size)}; the limit is ${formatBytes(MAX_FILE_BYTES)}. Split it into smaller files.`);
      return;
    }
    if (f.size === 0) {
      setFileError(`${f.name} is empty.`);
      return;
    }
    setFile(f);
  };

  const start = (dryRun: boolean) => {
    if (!file) return;
    setRun({ state: 'running', dryRun, phase: { phase: 'uploading', percent: 0 } });
    const { promise, abort } = uploadImport(kind, file, dryRun, (phase) => setRun((r) => (r.state === 'running' ? { ...r, phase } : r)));
    abortRef.current = abort;
    promise
      .then((result) => setRun(dryRun || result.errors.length ? { state: 'checked', result } : { state: 'imported', result }))
      .catch((e: Error) => setRun({ state: 'failed', dryRun, message: e.message }))
      .finally(() => {
        abortRef.current = null;
      });
  };

  const checked = run.state === 'checked' ? run.result : null;
  const canImport = !!file && !!checked && checked.errors.length === 0 && !running;

  const onDrop = (e: DragEvent) => {
    e.preventDefault();
    setDragging(false);
    if (running) return;
    pick(e.dataTransfer.files[0]);
  };

  return (
    <div>
      <div className="mb-4">
        <h1>Import</h1>
        <p className="text-sm text-ink-500">Bring depots, module types, vehicles and defects in from a spreadsheet saved as CSV.</p>
      </div>

      <div className="mb-5 rounded-md border border-seep-100 bg-seep-50 px-4 py-3 text-sm text-seep-700">
        <p>
          <strong>All or nothing.</strong> If any row has a problem, nothing is written; fix the file and try again.{' '}
          <strong>Re-importing the same file changes nothing</strong>: rows that match what is stored count as unchanged, so you can safely import an updated
          copy of the whole sheet.
        </p>
        <p className="mt-1">Import in this order, because later files refer to earlier ones: depots, modules, vehicles, defects.</p>
      </div>

      <div className="grid items-start gap-5 lg:grid-cols-[minmax(0,5fr)_minmax(0,7fr)]">
        <div className="order-1 min-w-0 space-y-5">
          <section className="card card-pad" aria-labelledby={`${uid}-kind`}>
            <h2 id={`${uid}-kind`} className="mb-3">
              1 · What are you importing?
            </h2>
            <div role="radiogroup" aria-labelledby={`${uid}-kind`} className="grid grid-cols-2 gap-2 sm:grid-cols-4 lg:grid-cols-2">
              {IMPORT_KINDS.map((k) => {
                const on = k === kind;
                return (
                  <button
                    key={k}
                    type="button"
                    role="radio"
                    aria-checked={on}
                    disabled={running}
                    onClick={() => setParams({ kind: k })}
                    className={`min-h-10 rounded-md border px-3 py-2 text-left transition-colors disabled:opacity-60 ${on ? 'border-estuary-600 bg-estuary-50 ring-1 ring-estuary-600' : 'border-ink-200 bg-white hover:border-ink-300 hover:bg-ink-50'}`}
                  >
                    <span className={`block text-[15px] font-semibold ${on ? 'text-estuary-800' : 'text-ink-900'}`}>{IMPORT_FORMATS[k].label}</span>
                    <span className="block text-xs text-ink-500">Matched {IMPORT_FORMATS[k].matchedShort}</span>
                  </button>
                );
              })}
            </div>
          </section>
          <section className="card card-pad" aria-labelledby={`${uid}-file`}>
            <h2 id={`${uid}-file`} className="mb-3">
              2 · Choose the file
            </h2>
            <div
              onDragOver={(e) => {
                e.preventDefault();
                if (!running) setDragging(true);
              }}
              onDragLeave={() => setDragging(false)}
              onDrop={onDrop}
              className={`flex flex-col items-center justify-center gap-2 rounded-lg border-2 border-dashed px-4 py-7 text-center transition-colors ${dragging ? 'border-estuary-500 bg-estuary-50' : 'border-ink-300 bg-ink-50'}`}
            >
              <Upload size={26} className="text-ink-400" aria-hidden="true" />
              <p className="text-sm text-ink-600">Drop a CSV file here, or</p>
              <button type="button" className="btn-secondary" onClick={() => inputRef.current?.click()} disabled={running}>
                Choose a file…
              </button>
              <input
                ref={inputRef}
                type="file"
                accept=".csv,.txt,text/csv,text/plain"
                className="sr-only"
                tabIndex={-1}
                aria-label="CSV file to import"
                onChange={(e) => {
                  pick(e.target.files?.[0]);
                  e.target.value = '';
                }}
              />
            </div>
            {fileError && (
              <p role="alert" className="mt-2 text-sm font-semibold text-brick-700">
                {fileError}
              </p>
            )}
            {file && (
              <div className="mt-3 flex items-center gap-3 rounded-md border border-ink-200 px-3 py-2">
                <FileText size={20} className="shrink-0 text-estuary-700" aria-hidden="true" />
                <div className="min-w-0 flex-1">
                  <div className="truncate font-semibold text-ink-900">{file.name}</div>
                  <div className="text-xs text-ink-500">
                    {formatBytes(file.size)} · to import as {format.label.toLowerCase()}
                  </div>
                </div>
                <button type="button" className="btn-ghost px-2.5" onClick={() => setFile(null)} disabled={running} aria-label="Remove file">
                  <X size={18} aria-hidden="true" />
                </button>
              </div>
            )}

            <div className="mt-4 flex flex-wrap items-center gap-2">
              <button type="button" className={canImport ? 'btn-secondary' : 'btn-primary'} disabled={!file || running} onClick={() => start(true)}>
                Check file
              </button>
              <button type="button" className="btn-primary" disabled={!canImport} onClick={() => start(false)}>
                Import {format.label.toLowerCase()}
              </button>
              {running && (
                <button type="button" className="btn-ghost" onClick={() => abortRef.current?.()}>
                  Cancel
                </button>
              )}
              {!running && !canImport && run.state !== 'imported' && (
                <span className="text-sm text-ink-500">{file ? 'Import opens once a check finds no problems.' : 'Choose a file, then check it.'}</span>
              )}
            </div>
            {run.state === 'running' && <Progress run={run} fileName={file?.name ?? ''} />}
          </section>
        </div>
        <section className="card card-pad order-3 min-w-0 lg:order-2" aria-labelledby={`${uid}-format`}>
          <div className="mb-2 flex flex-wrap items-start justify-between gap-2">
            <div>
              <h2 id={`${uid}-format`}>The {format.label.toLowerCase()} file</h2>
              <p className="text-sm text-ink-600">{format.summary}</p>
            </div>
            <button type="button" className="btn-secondary shrink-0" onClick={() => downloadCsv(`seepline-${kind}-template.csv`, templateCsv(kind))}>
              <Download size={16} aria-hidden="true" /> Template
            </button>
          </div>
          <ul className="text-sm text-ink-600">
            <li>
              Rows are matched to stored records by <strong className="text-ink-800">{format.matchedBy}</strong>: new ones are added, changed ones updated.
            </li>
            {format.needs && <li>{format.needs}</li>}
          </ul>
          <table className="data-table mt-3">
            <caption className="sr-only">Columns of the {kind} file</caption>
            <thead>
              <tr>
                <th scope="col">Column</th>
                <th scope="col">Holds</th>
              </tr>
            </thead>
            <tbody>
              {format.columns.map((c) => (
                <tr key={c.name}>
                  <td className="whitespace-nowrap">
                    <code className={c.required ? 'font-bold text-ink-900' : 'text-ink-600'}>{c.name}</code>
                    {c.required && <span className="sr-only"> (required)</span>}
                  </td>
                  <td className="text-ink-700">{c.text}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-2 text-xs text-ink-500">
            <strong className="text-ink-700">Bold</strong> columns are required. Columns may come in any order; header names ignore case and spaces; extra
            columns are ignored; an empty cell means no value. UTF-8 text, comma or semicolon between fields, up to {formatBytes(MAX_FILE_BYTES)}.
          </p>
        </section>
        <div className="order-2 min-w-0 empty:hidden lg:order-3 lg:col-span-2">
          <Outcome run={run} kind={kind} fileName={file?.name ?? ''} />
        </div>
      </div>
    </div>
  );
}

function Progress({ run, fileName }: { run: Extract<Run, { state: 'running' }>; fileName: string }) {
  const uploading = run.phase.phase === 'uploading';
  const percent = run.phase.phase === 'uploading' ? run.phase.percent : 100;
  const label = uploading
    ? `Uploading ${fileName}… ${percent} %`
    : run.dryRun
      ? 'Checking every row on the server…'
      : 'Checking and writing every row in one transaction…';
  return (
    <div className="mt-4" aria-live="polite">
      <style>{`@keyframes seep-slide{0%{transform:translateX(-100%)}100%{transform:translateX(250%)}}`}</style>
      <div className="mb-1 text-sm text-ink-600">{label}</div>
      {uploading ? (
        <div
          className="h-2 overflow-hidden rounded bg-ink-100"
          role="progressbar"
          aria-label="Upload"
          aria-valuemin={0}
          aria-valuemax={100}
          aria-valuenow={percent}
        >
          <div className="h-2 rounded bg-estuary-600 transition-[width] duration-150" style={{ width: `${percent}%` }} />
        </div>
      ) : (
        <div className="h-2 overflow-hidden rounded bg-ink-100" role="progressbar" aria-label={label}>
          <div className="h-2 w-2/5 rounded bg-estuary-600" style={{ animation: 'seep-slide 1.1s ease-in-out infinite' }} />
        </div>
      )}
    </div>
  );
}

function Counts({ result, done }: { result: ImportResult; done: boolean }) {
  const tiles = [
    { label: 'Rows read', value: result.rows },
    { label: done ? 'Added' : 'Would add', value: result.inserted },
    { label: done ? 'Updated' : 'Would update', value: result.updated },
    { label: 'Unchanged', value: result.unchanged },
  ];
  return (
    <dl className="grid grid-cols-2 gap-2 sm:grid-cols-4">
      {tiles.map((t) => (
        <div key={t.label} className="rounded-md border border-ink-200 bg-white px-3 py-2">
          <dt className="text-xs font-semibold tracking-wide text-ink-500 uppercase">{t.label}</dt>
          <dd className="text-2xl font-bold text-ink-900 tabular-nums">{n(t.value)}</dd>
        </div>
      ))}
    </dl>
  );
}

function Outcome({ run, kind, fileName }: { run: Run; kind: ImportKind; fileName: string }) {
  if (run.state === 'idle' || run.state === 'running') return null;
  if (run.state === 'failed') {
    return (
      <section className="card card-pad border-brick-100" aria-live="polite">
        <h2 className="mb-1">{run.dryRun ? 'The check could not run' : 'The import could not run'}</h2>
        <p role="alert" className="text-sm text-brick-700">
          {run.message}
        </p>
        <p className="mt-1 text-sm text-ink-600">Nothing was written.</p>
      </section>
    );
  }
  const r = run.result;
  const base = fileName.replace(/\.[^.]+$/, '') || kind;
  if (run.state === 'imported') {
    const changed = r.inserted + r.updated;
    return (
      <section className="card card-pad space-y-4" aria-live="polite">
        <div role="status" className="flex items-start gap-2 rounded-md border border-moss-100 bg-moss-50 px-3 py-2 text-sm text-moss-700">
          <CheckCircle2 size={18} className="mt-0.5 shrink-0" aria-hidden="true" />
          <p>
            <strong>Imported {fileName}.</strong>{' '}
            {changed === 0
              ? `Every row was already up to date, so nothing changed.`
              : `${plural(r.inserted, 'record')} added, ${n(r.updated)} updated, ${n(r.unchanged)} unchanged.`}
          </p>
        </div>
        <Counts result={r} done />
        {r.warnings.length > 0 && <Warnings result={r} base={base} />}
      </section>
    );
  }
  if (r.errors.length > 0) {
    const header = r.errors.filter((e) => e.row === 0).length;
    const rows = new Set(r.errors.filter((e) => e.row > 0).map((e) => e.row)).size;
    return (
      <section className="card card-pad space-y-3" aria-live="polite">
        <div role="alert" className="rounded-md border border-brick-100 bg-brick-50 px-3 py-2 text-sm text-brick-700">
          <strong>
            {plural(r.errors.length, 'problem')} found
            {rows ? ` in ${plural(rows, 'row')}` : ''}
            {header ? `${rows ? ' and' : ' in'} the header` : ''}.
          </strong>{' '}
          Nothing can be imported until they are fixed: correct them in the spreadsheet, save as CSV and check again.
          {r.errors.length >= 1000 && ' Only the first 1,000 are listed.'}
        </div>
        <p className="text-sm text-ink-600">
          Rows are counted from the first row under the header, so <strong className="text-ink-800">row 1 is line 2</strong> of the sheet when the header
          is on line 1; each problem gives both, and the row's {kind === 'defects' ? 'ref or VIN' : kind === 'vehicles' ? 'VIN' : 'code'}.
        </p>
        <IssueTable issues={r.errors} rows={r.issueRows} tone="error" caption="Problems in the file" fileName={`${base}-problems.csv`} />
        {r.warnings.length > 0 && <Warnings result={r} base={base} collapsed />}
      </section>
    );
  }
  return (
    <section className="card card-pad space-y-4" aria-live="polite">
      <div role="status" className="flex items-start gap-2 rounded-md border border-moss-100 bg-moss-50 px-3 py-2 text-sm text-moss-700">
        <CheckCircle2 size={18} className="mt-0.5 shrink-0" aria-hidden="true" />
        <p>
          <strong>No problems found.</strong>{' '}
          {r.inserted + r.updated === 0
            ? 'Every row already matches what is stored; importing would change nothing.'
            : 'Nothing has been written yet: press Import to apply these changes.'}
        </p>
      </div>
      <Counts result={r} done={false} />
      {r.warnings.length > 0 && <Warnings result={r} base={base} />}
    </section>
  );
}

function Warnings({ result, base, collapsed = false }: { result: ImportResult; base: string; collapsed?: boolean }) {
  const note = 'These do not stop the import, but are worth a look (for example a VIN whose check digit does not match, outside North America).';
  const table = <IssueTable issues={result.warnings} rows={result.issueRows} tone="warning" caption="Warnings" fileName={`${base}-warnings.csv`} />;
  if (collapsed) {
    return (
      <details className="group rounded-md border border-ink-200 px-3 py-1">
        <summary className="flex min-h-10 cursor-pointer list-none items-center gap-2 font-semibold text-ink-800 [&::-webkit-details-marker]:hidden">
          <ChevronRight size={16} className="shrink-0 text-ink-500 transition-transform group-open:rotate-90" aria-hidden="true" />
          Also {plural(result.warnings.length, 'warning')} (they would not stop the import)
        </summary>
        <div className="mt-2">{table}</div>
      </details>
    );
  }
  return (
    <div>
      <h3 className="mb-1">{plural(result.warnings.length, 'warning')}</h3>
      <p className="mb-2 text-sm text-ink-600">{note}</p>
      {table}
    </div>
  );
}
