/** Keep an island's filter/sort/page state in the URL query string (shareable, survives reload). */
import { useCallback, useEffect, useState } from 'react';

/** Current query parameters as a plain object. */
export function readUrlParams(): Record<string, string> {
  if (typeof window === 'undefined') return {};
  return Object.fromEntries(new URLSearchParams(window.location.search));
}

/** State mirrored into the URL with history.replaceState; empty values are dropped. */
export function useUrlState(initial: Record<string, string> = {}) {
  const [state, setState] = useState<Record<string, string>>(() => ({ ...initial, ...readUrlParams() }));
  useEffect(() => {
    const sp = new URLSearchParams();
    for (const [k, v] of Object.entries(state)) if (v !== '' && v !== undefined) sp.set(k, v);
    const qs = sp.toString();
    const url = window.location.pathname + (qs ? `?${qs}` : '');
    if (url !== window.location.pathname + window.location.search) window.history.replaceState(null, '', url);
  }, [state]);
  const update = useCallback((patch: Record<string, string | undefined>, resetPage = true) => {
    setState((s) => {
      const next: Record<string, string> = { ...s };
      for (const [k, v] of Object.entries(patch)) {
        if (v === undefined || v === '') delete next[k];
        else next[k] = v;
      }
      if (resetPage && !('page' in patch)) delete next.page;
      return next;
    });
  }, []);
  return [state, update] as const;
}
