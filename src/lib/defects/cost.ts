/**
 * Repair cost in minor currency units: parts (quantity × unit cost) plus labour at the configured hourly rate.
 * A part without a unit cost adds nothing; without a labour rate the cost is the parts alone.
 */

/** A part line as recorded on a defect. */
export interface PartLine {
  quantity: number;
  unitCostMinor: number | null;
}

/** Sum of quantity × unit cost over the lines that have a cost. */
export function partsTotalMinor(parts: readonly PartLine[]): number {
  return parts.reduce((s, p) => s + (p.unitCostMinor === null ? 0 : p.quantity * p.unitCostMinor), 0);
}

/** Labour minutes at a rate per hour, rounded to the nearest minor unit (half up). */
export function labourCostMinor(labourMinutes: number, ratePerHourMinor: number): number {
  return Math.round((labourMinutes * ratePerHourMinor) / 60);
}

/**
 * The defect's cost: parts plus labour when both the minutes and a rate are known; null when there is
 * nothing to count (no parts with a cost and no costed labour).
 */
export function repairCostMinor(parts: readonly PartLine[], labourMinutes: number | null, ratePerHourMinor: number | null): number | null {
  const costed = parts.some((p) => p.unitCostMinor !== null);
  const labour = labourMinutes !== null && ratePerHourMinor !== null ? labourCostMinor(labourMinutes, ratePerHourMinor) : null;
  if (!costed && labour === null) return null;
  return partsTotalMinor(parts) + (labour ?? 0);
}
