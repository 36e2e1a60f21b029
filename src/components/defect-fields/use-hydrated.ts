/** True once the island runs in the browser: forms stay disabled until then, so nothing typed early is lost. */
import { useEffect, useState } from 'react';

/** Whether the component has hydrated. */
export function useHydrated(): boolean {
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);
  return ready;
}
