import { describe, expect, it } from 'vitest';
import type { EdgeTrain } from './crossings';
import { EDGE_MARK_LIMIT, MAX_PLOT_COLUMNS, buildPlotWindow, toLinePoints } from './plot-window';

/** 1000 samples at 1 kHz (t = 0 .. 0.999 s): A a square wave of period 100 samples, B flat 1 V with one spike. */
function capture() {
  const time = Float64Array.from({ length: 1000 }, (_, i) => i / 1000);
  const a = Float64Array.from({ length: 1000 }, (_, i) => (i % 100 < 50 ? 5 : 0));
  const b = new Float64Array(1000).fill(1);
  b[437] = 3.25; // one sample wide
  return { time, a, b };
}

/** A's transitions: falls at 49.5, 149.5 ... ms, rises at 99.5, 199.5 ... ms (first falling, since A starts high). */
const edgesA: EdgeTrain = {
  timesS: Float64Array.from({ length: 19 }, (_, k) => (49.5 + 50 * k) / 1000),
  firstRising: false,
  initialHigh: true,
};
const none: EdgeTrain = { timesS: new Float64Array(0), firstRising: true, initialHigh: false };

describe('buildPlotWindow', () => {
  it('decimates the whole capture to min/max columns, keeping a one-sample spike', () => {
    const w = buildPlotWindow(capture(), { a: edgesA, b: none }, { columns: 100 });
    expect(w.mode).toBe('minmax');
    expect(w.timeS).toHaveLength(100);
    expect(w.a.min).toHaveLength(100);
    expect(w.a.max).toHaveLength(100);
    expect(w.fromS).toBe(0);
    expect(w.toS).toBe(0.999);
    expect(w.windowSamples).toBe(1000);
    expect(w.totalSamples).toBe(1000);
    // Column width 9.99 ms: the spike at 437 ms falls in column 43 (437 / 9.99 = 43.7).
    expect(w.b.max![43]).toBe(3.25);
    expect(w.b.min[43]).toBe(1);
    expect(Math.max(...(w.b.max as number[]).filter((_, c) => c !== 43))).toBe(1);
    // Column 4 (39.96-49.95 ms) holds samples 40-49, all high (the fall comes after sample 49).
    expect([w.a.min[4], w.a.max![4]]).toEqual([5, 5]);
    // Column 5 (49.95-59.94 ms) holds samples 50-59: low.
    expect([w.a.min[5], w.a.max![5]]).toEqual([0, 0]);
  });

  it('returns every sample in the window (raw) when it holds fewer than two per column', () => {
    const w = buildPlotWindow(capture(), { a: edgesA, b: none }, { fromS: 0.43, toS: 0.44, columns: 800 });
    expect(w.mode).toBe('raw');
    expect(w.timeS).toEqual([0.43, 0.431, 0.432, 0.433, 0.434, 0.435, 0.436, 0.437, 0.438, 0.439, 0.44]);
    expect(w.b.min).toEqual([1, 1, 1, 1, 1, 1, 1, 3.25, 1, 1, 1]);
    expect(w.b.max).toBeNull();
    expect(w.windowSamples).toBe(11);
  });

  it('sends the samples just outside a raw window whose edges fall between samples, so the line reaches the edges', () => {
    // Samples every 1 ms; a window from 430.4 ms to 439.6 ms holds 431…439 and has 430 and 440 just outside it.
    const w = buildPlotWindow(capture(), { a: edgesA, b: none }, { fromS: 0.4304, toS: 0.4396, columns: 800 });
    expect(w.mode).toBe('raw');
    expect(w.timeS).toEqual([0.43, 0.431, 0.432, 0.433, 0.434, 0.435, 0.436, 0.437, 0.438, 0.439, 0.44]);
    expect(w.timeS[0]!).toBeLessThan(w.fromS);
    expect(w.timeS[w.timeS.length - 1]!).toBeGreaterThan(w.toS);
    expect(w.b.min).toEqual([1, 1, 1, 1, 1, 1, 1, 3.25, 1, 1, 1]);
    // Only the samples inside the window count as shown.
    expect(w.windowSamples).toBe(9);
    // At the ends of the capture there is nothing beyond to add.
    const start = buildPlotWindow(capture(), { a: edgesA, b: none }, { fromS: 0, toS: 0.0055, columns: 800 });
    expect(start.timeS).toEqual([0, 0.001, 0.002, 0.003, 0.004, 0.005, 0.006]);
  });

  it('clamps the window to the capture and lists the edges inside it with their polarity', () => {
    const w = buildPlotWindow(capture(), { a: edgesA, b: none }, { fromS: -5, toS: 0.2, columns: 10 });
    expect(w.fromS).toBe(0);
    expect(w.toS).toBe(0.2);
    expect(w.edges.a).toEqual({ timesS: [0.0495, 0.0995, 0.1495, 0.1995], firstRising: false, count: 4, tooMany: false });
    const later = buildPlotWindow(capture(), { a: edgesA, b: none }, { fromS: 0.06, toS: 0.16, columns: 10 });
    expect(later.edges.a).toEqual({ timesS: [0.0995, 0.1495], firstRising: true, count: 2, tooMany: false });
    expect(later.edges.b).toEqual({ timesS: [], firstRising: true, count: 0, tooMany: false });
  });

  it(`lists no edges beyond ${EDGE_MARK_LIMIT} in a window, only their count`, () => {
    const n = 5000;
    const many: EdgeTrain = { timesS: Float64Array.from({ length: n }, (_, k) => (k + 0.5) / 5000), firstRising: true, initialHigh: false };
    const w = buildPlotWindow(capture(), { a: many, b: none }, { columns: 50 });
    expect(w.edges.a.tooMany).toBe(true);
    expect(w.edges.a.count).toBe(4995); // edges up to 0.999 s
    expect(w.edges.a.timesS).toEqual([]);
  });

  it('refuses bad columns and empty windows', () => {
    expect(() => buildPlotWindow(capture(), { a: none, b: none }, { columns: 0 })).toThrow(RangeError);
    expect(() => buildPlotWindow(capture(), { a: none, b: none }, { columns: MAX_PLOT_COLUMNS + 1 })).toThrow(RangeError);
    expect(() => buildPlotWindow(capture(), { a: none, b: none }, { columns: 1.5 })).toThrow(RangeError);
    expect(() => buildPlotWindow(capture(), { a: none, b: none }, { fromS: 0.5, toS: 0.5, columns: 10 })).toThrow(RangeError);
    expect(() => buildPlotWindow(capture(), { a: none, b: none }, { fromS: 2, toS: 3, columns: 10 })).toThrow(RangeError);
  });
});

describe('toLinePoints', () => {
  it('passes raw samples through', () => {
    expect(toLinePoints({ mode: 'raw', timeS: [0, 1, 2] }, { min: [1, 2, 3], max: null })).toEqual({ x: [0, 1, 2], y: [1, 2, 3] });
  });

  it('draws each column as two points continuing from the previous one, with gaps for empty columns', () => {
    // low, rising edge, high, falling edge, low, empty, spike column
    const r = toLinePoints(
      { mode: 'minmax', timeS: [0, 1, 2, 3, 4, 5, 6] },
      { min: [0, 0, 5, 0, 0, null, 0], max: [0.1, 5, 5.1, 5, 0.1, null, 4] },
    );
    expect(r.x).toEqual([0, 0, 1, 1, 2, 2, 3, 3, 4, 4, 5, 6, 6]);
    expect(r.y).toEqual([0, 0.1, 0, 5, 5, 5.1, 5, 0, 0, 0.1, null, 0, 4]);
  });
});
