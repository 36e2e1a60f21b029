// A small fleet whose Overview figures are known by construction (see the table in tests/api/overview.test.ts):
// two depots, four vehicles, eleven defects with fixed dates around a fixed "now" of 2026-06-15 12:00 UTC.
import { eq } from 'drizzle-orm';
import { getDb } from '../../src/db/client';
import { vehicles } from '../../src/db/schema';
import { addVehicle } from './fleet';
import { addDefects } from './defects';

/** The "now" the figures are worked out for. */
export const OVERVIEW_NOW = Date.UTC(2026, 5, 15, 12, 0);

const t = (s: string) => Date.parse(s);

/** Build the fleet on baseFleet() (call that first); `technicianId` is assigned D4. Returns the VINs and ref → id. */
export function buildOverviewFleet(technicianId: number) {
  const a = addVehicle('NTH');
  const b = addVehicle('NTH');
  const c = addVehicle('STH');
  const d = addVehicle('STH');
  getDb().update(vehicles).set({ offRoadSinceAt: t('2026-06-01T08:00:00Z') }).where(eq(vehicles.vin, b)).run();
  const ids = addDefects([
    // Vehicle a (NTH), front left window lifter three times: D2 repeats D1 (69 days after its repair), D3 repeats D2 (41 days).
    { ref: 'D1', vin: a, reportedAt: t('2025-05-10T09:00:00Z'), closedAt: t('2025-05-12T09:00:00Z'), position: 'FL', module: 'WLR-2' },
    { ref: 'D2', vin: a, reportedAt: t('2025-07-20T09:00:00Z'), closedAt: t('2025-07-22T09:00:00Z'), position: 'FL', module: 'WLR-2' },
    { ref: 'D3', vin: a, reportedAt: t('2025-09-01T09:00:00Z'), closedAt: t('2025-09-03T09:00:00Z'), position: 'FL', module: 'WLR-2' },
    { ref: 'D4', vin: a, reportedAt: t('2026-01-15T09:00:00Z'), position: 'FR', module: 'LCK-1', status: 'diagnosing', assignedToId: technicianId },
    // Vehicle b (NTH, off road): D6 repeats D5 (57 days).
    { ref: 'D5', vin: b, reportedAt: t('2026-03-03T09:00:00Z'), closedAt: t('2026-03-05T09:00:00Z'), position: 'RL', module: 'LCK-1' },
    { ref: 'D6', vin: b, reportedAt: t('2026-05-01T09:00:00Z'), position: 'RL', module: 'LCK-1', status: 'awaiting_parts' },
    // Vehicle c (STH): D8 an hour before the twelve-month window, D9 at its first instant.
    { ref: 'D7', vin: c, reportedAt: t('2026-06-01T09:00:00Z'), position: 'FL', module: 'WLR-2' },
    { ref: 'D8', vin: c, reportedAt: t('2025-06-30T23:00:00Z'), closedAt: t('2025-07-02T09:00:00Z'), position: 'TG', module: 'LCK-1' },
    { ref: 'D9', vin: c, reportedAt: t('2025-07-01T00:00:00Z'), closedAt: t('2025-07-03T09:00:00Z'), position: 'FL', module: 'WLR-2' },
    // Vehicle d (STH): one verified (still open) and one cancelled.
    { ref: 'D10', vin: d, reportedAt: t('2026-06-10T09:00:00Z'), position: 'FL', module: 'WLR-2', status: 'verified' },
    { ref: 'D11', vin: d, reportedAt: t('2026-02-10T09:00:00Z'), position: 'FR', module: 'WLR-2', status: 'cancelled' },
  ]);
  return { vins: { a, b, c, d }, ids };
}
