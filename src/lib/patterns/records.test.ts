import { describe, expect, it } from 'vitest';
import {
  canMovePatternStatus,
  computePatternChanges,
  describeRangeChange,
  diffCampaign,
  groupPatternHistory,
  isCampaignOverdue,
  formatBuildRange,
  formatDay,
  formatMonth,
  matchPatternRecord,
  overlapMonths,
  planPatternSync,
  PATTERN_STATUS_VALUES,
  type PatternStatus,
} from './records';

// Literal inputs, outcomes worked out by hand from the rules in docs/decisions/011.

describe('status moves', () => {
  it('allows exactly the documented moves', () => {
    const allowed: string[] = [];
    for (const from of PATTERN_STATUS_VALUES) for (const to of PATTERN_STATUS_VALUES) if (canMovePatternStatus(from, to)) allowed.push(`${from}>${to}`);
    expect(allowed).toEqual([
      'new>acknowledged',
      'new>campaign_planned',
      'new>dismissed',
      'acknowledged>campaign_planned',
      'acknowledged>dismissed',
      'campaign_planned>campaign_planned',
      'campaign_planned>resolved',
      'campaign_planned>dismissed',
      'resolved>acknowledged',
      'dismissed>acknowledged',
    ]);
  });
  it('never goes back to new and never resolves without a campaign', () => {
    for (const from of PATTERN_STATUS_VALUES) expect(canMovePatternStatus(from, 'new')).toBe(false);
    expect((['new', 'acknowledged', 'dismissed'] as PatternStatus[]).some((s) => canMovePatternStatus(s, 'resolved'))).toBe(false);
  });
});

describe('build ranges', () => {
  it('counts shared months, inclusive, across a year end', () => {
    expect(overlapMonths({ buildFrom: '2022-10', buildTo: '2023-03' }, { buildFrom: '2023-01', buildTo: '2023-06' })).toBe(3);
    expect(overlapMonths({ buildFrom: '2022-10', buildTo: '2023-03' }, { buildFrom: '2023-03', buildTo: '2023-03' })).toBe(1);
    expect(overlapMonths({ buildFrom: '2022-10', buildTo: '2023-03' }, { buildFrom: '2023-04', buildTo: '2023-06' })).toBe(0);
  });
  it('names a change of range', () => {
    const was = { buildFrom: '2022-10', buildTo: '2023-03' };
    expect(describeRangeChange(was, { buildFrom: '2022-10', buildTo: '2023-03' })).toBe('same');
    expect(describeRangeChange(was, { buildFrom: '2022-09', buildTo: '2023-03' })).toBe('widened');
    expect(describeRangeChange(was, { buildFrom: '2022-11', buildTo: '2023-02' })).toBe('narrowed');
    expect(describeRangeChange(was, { buildFrom: '2022-12', buildTo: '2023-05' })).toBe('moved');
  });
  it('writes a range in words', () => {
    expect(formatBuildRange({ buildFrom: '2022-10', buildTo: '2023-03' })).toBe('Oct 2022 – Mar 2023');
    expect(formatBuildRange({ buildFrom: '2024-02', buildTo: '2024-02' })).toBe('Feb 2024');
  });
});

describe('matching a cohort to its record', () => {
  const records = [
    { id: 1, key: 'WLR-2:high', buildFrom: '2021-01', buildTo: '2021-06', lastSeenAt: 100 },
    { id: 2, key: 'WLR-2:high', buildFrom: '2022-10', buildTo: '2023-03', lastSeenAt: 200 },
    { id: 3, key: 'WLR-2:medium', buildFrom: '2022-10', buildTo: '2023-03', lastSeenAt: 200 },
    { id: 4, key: 'WLR-2:high', buildFrom: '2023-02', buildTo: '2023-08', lastSeenAt: 300 },
  ];
  it('needs the same key and an overlapping range', () => {
    expect(matchPatternRecord({ key: 'WLR-2:low', buildFrom: '2022-10', buildTo: '2023-03' }, records)).toBeNull();
    expect(matchPatternRecord({ key: 'WLR-2:high', buildFrom: '2021-07', buildTo: '2022-09' }, records)).toBeNull();
    expect(matchPatternRecord({ key: 'WLR-2:medium', buildFrom: '2023-01', buildTo: '2023-01' }, records)?.id).toBe(3);
  });
  it('prefers the largest overlap, then the most recently seen, then the lowest id', () => {
    // 2022-11..2023-04 shares 5 months with record 2 and 3 with record 4.
    expect(matchPatternRecord({ key: 'WLR-2:high', buildFrom: '2022-11', buildTo: '2023-04' }, records)?.id).toBe(2);
    // 2023-02..2023-03 shares 2 months with both: record 4 was seen later.
    expect(matchPatternRecord({ key: 'WLR-2:high', buildFrom: '2023-02', buildTo: '2023-03' }, records)?.id).toBe(4);
    const tied = [
      { id: 9, key: 'K', buildFrom: '2020-01', buildTo: '2020-03', lastSeenAt: 5 },
      { id: 8, key: 'K', buildFrom: '2020-02', buildTo: '2020-04', lastSeenAt: 5 },
    ];
    expect(matchPatternRecord({ key: 'K', buildFrom: '2020-02', buildTo: '2020-03' }, tied)?.id).toBe(8);
  });
});

describe('planning a sync', () => {
  const records = [
    { id: 1, key: 'WLR-2:high', buildFrom: '2022-10', buildTo: '2023-03', lastSeenAt: 1 },
    { id: 2, key: 'MRM-4:high', buildFrom: '2024-02', buildTo: '2024-07', lastSeenAt: 1 },
    { id: 3, key: 'DLA-1:low', buildFrom: '2020-01', buildTo: '2020-06', lastSeenAt: 1 },
  ];
  const cohorts = [
    { key: 'WLR-2:high', buildFrom: '2022-09', buildTo: '2023-03', significant: true }, // widened: record 1
    { key: 'MRM-4:high', buildFrom: '2024-03', buildTo: '2024-07', significant: false }, // still updates record 2
    { key: 'MRM-4:medium', buildFrom: '2024-02', buildTo: '2024-07', significant: true }, // new
    { key: 'DLA-1:low', buildFrom: '2023-01', buildTo: '2023-04', significant: true }, // no overlap with 3: new
    { key: 'WSW-1:low', buildFrom: '2021-01', buildTo: '2021-02', significant: false }, // nothing to do
  ];
  const plan = planPatternSync(cohorts, records);
  it('creates records only for significant cohorts without one', () => {
    expect(plan.create.map((c) => `${c.key} ${c.buildFrom}`)).toEqual(['MRM-4:medium 2024-02', 'DLA-1:low 2023-01']);
  });
  it('updates matched records, significant or not, and leaves the rest unmatched', () => {
    expect(plan.update.map((u) => [u.record.id, u.cohort.buildFrom])).toEqual([
      [1, '2022-09'],
      [2, '2024-03'],
    ]);
    expect(plan.unmatched.map((r) => r.id)).toEqual([3]);
  });
  it('gives each record to one cohort at most', () => {
    const twice = planPatternSync(
      [
        { key: 'K', buildFrom: '2020-01', buildTo: '2020-02', significant: true },
        { key: 'K', buildFrom: '2020-02', buildTo: '2020-03', significant: true },
      ],
      [{ id: 7, key: 'K', buildFrom: '2020-01', buildTo: '2020-03', lastSeenAt: 0 }],
    );
    expect(twice.update.map((u) => u.record.id)).toEqual([7]);
    expect(twice.create).toHaveLength(1);
  });
  it('does nothing on an empty report', () => {
    expect(planPatternSync([], records)).toEqual({ create: [], update: [], unmatched: records });
  });
});

describe('what changed since a person acted', () => {
  const base = { buildFrom: '2022-10', buildTo: '2023-03', failures: 53, significant: true, actedFailures: 53, actedBuildFrom: '2022-10', actedBuildTo: '2023-03', inLatestReport: true };
  it('nothing changed', () => {
    expect(computePatternChanges(base)).toEqual({ changed: false, range: 'same', newFailures: 0, noLongerSignificant: false, notInLatestReport: false, summary: [] });
  });
  it('a widened range with new failures', () => {
    const c = computePatternChanges({ ...base, buildFrom: '2022-09', failures: 58 });
    expect(c.changed).toBe(true);
    expect(c.range).toBe('widened');
    expect(c.newFailures).toBe(5);
    expect(c.summary).toEqual(['Build range widened from Oct 2022 – Mar 2023 to Sep 2022 – Mar 2023', '5 new failures']);
  });
  it('fewer failures than before is not a change; lost significance and a missing cohort are', () => {
    const c = computePatternChanges({ ...base, failures: 50, significant: false, inLatestReport: false });
    expect(c.newFailures).toBe(0);
    expect(c.summary).toEqual(['No longer significant', 'Not found in the latest report']);
  });
  it('one new failure reads in the singular', () => {
    expect(computePatternChanges({ ...base, failures: 54 }).summary).toEqual(['1 new failure']);
  });
});

describe('campaigns: overdue and revisions', () => {
  it('is overdue only while in force and after its target day', () => {
    expect(isCampaignOverdue('campaign_planned', '2026-12-01', '2026-12-02')).toBe(true);
    expect(isCampaignOverdue('campaign_planned', '2026-12-02', '2026-12-02')).toBe(false);
    expect(isCampaignOverdue('resolved', '2020-01-01', '2026-12-02')).toBe(false);
    expect(isCampaignOverdue('acknowledged', '2020-01-01', '2026-12-02')).toBe(false);
    expect(isCampaignOverdue('campaign_planned', null, '2026-12-02')).toBe(false);
  });

  it('a revision lists only the fields that changed, in form order', () => {
    const before = { kind: 'inspect_cohort', note: 'Inspect', targetDate: '2027-01-31' };
    expect(diffCampaign(before, before)).toEqual([]);
    expect(diffCampaign(before, { ...before, targetDate: '2027-02-28' })).toEqual([{ field: 'campaignTargetDate', oldValue: '2027-01-31', newValue: '2027-02-28' }]);
    expect(diffCampaign(null, before).map((c) => [c.field, c.oldValue])).toEqual([
      ['campaignKind', null],
      ['campaignNote', null],
      ['campaignTargetDate', null],
    ]);
  });
});

describe('groupPatternHistory', () => {
  const row = (id: number, at: string, action: string, field: string | null, newValue: string | null, who = 'Ann') => ({ id, at, who, action, field, oldValue: null, newValue });
  it('one entry per action: rows of one moment, person and action together, in the order written', () => {
    // Newest first, as the audit list answers.
    const rows = [
      row(9, '2026-12-02T10:00:00Z', 'campaign_revised', 'note', 'Torn membranes'),
      row(8, '2026-12-02T10:00:00Z', 'campaign_revised', 'campaignTargetDate', '2027-02-28'),
      row(7, '2026-12-01T09:00:00Z', 'status', 'note', 'Checking'),
      row(6, '2026-12-01T09:00:00Z', 'status', 'status', 'acknowledged'),
      row(5, '2026-12-01T09:00:00Z', 'status', 'status', 'dismissed', 'Bob'),
      row(1, '2026-11-30T08:00:00Z', 'found', null, 'WLR-2 high'),
    ];
    expect(groupPatternHistory(rows).map((e) => [e.id, e.action, e.who, e.text, e.changes.map((c) => c.field)])).toEqual([
      [8, 'campaign_revised', 'Ann', null, ['campaignTargetDate', 'note']],
      [6, 'status', 'Ann', null, ['status', 'note']],
      [5, 'status', 'Bob', null, ['status']],
      [1, 'found', 'Ann', 'WLR-2 high', []],
    ]);
    expect(groupPatternHistory([])).toEqual([]);
  });
});

describe('computePatternChanges over part of the fleet', () => {
  it('says where the new failures are', () => {
    const c = computePatternChanges({ buildFrom: '2022-10', buildTo: '2023-03', failures: 3, significant: true, actedFailures: 0, actedBuildFrom: '2022-10', actedBuildTo: '2023-03', inLatestReport: true }, 'in your depots');
    expect(c.summary).toEqual(['3 new failures in your depots']);
  });
});

describe('formatMonth and formatDay', () => {
  it('one month format: "Sep 2023", days "24 Sep 2023" (UTC day of an instant)', () => {
    expect(formatMonth('2023-09')).toBe('Sep 2023');
    expect(formatDay('2023-09-24')).toBe('24 Sep 2023');
    expect(formatDay('2023-09-24T23:30:00.000Z')).toBe('24 Sep 2023');
    expect(formatDay('2023-09-24T23:30:00-02:00')).toBe('25 Sep 2023');
    expect(formatDay(null)).toBe('–');
    expect(formatDay('soon')).toBe('soon');
  });
});
