/**
 * The doors of a vehicle in the one order every screen lists them: the order of the door plan, front to rear
 * and left before right (FL, FR, SL, SR, RL, RR), then the tailgate or rear doors (TG). The import format
 * (CONTRACT.md) names the same seven codes in another order; that order is only the file format's.
 */
export const DOOR_ORDER = ['FL', 'FR', 'SL', 'SR', 'RL', 'RR', 'TG'] as const;

/** A door position code. */
export type DoorCode = (typeof DOOR_ORDER)[number];

/** Sort door codes (or anything with a door code) into the plan order; unknown codes go last, in their order. */
export function sortByDoor<T>(items: readonly T[], door: (item: T) => string = (x) => String(x)): T[] {
  const rank = (c: string) => {
    const i = (DOOR_ORDER as readonly string[]).indexOf(c);
    return i < 0 ? DOOR_ORDER.length : i;
  };
  return items
    .map((item, i) => ({ item, i }))
    .sort((a, b) => rank(door(a.item)) - rank(door(b.item)) || a.i - b.i)
    .map((x) => x.item);
}

/** What a door tile shows: defects on the door, how many are open, repeats, and how many found moisture. */
export type DoorCount = { total: number; open: number; repeats: number; water: number };

const WET = new Set(['traces', 'corrosion', 'standing_water']);

/** Count a vehicle's defects per door ("water" = moisture traces, corrosion or standing water found). */
export function countByDoor(items: ReadonlyArray<{ position: string; open: boolean; repeat: boolean; moisture: string | null }>): Record<string, DoorCount> {
  const counts: Record<string, DoorCount> = {};
  for (const d of items) {
    const c = (counts[d.position] ??= { total: 0, open: 0, repeats: 0, water: 0 });
    c.total++;
    if (d.open) c.open++;
    if (d.repeat) c.repeats++;
    if (d.moisture && WET.has(d.moisture)) c.water++;
  }
  return counts;
}
