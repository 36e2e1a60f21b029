// Loads a fleet made by the seeded generator (src/lib/patterns/fleet-generator.ts) through the real CSV imports:
// depots, module types, vehicles and defects, so the API tests see it exactly as a customer's data.
import { generateFleet, type FleetGeneratorOptions, type GeneratedFleet } from '../../src/lib/patterns/fleet-generator';
import { importCsv } from './fleet';

const cell = (v: string | number | null | undefined) => {
  if (v === null || v === undefined) return '';
  const s = String(v);
  return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
};
const csv = (header: string[], rows: (string | number | null | undefined)[][]) => [header.join(','), ...rows.map((r) => r.map(cell).join(','))].join('\n') + '\n';

/** What was loaded: the generated fleet and the defect ref of each generated failure id. */
export type LoadedFleet = { fleet: GeneratedFleet; refOfFailure: Map<number, string>; skippedDuplicates: number };

/** Generate a fleet and import it; failures that share vehicle, time, door and module with an earlier one are skipped. */
export function loadGeneratedFleet(options: FleetGeneratorOptions): LoadedFleet {
  const fleet = generateFleet(options);
  importCsv(
    'depots',
    csv(
      ['code', 'name', 'region', 'coastal', 'rain_days_per_year', 'mean_rh_pct', 'wash_bay', 'inspection_slots_per_day', 'timezone'],
      fleet.depots.map((d) => [d.code, d.name, d.region, d.coastal ? 'yes' : 'no', d.rainDaysPerYear, d.meanRhPct, d.washBay ? 'yes' : 'no', d.inspectionSlotsPerDay, d.timezone]),
    ),
  );
  importCsv(
    'modules',
    csv(
      ['code', 'name', 'function'],
      fleet.modules.map((m) => [m.code, m.name, m.function]),
    ),
  );
  importCsv(
    'vehicles',
    csv(
      ['vin', 'fleet_number', 'body', 'build_date', 'in_service_date', 'retired_date', 'depot_code', 'parking', 'washes_per_month'],
      fleet.vehicles.map((v) => [v.vin, v.fleetNumber, v.body, v.buildMonth, v.inServiceDate, v.retiredDate, v.depotCode, v.parking, v.washesPerMonth]),
    ),
  );
  const vinOf = new Map(fleet.vehicles.map((v) => [v.id, v.vin]));
  const seen = new Set<string>();
  const refOfFailure = new Map<number, string>();
  const rows: (string | number | null)[][] = [];
  let skippedDuplicates = 0;
  for (const f of fleet.failures) {
    const key = `${f.vehicleId}|${f.reportedAt}|${f.position}|${f.moduleCode}`;
    if (seen.has(key)) {
      skippedDuplicates++;
      continue;
    }
    seen.add(key);
    const ref = `GF-${String(f.id).padStart(6, '0')}`;
    refOfFailure.set(f.id, ref);
    rows.push([ref, vinOf.get(f.vehicleId)!, f.reportedAt, f.position, f.moduleCode, f.moisture, f.rootCause]);
  }
  importCsv('defects', csv(['ref', 'vin', 'reported_at', 'position', 'module_code', 'moisture', 'root_cause'], rows));
  return { fleet, refOfFailure, skippedDuplicates };
}
