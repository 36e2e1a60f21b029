/**
 * Why a depot or module type cannot be deleted, in words, from the usage counts the list sends to people who may
 * delete them (the server refuses the same cases with 409: src/server/fleet.ts deleteDepot / deleteModule).
 * Null when nothing stands in the way.
 */
const n = (x: number, one: string, many = `${one}s`) => `${x.toLocaleString('en-GB')} ${x === 1 ? one : many}`;

/** Join "a", "a and b", "a, b and c". */
function listWords(parts: string[]): string {
  return parts.length <= 1 ? (parts[0] ?? '') : `${parts.slice(0, -1).join(', ')} and ${parts[parts.length - 1]}`;
}

/** The reason a depot cannot be deleted, or null. */
export function depotDeleteBlocker(usage: { vehicles: number; defects: number; people: number } | undefined): string | null {
  if (!usage) return null;
  const parts: string[] = [];
  if (usage.vehicles > 0) parts.push(n(usage.vehicles, 'vehicle'));
  if (usage.defects > 0) parts.push(n(usage.defects, 'defect'));
  if (usage.people > 0) parts.push(n(usage.people, 'person', 'people'));
  if (parts.length === 0) return null;
  return `This depot cannot be deleted: it still holds ${listWords(parts)} (retired vehicles and closed defects count too). Move them to another depot first.`;
}

/** The reason a module type cannot be deleted, or null. */
export function moduleDeleteBlocker(usage: { defects: number } | undefined): string | null {
  if (!usage || usage.defects === 0) return null;
  return `This module type cannot be deleted: ${n(usage.defects, 'defect is', 'defects are')} recorded against it.`;
}
