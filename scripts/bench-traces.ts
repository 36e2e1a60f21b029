/**
 * `npm run bench:traces`: times the trace CLI on a full-size capture. Generates a 2,000,000-sample capture
 * (about 48 MB of CSV) into a temporary folder, runs `node --import tsx src/cli/trace-main.ts FILE --json`
 * as a child process five times after one warm-up run, and prints the median and max wall time and peak
 * RSS (from /usr/bin/time -v when present, else the child's own process.resourceUsage().maxRSS).
 * `--bundle` also measures a pre-bundled build of the same entry (esbuild). The temporary folder is removed;
 * nothing else is written. Goal: under 0.85 s and 300 MB on the 2-core reference machine.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
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
  measure('node --import tsx src/cli/trace-main.ts FILE --json', ['--import', 'tsx', 'src/cli/trace-main.ts', file, '--json']);
  if (process.argv.includes('--bundle')) {
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
} finally {
  rmSync(dir, { recursive: true, force: true });
}
