// Child process for the concurrent-reports test: reports N defects on one vehicle through the real service,
// on the database named by DATABASE_URL, as fast as it can, and prints the refs it got as JSON.
// Usage: node --import tsx tests/api/helpers/report-many.ts VIN COUNT REPORTED_AT
import { createDefect } from '../../../src/server/defect-record';

const [vin, countText, reportedAt] = process.argv.slice(2);
const user = { id: 0, email: 'child@example.test', name: 'child', role: 'admin' as const, depotIds: null, via: 'token' as const };
const refs: string[] = [];
const positions = ['FL', 'FR', 'SL', 'SR', 'RL', 'RR', 'TG'] as const;
for (let i = 0; i < Number(countText); i++) {
  // A distinct minute per defect so that no two are the same (vehicle, time, door, module).
  const at = new Date(Date.parse(reportedAt!) + (process.pid % 1000) * 3_600_000 + i * 60_000).toISOString();
  const d = createDefect(user, { vin: vin!, position: positions[i % positions.length]!, moduleCode: 'LCK-1', reportedAt: at }, { system: 'cli' });
  refs.push(d.ref);
}
process.stdout.write(JSON.stringify(refs));
