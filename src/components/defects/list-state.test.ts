import { describe, expect, it } from 'vitest';
import {
  activeFilterCount,
  applyDefectPatch,
  clearFiltersPatch,
  defectExportHref,
  defectStateToSearch,
  defectTab,
  dateRangeProblem,
  initialDefectState,
  normaliseDefectState,
  pickDefectState,
  searchToDefectState,
  tabPatch,
} from './list-state';

describe('pickDefectState / searchToDefectState / defectStateToSearch', () => {
  it('keeps only list keys with values, in the canonical order', () => {
    const s = pickDefectState({ status: 'closed', foo: 'bar', page: '2', q: '  ', depot: 'GHQ', mine: '1' });
    expect(s).toEqual({ mine: '1', depot: 'GHQ', status: 'closed', page: '2' });
    expect(Object.keys(s)).toEqual(['mine', 'depot', 'status', 'page']);
  });
  it('reads a query string, dropping unknown keys and trimming values', () => {
    expect(searchToDefectState('?depot=SMP&utm=x&olderThanDays=30&q=+door+')).toEqual({ depot: 'SMP', olderThanDays: '30', q: 'door' });
    expect(searchToDefectState('')).toEqual({});
  });
  it('writes the same URL whatever order the keys were set in', () => {
    expect(defectStateToSearch({ status: 'reported,diagnosing', depot: 'GHQ', open: '1' })).toBe('?open=1&depot=GHQ&status=reported%2Cdiagnosing');
    expect(defectStateToSearch({ open: '1', status: 'reported,diagnosing', depot: 'GHQ' })).toBe('?open=1&depot=GHQ&status=reported%2Cdiagnosing');
    expect(defectStateToSearch({})).toBe('');
  });
  it('round-trips a state through its URL', () => {
    const s = { mine: '0', q: 'B1A21', module: 'WLR-2', position: 'FL,FR', repeat: '1', reportedFrom: '2026-01-01', reportedTo: '2026-01-31', sort: 'reportedAt', page: '3' };
    expect(searchToDefectState(defectStateToSearch(s))).toEqual(s);
  });
});

describe('initialDefectState', () => {
  it('lands a technician with no list parameters on their open defects', () => {
    expect(initialDefectState({}, true)).toEqual({ mine: '1', open: '1' });
    expect(initialDefectState({ utm: 'x' }, true)).toEqual({ mine: '1', open: '1' });
  });
  it('keeps an explicit view, including the "All defects" tab (mine=0)', () => {
    expect(initialDefectState({ mine: '0' }, true)).toEqual({ mine: '0' });
    expect(initialDefectState({ depot: 'GHQ' }, true)).toEqual({ depot: 'GHQ' });
  });
  it('starts everyone else on everything in their depots', () => {
    expect(initialDefectState({}, false)).toEqual({});
  });
});

describe('tabs', () => {
  it('tells the tab from mine', () => {
    expect(defectTab({ mine: '1' })).toBe('mine');
    expect(defectTab({ mine: 'true' })).toBe('mine');
    expect(defectTab({ mine: '0' })).toBe('all');
    expect(defectTab({})).toBe('all');
  });
  it('switches to "My open defects" with mine and open', () => {
    expect(applyDefectPatch({ depot: 'GHQ', page: '4' }, tabPatch('mine', true))).toEqual({ mine: '1', open: '1', depot: 'GHQ' });
  });
  it('switches to "All defects" with mine=0 for a technician, without mine for others', () => {
    expect(applyDefectPatch({ mine: '1', open: '1', q: 'x' }, tabPatch('all', true))).toEqual({ mine: '0', q: 'x' });
    expect(applyDefectPatch({ mine: '1', open: '1', q: 'x' }, tabPatch('all', false))).toEqual({ q: 'x' });
  });
});

describe('applyDefectPatch', () => {
  it('sets and removes keys and goes back to page 1 on any filter change', () => {
    expect(applyDefectPatch({ status: 'reported', page: '5' }, { status: undefined, moisture: 'corrosion' })).toEqual({ moisture: 'corrosion' });
    expect(applyDefectPatch({ q: 'x' }, { q: '' })).toEqual({});
  });
  it('keeps the page when paging', () => {
    expect(applyDefectPatch({ depot: 'GHQ', page: '2' }, { page: '3' }, false)).toEqual({ depot: 'GHQ', page: '3' });
  });
  it('ignores keys that are not the list\'s', () => {
    expect(applyDefectPatch({}, { evil: '1' })).toEqual({});
  });
});

describe('activeFilterCount / clearFiltersPatch', () => {
  it('counts each value of a multi-value filter, not the tab, sort or paging', () => {
    expect(activeFilterCount({ mine: '1', sort: 'ref', page: '2', pageSize: '100' })).toBe(0);
    expect(activeFilterCount({ status: 'reported,diagnosing', position: 'FL', repeat: '1', olderThanDays: '30' })).toBe(5);
  });
  it('clears every filter but keeps the tab (with its own "open only"), sort and page size', () => {
    const s = { mine: '1', open: '1', depot: 'GHQ', q: 'x', vin: 'V', sort: 'ref', pageSize: '100', page: '2' };
    expect(applyDefectPatch(s, clearFiltersPatch())).toEqual({ mine: '1', open: '1', sort: 'ref', pageSize: '100' });
    expect(applyDefectPatch({ mine: '0', open: '1', q: 'x' }, clearFiltersPatch())).toEqual({ mine: '0' });
  });
  it('does not count "open" as a filter on the "My open defects" tab', () => {
    expect(activeFilterCount({ mine: '1', open: '1' })).toBe(0);
    expect(activeFilterCount({ mine: '1', open: '1', depot: 'GHQ' })).toBe(1);
    expect(activeFilterCount({ open: '1' })).toBe(1);
  });
});

describe('"My open defects" keeps its own constraint', () => {
  it('never shows closed or cancelled defects under the tab, whatever the patch', () => {
    expect(applyDefectPatch({ mine: '1', open: '1' }, { open: undefined })).toEqual({ mine: '1', open: '1' });
    expect(applyDefectPatch({ mine: '1', open: '1' }, { status: 'closed,cancelled' })).toEqual({ mine: '1', open: '1' });
    expect(applyDefectPatch({ mine: '1', open: '1' }, { status: 'diagnosing,closed' })).toEqual({ mine: '1', open: '1', status: 'diagnosing' });
    expect(defectTab(applyDefectPatch({ mine: '1', open: '1' }, clearFiltersPatch()))).toBe('mine');
  });
  it('normalises a shared link and Back/Forward to the tab\'s view', () => {
    expect(initialDefectState({ mine: '1' }, false)).toEqual({ mine: '1', open: '1' });
    expect(initialDefectState({ mine: 'true', status: 'cancelled' }, true)).toEqual({ mine: '1', open: '1' });
    expect(searchToDefectState('?mine=1&open=0')).toEqual({ mine: '1', open: '1' });
  });
  it('leaves "All defects" alone', () => {
    expect(normaliseDefectState({ mine: '0', status: 'closed' })).toEqual({ mine: '0', status: 'closed' });
    expect(normaliseDefectState({ open: '0' })).toEqual({ open: '0' });
  });
});

describe('dateRangeProblem', () => {
  it('flags a "from" after the "to" and accepts the rest', () => {
    expect(dateRangeProblem({ reportedFrom: '2026-11-30', reportedTo: '2026-11-01' })).toBe('"Reported from" is after "Reported to". Change one of the dates to see the list.');
    expect(dateRangeProblem({ reportedFrom: '2026-11-01', reportedTo: '2026-11-01' })).toBeNull();
    expect(dateRangeProblem({ reportedFrom: '2026-11-01', reportedTo: '2026-11-30' })).toBeNull();
    expect(dateRangeProblem({ reportedFrom: '2026-11-30' })).toBeNull();
    expect(dateRangeProblem({})).toBeNull();
  });
});

describe('defectExportHref', () => {
  it('links the export with the same filters and sort and without paging', () => {
    expect(defectExportHref({ open: '1', depot: 'GHQ', sort: '-reportedAt', page: '3', pageSize: '25' })).toBe('/api/defects/export?open=1&depot=GHQ&sort=-reportedAt');
    expect(defectExportHref({})).toBe('/api/defects/export');
  });
});
