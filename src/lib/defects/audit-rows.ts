/**
 * The audit trail of a defect as people read it: one row per thing that happened. A status step writes
 * several audit rows at the same instant (the status, its reason, and the closing time when it closes or
 * re-opens); shown one by one they repeat each other ("Status Verified → Closed" and "Closed – → 17:00").
 * Here the reason joins its status row and a closing time that only mirrors a step to or from "closed" is
 * left out. Every other row (assignment, verification fields, edits) is kept as it is.
 */

/** The audit row fields this needs. */
export interface AuditLike {
  id: number;
  at: string;
  who: string;
  action: string;
  field: string | null;
  oldValue: string | null;
  newValue: string | null;
}

/** A row to show: the audit row, with the reason of its step when it is a status change. */
export type AuditDisplayRow<T extends AuditLike> = T & { reason: string | null };

const isStatus = (r: AuditLike) => r.action === 'transition' && r.field === 'status';
const sameMoment = (a: AuditLike, b: AuditLike) => a.at === b.at && a.who === b.who;

/** Merge the rows of each status step into one, newest first as given. */
export function collapseAuditRows<T extends AuditLike>(rows: readonly T[]): AuditDisplayRow<T>[] {
  const statusRows = rows.filter(isStatus);
  const stepAt = (r: AuditLike) => statusRows.find((s) => sameMoment(s, r));
  const out: AuditDisplayRow<T>[] = [];
  for (const r of rows) {
    if (r.action === 'transition' && r.field === 'reason' && stepAt(r)) continue;
    if (r.field === 'closedAt' || r.field === 'closed_at') {
      const s = stepAt(r);
      if (s && (s.newValue === 'closed' || s.oldValue === 'closed')) continue;
    }
    const reason = isStatus(r) ? (rows.find((x) => x.action === 'transition' && x.field === 'reason' && sameMoment(x, r))?.newValue ?? null) : null;
    out.push({ ...r, reason });
  }
  return out;
}
