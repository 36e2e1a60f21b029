/**
 * Benchmark of the patterns report: generates seeded 20 000- and 100 000-vehicle fleets (two planted cohorts)
 * and times computePatternsReport (999 Monte Carlo replicates per cohort, and with 1 replicate to show the share
 * of the Monte Carlo), median of a few runs. Run: `npx tsx scripts/bench-patterns.ts [--runs N]`.
 * Edit when the report gains a stage worth timing separately.
 */
import os from 'node:os';
import { generateFleet, type PlantedCohort } from '../src/lib/patterns/fleet-generator';
import { computePatternsReport } from '../src/lib/patterns/report';

const PLANTED: PlantedCohort[] = [
  { label: 'wet', moduleCode: 'WLR-2', buildFrom: '2021-03', buildTo: '2021-09', band: 'high', rateMultiplier: 3, moistureShare: 0.9 },
  { label: 'dry', moduleCode: 'DLA-1', buildFrom: '2022-05', buildTo: '2022-12', band: 'low', rateMultiplier: 2.5, moistureShare: 0.05 },
];

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? (sorted[mid] as number) : ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}

/** Wall-clock and CPU milliseconds of each run (CPU time is what the run itself used, whatever else the machine runs). */
function timeRuns(runs: number, fn: () => void): { wall: number[]; cpu: number[] } {
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < runs; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    fn();
    wall.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  return { wall, cpu };
}

const runsArg = process.argv.indexOf('--runs');
const runsOverride = runsArg >= 0 ? Number(process.argv[runsArg + 1]) : undefined;

const rows: string[][] = [];
for (const vehicleCount of [20_000, 100_000]) {
  const runs = runsOverride ?? (vehicleCount <= 20_000 ? 7 : 3);
  const g0 = performance.now();
  const fleet = generateFleet({ seed: 1, vehicleCount, planted: PLANTED });
  const generateMs = performance.now() - g0;
  // Warm-up run (JIT), not counted.
  const report = computePatternsReport(fleet, { asOf: fleet.asOf });
  const full = timeRuns(runs, () => computePatternsReport(fleet, { asOf: fleet.asOf }));
  const noMc = timeRuns(runs, () => computePatternsReport(fleet, { asOf: fleet.asOf, replicates: 1 }));
  const windows = report.cohorts.reduce((s, c) => s + c.windowsTested, 0) / Math.max(1, report.cohorts.length);
  rows.push([
    String(vehicleCount),
    String(fleet.failures.length),
    String(report.cohorts.length),
    windows.toFixed(0),
    String(report.method.replicates),
    generateMs.toFixed(0),
    median(full.wall).toFixed(0),
    `${Math.min(...full.wall).toFixed(0)}–${Math.max(...full.wall).toFixed(0)}`,
    median(full.cpu).toFixed(0),
    median(noMc.wall).toFixed(0),
    String(report.counts.cohortsSignificant),
  ]);
}

const header = ['vehicles', 'defects', 'cohorts', 'windows/cohort', 'replicates', 'generate ms', 'report ms (median)', 'range ms', 'report CPU ms (median)', 'report ms, 1 replicate', 'significant'];
const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => (r[i] as string).length)));
const line = (cells: string[]) => `| ${cells.map((c, i) => c.padStart(widths[i] as number)).join(' | ')} |`;
console.log(`node ${process.version}, ${process.platform}/${process.arch}, load average ${os.loadavg().map((l) => l.toFixed(1)).join(' ')}`);
console.log(line(header));
console.log(`|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|`);
for (const r of rows) console.log(line(r));
