// Builds one migrated SQLite template for the API tests; each worker copies it (tests/setup/api-setup.ts).
import fs from 'node:fs';
import path from 'node:path';
import { openDb, runMigrations } from '../../src/db/client';

export const TMP_DIR = path.resolve('tests/.tmp');

export default function setup() {
  fs.rmSync(TMP_DIR, { recursive: true, force: true });
  fs.mkdirSync(TMP_DIR, { recursive: true });
  const db = openDb(path.join(TMP_DIR, 'template.db'));
  runMigrations(db);
  db.$client.pragma('wal_checkpoint(TRUNCATE)');
  db.$client.close();
}
