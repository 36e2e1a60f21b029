/**
 * Stored scope captures: the file under UPLOAD_DIR by content hash and its analysis in `attachments`
 * (kind `trace`), linked to a defect when given. Depot scope follows the defect; a capture without a defect
 * is visible to the person who stored it and to people who see every depot. Also the plot windows of a
 * stored capture (parsed once, then served from capture-cache.ts) and the original file for download.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { and, eq, sql } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { attachments, defects, depots, users, vehicles } from '@/db/schema';
import { uploadDir } from '@/env';
import { CaptureError, parseCapture, type CaptureData } from '@/lib/traces/capture-parse';
import { analyzeCaptureDetail, type AnalyzeOptions, type TraceAnalysis, type TraceAnalysisDetail } from '@/lib/traces/analyze';
import { buildPlotWindow } from '@/lib/traces/plot-window';
import { loadCapture, rememberCapture } from './capture-cache';
import { inScope, requireDepotScope, type SessionUser } from '../auth';
import { HttpError, invalid, notFound } from '../http';
import { writeAudit, type Actor } from '../audit';
import { depotScope, iso, orderBy } from '../list-helpers';
import type { TRACE_SORT_FIELDS } from '@/lib/contracts/traces';

/** Largest capture accepted by upload (2,000,000 samples of three columns fit well inside). */
export const MAX_TRACE_UPLOAD_BYTES = 96 * 1024 * 1024;

/** Analyse capture bytes; unusable files are a 422 naming the line. */
export function analyzeBytes(bytes: Uint8Array, opts: AnalyzeOptions): TraceAnalysis {
  return analyzeBytesDetail(bytes, opts).analysis;
}

/** analyzeBytes, keeping the parsed capture and its edges (to put straight into the plot cache). */
function analyzeBytesDetail(bytes: Uint8Array, opts: AnalyzeOptions): TraceAnalysisDetail & { capture: CaptureData } {
  try {
    const capture = parseCapture(bytes);
    return { capture, ...analyzeCaptureDetail(capture, opts) };
  } catch (e) {
    if (e instanceof CaptureError) {
      throw new HttpError(422, 'INVALID_INPUT', `The capture cannot be used: ${e.message}`, [{ path: 'file', message: e.message }]);
    }
    throw e;
  }
}

/** Where a capture with this content hash is kept, relative to UPLOAD_DIR. */
export function captureRelativePath(sha256: string): string {
  return path.join('traces', sha256.slice(0, 2), `${sha256}.csv`);
}

/** Write capture bytes under UPLOAD_DIR by content hash (once; the same bytes share one file). */
export function writeCaptureFile(bytes: Uint8Array): { sha256: string; storedPath: string } {
  const sha256 = crypto.createHash('sha256').update(bytes).digest('hex');
  const storedPath = captureRelativePath(sha256);
  const file = path.join(uploadDir(), storedPath);
  if (!fs.existsSync(file)) {
    fs.mkdirSync(path.dirname(file), { recursive: true });
    const tmp = `${file}.${process.pid}.tmp`;
    fs.writeFileSync(tmp, bytes);
    fs.renameSync(tmp, file);
  }
  return { sha256, storedPath };
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
  const { analysis, capture, edges } = analyzeBytesDetail(bytes, { pulsesPerRev: opts.pulsesPerRev, supplyV: opts.supplyV });
  const stored: StoredAnalysis = { ...analysis, pulsesPerRev: opts.pulsesPerRev ?? null };
  const { sha256, storedPath } = writeCaptureFile(bytes);
  // The trace page asks for the plot right after the upload: hand it the arrays already parsed.
  rememberCapture(sha256, capture, edges);
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
        storedPath,
        analysis: JSON.stringify(stored),
        createdById: user.id,
      })
      .returning({ id: attachments.id })
      .get();
    writeAudit(tx, actor, { entity: opts.defectId ? 'defect' : 'trace', entityId: String(opts.defectId ?? row.id), action: 'trace:add', newValue: `${analysis.verdict} (${name ?? 'capture'})` });
    return row.id;
  });
  return { id: String(id), ...stored };
}

/** The analysis as stored: the engine's result plus the options that are not in it. */
export type StoredAnalysis = TraceAnalysis & { pulsesPerRev: number | null };

/** The columns every trace query selects: the attachment and what it hangs off. */
function traceQuery() {
  return getDb()
    .select({
      a: attachments,
      defectRef: defects.ref,
      position: defects.position,
      vin: vehicles.vin,
      fleetNumber: vehicles.fleetNumber,
      registration: vehicles.registration,
      depotCode: depots.code,
      depotTimeZone: depots.timezone,
      createdBy: users.name,
    })
    .from(attachments)
    .leftJoin(defects, eq(defects.id, attachments.defectId))
    .leftJoin(vehicles, eq(vehicles.id, defects.vehicleId))
    .leftJoin(depots, eq(depots.id, attachments.depotId))
    .leftJoin(users, eq(users.id, attachments.createdById));
}

type TraceRow = Awaited<ReturnType<ReturnType<typeof traceQuery>['all']>>[number];
type Row = typeof attachments.$inferSelect;

function visible(user: SessionUser, r: Row): boolean {
  if (r.depotId !== null) return inScope(user, r.depotId);
  return user.depotIds === null || r.createdById === user.id;
}

function traceJson(r: TraceRow) {
  const stored = JSON.parse(r.a.analysis ?? '{}') as StoredAnalysis;
  return {
    id: String(r.a.id),
    defectId: r.a.defectId,
    defectRef: r.defectRef,
    position: r.position,
    vin: r.vin,
    fleetNumber: r.fleetNumber,
    registration: r.registration,
    depotCode: r.depotCode,
    fileName: r.a.originalName,
    bytes: r.a.bytes,
    createdAt: iso(r.a.createdAt),
    createdBy: r.createdBy,
    depotTimeZone: r.depotTimeZone,
    ...stored,
    pulsesPerRev: stored.pulsesPerRev ?? null,
  };
}

/** A stored trace as the API answers it (CONTRACT.md fields plus where it belongs and who stored it). */
export type TraceJson = ReturnType<typeof traceJson>;

/** The row of a trace the caller may see, or 404. */
function requireTraceRow(user: SessionUser, id: number): TraceRow {
  const r = traceQuery().where(and(eq(attachments.id, id), eq(attachments.kind, 'trace'))).get();
  if (!r || !visible(user, r.a)) throw notFound('Trace');
  if (r.a.depotId !== null) requireDepotScope(user, r.a.depotId, 'Trace');
  return r;
}

/** One stored trace with its analysis (404 outside the caller's depots). */
export function getTrace(user: SessionUser, id: number): TraceJson {
  return traceJson(requireTraceRow(user, id));
}

/** Sort columns of the trace list (TRACE_SORT_FIELDS). */
const TRACE_SORT = {
  createdAt: attachments.createdAt,
  verdict: sql`json_extract(${attachments.analysis}, '$.verdict')`,
  fileName: sql`lower(${attachments.originalName})`,
  defect: defects.ref,
  depot: depots.code,
  createdBy: users.name,
} satisfies Record<(typeof TRACE_SORT_FIELDS)[number], unknown>;

/** Stored traces, newest first unless sorted otherwise, optionally for one defect, one verdict or one depot. */
export function listTraces(user: SessionUser, q: { defectId?: number; verdict?: string; depot?: string; sort?: string; page: number; pageSize: number }) {
  const db = getDb();
  const scope = depotScope(user, attachments.depotId);
  const visibleToCaller = scope ? sql`(${scope} or (${attachments.depotId} is null and ${attachments.createdById} = ${user.id}))` : undefined;
  const where = and(
    eq(attachments.kind, 'trace'),
    q.defectId ? eq(attachments.defectId, q.defectId) : undefined,
    q.verdict ? sql`json_extract(${attachments.analysis}, '$.verdict') = ${q.verdict}` : undefined,
    q.depot ? eq(depots.code, q.depot.trim().toUpperCase()) : undefined,
    visibleToCaller,
  );
  const total =
    db
      .select({ n: sql<number>`count(*)` })
      .from(attachments)
      .leftJoin(depots, eq(depots.id, attachments.depotId))
      .where(where)
      .get()?.n ?? 0;
  const order = orderBy(q.sort, TRACE_SORT, '-createdAt', attachments.id);
  const rows = traceQuery().where(where).orderBy(...order).limit(q.pageSize).offset((q.page - 1) * q.pageSize).all();
  return { items: rows.map(traceJson), total, page: q.page, pageSize: q.pageSize };
}

/** Absolute path of a stored capture, refusing anything that would lie outside UPLOAD_DIR. */
function capturePath(storedPath: string): string {
  const root = uploadDir();
  const abs = path.resolve(root, storedPath);
  if (!abs.startsWith(root + path.sep)) throw notFound('Capture file');
  return abs;
}

/** The original capture file of a trace the caller may see: where it is, its name and size. */
export function getTraceFile(user: SessionUser, id: number): { path: string; fileName: string; bytes: number } {
  const r = requireTraceRow(user, id);
  const abs = capturePath(r.a.storedPath);
  let size: number;
  try {
    size = fs.statSync(abs).size;
  } catch {
    throw new HttpError(404, 'NOT_FOUND', 'The stored capture file is missing.');
  }
  const base = (r.a.originalName ?? '').replace(/[\\/]/g, '_').trim();
  return { path: abs, fileName: base || `trace-${r.a.id}.csv`, bytes: size };
}

/** A plot window of a stored trace (see src/lib/traces/plot-window.ts), parsed captures cached by content hash. */
export async function getTraceSamples(user: SessionUser, id: number, q: { fromS?: number; toS?: number; columns: number }) {
  const r = requireTraceRow(user, id);
  let entry;
  try {
    entry = await loadCapture(r.a.sha256, capturePath(r.a.storedPath));
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') throw new HttpError(404, 'NOT_FOUND', 'The stored capture file is missing.');
    if (e instanceof CaptureError) throw new HttpError(422, 'INVALID_INPUT', `The stored capture cannot be read: ${e.message}`);
    throw e;
  }
  try {
    return { id: String(r.a.id), ...buildPlotWindow(entry.capture, entry.edges, q) };
  } catch (e) {
    if (e instanceof RangeError) throw invalid(`Bad window: ${e.message}.`, [{ path: 'from', message: e.message }]);
    throw e;
  }
}
