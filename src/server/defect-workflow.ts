/**
 * The defect lifecycle on the server: checks a status change against the rules of
 * src/lib/defects/transitions.ts (role, allowed step, what it needs, the release-verification gate) and
 * applies it with its effects, a timeline row (defect_transitions) and audit rows, in one transaction with
 * the version check. Used by POST /api/defects/{id}/transitions and by PATCH when it carries `status` or
 * `closedAt`. Edit the rules in the engine, not here.
 */
import { and, eq, max } from 'drizzle-orm';
import type { Db } from '@/db/client';
import { defects, defectTransitions, depots, modules } from '@/db/schema';
import type { TransitionRequest, VerificationInput } from '@/lib/contracts/defects';
import { parseInstant } from '@/lib/dates/dates';
import { checkVerificationTime } from '@/lib/defects/times';
import {
  checkTransition,
  findTransition,
  requiresSafetyVerification,
  requirementMessage,
  verificationComplete,
  type DefectStatus,
  type Requirement,
  type TransitionRefusal,
  type TransitionRule,
  type VerificationState,
} from '@/lib/defects/transitions';
import { requireDepotScope, type SessionUser } from './auth';
import { forbidden, HttpError, notFound } from './http';
import { writeAudit, type Actor } from './audit';
import { refreshRepeats } from './repeats';

/** A transaction handle. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
/** A defect row as stored. */
export type DefectDb = typeof defects.$inferSelect;

/** How far ahead of the server clock a verification time may be (tablet clocks drift). */
const CLOCK_SKEW_MS = 5 * 60_000;

/** The stored verification of a row. */
export function verificationOf(d: Pick<DefectDb, 'verifiedReinit' | 'verifiedReversal' | 'verifiedById' | 'verifiedAt'>): VerificationState {
  return { reinitialised: d.verifiedReinit, reversalVerified: d.verifiedReversal, byUserId: d.verifiedById, atMs: d.verifiedAt };
}

/** The HTTP error for a refused step: 403 for the role, 422 for a step that does not exist or is not ready. */
export function refusal(r: TransitionRefusal): HttpError {
  if (r.code === 'forbidden') return forbidden(r.message);
  const issues =
    r.code === 'needs'
      ? r.missing.map((m) => ({ path: m === 'safety_verification' ? 'verification' : m === 'root_cause' ? 'rootCause' : m, message: m }))
      : [{ path: 'to', message: r.code }];
  return new HttpError(422, 'INVALID_INPUT', r.message, issues);
}

/** When the defect was last marked repaired (the repair a verification checks), or null when never in Seepline. */
function lastRepairedAt(tx: Tx, defectId: number): number | null {
  const r = tx
    .select({ at: max(defectTransitions.at) })
    .from(defectTransitions)
    .where(and(eq(defectTransitions.defectId, defectId), eq(defectTransitions.toStatus, 'repaired')))
    .get();
  return r?.at ?? null;
}

/** Time of a supplied verification: given (not in the future, not before the repair or the report) or now. */
function verificationTime(v: VerificationInput, reportedAt: number, repairedAt: number | null, now: number, tz: string | null): number {
  if (!v.at) return now;
  const at = parseInstant(v.at, tz);
  if (at === null) throw new HttpError(422, 'INVALID_INPUT', 'Checked at is not a date-time.', [{ path: 'verification.at', message: 'Not a date-time' }]);
  const problem = checkVerificationTime({ atMs: at, nowMs: now, reportedAtMs: reportedAt, repairedAtMs: repairedAt, skewMs: CLOCK_SKEW_MS });
  if (problem) throw new HttpError(422, 'INVALID_INPUT', problem.message, [{ path: 'verification.at', message: problem.message }]);
  return at;
}

/** Column changes a step makes, besides the status itself. */
export function stepEffects(
  row: DefectDb,
  rule: TransitionRule,
  userId: number,
  now: number,
  opts: { closedAtMs?: number; verification?: { atMs: number; note: string | null } } = {},
): Partial<DefectDb> {
  const set: Partial<DefectDb> = { status: rule.to };
  if (rule.effects.closes) {
    set.closedAt = opts.closedAtMs ?? now;
    set.closedAtText = null;
  }
  if (rule.effects.clearsClosedAt) {
    set.closedAt = null;
    set.closedAtText = null;
  }
  if (rule.effects.clearsVerification) {
    set.verifiedReinit = null;
    set.verifiedReversal = null;
    set.verifiedById = null;
    set.verifiedAt = null;
    set.verificationNote = null;
  }
  if (rule.effects.claims && row.assignedToId === null) set.assignedToId = userId;
  if (opts.verification) {
    set.verifiedReinit = true;
    set.verifiedReversal = true;
    set.verifiedById = userId;
    set.verifiedAt = opts.verification.atMs;
    set.verificationNote = opts.verification.note;
  }
  return set;
}

const str = (v: unknown): string | null => (v === null || v === undefined ? null : String(v));

/** Write the update, the timeline row and the audit rows of a step (and of any other changed columns in `set`). */
export function writeChange(
  tx: Tx,
  row: DefectDb,
  set: Partial<DefectDb>,
  actor: Actor,
  now: number,
  step?: { from: DefectStatus; to: DefectStatus; reason: string | null },
  /** Bump the version even when no column of `set` changed (another table of the record did). */
  force = false,
): void {
  const changed = (Object.keys(set) as Array<keyof DefectDb>).filter((k) => str(row[k]) !== str(set[k]));
  if (changed.length === 0 && !step && !force) return;
  tx.update(defects)
    .set({ ...set, version: row.version + 1, updatedAt: now })
    .where(eq(defects.id, row.id))
    .run();
  const entityId = String(row.id);
  for (const k of changed) {
    writeAudit(tx, actor, { entity: 'defect', entityId, action: k === 'status' ? 'transition' : 'update', field: k, oldValue: str(row[k]), newValue: str(set[k]) }, now);
  }
  if (step) {
    tx.insert(defectTransitions)
      .values({
        defectId: row.id,
        fromStatus: step.from,
        toStatus: step.to,
        at: now,
        userId: 'userId' in actor ? actor.userId : null,
        actor: 'system' in actor ? actor.system : null,
        reason: step.reason,
      })
      .run();
    if (step.reason) writeAudit(tx, actor, { entity: 'defect', entityId, action: 'transition', field: 'reason', newValue: step.reason }, now);
  }
}

/** Whether a set of column changes moves repeat links (closing times, cancelling, door, module, vehicle, report time). */
export function affectsRepeats(row: DefectDb, set: Partial<DefectDb>): boolean {
  const keys: Array<keyof DefectDb> = ['closedAt', 'reportedAt', 'position', 'moduleId', 'vehicleId'];
  if (keys.some((k) => k in set && str(set[k]) !== str(row[k]))) return true;
  return 'status' in set && set.status !== row.status && (set.status === 'cancelled' || row.status === 'cancelled');
}

/** Load a defect row with its module function, inside the caller's depots (else 404). */
export function loadForWrite(tx: Tx, user: SessionUser, id: number): { row: DefectDb; moduleFunction: string; timezone: string | null } {
  const r = tx
    .select({ d: defects, fn: modules.function })
    .from(defects)
    .innerJoin(modules, eq(modules.id, defects.moduleId))
    .where(eq(defects.id, id))
    .get();
  if (!r) throw notFound('Defect');
  requireDepotScope(user, r.d.depotId, 'Defect');
  const tz = tx.select({ timezone: depots.timezone }).from(depots).where(eq(depots.id, r.d.depotId)).get();
  return { row: r.d, moduleFunction: r.fn, timezone: tz?.timezone ?? null };
}

/** Thrown inside a write transaction when the caller's version is stale; the caller answers 409 with the record. */
export class StaleVersionError extends Error {
  constructor() {
    super('stale version');
    this.name = 'StaleVersionError';
  }
}

/** Check and apply a status change inside a transaction (POST /api/defects/{id}/transitions). */
export function applyTransition(tx: Tx, user: SessionUser, id: number, req: TransitionRequest, actor: Actor, now: number): void {
  const { row, moduleFunction, timezone } = loadForWrite(tx, user, id);
  if (req.version !== row.version) throw new StaleVersionError();
  const from = row.status;
  // First whether the step exists and is the caller's to take; then what it needs.
  const pre = checkTransition(from, req.to, { role: user.role, moduleFunction: 'other', hasAction: true, hasRootCause: true, verification: null, reason: 'given' });
  if (!pre.ok) throw refusal(pre);
  if (req.verification && req.to !== 'verified' && req.to !== 'closed') {
    throw new HttpError(422, 'INVALID_INPUT', 'A verification is recorded with the step to verified or closed.', [{ path: 'verification', message: 'Not with this step' }]);
  }
  const supplied = req.verification
    ? { atMs: verificationTime(req.verification, row.reportedAt, lastRepairedAt(tx, row.id), now, timezone), note: req.verification.note ?? null }
    : undefined;
  const verification: VerificationState | null = supplied
    ? { reinitialised: true, reversalVerified: true, byUserId: user.id, atMs: supplied.atMs }
    : verificationOf(row);
  const check = checkTransition(from, req.to, {
    role: user.role,
    moduleFunction,
    hasAction: !!row.action?.trim(),
    hasRootCause: row.rootCause !== null,
    verification,
    reason: req.reason ?? null,
  });
  if (!check.ok) throw refusal(check);
  const set = stepEffects(row, check.rule, user.id, now, { verification: supplied });
  writeChange(tx, row, set, actor, now, { from, to: req.to, reason: req.reason ?? null });
  if (affectsRepeats(row, set)) refreshRepeats(tx, [row.vehicleId]);
}

/**
 * The lifecycle part of a PATCH: `status` (by the same rules as a transition), or `closedAt` given on an open
 * defect (records its closing: the release-verification gate applies) or null on a closed one (re-opens it,
 * supervisors and above). Returns the column changes and the step, or null when the status does not change.
 */
export function patchLifecycle(
  user: SessionUser,
  row: DefectDb,
  moduleFunction: string,
  patch: { status?: DefectStatus; closedAtMs?: number | null; reason: string | null; hasAction: boolean; hasRootCause: boolean },
  now: number,
): { set: Partial<DefectDb>; step: { from: DefectStatus; to: DefectStatus; reason: string | null } } | null {
  const from = row.status;
  const ctx = { role: user.role, moduleFunction, hasAction: patch.hasAction, hasRootCause: patch.hasRootCause, verification: verificationOf(row), reason: patch.reason };
  if (patch.status !== undefined && patch.status !== from) {
    const check = checkTransition(from, patch.status, ctx);
    if (!check.ok) throw refusal(check);
    const closedAtMs = check.rule.effects.closes && typeof patch.closedAtMs === 'number' ? patch.closedAtMs : undefined;
    return { set: stepEffects(row, check.rule, user.id, now, { closedAtMs }), step: { from, to: patch.status, reason: patch.reason } };
  }
  if (patch.closedAtMs === undefined) return null;
  if (from === 'cancelled' && patch.closedAtMs !== null) {
    throw new HttpError(422, 'INVALID_INPUT', 'A cancelled defect cannot be closed; restore it first.', [{ path: 'closedAt', message: 'Defect is cancelled' }]);
  }
  if (from !== 'closed' && patch.closedAtMs !== null) {
    // Recording a closing time closes the defect from wherever it is (as an import row would), but never
    // around the release verification, and only for people who may close.
    const rule = findTransition('verified', 'closed')!;
    if (!rule.roles.includes(user.role)) throw forbidden('Your role cannot close defects.');
    // The same requirements as the Close step: a root cause, and the release verification where it applies.
    const missing: Requirement[] = [];
    if (!patch.hasRootCause) missing.push('root_cause');
    if (requiresSafetyVerification(moduleFunction) && !verificationComplete(ctx.verification)) missing.push('safety_verification');
    if (missing.length) {
      throw refusal({ ok: false, code: 'needs', message: missing.map((n) => requirementMessage(n, rule, moduleFunction)).join(' '), missing });
    }
    return { set: stepEffects(row, rule, user.id, now, { closedAtMs: patch.closedAtMs }), step: { from, to: 'closed', reason: patch.reason ?? 'Closing time recorded' } };
  }
  if (from === 'closed' && patch.closedAtMs === null) {
    const check = checkTransition('closed', 'diagnosing', { ...ctx, reason: patch.reason ?? 'Closing time removed' });
    if (!check.ok) throw refusal(check);
    return { set: stepEffects(row, check.rule, user.id, now), step: { from, to: 'diagnosing', reason: patch.reason ?? 'Closing time removed' } };
  }
  return null;
}
