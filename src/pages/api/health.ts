import type { APIRoute } from 'astro';
import { sql } from 'drizzle-orm';
import { getDb } from '@/db/client';

/** Liveness and database check; no credentials needed, nothing else disclosed. */
export const GET: APIRoute = () => {
  try {
    getDb().get(sql`select 1`);
    return Response.json({ ok: true, db: 'ok' });
  } catch {
    return Response.json({ ok: false, db: 'error' }, { status: 503 });
  }
};
