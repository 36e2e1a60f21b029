/**
 * What the trace plot draws for one view of a capture: both channels over a time window, min/max-decimated
 * to the plot's pixel columns (decimate.ts) so that edges, glitches and one-sample spikes survive at any
 * zoom, or every sample once the window holds fewer than two per column; plus the detected edges inside the
 * window. The result is plain JSON (numbers rounded, empty columns as null) for GET /api/traces/{id}/samples.
 * In raw mode the samples just outside the window are sent too (when the window's edge falls between two
 * samples), so the line reaches both edges of the plot instead of starting a sample's width inside it.
 */
import type { CaptureData } from './capture-parse';
import { isRisingEdge, type EdgeTrain } from './crossings';
import { decimateMinMax } from './decimate';

/** Most pixel columns a window may ask for (a very wide screen at device-pixel ratio 2). */
export const MAX_PLOT_COLUMNS = 4000;
/** Edges per channel sent at most; beyond this the window is too wide for edge marks to be readable. */
export const EDGE_MARK_LIMIT = 1000;

/** One channel of a window: per-column lows and highs, or (raw) the samples in `min` and `max` null. */
export interface PlotSeries {
  min: Array<number | null>;
  /** Per-column highs; null in raw mode, where `min` holds the samples themselves. */
  max: Array<number | null> | null;
}

/** Edges of one channel inside the window. */
export interface PlotEdges {
  /** Mid-reference instants, seconds (empty when `tooMany`). */
  timesS: number[];
  /** Polarity of timesS[0]; they alternate. */
  firstRising: boolean;
  /** Edges inside the window. */
  count: number;
  /** More than EDGE_MARK_LIMIT edges: none are listed. */
  tooMany: boolean;
}

/** A plot-ready view of a capture. */
export interface PlotWindow {
  mode: 'raw' | 'minmax';
  /** The window drawn (clamped to the capture), seconds. */
  fromS: number;
  toS: number;
  /** The whole capture, seconds. */
  startS: number;
  endS: number;
  columns: number;
  /** Samples of the capture inside the window, and in all. */
  windowSamples: number;
  totalSamples: number;
  /** Sample instants (raw, with the neighbouring sample beyond an edge that falls between samples) or column centres (minmax), seconds. */
  timeS: number[];
  a: PlotSeries;
  b: PlotSeries;
  edges: { a: PlotEdges; b: PlotEdges };
}

/** Round to `digits` significant digits (JSON stays short; plots need no more). */
function sig(x: number, digits: number): number {
  return x === 0 || !Number.isFinite(x) ? x : Number(x.toPrecision(digits));
}

/** Volts to 0.1 mV; NaN (an empty column) becomes null. */
function volts(x: number): number | null {
  return Number.isNaN(x) ? null : Math.round(x * 1e4) / 1e4 + 0;
}

/** Edges of a train within [fromS, toS]. */
function edgesIn(train: EdgeTrain, fromS: number, toS: number): PlotEdges {
  const t = train.timesS;
  let lo = 0;
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (t[mid]! < fromS) lo = mid + 1;
    else hi = mid;
  }
  let end = lo;
  while (end < t.length && t[end]! <= toS) end++;
  const count = end - lo;
  const tooMany = count > EDGE_MARK_LIMIT;
  const timesS: number[] = [];
  if (!tooMany) for (let k = lo; k < end; k++) timesS.push(sig(t[k]!, 12));
  return { timesS, firstRising: count > 0 ? isRisingEdge(train, lo) : train.firstRising, count, tooMany };
}

/**
 * Build the window [fromS, toS] (clamped to the capture; the whole capture when absent) at `columns` pixel
 * columns.
 */
export function buildPlotWindow(
  capture: CaptureData,
  edges: { a: EdgeTrain; b: EdgeTrain },
  opts: { fromS?: number; toS?: number; columns: number },
): PlotWindow {
  const n = capture.time.length;
  if (!Number.isInteger(opts.columns) || opts.columns < 1 || opts.columns > MAX_PLOT_COLUMNS) {
    throw new RangeError(`columns must be a whole number from 1 to ${MAX_PLOT_COLUMNS}`);
  }
  if (n === 0) throw new RangeError('the capture has no samples');
  const startS = capture.time[0]!;
  const endS = capture.time[n - 1]!;
  const fromS = Math.max(startS, opts.fromS ?? startS);
  const toS = Math.min(endS, opts.toS ?? endS);
  if (!(toS > fromS)) throw new RangeError('the window must end after it starts and overlap the capture');
  const da = decimateMinMax(capture.time, capture.a, fromS, toS, opts.columns);
  const db = decimateMinMax(capture.time, capture.b, fromS, toS, opts.columns);
  const raw = da.mode === 'raw';
  // Raw: add the sample before and after the window when the window's edge falls between samples (by more than a
  // hundredth of a sample interval, so that an edge on a sample, give or take rounding, adds nothing).
  const t = capture.time;
  const gapBefore = (i: number) => i >= n || t[i]! - fromS > 0.01 * (t[i]! - t[i - 1]!);
  const gapAfter = (i: number) => i < 0 || toS - t[i]! > 0.01 * (t[i + 1]! - t[i]!);
  const before = raw && da.fromIndex > 0 && (da.toIndex === da.fromIndex || gapBefore(da.fromIndex)) ? da.fromIndex - 1 : null;
  const after = raw && da.toIndex < n && (da.toIndex === da.fromIndex || gapAfter(da.toIndex - 1)) ? da.toIndex : null;
  const pad = (inside: ArrayLike<number>, all: Float64Array): number[] => [
    ...(before === null ? [] : [all[before]!]),
    ...Array.from(inside),
    ...(after === null ? [] : [all[after]!]),
  ];
  const series = (d: typeof da, all: Float64Array): PlotSeries => ({
    min: (raw ? pad(d.minV, all) : Array.from(d.minV)).map(volts),
    max: raw ? null : Array.from(d.maxV, volts),
  });
  return {
    mode: da.mode,
    fromS: sig(fromS, 12),
    toS: sig(toS, 12),
    startS: sig(startS, 12),
    endS: sig(endS, 12),
    columns: opts.columns,
    windowSamples: da.toIndex - da.fromIndex,
    totalSamples: n,
    timeS: (raw ? pad(da.timeS, capture.time) : Array.from(da.timeS)).map((t) => sig(t, 12)),
    a: series(da, capture.a),
    b: series(db, capture.b),
    edges: { a: edgesIn(edges.a, fromS, toS), b: edgesIn(edges.b, fromS, toS) },
  };
}

/**
 * Points to draw one channel of a window as a single line: raw samples as they are; each min/max column as
 * two points at the column centre, ordered to continue from the previous column (a rising edge draws low
 * then high, a falling edge high then low), so edges become vertical strokes and spikes stay visible.
 * Empty columns become a gap (null).
 */
export function toLinePoints(window: Pick<PlotWindow, 'mode' | 'timeS'>, series: PlotSeries): { x: number[]; y: Array<number | null> } {
  const t = window.timeS;
  if (window.mode === 'raw' || series.max === null) return { x: t.slice(), y: series.min.slice() };
  const x: number[] = [];
  const y: Array<number | null> = [];
  let previous: number | null = null;
  for (let c = 0; c < t.length; c++) {
    const lo = series.min[c] ?? null;
    const hi = series.max[c] ?? null;
    if (lo === null || hi === null) {
      x.push(t[c]!);
      y.push(null);
      previous = null;
      continue;
    }
    const highFirst: boolean = previous !== null && Math.abs(previous - hi) < Math.abs(previous - lo);
    x.push(t[c]!, t[c]!);
    if (highFirst) y.push(hi, lo);
    else y.push(lo, hi);
    previous = highFirst ? lo : hi;
  }
  return { x, y };
}
