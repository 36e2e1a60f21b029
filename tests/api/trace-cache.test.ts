// The parsed-capture LRU behind the plot windows: least recently used out first, by count and by bytes.
import { beforeEach, describe, expect, it } from 'vitest';
import { MAX_CACHE_BYTES, MAX_CACHE_ENTRIES, captureCacheStats, clearCaptureCache, loadCapture, rememberCapture } from '../../src/server/traces/capture-cache';

const none = { a: { timesS: new Float64Array(0), firstRising: true, initialHigh: false }, b: { timesS: new Float64Array(0), firstRising: true, initialHigh: false } };
const tiny = () => ({ time: Float64Array.of(0, 1), a: Float64Array.of(0, 1), b: Float64Array.of(1, 0) });

beforeEach(() => clearCaptureCache());

describe('capture cache', () => {
  it(`keeps at most ${MAX_CACHE_ENTRIES} captures, dropping the least recently used`, async () => {
    for (let i = 0; i < MAX_CACHE_ENTRIES; i++) rememberCapture(`h${i}`, tiny(), none);
    await loadCapture('h0', '/nonexistent'); // a hit: h0 becomes the most recent, h1 the least
    rememberCapture('h-new', tiny(), none);
    expect(captureCacheStats().entries).toBe(MAX_CACHE_ENTRIES);
    await expect(loadCapture('h0', '/nonexistent')).resolves.toMatchObject({ sha256: 'h0' });
    await expect(loadCapture('h1', '/nonexistent')).rejects.toMatchObject({ code: 'ENOENT' });
    expect(captureCacheStats()).toMatchObject({ hits: 2, misses: 1 });
  });

  it('drops older captures to stay within the byte budget, but keeps the one just added', () => {
    const big = () => {
      const n = Math.ceil(MAX_CACHE_BYTES / 8 / 3 / 2) + 1; // three arrays of this many doubles pass half the budget
      return { time: new Float64Array(n), a: new Float64Array(n), b: new Float64Array(n) };
    };
    rememberCapture('first', big(), none);
    rememberCapture('second', big(), none);
    const s = captureCacheStats();
    expect(s.entries).toBe(1);
    expect(s.bytes).toBeLessThanOrEqual(MAX_CACHE_BYTES);
  });

  it('a failed read caches nothing', async () => {
    await expect(loadCapture('missing', '/nonexistent/file.csv')).rejects.toMatchObject({ code: 'ENOENT' });
    expect(captureCacheStats()).toMatchObject({ entries: 0, bytes: 0, misses: 1 });
  });
});
