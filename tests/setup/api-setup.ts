// Per test file: a fresh copy of the migrated template database, and a failing console.error.
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, inject, vi } from 'vitest';

const dir = inject('apiTmpDir');
const file = path.join(dir, `api-${process.env.VITEST_POOL_ID ?? '0'}-${process.pid}-${Math.random().toString(36).slice(2)}.db`);
fs.copyFileSync(path.join(dir, 'template.db'), file);
process.env.DATABASE_URL = file;
process.env.UPLOAD_DIR = file + '-uploads';
process.env.AUTH_SECRET = 'test-secret-test-secret-test-secret';

beforeAll(() => {
  vi.spyOn(console, 'error').mockImplementation((...args: unknown[]) => {
    throw new Error(`console.error during a test: ${args.map(String).join(' ')}`);
  });
});

afterAll(async () => {
  const { closeDb } = await import('../../src/db/client');
  closeDb();
  for (const f of [file, file + '-wal', file + '-shm']) fs.rmSync(f, { force: true });
  fs.rmSync(file + '-uploads', { recursive: true, force: true });
});
