/** The audit trail: every change lands here (who, when, what, old → new). */
import { and, desc, eq } from 'drizzle-orm';
import { getDb, type Db } from '@/db/client';
import { auditLog, users } from '@/db/schema';

/** Who acts: a person (by id) or a named system actor. */
export type Actor = { userId: number } | { system: 'cli' | 'import' | 'seed' | 'system' };

type Tx = Pick<Db, 'insert'>;

export type AuditEntry = {
  entity: string;
  entityId: string;
  action: string;
  field?: string;
  oldValue?: string | null;
  newValue?: string | null;
};

/** Write one audit row inside the caller's transaction. */
export function writeAudit(tx: Tx, actor: Actor, e: AuditEntry, at = Date.now()): void {
  tx.insert(auditLog)
    .values({
      at,
      userId: 'userId' in actor ? actor.userId : null,
      actor: 'system' in actor ? actor.system : null,
      entity: e.entity,
      entityId: e.entityId,
      action: e.action,
      field: e.field ?? null,
      oldValue: e.oldValue ?? null,
      newValue: e.newValue ?? null,
    })
    .run();
}

/** Audit rows for one record, newest first. */
export function listAudit(entity: string, entityId: string, limit = 200) {
  return getDb()
    .select({
      id: auditLog.id,
      at: auditLog.at,
      actor: auditLog.actor,
      userName: users.name,
      action: auditLog.action,
      field: auditLog.field,
      oldValue: auditLog.oldValue,
      newValue: auditLog.newValue,
    })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.userId))
    .where(and(eq(auditLog.entity, entity), eq(auditLog.entityId, entityId)))
    .orderBy(desc(auditLog.at), desc(auditLog.id))
    .limit(limit)
    .all()
    .map((r) => ({ ...r, at: new Date(r.at).toISOString(), who: r.userName ?? r.actor ?? 'system' }));
}
