/**
 * Stored scope captures: the file under UPLOAD_DIR by content hash and its analysis in `attachments`
 * (kind `trace`), linked to a defect when given. Depot scope follows the defect; a capture without a defect
 * is visible to the person who stored it and to people who see every depot.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { and, desc, eq, sql } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { attachments, defects } from '@/db/schema';
import { uploadDir } from '@/env';
import { CaptureError, parseCapture } from '@/lib/traces/capture-parse';
import { analyzeCapture, type AnalyzeOptions, type TraceAnalysis } from '@/lib/traces/analyze';
import { inScope, requireDepotScope, type SessionUser } from '../auth';
import { HttpError, notFound } from '../http';
import { writeAudit, type Actor } from '../audit';
import { depotScope, iso } from '../list-helpers';

/** Largest capture accepted by upload (2,000,000 samples of three columns fit well inside). */
export const MAX_TRACE_UPLOAD_BYTES = 96 * 1024 * 1024;

/** Analyse capture bytes; unusable files are a 422 naming the line. */
export function analyzeBytes(bytes: Uint8Array, opts: AnalyzeOptions): TraceAnalysis {
  try {
    return analyzeCapture(parseCapture(bytes), opts);
  } catch (e) {
    if (e instanceof CaptureError) {
      throw new HttpError(422, 'INVALID_INPUT', `The capture cannot be used: ${e.message}`, [{ path: 'file', message: e.message }]);
    }
    throw e;
  }
}

/** Store a capture and its analysis; returns the stored id with the analysis. */
export function storeTrace(user: SessionUser, bytes: Uint8Array, name: string | null, opts: AnalyzeOptions & { defectId?: number }, actor: Actor) {
  const db = getDb();
  let depotId: number | null = null;
  if (opts.defectId !== undefined) {
    const d = db.select({ id: defects.id, depotId: defects.depotId }).from(defects).where(eq(defects.id, opts.defectId)).get();
    if (!d || !inScope(user, d.depotId)) {
      throw new HttpError(422, 'INVALID_INPUT', `No defect ${opts.defectId} in your depots.`, [{ path: 'defectId', message: 'Unknown defect' }]);
    }
    depotId = d.depotId;
  }
  const analysis = analyzeBytes(bytes, { pulsesPerRev: opts.pulsesPerRev, supplyV: opts.supplyV });
  const sha256 = crypto.createHash('sha256').update(bytes).digest('hex');
  const dir = path.join(uploadDir(), 'traces', sha256.slice(0, 2));
  const file = path.join(dir, `${sha256}.csv`);
  if (!fs.existsSync(file)) {
    fs.mkdirSync(dir, { recursive: true });
    const tmp = `${file}.${process.pid}.tmp`;
    fs.writeFileSync(tmp, bytes);
    fs.renameSync(tmp, file);
  }
  const id = db.transaction((tx) => {
    const row = tx
      .insert(attachments)
      .values({
        defectId: opts.defectId ?? null,
        depotId,
        kind: 'trace',
        sha256,
        mime: 'text/csv',
        bytes: bytes.byteLength,
        originalName: name ? name.slice(0, 200) : null,
        storedPath: path.relative(uploadDir(), file),
        analysis: JSON.stringify(analysis),
        createdById: user.id,
      })
      .returning({ id: attachments.id })
      .get();
    writeAudit(tx, actor, { entity: opts.defectId ? 'defect' : 'trace', entityId: String(opts.defectId ?? row.id), action: 'trace:add', newValue: `${analysis.verdict} (${name ?? 'capture'})` });
    return row.id;
  });
  return { id: String(id), ...analysis };
}

type Row = typeof attachments.$inferSelect;

function visible(user: SessionUser, r: Row): boolean {
  if (r.depotId !== null) return inScope(user, r.depotId);
  return user.depotIds === null || r.createdById === user.id;
}

function traceJson(r: Row) {
  const a = JSON.parse(r.analysis ?? '{}') as TraceAnalysis;
  return { id: String(r.id), defectId: r.defectId, fileName: r.originalName, bytes: r.bytes, createdAt: iso(r.createdAt), ...a };
}

/** One stored trace with its analysis (404 outside the caller's depots). */
export function getTrace(user: SessionUser, id: number) {
  const r = getDb().select().from(attachments).where(and(eq(attachments.id, id), eq(attachments.kind, 'trace'))).get();
  if (!r || !visible(user, r)) throw notFound('Trace');
  if (r.depotId !== null) requireDepotScope(user, r.depotId, 'Trace');
  return traceJson(r);
}

/** Stored traces, newest first, optionally for one defect. */
export function listTraces(user: SessionUser, q: { defectId?: number; page: number; pageSize: number }) {
  const db = getDb();
  const scope = depotScope(user, attachments.depotId);
  const visibleToCaller = scope ? sql`(${scope} or (${attachments.depotId} is null and ${attachments.createdById} = ${user.id}))` : undefined;
  const where = and(eq(attachments.kind, 'trace'), q.defectId ? eq(attachments.defectId, q.defectId) : undefined, visibleToCaller);
  const total = db.select({ n: sql<number>`count(*)` }).from(attachments).where(where).get()?.n ?? 0;
  const rows = db.select().from(attachments).where(where).orderBy(desc(attachments.id)).limit(q.pageSize).offset((q.page - 1) * q.pageSize).all();
  return { items: rows.map(traceJson), total, page: q.page, pageSize: q.pageSize };
}
