/**
 * A defect's photos (island): take one with the tablet camera or choose files, see them as thumbnails and
 * open a larger view. The server sniffs the type, refuses anything but a plain photo, strips the metadata and
 * serves images only to people of the defect's depot; this view shows its answer for each file.
 */
import { useId, useState, type DragEvent } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { Camera, ChevronLeft, ChevronRight, ExternalLink, ImagePlus, Trash2 } from 'lucide-react';
import { useIslandQueryClient } from '@/components/defect-workflow/island-client';
import type { DefectPhoto, DefectRecord } from '@/lib/contracts/defects';
import { MAX_PHOTO_BYTES } from '@/lib/photos/checks';
import { canEditRecord, SUPERVISOR_ROLES, type WorkflowRole } from '@/lib/defects/transitions';
import { formatInstant } from '@/components/defects/format';
import { Dialog } from '@/components/ui/Dialog';
import { useDefect, useDeletePhoto, useUploadPhoto } from '@/components/defect-workflow/queries';
import { useHydrated } from '@/components/defect-fields/use-hydrated';

type Props = { initial: DefectRecord; role: WorkflowRole; userId: number; timeZone: string | null };
type Outcome = { name: string; ok: boolean; message: string };

const mb = (n: number) => `${(n / 1024 / 1024).toFixed(1)} MB`;

function Gallery({ initial, role, userId, timeZone }: Props) {
  const { data: r } = useDefect(initial);
  const upload = useUploadPhoto(r.id);
  const remove = useDeletePhoto(r.id);
  const uid = useId();
  const [caption, setCaption] = useState('');
  const [progress, setProgress] = useState<string | null>(null);
  const [outcomes, setOutcomes] = useState<Outcome[]>([]);
  const [open, setOpen] = useState<number | null>(null);
  const [dragging, setDragging] = useState(false);
  const [confirmRemove, setConfirmRemove] = useState(false);
  const editable = canEditRecord(r.status, role);
  const hydrated = useHydrated();
  const photos = r.photos;
  const mayRemove = (p: DefectPhoto) => (p.byId === userId && editable) || SUPERVISOR_ROLES.includes(role);

  const send = async (files: File[]) => {
    const out: Outcome[] = [];
    for (let i = 0; i < files.length; i++) {
      const f = files[i]!;
      if (f.size > MAX_PHOTO_BYTES) {
        out.push({ name: f.name, ok: false, message: `${mb(f.size)} is over the limit of ${mb(MAX_PHOTO_BYTES)}.` });
        continue;
      }
      setProgress(`Uploading ${files.length > 1 ? `${i + 1} of ${files.length}: ` : ''}${f.name}…`);
      try {
        const p = await upload.mutateAsync({ file: f, caption });
        out.push({ name: f.name, ok: true, message: p.duplicate ? 'Already on this defect.' : 'Stored.' });
      } catch (e) {
        out.push({ name: f.name, ok: false, message: e instanceof Error ? e.message : 'Not stored.' });
      }
    }
    setProgress(null);
    setOutcomes(out);
    if (out.some((o) => o.ok)) setCaption('');
  };
  const onFiles = (list: FileList | null) => {
    if (list && list.length) void send([...list]);
  };
  const onDrop = (e: DragEvent) => {
    e.preventDefault();
    setDragging(false);
    onFiles(e.dataTransfer.files);
  };

  const current = open === null ? null : (photos[open] ?? null);
  return (
    <section className="card" aria-labelledby="h-photos" data-testid="photo-gallery">
      <div className="flex flex-wrap items-baseline justify-between gap-2 border-b border-ink-200 px-4 py-3 sm:px-5">
        <h2 id="h-photos">Photos</h2>
        <span className="text-sm text-ink-500">{photos.length === 0 ? 'None yet' : `${photos.length} photo${photos.length === 1 ? '' : 's'}`}</span>
      </div>
      <div className="space-y-4 px-4 py-4 sm:px-5">
        {editable && (
          <div
            className={`rounded-md border-2 border-dashed px-3 py-3 ${dragging ? 'border-estuary-500 bg-estuary-50' : 'border-ink-200'}`}
            onDragOver={(e) => {
              e.preventDefault();
              setDragging(true);
            }}
            onDragLeave={() => setDragging(false)}
            onDrop={onDrop}
          >
            <div className="grid gap-3 sm:grid-cols-[1fr_auto] sm:items-end">
              <div>
                <label htmlFor={`${uid}-caption`} className="field-label">
                  Caption <span className="font-normal text-ink-500">(optional, for the next photo)</span>
                </label>
                <input id={`${uid}-caption`} disabled={!hydrated} className="input" maxLength={200} placeholder="e.g. corroded encoder board" value={caption} onChange={(e) => setCaption(e.target.value)} />
              </div>
              <div className="flex flex-wrap gap-2">
                <label className="btn-primary cursor-pointer focus-within:ring-2 focus-within:ring-estuary-300">
                  <Camera size={18} aria-hidden="true" />
                  Take a photo
                  <input type="file" accept="image/*" capture="environment" className="sr-only" disabled={!hydrated || upload.isPending} onChange={(e) => { onFiles(e.target.files); e.target.value = ''; }} />
                </label>
                <label className="btn-secondary cursor-pointer focus-within:ring-2 focus-within:ring-estuary-300">
                  <ImagePlus size={18} aria-hidden="true" />
                  Choose files
                  <input type="file" accept="image/jpeg,image/png,image/webp" multiple className="sr-only" disabled={!hydrated || upload.isPending} onChange={(e) => { onFiles(e.target.files); e.target.value = ''; }} />
                </label>
              </div>
            </div>
            <p className="mt-2 text-xs text-ink-500">
              JPEG, PNG or WebP, up to {mb(MAX_PHOTO_BYTES).replace('.0', '')}; you can also drop images here. Camera details and location are removed when a photo is stored.
            </p>
            {progress && (
              <p role="status" className="mt-2 flex items-center gap-2 text-sm font-semibold text-estuary-800">
                <span className="inline-block h-3 w-3 animate-spin rounded-full border-2 border-estuary-700 border-t-transparent" aria-hidden="true" />
                {progress}
              </p>
            )}
            {outcomes.length > 0 && !progress && (
              <ul className="mt-2 space-y-1 text-sm" role={outcomes.some((o) => !o.ok) ? 'alert' : 'status'} data-testid="upload-outcomes">
                {outcomes.map((o, i) => (
                  <li key={`${o.name}-${i}`} className={o.ok ? 'text-moss-700' : 'text-brick-700'}>
                    <span className="font-semibold wrap-anywhere">{o.name}</span>: {o.message}
                  </li>
                ))}
              </ul>
            )}
          </div>
        )}

        {photos.length === 0 ? (
          <p className="text-sm text-ink-500">No photos on this defect{editable ? ' yet. A photo of the door inside, the connector and the board makes the record far easier to trust later.' : '.'}</p>
        ) : (
          <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3 xl:grid-cols-4" aria-label="Photos of this defect">
            {photos.map((p, i) => (
              <li key={p.id}>
                <button type="button" className="group block w-full overflow-hidden rounded-md border border-ink-200 bg-ink-50 text-left hover:border-estuary-500" onClick={() => setOpen(i)} aria-label={`Open photo ${i + 1}${p.caption ? `: ${p.caption}` : ''}`}>
                  <img src={p.thumbUrl} alt={p.caption ?? `Photo ${i + 1} of ${r.ref}`} loading="lazy" className="aspect-[4/3] w-full object-cover" />
                  <span className="block truncate px-2 py-1 text-xs text-ink-700">{p.caption ?? <span className="text-ink-400">No caption</span>}</span>
                </button>
              </li>
            ))}
          </ul>
        )}
      </div>

      {current && open !== null && (
        <Dialog
          open
          size="lg"
          onClose={() => {
            setOpen(null);
            setConfirmRemove(false);
          }}
          title={current.caption ?? `Photo ${open + 1} of ${photos.length}`}
          description={`${current.by ?? 'Someone'} · ${formatInstant(current.createdAt, timeZone)} · ${current.width ?? '?'} × ${current.height ?? '?'} px`}
          footer={
            <>
              {mayRemove(current) &&
                (confirmRemove ? (
                  <span className="mr-auto flex flex-wrap items-center gap-2">
                    <span className="text-sm text-ink-700">Remove this photo?</span>
                    <button
                      type="button"
                      className="btn-danger"
                      disabled={remove.isPending}
                      onClick={async () => {
                        await remove.mutateAsync(current.id);
                        setConfirmRemove(false);
                        setOpen(null);
                      }}
                    >
                      {remove.isPending ? 'Removing…' : 'Yes, remove'}
                    </button>
                    <button type="button" className="btn-secondary" onClick={() => setConfirmRemove(false)}>
                      Keep
                    </button>
                  </span>
                ) : (
                  <button type="button" className="btn-secondary mr-auto text-brick-700" onClick={() => setConfirmRemove(true)}>
                    <Trash2 size={16} aria-hidden="true" /> Remove
                  </button>
                ))}
              <button type="button" className="btn-secondary" disabled={open === 0} onClick={() => setOpen(open - 1)} aria-label="Previous photo">
                <ChevronLeft size={18} aria-hidden="true" />
              </button>
              <button type="button" className="btn-secondary" disabled={open >= photos.length - 1} onClick={() => setOpen(open + 1)} aria-label="Next photo">
                <ChevronRight size={18} aria-hidden="true" />
              </button>
              <a className="btn-secondary" href={current.url} target="_blank" rel="noopener">
                <ExternalLink size={16} aria-hidden="true" /> Full size
              </a>
            </>
          }
        >
          <img src={current.url} alt={current.caption ?? `Photo ${open + 1} of ${r.ref}`} className="mx-auto max-h-[65dvh] w-auto rounded object-contain" />
        </Dialog>
      )}
    </section>
  );
}

/** Island root. */
export default function PhotoGallery(props: Props) {
  const client = useIslandQueryClient();
  return (
    <QueryClientProvider client={client}>
      <Gallery {...props} />
    </QueryClientProvider>
  );
}
