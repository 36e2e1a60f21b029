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
