/**
 * The only database connection: one better-sqlite3 handle wrapped by Drizzle, reused across dev reloads.
 * WAL, foreign keys and a busy timeout are set on open. Edit when changing connection pragmas.
 */
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import * as schema from './schema';
import { databasePath } from '../env';

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

type Holder = { db?: Db; path?: string };
const g = globalThis as unknown as { __seeplineDb?: Holder };
const holder: Holder = (g.__seeplineDb ??= {});

/** Open a connection with the project's pragmas. */
export function openDb(file: string): Db {
  if (file !== ':memory:') fs.mkdirSync(path.dirname(file), { recursive: true });
  const sqlite = new Database(file);
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.pragma('busy_timeout = 5000');
  sqlite.pragma('synchronous = NORMAL');
  return drizzle(sqlite, { schema }) as Db;
}

/** The shared connection for DATABASE_URL (opened on first use). */
export function getDb(): Db {
  const file = databasePath();
  if (!holder.db || holder.path !== file) {
    holder.db?.$client.close();
    holder.db = openDb(file);
    holder.path = file;
  }
  return holder.db;
}

/** Close the shared connection (CLI and tests). */
export function closeDb(): void {
  holder.db?.$client.close();
  holder.db = undefined;
  holder.path = undefined;
}

/** drizzle/ resolved from the project root, whether running from src/ or from the built dist/. */
export function migrationsFolder(): string {
  const candidates = [
    path.resolve(process.cwd(), 'drizzle'),
    path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../drizzle'),
    path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../../drizzle'),
  ];
  const found = candidates.find((c) => fs.existsSync(path.join(c, 'meta', '_journal.json')));
  if (!found) throw new Error('drizzle/ migrations folder not found');
  return found;
}

/** Apply pending migrations to a connection. */
export function runMigrations(db: Db = getDb()): void {
  migrate(db, { migrationsFolder: migrationsFolder() });
}
