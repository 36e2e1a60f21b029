import { describe, expect, it } from 'vitest';
import { defectsHref } from './links';

describe('defectsHref', () => {
  it('writes flags as 1, leaves out absent ones and keeps a fixed order', () => {
    expect(defectsHref({})).toBe('/defects');
    expect(defectsHref({ status: 'diagnosing', depot: 'GHQ' })).toBe('/defects?depot=GHQ&status=diagnosing');
    expect(defectsHref({ repeat: true, reportedTo: '2026-01-31', reportedFrom: '2026-01-01', open: false })).toBe('/defects?repeat=1&reportedFrom=2026-01-01&reportedTo=2026-01-31');
    expect(defectsHref({ open: true, olderThanDays: 30, mine: true })).toBe('/defects?mine=1&open=1&olderThanDays=30');
  });
});
