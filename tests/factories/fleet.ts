// Test data factories: depots, modules, vehicles, people and tokens through the real services.
import { computeVinCheckDigit } from '../../src/lib/vin/vin';
import { runImport } from '../../src/server/imports';
import { createToken, createUser } from '../../src/server/users';
import type { Role } from '../../src/lib/auth/permissions';

let serial = 0;

/** A valid VIN (non-North-American WMI "SXP", check digit computed). */
export function makeVin(n = ++serial, wmi = 'SXP'): string {
  const body = `${wmi}AB1CD0NK` + String(n).padStart(6, '0');
  return body.slice(0, 8) + computeVinCheckDigit(body) + body.slice(9);
}

/** Import CSV text as the CLI actor; throws when it fails. */
export function importCsv(kind: 'depots' | 'modules' | 'vehicles' | 'defects', csv: string) {
  const r = runImport(kind, csv, { dryRun: false, actor: { system: 'cli' } });
  if (r.errors.length) throw new Error(`factory import failed: ${JSON.stringify(r.errors)}`);
  return r;
}

/** Two depots (NTH wet coastal, STH dry), two module types. */
export function baseFleet() {
  importCsv(
    'depots',
    'code,name,region,coastal,rain_days_per_year,mean_rh_pct,wash_bay,inspection_slots_per_day,timezone\n' +
      'NTH,North Quay,Coast,yes,200,86,yes,2,Europe/London\n' +
      'STH,South Plain,Inland,no,70,55,no,1,Europe/London\n',
  );
  importCsv('modules', 'code,name,function,part_number,supplier\nWLR-2,Window lifter motor gen 2,window_lifter,PN-100,Acme Motors\nLCK-1,Lock actuator,lock_actuator,PN-200,\n');
}

/** Add a vehicle to a depot and return its VIN. */
export function addVehicle(depot: string, opts: { vin?: string; fleet?: string } = {}): string {
  const vin = opts.vin ?? makeVin();
  importCsv(
    'vehicles',
    `vin,fleet_number,build_date,in_service_date,depot_code,parking,washes_per_month\n${vin},${opts.fleet ?? 'F' + vin.slice(-4)},2022-11,2023-01-10,${depot},outdoor,4\n`,
  );
  return vin;
}

/** Create a person and return an API token for them. */
export async function personWithToken(role: Role, depots: string[] = [], email = `${role}-${++serial}@example.test`): Promise<{ token: string; id: number; email: string }> {
  const { id } = await createUser({ email, name: `${role} person`, role, password: 'correct horse battery', depots, allDepots: role === 'viewer' && depots.length === 0 }, { system: 'cli' });
  return { token: createToken(id, 'test', { system: 'cli' }).token, id, email };
}
