import { describe, expect, it } from 'vitest';
import { latestReason, reasonedStep } from './status-reason';

const t = (from: string, to: string, reason: string | null = null, at = '2026-12-02T17:00:00.000Z') => ({ at, from, to, by: 'Marta', reason });

describe('latestReason', () => {
  it('names re-open, cancel and restore steps only', () => {
    expect(reasonedStep({ from: 'closed', to: 'diagnosing' })).toBe('reopened');
    expect(reasonedStep({ from: 'repaired', to: 'cancelled' })).toBe('cancelled');
    expect(reasonedStep({ from: 'cancelled', to: 'reported' })).toBe('restored');
    expect(reasonedStep({ from: 'repaired', to: 'diagnosing' })).toBeNull();
  });
  it('keeps the re-open reason through the work that follows it', () => {
    const tl = [t('reported', 'diagnosing'), t('diagnosing', 'repaired'), t('repaired', 'closed'), t('closed', 'diagnosing', 'Still stops part way'), t('diagnosing', 'repaired')];
    expect(latestReason(tl)).toMatchObject({ kind: 'reopened', reason: 'Still stops part way' });
  });
  it('forgets it once the defect is closed again, and takes the newest of several', () => {
    expect(latestReason([t('closed', 'diagnosing', 'Came back'), t('diagnosing', 'closed')])).toBeNull();
    expect(latestReason([t('reported', 'cancelled', 'Duplicate'), t('cancelled', 'reported', 'Not a duplicate after all')])).toMatchObject({ kind: 'restored', reason: 'Not a duplicate after all' });
    expect(latestReason([t('reported', 'cancelled', 'Duplicate')])).toMatchObject({ kind: 'cancelled' });
  });
  it('is null without a reasoned step, or for one without a reason (imported history)', () => {
    expect(latestReason([])).toBeNull();
    expect(latestReason([t('reported', 'diagnosing')])).toBeNull();
    expect(latestReason([t('closed', 'diagnosing', null)])).toBeNull();
  });
});
