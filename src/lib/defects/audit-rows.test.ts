import { describe, expect, it } from 'vitest';
import { collapseAuditRows, type AuditLike } from './audit-rows';

const row = (id: number, at: string, action: string, field: string | null, oldValue: string | null, newValue: string | null, who = 'Marta'): AuditLike => ({ id, at, who, action, field, oldValue, newValue });
const T1 = '2026-12-02T17:00:00.000Z';
const T2 = '2026-12-02T17:03:00.000Z';

describe('collapseAuditRows', () => {
  it('leaves out the closing time that mirrors a close, and keeps the status row', () => {
    const rows = [row(3, T1, 'update', 'closedAt', null, '1796230800000'), row(2, T1, 'transition', 'status', 'verified', 'closed'), row(1, '2026-12-02T16:00:00.000Z', 'update', 'action', null, 'Replaced')];
    expect(collapseAuditRows(rows).map((r) => [r.id, r.reason])).toEqual([
      [2, null],
      [1, null],
    ]);
  });
  it('joins the reason of a re-open to its status row, and drops the cleared closing time', () => {
    const rows = [
      row(9, T2, 'transition', 'reason', null, 'Driver says it still stops'),
      row(8, T2, 'update', 'verifiedById', '4', null),
      row(7, T2, 'update', 'closedAt', '1796230800000', null),
      row(6, T2, 'transition', 'status', 'closed', 'diagnosing'),
    ];
    expect(collapseAuditRows(rows).map((r) => [r.id, r.reason])).toEqual([
      [8, null],
      [6, 'Driver says it still stops'],
    ]);
  });
  it('keeps a closing time changed on its own, or by someone else at the same moment', () => {
    const rows = [row(5, T1, 'update', 'closedAt', '1', '2'), row(4, T1, 'transition', 'status', 'verified', 'closed', 'Oskar')];
    expect(collapseAuditRows(rows).map((r) => r.id)).toEqual([5, 4]);
    expect(collapseAuditRows([row(1, T1, 'update', 'closedAt', null, '2')]).map((r) => r.id)).toEqual([1]);
  });
  it('keeps a reason without a status row at its moment, and an empty trail empty', () => {
    expect(collapseAuditRows([row(1, T1, 'transition', 'reason', null, 'why')]).map((r) => r.id)).toEqual([1]);
    expect(collapseAuditRows([])).toEqual([]);
  });
});
