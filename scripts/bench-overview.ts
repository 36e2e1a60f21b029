/**
 * `npm run bench:overview [vehicles]`: a seeded fleet from the patterns fleet generator (default 100,000
 * vehicles, failures up to today) imported through the real import service into a fresh SQLite file (repeat
 * links computed by the app), recent defects left open in every status; then times the Overview aggregation per
 * role, the Defects list filters its links use, the CSV export of a large view, and a repeat-window preview.
 * Prints a table; numbers go in docs/benchmarks.md. Edit when the Overview gains a query.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';

const N = Number(process.argv[2] ?? 100_000);
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'seepline-bench-overview-'));
process.env.DATABASE_URL = path.join(dir, 'bench.db');
process.env.LOG_LEVEL = 'silent';

const { getDb, runMigrations, closeDb } = await import('../src/db/client');
const { defects } = await import('../src/db/schema');
const { runImport } = await import('../src/server/imports');
const { getOverview } = await import('../src/server/overview');
const { listDefects, listDefectsForExport } = await import('../src/server/defects');
const { updateSettings } = await import('../src/server/settings');
const { createUser } = await import('../src/server/users');
const { buildDefectsCsv } = await import('../src/lib/exports/defects-csv');
const { generateFleet } = await import('../src/lib/patterns/fleet-generator');
const { monthWindows } = await import('../src/lib/overview/windows');
const { sql } = await import('drizzle-orm');

const DAY_MS = 86_400_000;
const today = new Date().toISOString().slice(0, 10);
const nowMs = Date.parse(`${today}T12:00:00Z`);
const actor = { system: 'cli' as const };
const rows: Array<[string, string]> = [];
const yesNo = (b: boolean) => (b ? 'yes' : 'no');

runMigrations(getDb());
const fleet = generateFleet({ seed: 7, vehicleCount: N, asOf: today });

function must(kind: 'depots' | 'modules' | 'vehicles' | 'defects', csv: string) {
  const t = performance.now();
  const r = runImport(kind, csv, { dryRun: false, actor });
  if (r.errors.length) throw new Error(`${kind}: ${JSON.stringify(r.errors.slice(0, 3))}`);
  return { ms: performance.now() - t, inserted: r.inserted };
}

must(
  'depots',
  'code,name,region,coastal,rain_days_per_year,mean_rh_pct,wash_bay,inspection_slots_per_day,timezone\n' +
    fleet.depots.map((d) => [d.code, d.name, d.region, yesNo(d.coastal), d.rainDaysPerYear, d.meanRhPct, yesNo(d.washBay), d.inspectionSlotsPerDay, 'UTC'].join(',')).join('\n'),
);
must('modules', 'code,name,function\n' + fleet.modules.map((m) => [m.code, m.name, m.function].join(',')).join('\n'));
const depotCode = new Map(fleet.depots.map((d) => [d.id, d.code]));
const vehicleCsv =
  'vin,fleet_number,build_date,in_service_date,retired_date,depot_code,parking,washes_per_month\n' +
  fleet.vehicles.map((v) => [v.vin, v.fleetNumber, v.buildMonth, v.inServiceDate, v.retiredDate ?? '', depotCode.get(v.depotId), v.parking, v.washesPerMonth].join(',')).join('\n');
const vi = must('vehicles', vehicleCsv);
rows.push([`import ${N.toLocaleString('en-GB')} vehicles`, `${(vi.ms / 1000).toFixed(1)} s`]);

// Defects: closed a week after the report unless reported in the last six weeks (those stay open).
const vinOf = new Map(fleet.vehicles.map((v) => [v.id, v.vin]));
const moduleCode = new Map(fleet.modules.map((m) => [m.id, m.code]));
const openFrom = nowMs - 42 * DAY_MS;
const defectLines = fleet.failures.map((f, i) => {
  const reported = Date.parse(f.reportedAt.length === 10 ? `${f.reportedAt}T09:00:00Z` : f.reportedAt) + (i % 480) * 60_000;
  const closed = reported < openFrom ? new Date(reported + 7 * DAY_MS).toISOString() : '';
  return [`B-${i}`, vinOf.get(f.vehicleId), new Date(reported).toISOString(), f.position, moduleCode.get(f.moduleId), f.moisture ?? '', f.rootCause ?? '', closed].join(',');
});
const di = must('defects', 'ref,vin,reported_at,position,module_code,moisture,root_cause,closed_at\n' + defectLines.join('\n'));
rows.push([`import ${di.inserted.toLocaleString('en-GB')} defects (repeat links computed)`, `${(di.ms / 1000).toFixed(1)} s`]);

const tech = await createUser({ email: 'bench.tech@example.test', name: 'Bench Tech', role: 'technician', password: 'bench password 1', depots: [fleet.depots[0]!.code], allDepots: false }, actor);
const db = getDb();
db.run(sql`update defects set status = case id % 5 when 0 then 'reported' when 1 then 'diagnosing' when 2 then 'awaiting_parts' when 3 then 'repaired' else 'verified' end,
                             assigned_to_id = case when id % 3 = 0 then ${tech.id} end
           where closed_at is null`);
db.run(sql`update vehicles set off_road_since_at = ${nowMs} where id % 97 = 0`);
const counts = db.get<{ n: number; open: number; repeats: number }>(
  sql`select count(*) as n, sum(status not in ('closed','cancelled')) as open, sum(repeat_of_id is not null) as repeats from ${defects}`,
);
rows.push(['defects / open / repeats', `${counts.n.toLocaleString('en-GB')} / ${counts.open.toLocaleString('en-GB')} / ${counts.repeats.toLocaleString('en-GB')}`]);

const manager = { id: 0, email: 'bench', name: 'bench', role: 'manager' as const, depotIds: null, via: 'token' as const };
const supervisor = { ...manager, role: 'supervisor' as const, depotIds: [1, 2] };
const technician = { ...manager, id: tech.id, role: 'technician' as const, depotIds: [1] };
const windowFrom = monthWindows(nowMs, 12)[0]!.from;

function median(fn: () => unknown, runs = 7): number {
  fn();
  const t: number[] = [];
  for (let i = 0; i < runs; i++) {
    const s = performance.now();
    fn();
    t.push(performance.now() - s);
  }
  return t.sort((a, b) => a - b)[runs >> 1]!;
}
const timings: Array<[string, () => unknown, number?]> = [
  ['Overview, manager (every depot)', () => getOverview(manager, nowMs)],
  ['Overview, supervisor (2 depots)', () => getOverview(supervisor, nowMs)],
  ['Overview, technician (1 depot, own work)', () => getOverview(technician, nowMs)],
  ['list open=1&olderThanDays=30', () => listDefects(manager, { open: '1', olderThanDays: 30 }, nowMs)],
  ['list repeat=1&reportedFrom=<window>&depot=…', () => listDefects(manager, { repeat: '1', reportedFrom: windowFrom, depot: fleet.depots[0]!.code }, nowMs)],
  ['list depot=…&status=diagnosing', () => listDefects(manager, { depot: fleet.depots[0]!.code, status: 'diagnosing' }, nowMs)],
  ['list mine=1&open=1 (technician)', () => listDefects(technician, { mine: '1', open: '1' }, nowMs)],
  ['CSV export of every defect (query + CSV text)', () => buildDefectsCsv(listDefectsForExport(manager, {}, nowMs)), 3],
  ['repeat window 90 → 60 days, dry run (full recompute)', () => updateSettings({ repeatWindowDays: 60 }, actor, { dryRun: true }), 3],
];
for (const [label, fn, runs] of timings) rows.push([label, `median ${median(fn, runs ?? 7).toFixed(1)} ms`]);
rows.push(['CSV size of every defect', `${(buildDefectsCsv(listDefectsForExport(manager, {}, nowMs)).length / 1e6).toFixed(1)} MB`]);
rows.push(['peak RSS', `${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`]);
closeDb();
fs.rmSync(dir, { recursive: true, force: true });
const w = Math.max(...rows.map((r) => r[0].length));
console.log(`node ${process.version}, load average ${os.loadavg().map((l) => l.toFixed(1)).join(' ')}`);
for (const [a, b] of rows) console.log(`${a.padEnd(w)}  ${b}`);
