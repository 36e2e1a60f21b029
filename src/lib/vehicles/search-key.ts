/**
 * The search key of a vehicle: its registration and fleet number in upper case without separators, so that a plate
 * or fleet number typed without (or with other) dashes, spaces, dots or slashes still finds it ("GHQ4941J" and
 * "ghq 4941" find "GHQ-4941-J"). Stored in `vehicles.search_key` whenever a vehicle is written, so that the search
 * compares one short column instead of rewriting two per row (docs/benchmarks.md, bench:fleet).
 */

/** Characters dropped from plates, fleet numbers and the search text. */
const SEPARATORS = /[-\s./_]+/g;

/** Text without separators, upper case ("ghq-4941 j" → "GHQ4941J"). */
export function stripSeparators(text: string): string {
  return text.toUpperCase().replace(SEPARATORS, '');
}

/** The stored key: the stripped registration and fleet number, kept apart by a "|" so that a search cannot span both. */
export function vehicleSearchKey(registration: string | null | undefined, fleetNumber: string | null | undefined): string {
  return `${stripSeparators(registration ?? '')}|${stripSeparators(fleetNumber ?? '')}`;
}
