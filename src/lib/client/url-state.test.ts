import { describe, expect, it } from 'vitest';
import { patchUrlState, urlStateSearch } from './url-state';

describe('patchUrlState', () => {
  it('sets and drops values and sends the page back to 1 on a filter change', () => {
    expect(patchUrlState({ depot: 'GHQ', page: '3' }, { parking: 'outdoor' }, true)).toEqual({ depot: 'GHQ', parking: 'outdoor' });
    expect(patchUrlState({ depot: 'GHQ', page: '3' }, { depot: '' }, true)).toEqual({});
    expect(patchUrlState({ depot: 'GHQ', page: '3' }, { depot: undefined }, false)).toEqual({ page: '3' });
  });
  it('keeps the page when asked, and takes a page given in the patch', () => {
    expect(patchUrlState({ q: 'x', page: '3' }, { sort: '-vin' }, false)).toEqual({ q: 'x', page: '3', sort: '-vin' });
    expect(patchUrlState({ q: 'x', page: '3' }, { page: '4' }, true)).toEqual({ q: 'x', page: '4' });
  });
});

describe('urlStateSearch', () => {
  it('writes a query string without empty values, encoded', () => {
    expect(urlStateSearch({})).toBe('');
    expect(urlStateSearch({ q: 'a b&c', depot: '' })).toBe('?q=a+b%26c');
    expect(urlStateSearch({ depot: 'GHQ', page: '2' })).toBe('?depot=GHQ&page=2');
  });
});
