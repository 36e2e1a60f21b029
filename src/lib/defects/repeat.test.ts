import { describe, expect, it } from 'vitest';
import { computeRepeats } from './repeat';

const DAY = 86_400_000;
const t0 = Date.UTC(2026, 0, 1);
const base = { vehicleId: 1, position: 'FL', moduleFunction: 'window_lifter' };

// The 90-day window is the product's rule (PRODUCT/issue text), a common-practice comeback window.
describe('computeRepeats', () => {
  const earlier = { ...base, id: 1, reportedAt: t0 - 5 * DAY, closedAt: t0 };
  it.each([
    [89, 1],
    [90, 1],
    [91, null],
  ])('a defect %i days after the earlier one closed -> repeat of %s', (days, expected) => {
    const later = { ...base, id: 2, reportedAt: t0 + days * DAY, closedAt: null };
    expect(computeRepeats([earlier, later]).get(2)).toBe(expected);
  });
  it('another door is not a repeat', () => {
    const later = { ...base, id: 2, position: 'FR', reportedAt: t0 + 10 * DAY, closedAt: null };
    expect(computeRepeats([earlier, later]).get(2)).toBeNull();
  });
  it('another module function on the same door is not a repeat', () => {
    const later = { ...base, id: 2, moduleFunction: 'lock_actuator', reportedAt: t0 + 10 * DAY, closedAt: null };
    expect(computeRepeats([earlier, later]).get(2)).toBeNull();
  });
  it('an earlier defect that is still open does not make a repeat', () => {
    const open = { ...earlier, closedAt: null };
    const later = { ...base, id: 2, reportedAt: t0 + 10 * DAY, closedAt: null };
    expect(computeRepeats([open, later]).get(2)).toBeNull();
  });
  it('links to the most recently closed of several', () => {
    const a = { ...base, id: 1, reportedAt: t0 - 60 * DAY, closedAt: t0 - 50 * DAY };
    const b = { ...base, id: 2, reportedAt: t0 - 20 * DAY, closedAt: t0 - 10 * DAY };
    const c = { ...base, id: 3, reportedAt: t0, closedAt: null };
    const r = computeRepeats([c, a, b]);
    expect(r.get(3)).toBe(2);
    expect(r.get(2)).toBe(1);
    expect(r.get(1)).toBeNull();
  });
  it('honours a configured window', () => {
    const later = { ...base, id: 2, reportedAt: t0 + 40 * DAY, closedAt: null };
    expect(computeRepeats([earlier, later], 30).get(2)).toBeNull();
    expect(computeRepeats([earlier, later], 45).get(2)).toBe(1);
  });
  it('counts whole days to the millisecond: 90 days after closing is in, one millisecond more is out', () => {
    const at = (ms: number) => computeRepeats([earlier, { ...base, id: 2, reportedAt: t0 + ms, closedAt: null }]).get(2);
    expect(at(90 * DAY)).toBe(1);
    expect(at(90 * DAY + 1)).toBeNull();
  });
  it('a defect reported before the earlier one was closed is not its repeat', () => {
    const later = { ...base, id: 2, reportedAt: t0 - DAY, closedAt: null };
    expect(computeRepeats([earlier, later]).get(2)).toBeNull();
  });
  it('a cancelled earlier defect is no earlier repair, and a cancelled later one is no repeat', () => {
    const cancelledEarlier = { ...earlier, cancelled: true };
    const later = { ...base, id: 2, reportedAt: t0 + 10 * DAY, closedAt: null };
    expect(computeRepeats([cancelledEarlier, later]).get(2)).toBeNull();
    expect(computeRepeats([earlier, { ...later, cancelled: true }]).get(2)).toBeNull();
  });
  it('another vehicle is not a repeat', () => {
    const later = { ...base, id: 2, vehicleId: 2, reportedAt: t0 + 10 * DAY, closedAt: null };
    expect(computeRepeats([earlier, later]).get(2)).toBeNull();
  });
  it('gives nothing for an empty list', () => {
    expect(computeRepeats([]).size).toBe(0);
  });
});
