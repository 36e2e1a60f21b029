/**
 * `npm run bench:traces`: times the trace CLI on a full-size capture. Generates a 2,000,000-sample capture
 * (about 48 MB of CSV) into a temporary folder, runs `node --import tsx src/cli/trace-main.ts FILE --json`
 * as a child process five times after one warm-up run, and prints the median and max wall time and peak
 * RSS (from /usr/bin/time -v when present, else the child's own process.resourceUsage().maxRSS).
 * `--bundle` also measures a pre-bundled build of the same entry (esbuild).
 *
 * Then the plot's samples endpoint on the same capture: a scratch SQLite database and upload folder in the
 * temporary folder, the capture stored as an upload stores it, and GET /api/traces/{id}/samples called
 * through the real request guard and route (Bearer token) — the first call (read, parse and edge-find the
 * 48 MB file, then decimate), then cached calls for the whole capture, a 10% window and a raw 1 ms window.
 * `--samples-only` skips the CLI runs. The temporary folder is removed; nothing else is written.
 * Goals: CLI under 0.85 s and 300 MB on the 2-core reference machine; cached windows well under 100 ms.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import type { APIContext } from 'astro';
import { captureToCsv, generateCapture } from '../src/lib/traces/generate';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const RUNS = 5;
const SAMPLES = 2_000_000;
const TIME_BIN = '/usr/bin/time';
const RSS_HOOK =
  "data:text/javascript,process.on('exit',()=>process.stderr.write('maxrss_kb='+process.resourceUsage().maxRSS+'\\n'))";

interface Run {
  wallS: number;
  rssMB: number;
}

function runOnce(args: string[]): Run {
  const useTime = existsSync(TIME_BIN);
  const cmd = useTime ? TIME_BIN : process.execPath;
  const full = useTime ? ['-v', process.execPath, ...args] : ['--import', RSS_HOOK, ...args];
  const t0 = performance.now();
  const r = spawnSync(cmd, full, { cwd: ROOT, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  const wallS = (performance.now() - t0) / 1000;
  if (r.status !== 0) {
    process.stderr.write(`trace command failed (status ${r.status}):\n${r.stderr}\n`);
    process.exit(1);
  }
  JSON.parse(r.stdout); // the output must be the analysis JSON
  const m = useTime
    ? /Maximum resident set size \(kbytes\):\s*(\d+)/.exec(r.stderr)
    : /maxrss_kb=(\d+)/.exec(r.stderr);
  return { wallS, rssMB: m ? Number(m[1]) / 1024 : NaN };
}

function stats(xs: number[]): { median: number; max: number } {
  const s = [...xs].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return { median: s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2, max: s[s.length - 1]! };
}

function measure(label: string, args: string[]): void {
  runOnce(args); // warm-up (tsx transform cache, file cache)
  const runs: Run[] = [];
  for (let i = 0; i < RUNS; i++) runs.push(runOnce(args));
  const wall = stats(runs.map((r) => r.wallS));
  const rss = stats(runs.map((r) => r.rssMB));
  console.log(
    `${label}: wall median ${wall.median.toFixed(3)} s, max ${wall.max.toFixed(3)} s; ` +
      `peak RSS median ${rss.median.toFixed(0)} MB, max ${rss.max.toFixed(0)} MB (${RUNS} runs)`,
  );
}

/** Time GET /api/traces/{id}/samples through the request guard and route, as a browser's call would run. */
async function measureSamples(dir: string, file: string): Promise<void> {
  process.env.DATABASE_URL = path.join(dir, 'bench.db');
  process.env.UPLOAD_DIR = path.join(dir, 'uploads');
  process.env.AUTH_SECRET = 'bench-secret-bench-secret-bench-secret';
  const { getDb, runMigrations, closeDb } = await import('../src/db/client');
  const { createUser, createToken } = await import('../src/server/users');
  const { storeTrace } = await import('../src/server/traces/store');
  const { captureCacheStats, clearCaptureCache } = await import('../src/server/traces/capture-cache');
  const { guardRequest } = await import('../src/server/request-guard');
  const route = await import('../src/pages/api/traces/[id]/samples');
  runMigrations(getDb());
  const { id: userId } = await createUser({ email: 'bench@example.test', name: 'Bench', role: 'admin', password: 'bench-password-1', depots: [], allDepots: true }, { system: 'cli' });
  const { token } = createToken(userId, 'bench', { system: 'cli' });
  const bytes = new Uint8Array(readFileSync(file));
  const user = { id: userId, email: 'bench@example.test', name: 'Bench', role: 'admin' as const, depotIds: null, via: 'token' as const };
  const traceId = storeTrace(user, bytes, 'capture.csv', {}, { userId }).id;

  const call = async (query: string): Promise<{ ms: number; bytes: number; mode: string }> => {
    const url = new URL(`/api/traces/${traceId}/samples${query}`, 'http://localhost');
    const request = new Request(url, { headers: { authorization: `Bearer ${token}` } });
    const ctx = { request, url, params: { id: traceId }, locals: {}, redirect: () => new Response(null, { status: 302 }) } as unknown as APIContext;
    const t0 = performance.now();
    const res = await guardRequest(ctx, async () => route.GET(ctx), async () => null);
    const text = await res.text();
    const ms = performance.now() - t0;
    if (res.status !== 200) throw new Error(`samples answered ${res.status}: ${text.slice(0, 200)}`);
    return { ms, bytes: text.length, mode: (JSON.parse(text) as { mode: string }).mode };
  };
  const median = (xs: number[]) => stats(xs).median;
  const COLUMNS = 1200;
  const firsts: number[] = [];
  for (let i = 0; i < 3; i++) {
    clearCaptureCache();
    firsts.push((await call(`?columns=${COLUMNS}`)).ms);
  }
  const rows: Array<[string, string, number, { bytes: number; mode: string }]> = [];
  const sample = async (label: string, query: string, runs = 15) => {
    const times: number[] = [];
    let last = { ms: 0, bytes: 0, mode: '' };
    for (let i = 0; i < runs; i++) {
      last = await call(query);
      times.push(last.ms);
    }
    rows.push([label, query, median(times), last]);
  };
  await sample('whole capture (cached)', `?columns=${COLUMNS}`);
  await sample('10% window (cached)', `?from=0.9&to=1.1&columns=${COLUMNS}`);
  await sample('1 ms window, every sample (cached)', `?from=1.0&to=1.001&columns=${COLUMNS}`);
  console.log(`samples endpoint, ${COLUMNS} columns: first call (read + parse + edges + decimate) median ${median(firsts).toFixed(0)} ms of ${firsts.map((x) => x.toFixed(0)).join(', ')}`);
  for (const [label, query, ms, last] of rows) {
    console.log(`  ${label}: median ${ms.toFixed(1)} ms, ${(last.bytes / 1024).toFixed(0)} KB JSON, mode ${last.mode} (${query})`);
  }
  console.log(`  the cache holds ${(captureCacheStats().bytes / 1048576).toFixed(1)} MB for this capture (time, A and B as Float64Arrays, plus edges)`);
  closeDb();
}

const dir = mkdtempSync(path.join(tmpdir(), 'seepline-bench-traces-'));
try {
  const capture = generateCapture({
    sampleRateHz: 1_000_000,
    samples: SAMPLES,
    freqHz: 180,
    endFreqHz: 150,
    phaseDeg: 90,
    lowV: 0.15,
    highV: 4.95,
    noiseV: 0.03,
    riseS: 4e-6,
    seed: 181,
  });
  const file = path.join(dir, 'capture.csv');
  writeFileSync(file, captureToCsv(capture, { preamble: ['Seepline benchmark capture', 'Sample rate,1000000'], timeDecimals: 7 }));
  const sizeMB = statSync(file).size / 1e6;
  console.log(`capture: ${SAMPLES.toLocaleString('en-US')} samples, ${sizeMB.toFixed(1)} MB; goal < 0.85 s and < 300 MB`);
  const cli = !process.argv.includes('--samples-only');
  if (cli) measure('node --import tsx src/cli/trace-main.ts FILE --json', ['--import', 'tsx', 'src/cli/trace-main.ts', file, '--json']);
  if (cli && process.argv.includes('--bundle')) {
    const bundle = path.join(dir, 'trace-main.mjs');
    const esbuild = path.join(ROOT, 'node_modules', '.bin', 'esbuild');
    const b = spawnSync(
      esbuild,
      ['src/cli/trace-main.ts', '--bundle', '--platform=node', '--format=esm', '--target=node20', `--outfile=${bundle}`, '--log-level=warning'],
      { cwd: ROOT, encoding: 'utf8' },
    );
    if (b.status !== 0) {
      process.stderr.write(`esbuild failed:\n${b.stderr}\n`);
      process.exit(1);
    }
    measure('node <esbuild bundle of src/cli/trace-main.ts> FILE --json', [bundle, file, '--json']);
  }
  await measureSamples(dir, file);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
