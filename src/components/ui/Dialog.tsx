/**
 * A modal dialog on the native <dialog> element (focus trap, Esc and the backdrop come from the browser),
 * and a confirmation dialog built on it. Used by the Depots, Modules and People views.
 * Edit here when a dialog needs a new size or footer layout.
 */
import { useEffect, useId, useRef, useState, type ReactNode } from 'react';
import { X } from 'lucide-react';

const SIZES = { sm: 'w-[min(calc(100vw-2rem),28rem)]', md: 'w-[min(calc(100vw-2rem),36rem)]', lg: 'w-[min(calc(100vw-2rem),46rem)]' } as const;

type DialogProps = {
  open: boolean;
  onClose: () => void;
  title: string;
  description?: ReactNode;
  children: ReactNode;
  footer?: ReactNode;
  size?: keyof typeof SIZES;
};

/** A modal dialog; its content is mounted only while open, so forms start fresh each time. */
export function Dialog({ open, onClose, title, description, children, footer, size = 'md' }: DialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) d.showModal();
    if (!open && d.open) d.close();
  }, [open]);
  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onCancel={(e) => {
        e.preventDefault();
        onClose();
      }}
      className={`m-auto max-h-[calc(100dvh-2rem)] overflow-hidden rounded-lg border border-ink-200 bg-white p-0 text-ink-800 shadow-xl backdrop:bg-ink-900/40 ${SIZES[size]}`}
    >
      {open && (
        <div className="flex max-h-[calc(100dvh-2rem)] flex-col">
          <header className="flex items-start justify-between gap-3 border-b border-ink-200 px-5 py-3">
            <div className="min-w-0 pt-1.5">
              <h2 id={titleId}>{title}</h2>
              {description && <p className="mt-0.5 text-sm text-ink-500">{description}</p>}
            </div>
            <button type="button" className="btn-ghost -mr-2 shrink-0 px-2.5" aria-label="Close" onClick={onClose}>
              <X size={18} aria-hidden="true" />
            </button>
          </header>
          <div className="min-h-0 flex-1 overflow-y-auto px-5 py-4">{children}</div>
          {footer && <footer className="flex flex-wrap justify-end gap-2 border-t border-ink-200 bg-ink-50 px-5 py-3">{footer}</footer>}
        </div>
      )}
    </dialog>
  );
}

type ConfirmProps = {
  open: boolean;
  onClose: () => void;
  title: string;
  children: ReactNode;
  confirmLabel: string;
  /** Runs the action; a thrown error's message is shown in the dialog and the dialog stays open. */
  onConfirm: () => Promise<unknown>;
  danger?: boolean;
  /** Why the action cannot be done now (known before asking the server): the confirm button is disabled with it. */
  blockedReason?: string | null;
};

/** Ask before doing something that cannot be undone; shows the server's answer when it refuses (e.g. 409). */
export function ConfirmDialog({ open, onClose, title, children, confirmLabel, onConfirm, danger = true, blockedReason = null }: ConfirmProps) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    if (open) setError(null);
  }, [open]);
  const run = async () => {
    setBusy(true);
    setError(null);
    try {
      await onConfirm();
      onClose();
    } catch (e) {
      setError(e instanceof Error ? e.message : 'That did not work; try again.');
    } finally {
      setBusy(false);
    }
  };
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={title}
      size="sm"
      footer={
        <>
          <button type="button" className="btn-secondary" onClick={onClose}>
            {error || blockedReason ? 'Close' : 'Cancel'}
          </button>
          <button
            type="button"
            className={danger ? 'btn-danger' : 'btn-primary'}
            onClick={run}
            disabled={busy || !!blockedReason}
            aria-describedby={blockedReason ? 'confirm-blocked' : undefined}
          >
            {busy ? 'Working…' : confirmLabel}
          </button>
        </>
      }
    >
      <div className="space-y-3 text-sm">
        {children}
        {blockedReason && (
          <p id="confirm-blocked" className="caution">
            {blockedReason}
          </p>
        )}
        {error && (
          <p role="alert" className="rounded-md border border-brick-100 bg-brick-50 px-3 py-2 text-brick-700">
            {error}
          </p>
        )}
      </div>
    </Dialog>
  );
}
