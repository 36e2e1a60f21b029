/**
 * The Defects list's state, kept in the URL with browser history: each change a person makes is a history
 * entry (pushState), so Back and Forward step through filters and pages, and a shared or reloaded link shows
 * the same view. Corrections the list makes by itself (a page past the end) replace the entry instead.
 */
import { useCallback, useEffect, useRef, useState } from 'react';
import { applyDefectPatch, defectStateToSearch, searchToDefectState, type DefectListState } from './list-state';

/** State and an updater; `push: false` replaces the history entry, `resetPage: false` keeps the page. */
export function useDefectListUrl(initial: DefectListState) {
  const [state, setState] = useState<DefectListState>(initial);
  const pending = useRef<'push' | 'replace'>('replace');

  // Write the state into the URL after each change (replace on the first render: the canonical form of the landing URL).
  useEffect(() => {
    const url = window.location.pathname + defectStateToSearch(state) + window.location.hash;
    const here = window.location.pathname + window.location.search + window.location.hash;
    if (url !== here) {
      if (pending.current === 'push') window.history.pushState(null, '', url);
      else window.history.replaceState(null, '', url);
    }
    pending.current = 'replace';
  }, [state]);

  // Back / Forward: take the state from the URL the browser went to.
  useEffect(() => {
    const onPop = () => {
      pending.current = 'replace';
      setState(searchToDefectState(window.location.search));
    };
    window.addEventListener('popstate', onPop);
    return () => window.removeEventListener('popstate', onPop);
  }, []);

  const update = useCallback((patch: Record<string, string | undefined>, opts: { push?: boolean; resetPage?: boolean } = {}) => {
    pending.current = opts.push === false ? 'replace' : 'push';
    setState((s) => applyDefectPatch(s, patch, opts.resetPage ?? true));
  }, []);

  return [state, update] as const;
}
