/**
 * The safety cautions of PRODUCT.md, in one place for the server-rendered SafetyCautions.astro and the
 * islands' SafetyCautions.tsx, so that both say exactly the same.
 */

/** Each caution as one sentence or two. */
export const SAFETY_CAUTIONS = [
  "Doors can hold airbag and side-impact sensor wiring. Follow the vehicle maker's procedure before you remove trims or disconnect connectors.",
  'Back-probe connectors; never pierce wire insulation — the hole lets water in.',
  "After window-lifter or door-module work, re-initialise the window as the maker's procedure says, and check that automatic closing reverses on an obstruction before the vehicle is released. Regulations such as FMVSS No. 118 and UNECE Regulation No. 21 set a 100 N limit on closing force.",
  "Seepline records the verification; it certifies nothing. Defer to the maker's service information, local regulations and licensed practice.",
] as const;

/** Headings per step of the work. */
export const CAUTION_HEADINGS = {
  diagnosis: 'Before and after work on this door',
  closing: 'Before the vehicle is released',
} as const;
