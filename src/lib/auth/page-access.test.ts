import { describe, expect, it } from 'vitest';
import { pageArea } from './page-access';
import { can } from './permissions';

describe('pageArea', () => {
  it('finds the area of a page and of the pages under it', () => {
    expect(pageArea('/patterns')).toEqual({ area: 'Patterns', permission: 'pattern:read', who: 'depot supervisors, fleet managers and admins' });
    expect(pageArea('/patterns/2')?.area).toBe('Patterns');
    expect(pageArea('/patterns/2/evidence')?.area).toBe('Patterns');
    expect(pageArea('/import')?.permission).toBe('import');
    expect(pageArea('/people/')?.permission).toBe('user:write');
    expect(pageArea('/settings')?.permission).toBe('settings:write');
  });

  it('leaves pages every role opens, and look-alike paths, alone', () => {
    for (const p of ['/', '/defects', '/defects/12', '/vehicles', '/traces', '/depots', '/modules', '/patternsx', '/importer', '/nope']) {
      expect(pageArea(p), p).toBeNull();
    }
  });

  it('matches the permission table: a technician may open none of the areas, an admin all', () => {
    for (const p of ['/patterns/2', '/import', '/people', '/settings']) {
      const a = pageArea(p)!;
      expect(can('technician', a.permission), p).toBe(false);
      expect(can('admin', a.permission), p).toBe(true);
    }
    expect(can('supervisor', pageArea('/patterns')!.permission)).toBe(true);
    expect(can('manager', pageArea('/import')!.permission)).toBe(true);
    expect(can('manager', pageArea('/settings')!.permission)).toBe(false);
  });
});
