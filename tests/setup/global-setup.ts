// Builds one migrated SQLite template for the API tests in a folder of this run's own (so that two runs, or an
// API run beside a browser run, never delete each other's files); each worker copies it (tests/setup/api-setup.ts).
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { openDb, runMigrations } from '../../src/db/client';

export default function setup(project: TestProject) {
  const base = path.resolve('tests/.tmp');
  fs.mkdirSync(base, { recursive: true });
  const dir = fs.mkdtempSync(path.join(base, `api-${os.hostname().slice(0, 12)}-`));
  const db = openDb(path.join(dir, 'template.db'));
  runMigrations(db);
  db.$client.pragma('wal_checkpoint(TRUNCATE)');
  db.$client.close();
  project.provide('apiTmpDir', dir);
  return () => fs.rmSync(dir, { recursive: true, force: true });
}

declare module 'vitest' {
  export interface ProvidedContext {
    apiTmpDir: string;
  }
}
