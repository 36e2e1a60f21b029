/**
 * Sanity check of the demo scenario: seeds a throw-away database and prints counts, VIN checks, statuses and
 * the planted stories' failure rates computed by SQL. Run with `npx tsx seed/check-demo.ts [seed] [today]`.
 * Edit when the scenario gains a story worth checking.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { openDb, runMigrations } from '../src/db/client';
import { verifyPassword } from '../src/server/passwords';
import { seedDemo } from './demo';
import { DEMO_SIGN_INS } from './demo-data';
import { DEFAULT_SEED, DEFAULT_TODAY, generateDemoData } from './generate';

const seed = process.argv[2] ? Number(process.argv[2]) : DEFAULT_SEED;
const today = process.argv[3] ?? DEFAULT_TODAY;

// An independent VIN check (not the generator's), tried first on the well-known valid example 1M8GDM9AXKP042788.
function checkDigitOf(vin: string): string {
  const map = 'ABCDEFGHJKLMNPRSTUVWXYZ';
  const vals = [1, 2, 3, 4, 5, 6, 7, 8, 1, 2, 3, 4, 5, 7, 9, 2, 3, 4, 5, 6, 7, 8, 9];
  const w = [8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2];
  let s = 0;
  for (let i = 0; i < 17; i++) {
    const c = vin[i] ?? '';
    const v = c >= '0' && c <= '9' ? Number(c) : vals[map.indexOf(c)];
    if (v === undefined) return '?';
    s += v * (w[i] ?? 0);
  }
  return s % 11 === 10 ? 'X' : String(s % 11);
}
if (checkDigitOf('1M8GDM9AXKP042788') !== 'X') throw new Error('VIN checker self-test failed');

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'seepline-seed-'));
const file = path.join(dir, 'demo.db');
const db = openDb(file);
runMigrations(db);

const t0 = performance.now();
const summary = await seedDemo(db, { seed, today });
const seedMs = performance.now() - t0;
console.log('summary', summary, `seedDemo ${seedMs.toFixed(0)} ms`);

try {
  await seedDemo(db, { seed, today });
  console.log('SECOND SEED DID NOT REFUSE');
  process.exitCode = 1;
} catch (e) {
  console.log('second seed refused:', (e as Error).message);
}

const t1 = performance.now();
const a = JSON.stringify(generateDemoData({ seed, today }));
const b = JSON.stringify(generateDemoData({ seed, today }));
const c = JSON.stringify(generateDemoData({ seed: seed + 1, today }));
const h = (s: string): string => crypto.createHash('sha256').update(s).digest('hex').slice(0, 16);
console.log(`deterministic: ${a === b} (${h(a)}), other seed differs: ${a !== c}, generate x3 ${(performance.now() - t1).toFixed(0)} ms`);

const q = db.$client;
const all = <T>(sql: string, ...params: unknown[]): T[] => q.prepare(sql).all(...params) as T[];
const one = <T>(sql: string, ...params: unknown[]): T => q.prepare(sql).get(...params) as T;

for (const t of ['depots', 'modules', 'users', 'user_depots', 'vehicles', 'defects', 'defect_codes', 'defect_parts', 'defect_transitions', 'audit_log']) {
  console.log(`rows ${t}: ${one<{ n: number }>(`select count(*) n from ${t}`).n}`);
}

// VINs.
const vins = all<{ vin: string; model_year: number; build_date: string }>('select vin, model_year, build_date from vehicles');
const yearCodes = 'ABCDEFGHJKLMNPRSTVWXY123456789';
const bad = vins.filter(
  (v) =>
    !/^[A-HJ-NPR-Z0-9]{17}$/.test(v.vin) ||
    checkDigitOf(v.vin) !== v.vin[8] ||
    yearCodes[v.model_year - 2010] !== v.vin[9] ||
    Number(v.build_date.slice(0, 4)) !== v.model_year ||
    !/[A-Z]/.test(v.vin[6] ?? '') ||
    /^[1-5]/.test(v.vin),
);
console.log(`VINs: ${vins.length}, invalid: ${bad.length}`, bad.slice(0, 3));
// The app's own parsers, when they are there: no VIN warnings, model year decoded, every DTC accepted.
try {
  const { parseVin } = await import('../src/lib/vin/vin');
  const { parseDtcList } = await import('../src/lib/dtc/dtc');
  let vinIssues = 0;
  for (const v of vins) {
    const r = parseVin(v.vin);
    if (!r.ok || r.warnings.length > 0 || !r.checkDigit.valid || r.modelYear !== v.model_year) vinIssues++;
  }
  const codes = all<{ dtcs: string }>('select distinct dtcs from defects where dtcs is not null');
  const badCodes = codes.filter((c) => {
    const r = parseDtcList(c.dtcs);
    return !r.ok || r.codes.map((x) => x.display).join(' ') !== c.dtcs;
  });
  const mismatchRows = one<{ n: number }>(
    `select count(*) n from defects f where f.dtcs is not null and f.dtcs != (select group_concat(x, ' ') from (select code || coalesce('-' || failure_type, '') x from defect_codes c where c.defect_id = f.id order by seq))`,
  ).n;
  console.log(`app parsers: VINs with issues ${vinIssues}; distinct dtcs ${codes.length}, rejected/not normalised ${badCodes.length}; defect_codes mismatches ${mismatchRows}`);
} catch (e) {
  console.log('app parsers not run:', (e as Error).message);
}
console.log('build months', one('select min(build_month) lo, max(build_month) hi from vehicles'));
console.log('in service', one('select min(in_service_date) lo, max(in_service_date) hi, sum(retired_date is not null) retired from vehicles'));
console.log('defects reported', one(`select date(min(reported_at)/1000,'unixepoch') lo, date(max(reported_at)/1000,'unixepoch') hi from defects`));

// Sign-ins.
for (const s of DEMO_SIGN_INS) {
  const u = one<{ password_hash: string; depots: string | null; all_depots: number }>(
    `select password_hash, all_depots, (select group_concat(d.code) from user_depots ud join depots d on d.id = ud.depot_id where ud.user_id = users.id) depots from users where email = ?`,
    s.email,
  );
  console.log(`sign-in ${s.role} ${s.email} ok=${await verifyPassword(u.password_hash, s.password)} depots=${u.all_depots ? 'all' : u.depots}`);
}

// Statuses and open work.
console.log('statuses', all('select status, count(*) n from defects group by status order by n desc'));
const recentFrom = Date.parse(`${today}T00:00:00Z`) - 42 * 86_400_000;
console.log('last 42 days', all('select status, count(*) n from defects where reported_at >= ? group by status order by n desc', recentFrom));
console.log(
  'open per depot',
  all(`select d.code, count(*) n from defects f join depots d on d.id = f.depot_id where f.status not in ('closed','cancelled') group by d.code order by d.code`),
);
console.log('off road', one('select count(*) n from vehicles where off_road_since_at is not null'));
console.log('closing days', one(`select round(avg((closed_at - reported_at)/86400000.0),1) mean, round(max((closed_at - reported_at)/86400000.0),1) max from defects where status = 'closed'`));

// Failure rates per vehicle-year, by SQL. Exposure: in service until retired or today.
const data = generateDemoData({ seed, today });
const planted = data.planted;
q.prepare('create temp table exposure as select id, (julianday(min(coalesce(retired_date, ?), ?)) - julianday(in_service_date)) / 365.25 years from vehicles').run(today, today);
const fitted = (code: string): string =>
  `(v.make || ' ' || v.model) in (${(planted.fitment[code] ?? []).map((m) => `'${m.replace(/'/g, "''")}'`).join(',')})`;

interface RateRow { vehicles: number; years: number; failures: number; moist: number; water: number; repeatVehicles: number; rate: number }
function rate(code: string, where: string, fleetWide = false): RateRow {
  const r = one<Omit<RateRow, 'rate'>>(
    `select count(*) vehicles, coalesce(sum(e.years),0) years,
            coalesce(sum((select count(*) from defects f where f.vehicle_id = v.id and f.module_id = m.id and f.status != 'cancelled')),0) failures,
            coalesce(sum((select count(*) from defects f where f.vehicle_id = v.id and f.module_id = m.id and f.status != 'cancelled' and f.moisture in ('traces','corrosion','standing_water'))),0) moist,
            coalesce(sum((select count(*) from defects f where f.vehicle_id = v.id and f.module_id = m.id and f.root_cause = 'water_ingress')),0) water,
            coalesce(sum(exists(select 1 from defects f where f.vehicle_id = v.id and f.module_id = m.id and f.repeat_of_id is not null)),0) repeatVehicles
       from vehicles v join exposure e on e.id = v.id join depots d on d.id = v.depot_id join modules m on m.code = ?
      where ${fleetWide ? '1' : fitted(code)} and (${where})`,
    code,
  );
  return { ...r, rate: r.years ? r.failures / r.years : 0 };
}
function show(label: string, r: RateRow, base?: RateRow): void {
  const ratio = base && base.rate ? ` ratio ${(r.rate / base.rate).toFixed(2)}` : '';
  console.log(
    `${label.padEnd(58)} vehicles ${String(r.vehicles).padStart(4)}  veh-years ${r.years.toFixed(1).padStart(7)}  failures ${String(r.failures).padStart(4)}  rate ${r.rate.toFixed(3)}/vy${ratio}  moisture ${r.moist}  water_ingress ${r.water}  repeat vehicles ${r.repeatVehicles}`,
  );
}

const w = planted.water;
const inRange = `v.build_month between '${w.buildFrom}' and '${w.buildTo}'`;
const wet = `d.code in (${w.depots.map((x) => `'${x}'`).join(',')})`;
console.log(`\nWater story: ${w.moduleCode}, builds ${w.buildFrom}..${w.buildTo}, depots ${w.depots.join('+')}, parking ${w.parking}; fitted to ${planted.fitment[w.moduleCode]?.join(', ')}`);
const cohort = rate(w.moduleCode, `${inRange} and ${wet} and v.parking = 'outdoor'`);
const rest = rate(w.moduleCode, `not (${inRange} and ${wet} and v.parking = 'outdoor')`);
const fleet = rate(w.moduleCode, '1');
show('cohort (range, wet depots, outdoor)', cohort, rest);
show('rest of fitted fleet', rest);
show('all fitted', fleet);
show('range, wet depots, mixed parking', rate(w.moduleCode, `${inRange} and ${wet} and v.parking = 'mixed'`), rest);
show('range, wet depots, indoor', rate(w.moduleCode, `${inRange} and ${wet} and v.parking = 'indoor'`), rest);
show('range, wet depots, any parking', rate(w.moduleCode, `${inRange} and ${wet}`), rate(w.moduleCode, `not (${inRange} and ${wet})`));
show('range, other depots', rate(w.moduleCode, `${inRange} and not ${wet}`), rest);
show('wet depots, outdoor, outside range', rate(w.moduleCode, `not ${inRange} and ${wet} and v.parking = 'outdoor'`), rest);
const cohortAll = rate(w.moduleCode, `${inRange} and ${wet} and v.parking = 'outdoor'`, true);
const restAll = rate(w.moduleCode, `not (${inRange} and ${wet} and v.parking = 'outdoor')`, true);
show('fleet-wide exposure (no fitment): cohort', cohortAll, restAll);
show('fleet-wide exposure (no fitment): rest', restAll);
console.log('cohort DTCs', all(`select f.dtcs, count(*) n from defects f join vehicles v on v.id = f.vehicle_id join depots d on d.id = v.depot_id join modules m on m.id = f.module_id where m.code = ? and ${inRange} and ${wet} and v.parking = 'outdoor' group by f.dtcs order by n desc`, w.moduleCode));
console.log('cohort positions', all(`select f.position, count(*) n from defects f join vehicles v on v.id = f.vehicle_id join depots d on d.id = v.depot_id join modules m on m.id = f.module_id where m.code = ? and ${inRange} and ${wet} and v.parking = 'outdoor' group by f.position`, w.moduleCode));

const mb = planted.mirror;
const mRange = `v.build_month between '${mb.buildFrom}' and '${mb.buildTo}'`;
console.log(`\nMirror batch: ${mb.moduleCode}, builds ${mb.buildFrom}..${mb.buildTo}, every depot`);
const mCohort = rate(mb.moduleCode, mRange);
const mRest = rate(mb.moduleCode, `not ${mRange}`);
show('batch', mCohort, mRest);
show('rest', mRest);
console.log('batch root causes', all(`select f.root_cause, f.moisture, count(*) n from defects f join vehicles v on v.id = f.vehicle_id join modules m on m.id = f.module_id where m.code = ? and ${mRange} group by 1,2 order by n desc`, mb.moduleCode));

console.log('\nBaseline per module type (fitted exposure, outside the planted cohorts):');
for (const m of data.modules) {
  const excl = m.code === w.moduleCode ? `not (${inRange} and ${wet})` : m.code === mb.moduleCode ? `not ${mRange}` : '1';
  show(`  ${m.code}`, rate(m.code, excl));
}
console.log('\nroot causes overall', all('select root_cause, count(*) n from defects group by root_cause order by n desc'));
console.log('moisture overall', all('select moisture, count(*) n from defects group by moisture order by n desc'));
console.log('refs unique', one('select count(distinct ref) = count(*) ok, min(ref) lo, max(ref) hi from defects'));
console.log('sample vehicles', all('select vin, fleet_number, registration, make, model, build_date, in_service_date, parking, washes_per_month from vehicles where id in (1, 300, 600)'));

// The patterns engine (src/lib/patterns) on the seeded rows, when it is there.
try {
  const { computePatternsReport } = await import('../src/lib/patterns/report');
  const t2 = performance.now();
  const report = computePatternsReport(
    {
      vehicles: all<{ id: number; vin: string; buildMonth: string; inServiceDate: string; retiredDate: string | null; depotId: number; parking: 'indoor' | 'outdoor' | 'mixed'; washesPerMonth: number }>(
        'select id, vin, build_month buildMonth, in_service_date inServiceDate, retired_date retiredDate, depot_id depotId, parking, washes_per_month washesPerMonth from vehicles',
      ),
      depots: all<{ id: number; code: string; coastal: number; rainDaysPerYear: number; meanRhPct: number; washBay: number }>(
        'select id, code, coastal, rain_days_per_year rainDaysPerYear, mean_rh_pct meanRhPct, wash_bay washBay from depots',
      ).map((d) => ({ ...d, coastal: d.coastal === 1, washBay: d.washBay === 1 })),
      modules: all<{ id: number; code: string; function: string }>('select id, code, function from modules'),
      failures: all<{ id: number; vehicleId: number; moduleId: number; reportedAt: number; moisture: 'none' | 'traces' | 'corrosion' | 'standing_water' | null; rootCause: string | null }>(
        `select id, vehicle_id vehicleId, module_id moduleId, reported_at reportedAt, moisture, root_cause rootCause from defects where status != 'cancelled'`,
      ).map((f) => ({ ...f, reportedAt: new Date(f.reportedAt).toISOString() })),
    },
    { asOf: today },
  );
  console.log(`\npatterns engine (${(performance.now() - t2).toFixed(0)} ms): ${report.cohorts.length} cohorts tested, ${report.cohorts.filter((x) => x.significant).length} significant`);
  for (const x of report.cohorts.slice(0, 8)) {
    console.log(
      `  ${x.id.padEnd(28)} veh ${String(x.vehicles).padStart(3)} vy ${x.vehicleYears.toFixed(1).padStart(6)} fail ${String(x.failures).padStart(3)} exp ${x.expected.toFixed(1).padStart(5)} RR ${x.rateRatio?.toFixed(2) ?? '-'} [${x.ciLow.toFixed(2)}, ${x.ciHigh?.toFixed(2) ?? 'inf'}] p ${x.pValue.toExponential(2)} q ${x.qValue.toExponential(2)} moist ${x.moistureShare.toFixed(2)} rep ${x.repeatVehicles} sig ${x.significant} water ${x.waterIngress}`,
    );
  }
} catch (e) {
  console.log('patterns engine not run:', (e as Error).message);
}

db.$client.close();
fs.rmSync(dir, { recursive: true, force: true });
