/**
 * `npm start`: build when dist/ is missing or older than the sources, apply migrations, load the demo
 * scenario into an empty database (unless SEED_DEMO=0), then serve the production build.
 * Edit when start-up gains a step (the local mail server arrives with the digest).
 */
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { sql } from 'drizzle-orm';

const root = path.resolve(import.meta.dirname, '..');
process.chdir(root);

const host = process.env.HOST || 'localhost';
// NOTE: the build bakes in the allowed host names (astro security.allowedDomains); localhost and 127.0.0.1 are always in.
const port = process.env.PORT || '4321';
const stampFile = path.join(root, 'dist', '.seepline-build');

function newestMtime(p: string): number {
  if (!fs.existsSync(p)) return 0;
  const st = fs.statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  let max = st.mtimeMs;
  for (const e of fs.readdirSync(p)) max = Math.max(max, newestMtime(path.join(p, e)));
  return max;
}

function buildIfStale(): void {
  const inputs = ['src', 'public', 'astro.config.mjs', 'auth.config.ts', 'package.json', 'tsconfig.json'];
  const newest = Math.max(...inputs.map((i) => newestMtime(path.join(root, i))));
  let stamp: { at: number; hosts: string } | null = null;
  try {
    stamp = JSON.parse(fs.readFileSync(stampFile, 'utf8'));
  } catch {
    stamp = null;
  }
  const builtIn = ['localhost', '127.0.0.1', '[::1]', '0.0.0.0'];
  const hosts = [...(builtIn.includes(host) ? [] : [host]), ...(process.env.SEEPLINE_HOSTS ?? '').split(',').filter(Boolean)].join(',');
  const entry = path.join(root, 'dist', 'server', 'entry.mjs');
  if (stamp && fs.existsSync(entry) && stamp.at >= newest && stamp.hosts === hosts) return;
  console.log('Building Seepline (first start, or the sources changed)…');
  const r = spawnSync(process.execPath, [path.join(root, 'node_modules', 'astro', 'astro.js'), 'build'], {
    stdio: 'inherit',
    env: { ...process.env, SEEPLINE_HOSTS: hosts },
  });
  if (r.status !== 0) {
    console.error('Build failed.');
    process.exit(1);
  }
  fs.writeFileSync(stampFile, JSON.stringify({ at: Date.now(), hosts }));
}

async function prepareDatabase(): Promise<void> {
  const { getDb, runMigrations, closeDb } = await import('../src/db/client');
  const { ensureAuthSecret, databasePath } = await import('../src/env');
  ensureAuthSecret();
  const db = getDb();
  runMigrations(db);
  const count = db.get<{ n: number }>(sql`select (select count(*) from users) + (select count(*) from depots) as n`);
  if (count.n === 0 && process.env.SEED_DEMO !== '0') {
    const { seedDemo } = await import('../seed/demo');
    const t = Date.now();
    const s = await seedDemo(db);
    // The demo opens with its patterns on record, as if a fleet manager had looked at Patterns today.
    const { syncPatternRecords } = await import('../src/server/patterns-records');
    const sync = syncPatternRecords(null);
    console.log(`Loaded the demo scenario into ${databasePath()} in ${Date.now() - t} ms: ${JSON.stringify({ ...s, patternRecords: sync.created })}`);
  }
  closeDb();
}

buildIfStale();
await prepareDatabase();
if (process.argv.includes('--prepare-only')) process.exit(0);
console.log(`Seepline is serving at http://${host}:${port}`);
const child = spawn(process.execPath, [path.join(root, 'dist', 'server', 'entry.mjs')], {
  stdio: 'inherit',
  env: { ...process.env, HOST: host, PORT: port },
});
const stop = (sig: NodeJS.Signals) => child.kill(sig);
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
child.on('exit', (code) => process.exit(code ?? 0));
