// Browser-test set-up: build when needed, seed a fresh database, start the production server on a free port.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import type { TestProject } from 'vitest/node';

const root = path.resolve(import.meta.dirname, '../..');
let server: ChildProcess | undefined;

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.listen(0, '127.0.0.1', () => {
      const a = s.address();
      s.close(() => (typeof a === 'object' && a ? resolve(a.port) : reject(new Error('no port'))));
    });
  });
}

export default async function setup(project: TestProject) {
  // A folder of this run's own: two runs side by side (or an API run) never delete each other's database.
  fs.mkdirSync(path.join(root, 'tests/.tmp'), { recursive: true });
  const tmp = fs.mkdtempSync(path.join(root, 'tests/.tmp/browser-'));
  const env = { ...process.env, DATABASE_URL: path.join(tmp, 'e2e.db'), UPLOAD_DIR: path.join(tmp, 'uploads'), AUTH_SECRET: 'e2e-secret-e2e-secret-e2e-secret-0', HOST: '127.0.0.1' };
  // Build (the start script's logic decides whether dist/ is stale) and seed, without serving.
  const prep = spawnSync(process.execPath, ['--import', 'tsx', path.join(root, 'scripts/start.ts'), '--prepare-only'], { cwd: root, env, stdio: 'inherit' });
  if (prep.status !== 0) throw new Error('build or seed failed');
  const port = await freePort();
  server = spawn(process.execPath, [path.join(root, 'dist/server/entry.mjs')], { cwd: root, env: { ...env, PORT: String(port) }, stdio: ['ignore', 'pipe', 'pipe'] });
  let log = '';
  server.stdout?.on('data', (d) => (log += d));
  server.stderr?.on('data', (d) => (log += d));
  const base = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 100; i++) {
    try {
      const r = await fetch(`${base}/api/health`);
      if (r.ok) break;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 200));
    if (i === 99) throw new Error(`server did not start:\n${log}`);
  }
  project.provide('baseUrl', base);
  project.provide('e2eDbPath', path.join(tmp, 'e2e.db'));
  return async () => {
    if (server && server.exitCode === null) {
      const exited = new Promise((r) => server!.once('exit', r));
      server.kill('SIGTERM');
      await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
    }
    fs.rmSync(tmp, { recursive: true, force: true });
  };
}

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    /** The SQLite file the server of this run uses. */
    e2eDbPath: string;
  }
}
