/**
 * The trace plot island: both hall-sensor channels in stacked lanes (uPlot), drawn from min/max-decimated
 * windows of the stored capture (GET /api/traces/{id}/samples), so a 2,000,000-sample capture stays quick
 * and edges and spikes stay visible; every sample once zoomed in far enough (each one then marked with a dot).
 * Each lane marks its channel's 50% reference level (labelled in the margin right of the plot, clear of the
 * trace) and the detected edges (▲ rising, ▼ falling). Zoom by dragging across the plot, with
 * the mouse wheel, by pinching on a touch screen, or with the buttons; pan with the buttons or one finger;
 * Reset shows the whole capture again. See docs/decisions/010-trace-plot-decimation-cache.md.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { ChevronLeft, ChevronRight, Maximize2, ZoomIn, ZoomOut } from 'lucide-react';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { toLinePoints } from '@/lib/traces/plot-window';
import type { TraceSamples } from '@/lib/contracts/traces';
import { useContainerWidth } from '@/components/defects/use-container-width';
import { CHANNEL_COLOURS } from './labels';
import { formatSpan, formatWindowBounds } from './format';
import { useTraceSamples } from './queries';

/** What the plot needs to know about a channel from the analysis. */
export type PlotChannel = { lowV: number; highV: number; midV: number; stuck: boolean };

type Props = {
  traceId: string;
  channels: { a: PlotChannel; b: PlotChannel };
  sampleRateHz: number;
  samples: number;
};

type Key = 'a' | 'b';
const KEYS: readonly Key[] = ['a', 'b'];
/** Columns are requested in steps of this many, so small resizes do not refetch. */
const COLUMN_STEP = 100;
/** The narrowest window, in samples. */
const MIN_WINDOW_SAMPLES = 12;
/** Wait this long after the last wheel or pinch step before fetching the new window, ms. */
const COMMIT_DELAY_MS = 180;
const ZOOM_STEP = 2;
/** Edges are marked only when there is at least this much room per edge, CSS px. */
const EDGE_MARK_SPACING_PX = 12;
/** Room right of the plot for the 50% level's label (CSS px), so it never sits on the waveform. */
const LEVEL_LABEL_GUTTER_PX = 52;
const AMBER = '#b07a10';
const GRID = '#eceef1';
const AXIS = '#4d5665';
const FONT = '12px "Source Sans 3", ui-sans-serif, system-ui, sans-serif';

/** Island root. */
export default function TracePlot(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <Plot {...props} />
    </QueryClientProvider>
  );
}

type View = { fromS: number | null; toS: number | null };

/** Tick labels on the time axis, in ms, with as many decimals as the tick step needs. */
function msTicks(splits: number[]): string[] {
  const step = splits.length > 1 ? Math.abs(splits[1]! - splits[0]!) : 1;
  const decimals = Math.min(6, Math.max(0, Math.ceil(-Math.log10(step) + 0.001)));
  return splits.map((v) => v.toFixed(decimals));
}

function Plot({ traceId, channels, sampleRateHz, samples }: Props) {
  const [boxRef, width] = useContainerWidth<HTMLDivElement>();
  const dpr = typeof window === 'undefined' ? 1 : Math.min(2, window.devicePixelRatio || 1);
  const columns = width ? Math.min(4000, Math.ceil((width * dpr) / COLUMN_STEP) * COLUMN_STEP) : 0;
  const [view, setView] = useState<View>({ fromS: null, toS: null });
  const query = useTraceSamples(traceId, { ...view, columns });
  const data = query.data;

  const lanesRef = useRef<HTMLDivElement>(null);
  const plots = useRef<{ a: uPlot; b: uPlot } | null>(null);
  const dataRef = useRef<TraceSamples | null>(null);
  const extent = useRef<{ startS: number; endS: number } | null>(null);
  const yRanges = useRef<{ a: [number, number]; b: [number, number] } | null>(null);
  const readoutRef = useRef<HTMLSpanElement>(null);
  const commitTimer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const [shown, setShown] = useState<{ fromS: number; toS: number } | null>(null);
  const [ready, setReady] = useState(false);

  const laneHeight = width !== null && width < 640 ? 150 : 185;

  /** Show [fromS, toS] at once (stretching what is loaded) and fetch it after a pause, or now. */
  const showWindow = useCallback(
    (fromS: number, toS: number, commit: 'now' | 'later') => {
      const e = extent.current;
      const p = plots.current;
      if (!e || !p) return;
      const full = e.endS - e.startS;
      const minSpan = Math.min(full, MIN_WINDOW_SAMPLES / sampleRateHz);
      let span = Math.max(minSpan, Math.min(full, toS - fromS));
      let from = Math.max(e.startS, Math.min(fromS, e.endS - span));
      if (!Number.isFinite(from)) from = e.startS;
      span = Math.min(span, e.endS - from);
      const to = from + span;
      for (const k of KEYS) p[k].setScale('x', { min: from * 1e3, max: to * 1e3 });
      setShown({ fromS: from, toS: to });
      if (commitTimer.current) clearTimeout(commitTimer.current);
      const atFull = from <= e.startS && to >= e.endS;
      const apply = () => setView(atFull ? { fromS: null, toS: null } : { fromS: from, toS: to });
      if (commit === 'now') apply();
      else commitTimer.current = setTimeout(apply, COMMIT_DELAY_MS);
    },
    [sampleRateHz],
  );

  const current = useCallback((): { fromS: number; toS: number } | null => {
    const p = plots.current;
    if (!p) return null;
    const s = p.a.scales.x;
    return s && s.min !== undefined && s.max !== undefined ? { fromS: s.min / 1e3, toS: s.max / 1e3 } : null;
  }, []);

  const zoomBy = useCallback(
    (factor: number, anchorS?: number) => {
      const c = current();
      if (!c) return;
      const anchor = anchorS ?? (c.fromS + c.toS) / 2;
      showWindow(anchor - (anchor - c.fromS) * factor, anchor + (c.toS - anchor) * factor, 'later');
    },
    [current, showWindow],
  );

  const panBy = useCallback(
    (fraction: number) => {
      const c = current();
      if (!c) return;
      const d = (c.toS - c.fromS) * fraction;
      showWindow(c.fromS + d, c.toS + d, 'later');
    },
    [current, showWindow],
  );

  const reset = useCallback(() => {
    const e = extent.current;
    if (e) showWindow(e.startS, e.endS, 'now');
  }, [showWindow]);

  // Create the two lanes once the first window and the width are known.
  useEffect(() => {
    if (!data || !width || plots.current || !lanesRef.current) return;
    extent.current = { startS: data.startS, endS: data.endS };
    // One y range for both lanes, so their levels compare at a glance (a weak or stuck channel shows as such).
    const shared = laneRange([channels.a, channels.b], [data.a.min, data.b.min], [data.a.max ?? data.a.min, data.b.max ?? data.b.min]);
    yRanges.current = { a: shared, b: shared };
    dataRef.current = data;
    const host = lanesRef.current;
    const made: Partial<Record<Key, uPlot>> = {};
    for (const k of KEYS) {
      const el = document.createElement('div');
      el.setAttribute('data-lane', k);
      host.appendChild(el);
      const opts = laneOptions({
        key: k,
        width,
        height: laneHeight + (k === 'b' ? 36 : 0),
        syncKey: `trace-${traceId}`,
        channel: channels[k],
        range: () => yRanges.current![k],
        dataRef,
        onSelect: (u) => {
          const sel = u.select;
          if (sel.width >= 6) {
            const from = u.posToVal(sel.left, 'x') / 1e3;
            const to = u.posToVal(sel.left + sel.width, 'x') / 1e3;
            showWindow(from, to, 'now');
          }
          for (const other of KEYS) made[other]?.setSelect({ left: 0, top: 0, width: 0, height: 0 }, false);
        },
        onCursor: (u) => writeReadout(u, dataRef.current, readoutRef.current),
      });
      made[k] = new uPlot(opts, lanePoints(data, k), el);
      made[k]!.setScale('x', { min: data.fromS * 1e3, max: data.toS * 1e3 });
    }
    plots.current = made as { a: uPlot; b: uPlot };
    setShown({ fromS: data.fromS, toS: data.toS });
    setReady(true);
  }, [data, width, channels, laneHeight, traceId, showWindow]);

  // New window data: draw it, keeping the scale the person is looking at.
  useEffect(() => {
    const p = plots.current;
    if (!p || !data || dataRef.current === data) return;
    dataRef.current = data;
    const c = current();
    for (const k of KEYS) {
      p[k].setData(lanePoints(data, k), false);
      if (c) p[k].setScale('x', { min: c.fromS * 1e3, max: c.toS * 1e3 });
    }
  }, [data, current]);

  // Follow the container's width.
  useEffect(() => {
    const p = plots.current;
    if (!p || !width) return;
    for (const k of KEYS) p[k].setSize({ width, height: laneHeight + (k === 'b' ? 36 : 0) });
  }, [width, laneHeight]);

  // Wheel zoom (around the pointer) and touch: pinch to zoom, one finger to pan when zoomed in.
  useEffect(() => {
    const p = plots.current;
    if (!ready || !p) return;
    const cleanups: Array<() => void> = [];
    for (const k of KEYS) {
      const u = p[k];
      const over = u.over;
      over.style.touchAction = 'pan-y';
      const onWheel = (e: WheelEvent) => {
        const c = current();
        const ext = extent.current;
        if (!c || !ext) return;
        const zoomingOut = e.deltaY > 0;
        const atFull = c.fromS <= ext.startS && c.toS >= ext.endS;
        if (zoomingOut && atFull) return; // let the page scroll
        e.preventDefault();
        const anchor = u.posToVal(e.offsetX, 'x') / 1e3;
        zoomBy(zoomingOut ? 1.25 : 0.8, anchor);
      };
      let pinch: { d0: number; from: number; to: number; anchor: number } | null = null;
      let pan: { x0: number; from: number; to: number } | null = null;
      const rectX = (t: Touch) => t.clientX - over.getBoundingClientRect().left;
      const onTouchStart = (e: TouchEvent) => {
        const c = current();
        if (!c) return;
        if (e.touches.length === 2) {
          const [t0, t1] = [e.touches[0]!, e.touches[1]!];
          pinch = { d0: Math.max(10, Math.abs(t0.clientX - t1.clientX)), from: c.fromS, to: c.toS, anchor: u.posToVal((rectX(t0) + rectX(t1)) / 2, 'x') / 1e3 };
          pan = null;
          e.preventDefault();
        } else if (e.touches.length === 1) {
          const ext = extent.current;
          const zoomed = ext && (c.fromS > ext.startS || c.toS < ext.endS);
          pan = zoomed ? { x0: e.touches[0]!.clientX, from: c.fromS, to: c.toS } : null;
        }
      };
      const onTouchMove = (e: TouchEvent) => {
        if (pinch && e.touches.length === 2) {
          e.preventDefault();
          const d = Math.max(10, Math.abs(e.touches[0]!.clientX - e.touches[1]!.clientX));
          const f = pinch.d0 / d;
          showWindow(pinch.anchor - (pinch.anchor - pinch.from) * f, pinch.anchor + (pinch.to - pinch.anchor) * f, 'later');
        } else if (pan && e.touches.length === 1) {
          e.preventDefault();
          const dx = e.touches[0]!.clientX - pan.x0;
          const dS = (-dx / Math.max(1, over.clientWidth)) * (pan.to - pan.from);
          showWindow(pan.from + dS, pan.to + dS, 'later');
        }
      };
      const onTouchEnd = (e: TouchEvent) => {
        if (e.touches.length < 2) pinch = null;
        if (e.touches.length === 0) pan = null;
      };
      over.addEventListener('wheel', onWheel, { passive: false });
      over.addEventListener('touchstart', onTouchStart, { passive: false });
      over.addEventListener('touchmove', onTouchMove, { passive: false });
      over.addEventListener('touchend', onTouchEnd);
      cleanups.push(() => {
        over.removeEventListener('wheel', onWheel);
        over.removeEventListener('touchstart', onTouchStart);
        over.removeEventListener('touchmove', onTouchMove);
        over.removeEventListener('touchend', onTouchEnd);
      });
    }
    return () => cleanups.forEach((f) => f());
  }, [ready, current, showWindow, zoomBy]);

  // Tear the lanes down with the island.
  useEffect(
    () => () => {
      if (commitTimer.current) clearTimeout(commitTimer.current);
      plots.current?.a.destroy();
      plots.current?.b.destroy();
      plots.current = null;
    },
    [],
  );

  const full = extent.current;
  const atFull = !shown || !full || (shown.fromS <= full.startS && shown.toS >= full.endS);
  const atMin = !!shown && shown.toS - shown.fromS <= (MIN_WINDOW_SAMPLES / sampleRateHz) * 1.01;
  const status = useMemo(() => describeWindow(data, shown, full, width ?? 0), [data, shown, full, width]);
  const loading = query.isFetching;

  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <div className="flex flex-wrap items-center gap-x-4 gap-y-1 text-sm text-ink-700" aria-label="Plot key">
          <span className="inline-flex items-center gap-1.5">
            <span className="inline-block h-0.5 w-5" style={{ background: CHANNEL_COLOURS.a }} aria-hidden="true" /> Channel A
          </span>
          <span className="inline-flex items-center gap-1.5">
            <span className="inline-block h-0.5 w-5" style={{ background: CHANNEL_COLOURS.b }} aria-hidden="true" /> Channel B
          </span>
          <span className="inline-flex items-center gap-1.5">
            <span className="inline-block w-5 border-t-2 border-dashed" style={{ borderColor: AMBER }} aria-hidden="true" /> 50% level
          </span>
          <span className="inline-flex items-center gap-1.5">
            <span aria-hidden="true" className="text-xs text-ink-600">▲▼</span> edges
          </span>
        </div>
        <div className="flex flex-wrap items-center gap-1" role="group" aria-label="Zoom and pan">
          <button type="button" className="btn-secondary px-2.5" onClick={() => panBy(-0.5)} disabled={atFull || !ready} aria-label="Earlier">
            <ChevronLeft size={18} aria-hidden="true" />
          </button>
          <button type="button" className="btn-secondary px-2.5" onClick={() => zoomBy(1 / ZOOM_STEP)} disabled={atMin || !ready} aria-label="Zoom in">
            <ZoomIn size={18} aria-hidden="true" />
          </button>
          <button type="button" className="btn-secondary px-2.5" onClick={() => zoomBy(ZOOM_STEP)} disabled={atFull || !ready} aria-label="Zoom out">
            <ZoomOut size={18} aria-hidden="true" />
          </button>
          <button type="button" className="btn-secondary px-2.5" onClick={() => panBy(0.5)} disabled={atFull || !ready} aria-label="Later">
            <ChevronRight size={18} aria-hidden="true" />
          </button>
          <button type="button" className="btn-secondary" onClick={reset} disabled={atFull || !ready}>
            <Maximize2 size={16} aria-hidden="true" /> Reset
          </button>
        </div>
      </div>

      <div ref={boxRef} className="relative min-w-0">
        <div
          ref={lanesRef}
          className="trace-lanes select-none"
          role="img"
          aria-label={`Plot of channels A and B${status ? `: ${status.window}` : ''}`}
          style={{ minHeight: laneHeight * 2 + 36 }}
        />
        {!data && !query.error && (
          <div className="absolute inset-0 flex items-center justify-center rounded-md bg-ink-50 text-sm text-ink-500">
            Loading the capture ({samples.toLocaleString('en-GB')} samples)…
          </div>
        )}
        {query.error && (
          <p role="alert" className="absolute inset-x-0 top-4 mx-auto w-fit rounded-md bg-brick-50 px-3 py-2 text-sm font-semibold text-brick-700">
            The plot could not be loaded: {query.error.message}
          </p>
        )}
      </div>

      <div className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 text-xs text-ink-600">
        <span data-testid="plot-window" aria-live="polite">
          {status ? status.window : ' '}
          {loading && data ? ' · loading…' : ''}
        </span>
        <span className="tabular-nums" ref={readoutRef} aria-hidden="true" />
      </div>
      <p className="text-xs text-ink-500">
        {status?.detail ?? ''} Drag across the plot to zoom in; use the wheel, pinch, or the buttons to zoom and move; Reset shows the whole capture.
      </p>
    </div>
  );
}

/** Readout lines under the plot. */
function describeWindow(
  data: TraceSamples | undefined,
  shown: { fromS: number; toS: number } | null,
  full: { startS: number; endS: number } | null,
  widthCss: number,
): { window: string; detail: string } | null {
  if (!data || !shown || !full) return null;
  const whole = shown.fromS <= full.startS && shown.toS >= full.endS;
  const bounds = formatWindowBounds(shown.fromS - full.startS, shown.toS - full.startS);
  const window = whole
    ? `The whole capture: ${formatSpan(full.endS - full.startS)}`
    : `${formatSpan(shown.toS - shown.fromS)} shown, from ${bounds.from} to ${bounds.to} of ${formatSpan(full.endS - full.startS)}`;
  const perColumn = data.windowSamples / Math.max(1, data.columns);
  const detail =
    data.mode === 'raw'
      ? `Every sample shown (${data.windowSamples.toLocaleString('en-GB')} in this window), each marked with a dot.`
      : `Each pixel column shows the lowest and highest of about ${Math.round(perColumn).toLocaleString('en-GB')} samples, so edges and short spikes stay visible.`;
  const markable = (e: TraceSamples['edges']['a']) => !e.tooMany && e.count <= Math.max(0, widthCss - 70) / EDGE_MARK_SPACING_PX;
  const edges = markable(data.edges.a) && markable(data.edges.b) ? '' : ' Edges are marked once you zoom in.';
  return { window, detail: detail + edges };
}

/** The y range of the lanes: the channels' levels and everything the first window holds, with room for the edge marks. */
function laneRange(cs: PlotChannel[], mins: Array<Array<number | null>>, maxs: Array<Array<number | null>>): [number, number] {
  let lo = Math.min(0, ...cs.map((c) => c.lowV));
  let hi = Math.max(...cs.map((c) => c.highV));
  for (const m of mins) for (const v of m) if (v !== null && v < lo) lo = v;
  for (const m of maxs) for (const v of m) if (v !== null && v > hi) hi = v;
  const span = Math.max(1, hi - lo);
  return [lo - 0.12 * span, hi + 0.22 * span];
}

/** uPlot data of one lane (time in ms). */
function lanePoints(w: TraceSamples, k: Key): uPlot.AlignedData {
  const { x, y } = toLinePoints(w, w[k]);
  return [x.map((t) => t * 1e3), y];
}

/** Cursor readout: time and both channels' values (or min-max of the column) at the pointer. */
function writeReadout(u: uPlot, w: TraceSamples | null, el: HTMLElement | null): void {
  if (!el) return;
  const left = u.cursor.left ?? -1;
  if (!w || left < 0 || w.timeS.length === 0) {
    el.textContent = '';
    return;
  }
  const tS = u.posToVal(left, 'x') / 1e3;
  let lo = 0;
  let hi = w.timeS.length - 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (w.timeS[mid]! < tS) lo = mid + 1;
    else hi = mid;
  }
  const i = lo > 0 && Math.abs(w.timeS[lo - 1]! - tS) < Math.abs(w.timeS[lo]! - tS) ? lo - 1 : lo;
  const val = (k: Key): string => {
    const a = w[k].min[i];
    const b = w[k].max ? w[k].max![i] : a;
    if (a === null || a === undefined || b === null || b === undefined) return '–';
    return Math.abs(b - a) < 0.005 ? `${a.toFixed(2)} V` : `${a.toFixed(2)}–${b.toFixed(2)} V`;
  };
  el.textContent = `t ${(tS * 1e3).toFixed(3)} ms · A ${val('a')} · B ${val('b')}`;
}

/** Options of one lane. */
function laneOptions(o: {
  key: Key;
  width: number;
  height: number;
  syncKey: string;
  channel: PlotChannel;
  range: () => [number, number];
  dataRef: { current: TraceSamples | null };
  onSelect: (u: uPlot) => void;
  onCursor: (u: uPlot) => void;
}): uPlot.Options {
  const colour = CHANNEL_COLOURS[o.key];
  const bottom = o.key === 'b';
  const name = o.key.toUpperCase();
  return {
    width: o.width,
    height: o.height,
    // Right padding leaves the gutter where the 50% level is labelled (drawOverlay).
    padding: [8, LEVEL_LABEL_GUTTER_PX, 0, 0],
    legend: { show: false },
    cursor: { sync: { key: o.syncKey }, drag: { x: true, y: false, setScale: false }, points: { show: false }, y: false },
    scales: {
      x: { time: false, auto: false },
      y: { auto: false, range: () => o.range() },
    },
    axes: [
      {
        scale: 'x',
        font: FONT,
        labelFont: FONT,
        stroke: AXIS,
        grid: { stroke: GRID, width: 1 },
        ticks: { stroke: '#d8dce2', width: 1, size: bottom ? 5 : 0 },
        size: bottom ? 40 : 6,
        values: bottom ? (_u, splits) => msTicks(splits) : (_u, splits) => splits.map(() => ''),
        label: bottom ? 'Time (ms)' : undefined,
        labelSize: bottom ? 18 : 0,
      },
      {
        scale: 'y',
        font: FONT,
        labelFont: `600 ${FONT}`,
        stroke: AXIS,
        size: 58,
        gap: 4,
        label: `Channel ${name} (V)`,
        labelSize: 18,
        grid: { stroke: GRID, width: 1 },
        ticks: { stroke: '#d8dce2', width: 1, size: 4 },
        splits: (u) => levelSplits(u, o.channel),
        values: (_u, splits) => splits.map((v) => v.toFixed(2)),
      },
    ],
    series: [
      {},
      {
        label: `Channel ${name}`,
        stroke: colour,
        width: 1.5,
        // Each sample gets a dot once every sample is drawn (raw windows); min/max columns stay a plain line.
        points: { show: () => o.dataRef.current?.mode === 'raw', size: 5, width: 1, fill: colour, stroke: colour },
        spanGaps: false,
      },
    ],
    hooks: {
      draw: [(u) => drawOverlay(u, o.key, o.channel, o.dataRef.current, colour)],
      setSelect: [o.onSelect],
      setCursor: [o.onCursor],
    },
  };
}

/** Axis ticks at the channel's measured levels (low, 50%, high), skipping any that would overlap. */
function levelSplits(u: uPlot, c: PlotChannel): number[] {
  const wanted = c.stuck ? [c.lowV] : [c.lowV, c.midV, c.highV];
  const out: number[] = [];
  let lastPx = Infinity;
  for (const v of wanted) {
    const px = u.valToPos(v, 'y');
    if (Math.abs(px - lastPx) >= 14) {
      out.push(v);
      lastPx = px;
    }
  }
  return out;
}

/** The 50% reference line (labelled in the right gutter, outside the plot) and the edge marks of one lane. */
function drawOverlay(u: uPlot, k: Key, c: PlotChannel, w: TraceSamples | null, colour: string): void {
  const ctx = u.ctx;
  const { left, top, width, height } = u.bbox;
  const px = window.devicePixelRatio || 1;
  if (!c.stuck) {
    const y = Math.round(u.valToPos(c.midV, 'y', true)) + 0.5;
    if (y >= top && y <= top + height) {
      // The label goes in the gutter right of the plot area, where no sample is ever drawn.
      ctx.save();
      ctx.font = `600 ${11 * px}px "Source Sans 3", ui-sans-serif, sans-serif`;
      ctx.fillStyle = AMBER;
      ctx.textAlign = 'left';
      const x = left + width + 5 * px;
      ctx.textBaseline = 'bottom';
      ctx.fillText('50%', x, y - 1 * px);
      ctx.textBaseline = 'top';
      ctx.fillText(`${c.midV.toFixed(2)} V`, x, y + 1 * px);
      ctx.restore();
    }
  }
  ctx.save();
  ctx.beginPath();
  ctx.rect(left, top, width, height);
  ctx.clip();
  if (!c.stuck) {
    const y = Math.round(u.valToPos(c.midV, 'y', true)) + 0.5;
    ctx.strokeStyle = AMBER;
    ctx.lineWidth = px;
    ctx.setLineDash([6 * px, 4 * px]);
    ctx.beginPath();
    ctx.moveTo(left, y);
    ctx.lineTo(left + width, y);
    ctx.stroke();
    ctx.setLineDash([]);
  }
  const e = w?.edges[k];
  if (e && !e.tooMany && e.timesS.length > 0 && e.timesS.length <= width / (EDGE_MARK_SPACING_PX * px)) {
    const size = 5 * px;
    const yTop = top + 3 * px;
    for (let i = 0; i < e.timesS.length; i++) {
      const x = u.valToPos(e.timesS[i]! * 1e3, 'x', true);
      if (x < left - size || x > left + width + size) continue;
      const rising = (i % 2 === 0) === e.firstRising;
      ctx.globalAlpha = 0.22;
      ctx.strokeStyle = colour;
      ctx.lineWidth = px;
      ctx.beginPath();
      ctx.moveTo(Math.round(x) + 0.5, yTop + size * 1.6);
      ctx.lineTo(Math.round(x) + 0.5, top + height);
      ctx.stroke();
      ctx.globalAlpha = 1;
      ctx.fillStyle = colour;
      ctx.beginPath();
      if (rising) {
        ctx.moveTo(x, yTop);
        ctx.lineTo(x - size, yTop + size * 1.5);
        ctx.lineTo(x + size, yTop + size * 1.5);
      } else {
        ctx.moveTo(x - size, yTop);
        ctx.lineTo(x + size, yTop);
        ctx.lineTo(x, yTop + size * 1.5);
      }
      ctx.closePath();
      ctx.fill();
    }
  }
  ctx.restore();
}
