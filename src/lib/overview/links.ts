/**
 * Links from an Overview figure to the Defects list filtered to exactly the defects it counts. The keys are
 * the list's URL parameters (GET /api/defects takes the same ones).
 */
export type DefectLinkFilters = {
  mine?: boolean;
  open?: boolean;
  depot?: string;
  status?: string;
  module?: string;
  repeat?: boolean;
  olderThanDays?: number;
  reportedFrom?: string;
  reportedTo?: string;
  sort?: string;
};

const ORDER: (keyof DefectLinkFilters)[] = ['mine', 'open', 'depot', 'status', 'module', 'repeat', 'olderThanDays', 'reportedFrom', 'reportedTo', 'sort'];

/** `/defects?…` for a set of filters (true flags as `1`; absent or false ones left out). */
export function defectsHref(f: DefectLinkFilters): string {
  const sp = new URLSearchParams();
  for (const k of ORDER) {
    const v = f[k];
    if (v === undefined || v === false || v === '') continue;
    sp.set(k, v === true ? '1' : String(v));
  }
  const s = sp.toString();
  return s ? `/defects?${s}` : '/defects';
}
