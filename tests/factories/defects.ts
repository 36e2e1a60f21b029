// Defect factories: defects imported through the real import service (so repeat links are computed by the
// app's own rule), then a status or assignee set directly where a test needs a workflow state.
import { eq } from 'drizzle-orm';
import Papa from 'papaparse';
import { getDb } from '../../src/db/client';
import { defects } from '../../src/db/schema';
import { importCsv } from './fleet';

export const DAY_MS = 86_400_000;

export type DefectSpec = {
  ref: string;
  vin: string;
  reportedAt: number;
  position: string;
  module: string;
  closedAt?: number;
  moisture?: string;
  symptom?: string;
  /** A workflow status other than the import's reported/closed. */
  status?: 'reported' | 'diagnosing' | 'awaiting_parts' | 'repaired' | 'verified' | 'closed' | 'cancelled';
  assignedToId?: number;
  reportedById?: number;
};

const iso = (ms: number) => new Date(ms).toISOString();

/** Import the defects in one file, then apply statuses and people; returns ref → id. */
export function addDefects(specs: DefectSpec[]): Map<string, number> {
  const csv = Papa.unparse({
    fields: ['ref', 'vin', 'reported_at', 'position', 'module_code', 'symptom', 'moisture', 'closed_at'],
    data: specs.map((s) => [s.ref, s.vin, iso(s.reportedAt), s.position, s.module, s.symptom ?? '', s.moisture ?? '', s.closedAt ? iso(s.closedAt) : '']),
  });
  importCsv('defects', csv);
  const db = getDb();
  const ids = new Map<string, number>();
  for (const s of specs) {
    const row = db.select({ id: defects.id }).from(defects).where(eq(defects.ref, s.ref)).get();
    if (!row) throw new Error(`factory: defect ${s.ref} not imported`);
    ids.set(s.ref, row.id);
    const set: Partial<typeof defects.$inferInsert> = {};
    if (s.status) set.status = s.status;
    if (s.assignedToId !== undefined) set.assignedToId = s.assignedToId;
    if (s.reportedById !== undefined) set.reportedById = s.reportedById;
    if (Object.keys(set).length) db.update(defects).set(set).where(eq(defects.id, row.id)).run();
  }
  return ids;
}

/** `YYYY-MM-DD` (UTC) of an instant. */
export function utcDay(ms: number): string {
  return new Date(ms).toISOString().slice(0, 10);
}
