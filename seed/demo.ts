/**
 * Loads the demo scenario into an empty database in one transaction. Called by `npm run cli -- seed-demo` and
 * by `npm start` on an empty database. Edit when a new table needs demo rows; the rows come from generate.ts.
 */
import { count } from 'drizzle-orm';
import type { Db } from '../src/db/client';
import * as schema from '../src/db/schema';
import { hashPassword } from '../src/server/passwords';
import { generateDemoData } from './generate';

/** What seedDemo inserted. */
export interface SeedSummary {
  depots: number;
  modules: number;
  vehicles: number;
  defects: number;
  users: number;
}

/** Rows per multi-row INSERT (defects have 36 columns; SQLite allows 32766 bound values per statement). */
const CHUNK_ROWS = 400;

function chunks<T>(rows: readonly T[], size = CHUNK_ROWS): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < rows.length; i += size) out.push(rows.slice(i, i + size));
  return out;
}

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

function requireEmpty(db: Db | Tx): void {
  const n = (table: typeof schema.depots | typeof schema.users | typeof schema.modules): number =>
    db.select({ n: count() }).from(table).get()?.n ?? 0;
  const found = { depots: n(schema.depots), users: n(schema.users), modules: n(schema.modules) };
  const nonEmpty = Object.entries(found).filter(([, c]) => c > 0);
  if (nonEmpty.length > 0) {
    throw new Error(
      `seed-demo needs an empty database, but it already has ${nonEmpty.map(([t, c]) => `${c} ${t}`).join(', ')}; ` +
        'nothing was written (start from a new database file, or set SEED_DEMO=0)',
    );
  }
}

/**
 * Insert the demo scenario (depots, catalogue, people, vehicles, defects with their codes, parts, timelines and audit rows)
 * into an empty, migrated database, all in one transaction. Throws if any depot, person or module exists.
 */
export async function seedDemo(db: Db, opts: { seed?: number; today?: string } = {}): Promise<SeedSummary> {
  requireEmpty(db);
  const data = generateDemoData(opts);
  const hashes = await Promise.all(data.users.map((u) => hashPassword(u.password)));
  const users = data.users.map(({ password: _password, ...u }, i) => ({ ...u, passwordHash: hashes[i] ?? '' }));

  db.transaction(
    (tx) => {
      requireEmpty(tx); // again inside the write lock, in case something was written while hashing
      tx.insert(schema.depots).values(data.depots).run();
      tx.insert(schema.modules).values(data.modules).run();
      tx.insert(schema.users).values(users).run();
      if (data.userDepots.length) tx.insert(schema.userDepots).values(data.userDepots).run();
      for (const c of chunks(data.vehicles)) tx.insert(schema.vehicles).values(c).run();
      for (const c of chunks(data.defects)) tx.insert(schema.defects).values(c).run();
      for (const c of chunks(data.defectCodes)) tx.insert(schema.defectCodes).values(c).run();
      for (const c of chunks(data.defectParts)) tx.insert(schema.defectParts).values(c).run();
      for (const c of chunks(data.defectTransitions)) tx.insert(schema.defectTransitions).values(c).run();
      if (data.settings.length) tx.insert(schema.settings).values(data.settings).onConflictDoNothing().run();
      for (const c of chunks(data.auditLog)) tx.insert(schema.auditLog).values(c).run();
      for (const c of chunks(data.offRoadPeriods)) tx.insert(schema.vehicleOffRoad).values(c).run();
    },
    { behavior: 'immediate' },
  );
  (await import('./traces')).seedTraces(db); // demo scope captures on a few defects, files under UPLOAD_DIR

  return {
    depots: data.depots.length,
    modules: data.modules.length,
    vehicles: data.vehicles.length,
    defects: data.defects.length,
    users: data.users.length,
  };
}
