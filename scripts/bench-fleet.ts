/**
 * `npm run bench:fleet`: imports a generated 100,000-vehicle CSV into a fresh SQLite file through the real
 * import service, re-imports it (all unchanged), then times the vehicle list queries the Vehicles screen makes.
 * Prints a table; numbers go in docs/benchmarks.md.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';

const N = Number(process.argv[2] ?? 100_000);
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'seepline-bench-'));
process.env.DATABASE_URL = path.join(dir, 'bench.db');
process.env.LOG_LEVEL = 'silent';

const { getDb, runMigrations, closeDb } = await import('../src/db/client');
const { runImport } = await import('../src/server/imports');
const { listVehicles } = await import('../src/server/fleet');
const { computeVinCheckDigit } = await import('../src/lib/vin/vin');

runMigrations(getDb());
const actor = { system: 'cli' as const };
const depotCodes = ['AAA', 'BBB', 'CCC', 'DDD', 'EEE', 'FFF', 'GGG', 'HHH'];
runImport(
  'depots',
  'code,name,coastal,rain_days_per_year,mean_rh_pct,wash_bay\n' + depotCodes.map((c, i) => `${c},Depot ${c},${i % 2 ? 'yes' : 'no'},${60 + i * 20},${55 + i * 4},yes`).join('\n'),
  { dryRun: false, actor },
);

const lines = ['vin,fleet_number,registration,make,model,body,build_date,in_service_date,depot_code,parking,washes_per_month'];
const parking = ['indoor', 'outdoor', 'mixed'];
for (let i = 0; i < N; i++) {
  const body = `SBN${'ABCDEFGH'[i % 8]}K2D90${'MNPR'[i % 4]}A${String(i).padStart(6, '0')}`;
  const vin = body.slice(0, 8) + computeVinCheckDigit(body) + body.slice(9);
  const y = 2021 + (i % 4);
  const m = String(1 + (i % 12)).padStart(2, '0');
  // Registrations as plates are written, with dashes ("CCC-0999-D"), so that a search typed without them is measured.
  const plate = `${depotCodes[i % 8]}-${String(i % 10_000).padStart(4, '0')}-${'ABCDEFGHJK'[Math.floor(i / 10_000) % 10]}`;
  lines.push(`${vin},F${String(i).padStart(6, '0')},${plate},Make${i % 5},Model${i % 9},van,${y}-${m},${y}-${m}-20,${depotCodes[i % 8]},${parking[i % 3]},${i % 9}`);
}
const csv = lines.join('\n') + '\n';

function time<T>(label: string, fn: () => T): { r: T; ms: number } {
  const t = performance.now();
  const r = fn();
  const ms = performance.now() - t;
  return { r, ms };
}

const rows: Array<[string, string]> = [];
const first = time('import', () => runImport('vehicles', csv, { dryRun: false, actor }));
rows.push([`import ${N.toLocaleString('en-GB')} vehicles (${(csv.length / 1e6).toFixed(1)} MB)`, `${first.ms.toFixed(0)} ms, inserted ${first.r.inserted}`]);
const again = time('reimport', () => runImport('vehicles', csv, { dryRun: false, actor }));
rows.push(['re-import, all unchanged', `${again.ms.toFixed(0)} ms, unchanged ${again.r.unchanged}`]);
const dry = time('dry', () => runImport('vehicles', csv, { dryRun: true, actor }));
rows.push(['dry run of the same file', `${dry.ms.toFixed(0)} ms`]);

const user = { id: 0, email: 'bench', name: 'bench', role: 'manager' as const, depotIds: null, via: 'token' as const };
const scoped = { ...user, role: 'supervisor' as const, depotIds: [1, 2] };
const queries: Array<[string, () => unknown]> = [
  ['list page 1 (default sort)', () => listVehicles(user, {})],
  ['list sort -buildDate, page 1000', () => listVehicles(user, { sort: '-buildDate', page: 1000, pageSize: 50 })],
  ['list search q=F0999', () => listVehicles(user, { q: 'F0999' })],
  ['list search q=DDD0999D (a plate typed without dashes)', () => listVehicles(user, { q: 'DDD0999D' })],
  ['list search q=DDD0999D, one depot', () => listVehicles(scoped, { q: 'DDD0999D' })],
  ['list depot=CCC, parking=outdoor', () => listVehicles(user, { depot: 'CCC', parking: 'outdoor' })],
  ['list 2-depot scope, pageSize 200', () => listVehicles(scoped, { pageSize: 200 })],
  ['list sort by open defects', () => listVehicles(user, { sort: '-openDefects' })],
];
for (const [label, fn] of queries) {
  fn();
  const times: number[] = [];
  for (let i = 0; i < 5; i++) times.push(time(label, fn).ms);
  times.sort((a, b) => a - b);
  rows.push([label, `median ${times[2]!.toFixed(1)} ms`]);
}
rows.push(['peak RSS', `${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`]);
closeDb();
fs.rmSync(dir, { recursive: true, force: true });
const w = Math.max(...rows.map((r) => r[0].length));
for (const [a, b] of rows) console.log(`${a.padEnd(w)}  ${b}`);
