/**
 * Keep an island's filter/sort/page state in the URL query string (shareable, survives reload), with browser
 * history: each change a person makes is a history entry (pushState), so Back and Forward step through filters
 * and pages; the first canonical write and corrections the list makes by itself replace the entry instead.
 */
import { useCallback, useEffect, useRef, useState } from 'react';

/** Current query parameters as a plain object. */
export function readUrlParams(): Record<string, string> {
  if (typeof window === 'undefined') return {};
  return Object.fromEntries(new URLSearchParams(window.location.search));
}

/** Apply a patch to URL state: empty values are dropped, and the page goes back to 1 unless kept or given. */
export function patchUrlState(s: Record<string, string>, patch: Record<string, string | undefined>, resetPage: boolean): Record<string, string> {
  const next: Record<string, string> = { ...s };
  for (const [k, v] of Object.entries(patch)) {
    if (v === undefined || v === '') delete next[k];
    else next[k] = v;
  }
  if (resetPage && !('page' in patch)) delete next.page;
  return next;
}

/** The query string of a state (empty values dropped), with its leading `?` when not empty. */
export function urlStateSearch(state: Record<string, string>): string {
  const sp = new URLSearchParams();
  for (const [k, v] of Object.entries(state)) if (v !== '' && v !== undefined) sp.set(k, v);
  const qs = sp.toString();
  return qs ? `?${qs}` : '';
}

/** State mirrored into the URL; `update(patch, resetPage, { replace })` changes it. */
export function useUrlState(initial: Record<string, string> = {}) {
  const [state, setState] = useState<Record<string, string>>(() => ({ ...initial, ...readUrlParams() }));
  const pending = useRef<'push' | 'replace'>('replace');
  useEffect(() => {
    const url = window.location.pathname + urlStateSearch(state) + window.location.hash;
    if (url !== window.location.pathname + window.location.search + window.location.hash) {
      if (pending.current === 'push') window.history.pushState(null, '', url);
      else window.history.replaceState(null, '', url);
    }
    pending.current = 'replace';
  }, [state]);
  // Back / Forward: take the state from the URL the browser went to.
  useEffect(() => {
    const onPop = () => {
      pending.current = 'replace';
      setState(readUrlParams());
    };
    window.addEventListener('popstate', onPop);
    return () => window.removeEventListener('popstate', onPop);
  }, []);
  const update = useCallback((patch: Record<string, string | undefined>, resetPage = true, opts: { replace?: boolean } = {}) => {
    pending.current = opts.replace ? 'replace' : 'push';
    setState((s) => patchUrlState(s, patch, resetPage));
  }, []);
  return [state, update] as const;
}
