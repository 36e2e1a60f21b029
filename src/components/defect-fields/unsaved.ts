/**
 * Unsaved changes on a page of several islands (the defect page's forms, the report form), in one
 * module-level store that every island of the page shares (the browser loads this module once per page).
 *
 * - Forms say whether they hold unsaved edits (`useUnsavedChanges`); while any does, reloading, closing the
 *   tab or going Back asks the browser's own "leave site?" question (beforeunload), and a click on a link of
 *   the page is held and asked in the app (`LeavePrompt`): stay, or leave without saving.
 * - A form may also offer to save itself (`flush`): a lifecycle step saves every pending edit first, so a
 *   technician who typed the action and pressed "Mark repaired" gets both (docs/decisions/014).
 * - `allowLeave()` before a navigation the person asked for knowingly (after a successful report, or
 *   "Open that defect" on the report form).
 *
 * Edit here to change what counts as leaving; forms only report their state.
 */
import { useEffect, useRef, useSyncExternalStore } from 'react';

/** What saving a form's pending edits came to. */
export type FlushResult = 'clean' | 'saved' | 'failed';

type Entry = {
  label: string;
  dirty: boolean;
  flush: (() => Promise<FlushResult>) | null;
  /** Values the form holds but has not saved (e.g. the action typed), for other islands' hints. */
  pending: Record<string, unknown>;
};

/** What islands read from the store. */
export type UnsavedSnapshot = {
  /** Labels of the forms with unsaved edits (and of work under way, such as an upload), in the order they registered. */
  dirtyLabels: string[];
  /** Labels of the dirty forms that a step can save first (they offer `flush`). */
  savableLabels: string[];
  /** Unsaved values of every dirty form, merged. */
  pending: Record<string, unknown>;
  /** A link the person clicked while something was unsaved, waiting for their answer. */
  pendingHref: string | null;
  /** The LeavePrompt that shows the question (one per page). */
  host: symbol | null;
};

const entries = new Map<string, Entry>();
const listeners = new Set<() => void>();
let leaving = false;
let pendingHref: string | null = null;
let host: symbol | null = null;
let installed = false;
let snapshot: UnsavedSnapshot = { dirtyLabels: [], savableLabels: [], pending: {}, pendingHref: null, host: null };

function emit(): void {
  const dirty = [...entries.values()].filter((e) => e.dirty);
  snapshot = { dirtyLabels: dirty.map((e) => e.label), savableLabels: dirty.filter((e) => e.flush).map((e) => e.label), pending: Object.assign({}, ...dirty.map((e) => e.pending)), pendingHref, host };
  for (const l of listeners) l();
}

/** True while some form holds unsaved edits. */
export function hasUnsavedChanges(): boolean {
  return [...entries.values()].some((e) => e.dirty);
}

function onBeforeUnload(e: BeforeUnloadEvent): void {
  if (leaving || !hasUnsavedChanges()) return;
  e.preventDefault();
  // NOTE: older Chromium needs returnValue set as well as preventDefault() to ask.
  e.returnValue = '';
}

function onClick(e: MouseEvent): void {
  if (leaving || e.defaultPrevented || e.button !== 0 || e.metaKey || e.ctrlKey || e.shiftKey || e.altKey || !hasUnsavedChanges()) return;
  const a = e.target instanceof Element ? e.target.closest('a[href]') : null;
  if (!(a instanceof HTMLAnchorElement) || a.hasAttribute('download') || (a.target && a.target !== '_self')) return;
  const url = new URL(a.href, window.location.href);
  const here = new URL(window.location.href);
  // A jump within this page loses nothing.
  if (url.origin === here.origin && url.pathname === here.pathname && url.search === here.search && url.hash) return;
  e.preventDefault();
  pendingHref = url.href;
  emit();
}

function onPageShow(e: PageTransitionEvent): void {
  // Back to this page from the browser's cache: it is being worked on again.
  if (e.persisted) leaving = false;
}

function install(): void {
  if (installed || typeof window === 'undefined') return;
  installed = true;
  window.addEventListener('beforeunload', onBeforeUnload);
  window.addEventListener('pageshow', onPageShow);
  // Bubble phase on the document: runs after the islands' own handlers, which may have handled the click.
  document.addEventListener('click', onClick);
}

/** The page is about to go somewhere on purpose: do not ask. */
export function allowLeave(): void {
  leaving = true;
}

/** Answer to the held link: leave without saving. */
export function leaveNow(): void {
  const href = pendingHref;
  pendingHref = null;
  leaving = true;
  emit();
  if (href) window.location.assign(href);
}

/** Answer to the held link: stay on the page. */
export function stayHere(): void {
  pendingHref = null;
  emit();
}

/**
 * Save every form's pending edits, one after the other. Stops at the first form that could not save (its
 * own message says why: a field to fix, or someone else's change to compare) and names it.
 */
export async function flushUnsaved(): Promise<{ ok: true; saved: string[] } | { ok: false; label: string }> {
  const saved: string[] = [];
  for (const e of [...entries.values()]) {
    if (!e.dirty || !e.flush) continue;
    const r = await e.flush();
    if (r === 'failed') return { ok: false, label: e.label };
    if (r === 'saved') saved.push(e.label);
  }
  return { ok: true, saved };
}

function subscribe(l: () => void): () => void {
  listeners.add(l);
  return () => listeners.delete(l);
}
const getSnapshot = () => snapshot;
const serverSnapshot: UnsavedSnapshot = { dirtyLabels: [], savableLabels: [], pending: {}, pendingHref: null, host: null };

/** Read the store (re-renders when it changes). */
export function useUnsavedSnapshot(): UnsavedSnapshot {
  return useSyncExternalStore(subscribe, getSnapshot, () => serverSnapshot);
}

/**
 * Report a form's unsaved state. `id` is unique on the page; `flush` saves the pending edits (for steps);
 * `pending` are unsaved values other islands may show hints from.
 */
export function useUnsavedChanges(id: string, label: string, dirty: boolean, opts: { flush?: () => Promise<FlushResult>; pending?: Record<string, unknown> } = {}): void {
  const flushRef = useRef(opts.flush);
  flushRef.current = opts.flush;
  const pendingKey = JSON.stringify(dirty ? (opts.pending ?? {}) : {});
  const hasFlush = !!opts.flush;
  useEffect(() => {
    install();
    entries.set(id, { label, dirty, flush: hasFlush ? () => flushRef.current!() : null, pending: JSON.parse(pendingKey) as Record<string, unknown> });
    emit();
  }, [id, label, dirty, hasFlush, pendingKey]);
  useEffect(
    () => () => {
      entries.delete(id);
      emit();
    },
    [id],
  );
}

/** Take the host role for the leave question if nobody has it (the first LeavePrompt mounted shows it). */
export function useLeaveHost(): boolean {
  const me = useRef<symbol>(Symbol('leave-prompt'));
  const snap = useUnsavedSnapshot();
  useEffect(() => {
    install();
    if (host === null) {
      host = me.current;
      emit();
    }
  }, [snap.host]);
  useEffect(
    () => () => {
      if (host === me.current) {
        host = null;
        emit();
      }
    },
    [],
  );
  return snap.host === me.current;
}
