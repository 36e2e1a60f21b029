/**
 * The Overview's charts (recharts). Every bar segment and trend point is a real SVG link to the Defects list
 * filtered to the defects it counts, with an accessible name saying what it counts, so a chart can be clicked,
 * tabbed through and read by a screen reader. Bars are at least 40 px thick and trend points have a 40 px hit
 * circle, for fingers on a tablet. Charts render after the container is measured (nothing on the server), in a
 * box of fixed height so the page does not jump. `span` names the exact calendar months shown ("Jan – Dec 2026").
 */
import type { ReactNode } from 'react';
import { Bar, BarChart, CartesianGrid, Legend, Line, LineChart, ReferenceLine, Tooltip, XAxis, YAxis, type BarShapeProps } from 'recharts';
import { STATUS_LABELS } from '@/components/labels';
import { plural } from '@/components/defects/format';
import { useContainerWidth } from '@/components/defects/use-container-width';
import { OPEN_STATUSES, type OpenStatus, type OverviewDepot, type OverviewModule, type OverviewMonth } from '@/lib/contracts/overview';
import { defectsHref } from '@/lib/overview/links';
import { formatMonth, formatPct, percentTicks } from './format';

/** Series colours of the open statuses (design tokens of global.css). */
export const STATUS_COLOURS: Record<OpenStatus, string> = {
  reported: '#b07a10',
  diagnosing: '#3a78c2',
  awaiting_parts: '#acd8d9',
  repaired: '#2c8589',
  verified: '#3f7d34',
};
const INK_400 = '#8c95a3';
const INK_200 = '#d8dce2';
const ESTUARY_700 = '#1a5559';
const BRICK_600 = '#b23a2b';
const AXIS = { fontSize: 13, fill: '#4d5665' };
/** Radius of the invisible circle that takes a tap on a trend point (40 px across). */
const POINT_HIT_RADIUS = 20;
/** Height of one bar row in the horizontal bar charts: a 40 px bar and its gap. */
const BAR_ROW_PX = 48;

/** Measures its width and renders the chart for it; a fixed-height placeholder until then. */
function ChartBox({ height, label, children }: { height: number; label: string; children: (width: number) => ReactNode }) {
  const [ref, width] = useContainerWidth<HTMLDivElement>();
  return (
    <div ref={ref} style={{ height }} className="w-full" role="figure" aria-label={label}>
      {width !== null && width > 0 ? children(width) : null}
    </div>
  );
}

/** A bar (or stacked segment) drawn as a link; zero-size segments draw nothing. */
function linkedBar(href: (p: BarShapeProps) => string | null, name: (p: BarShapeProps) => string) {
  return function LinkedBarShape(p: BarShapeProps) {
    const url = href(p);
    if (!url || !(p.width > 0) || !(p.height > 0)) return <g />;
    return (
      <a href={url} aria-label={name(p)} className="chart-link">
        <rect x={p.x} y={p.y} width={p.width} height={p.height} fill={p.fill} />
      </a>
    );
  };
}

type StatusRow = { code: string; name: string } & Record<OpenStatus, number>;

/** Open defects by depot (one bar each), stacked by status; a segment opens that depot's defects in that status. */
export function StatusDepotChart({ depots }: { depots: OverviewDepot[] }) {
  const data: StatusRow[] = depots.map((d) => ({ code: d.code, name: d.name, ...d.open }));
  const height = Math.max(180, 64 + data.length * BAR_ROW_PX);
  return (
    <ChartBox height={height} label="Open defects by depot and status">
      {(width) => (
        <BarChart width={width} height={height} data={data} layout="vertical" margin={{ top: 4, right: 16, bottom: 4, left: 4 }} barCategoryGap={8}>
          <CartesianGrid horizontal={false} stroke={INK_200} />
          <XAxis type="number" allowDecimals={false} tick={AXIS} />
          <YAxis type="category" dataKey="code" width={52} tick={AXIS} />
          <Tooltip cursor={{ fill: 'rgba(44,133,137,0.08)' }} formatter={(v, n) => [v, STATUS_LABELS[String(n)] ?? n]} labelFormatter={(code) => depots.find((d) => d.code === code)?.name ?? code} />
          <Legend itemSorter={null} formatter={(v) => <span className="text-ink-700">{STATUS_LABELS[String(v)] ?? v}</span>} wrapperStyle={{ fontSize: 13 }} />
          {OPEN_STATUSES.map((s) => (
            <Bar
              key={s}
              dataKey={s}
              stackId="open"
              fill={STATUS_COLOURS[s]}
              maxBarSize={44}
              isAnimationActive={false}
              shape={linkedBar(
                (p) => defectsHref({ depot: (p.payload as StatusRow).code, status: s }),
                (p) => `${(p.payload as StatusRow).code}, ${STATUS_LABELS[s]}: ${(p.payload as StatusRow)[s]} open`,
              )}
            />
          ))}
        </BarChart>
      )}
    </ChartBox>
  );
}

/**
 * Repeat rate per month (line, %); a point opens that month's repeats. The month still running is counted so far:
 * its point is hollow and dashed and the line into it is dashed, so a month with one defect is not read as a trend.
 */
export function RepeatTrendChart({ trend, average, span }: { trend: OverviewMonth[]; average: number | null; span: string }) {
  const pct = (m: OverviewMonth) => (m.rate === null ? null : Math.round(m.rate * 1000) / 10);
  // Whole months draw the solid line; the last whole month and the running one draw the dashed tail.
  const lastWhole = trend.reduce((k, m, i) => (m.partial ? k : i), -1);
  const data = trend.map((m, i) => ({
    ...m,
    label: formatMonth(m.month),
    ratePct: pct(m),
    solidPct: m.partial ? null : pct(m),
    tailPct: m.partial || (i === lastWhole && trend.some((x) => x.partial)) ? pct(m) : null,
  }));
  const partial = trend.find((m) => m.partial);
  const height = 260;
  const ticks = percentTicks(Math.max(0, ...data.map((m) => m.ratePct ?? 0), average === null ? 0 : average * 100));
  const point = (p: { index: number; cx?: number | null; cy?: number | null }) => {
    const m = data[p.index];
    if (!m || m.ratePct === null || p.cx == null || p.cy == null) return <g key={p.index} />;
    const words = `${m.label}${m.partial ? ' (so far)' : ''}: ${plural(m.repeats, 'repeat')} of ${m.reported.toLocaleString('en-GB')} reported (${formatPct(m.rate)})`;
    return (
      <a key={p.index} href={defectsHref({ repeat: true, reportedFrom: m.from, reportedTo: m.to })} aria-label={words} className="chart-link">
        <circle cx={p.cx} cy={p.cy} r={POINT_HIT_RADIUS} fill="transparent" />
        <circle cx={p.cx} cy={p.cy} r={4.5} fill="#fff" stroke={BRICK_600} strokeWidth={2} strokeDasharray={m.partial ? '2 2' : undefined} />
      </a>
    );
  };
  return (
    <div>
      <ChartBox height={height} label={`Repeat rate by month, ${span}`}>
        {(width) => (
          <LineChart width={width} height={height} data={data} margin={{ top: 12, right: 84, bottom: 4, left: 0 }}>
            <CartesianGrid vertical={false} stroke={INK_200} />
            <XAxis dataKey="label" tick={AXIS} interval={width < 560 ? 1 : 0} />
            <YAxis tick={AXIS} unit="%" width={48} ticks={ticks} domain={[0, ticks[ticks.length - 1]!]} />
            <Tooltip
              formatter={(_v, _n, item) => {
                const m = item.payload as OverviewMonth;
                return [`${formatPct(m.rate)} (${m.repeats} of ${m.reported}${m.partial ? ', month so far' : ''})`, 'Repeat rate'];
              }}
            />
            {average !== null && <ReferenceLine y={Math.round(average * 1000) / 10} stroke={INK_400} strokeDasharray="4 4" label={{ value: 'whole window', position: 'right', fontSize: 12, fill: '#667080' }} />}
            <Line type="linear" dataKey="solidPct" stroke={BRICK_600} strokeWidth={2} connectNulls isAnimationActive={false} dot={(p) => (data[p.index]?.partial ? <g key={p.index} /> : point(p))} activeDot={false} />
            <Line
              type="linear"
              dataKey="tailPct"
              stroke={BRICK_600}
              strokeWidth={2}
              strokeDasharray="5 4"
              connectNulls
              isAnimationActive={false}
              dot={(p) => (data[p.index]?.partial ? point(p) : <g key={p.index} />)}
              activeDot={false}
              legendType="none"
            />
          </LineChart>
        )}
      </ChartBox>
      {partial && (
        <p className="mt-1 text-xs text-ink-500">
          <svg width="22" height="8" className="mr-1 inline-block align-middle" aria-hidden="true">
            <line x1="1" y1="4" x2="21" y2="4" stroke={BRICK_600} strokeWidth="2" strokeDasharray="5 4" />
          </svg>
          {partial.reported === 0
            ? `${formatMonth(partial.month)} is still running, with no defect reported yet, so it has no point.`
            : `${formatMonth(partial.month)} is still running: its point counts ${plural(partial.reported, 'defect')} reported so far, not a whole month.`}
        </p>
      )}
    </div>
  );
}

/** Module types with the most defects reported in the window (bars: repeats and the rest). */
export function ModuleChart({ modules, windowFrom, span, limit = 8 }: { modules: OverviewModule[]; windowFrom: string; span: string; limit?: number }) {
  const data = modules.slice(0, limit).map((m) => ({ ...m, others: m.reported - m.repeats }));
  const height = Math.max(160, 56 + data.length * BAR_ROW_PX);
  const row = (p: BarShapeProps) => p.payload as OverviewModule;
  return (
    <div>
    <ChartBox height={height} label={`Module types with the most defects, ${span}`}>
      {(width) => (
        <BarChart width={width} height={height} data={data} layout="vertical" margin={{ top: 4, right: 16, bottom: 4, left: 4 }} barCategoryGap={8}>
          <CartesianGrid horizontal={false} stroke={INK_200} />
          <XAxis type="number" allowDecimals={false} tick={AXIS} />
          <YAxis type="category" dataKey="code" width={64} tick={AXIS} />
          <Tooltip
            cursor={{ fill: 'rgba(44,133,137,0.08)' }}
            formatter={(v, n) => [v, n === 'repeats' ? 'Repeats' : 'First-time']}
            labelFormatter={(code) => modules.find((m) => m.code === code)?.name ?? code}
          />
          <Legend itemSorter={null} formatter={(v) => <span className="text-ink-700">{v === 'repeats' ? 'Repeats' : 'First-time'}</span>} wrapperStyle={{ fontSize: 13 }} />
          <Bar
            dataKey="others"
            stackId="m"
            fill={ESTUARY_700}
            isAnimationActive={false}
            shape={linkedBar(
              (p) => defectsHref({ module: row(p).code, reportedFrom: windowFrom }),
              (p) => `${row(p).code}: ${row(p).reported.toLocaleString('en-GB')} reported since ${windowFrom}`,
            )}
          />
          <Bar
            dataKey="repeats"
            stackId="m"
            fill={BRICK_600}
            isAnimationActive={false}
            shape={linkedBar(
              (p) => defectsHref({ module: row(p).code, repeat: true, reportedFrom: windowFrom }),
              (p) => `${row(p).code}: ${plural(row(p).repeats, 'repeat')} since ${windowFrom}`,
            )}
          />
        </BarChart>
      )}
    </ChartBox>
      {modules.length > data.length && (
        <p className="mt-1 text-xs text-ink-500">
          The {data.length} module types with the most defects, of {modules.length}; every one is in “Repeats by module type” below.
        </p>
      )}
    </div>
  );
}

/** Repeat rate per depot against the rate of every depot shown (the cross-depot comparison). */
export function DepotRepeatChart({ depots, windowFrom, average, span }: { depots: OverviewDepot[]; windowFrom: string; average: number | null; span: string }) {
  const data = depots.map((d) => ({ ...d, ratePct: d.rate === null ? 0 : Math.round(d.rate * 1000) / 10 }));
  const height = 240;
  const row = (p: BarShapeProps) => p.payload as OverviewDepot;
  const ticks = percentTicks(Math.max(0, ...data.map((d) => d.ratePct)));
  return (
    <ChartBox height={height} label={`Repeat rate by depot, ${span}`}>
      {(width) => (
        <BarChart width={width} height={height} data={data} margin={{ top: 12, right: 72, bottom: 4, left: 0 }}>
          <CartesianGrid vertical={false} stroke={INK_200} />
          <XAxis dataKey="code" tick={AXIS} />
          <YAxis tick={AXIS} unit="%" width={48} ticks={ticks} domain={[0, ticks[ticks.length - 1]!]} />
          <Tooltip
            cursor={{ fill: 'rgba(44,133,137,0.08)' }}
            formatter={(_v, _n, item) => {
              const d = item.payload as OverviewDepot;
              return [`${formatPct(d.rate)} (${d.repeats} of ${d.reported})`, 'Repeat rate'];
            }}
            labelFormatter={(code) => depots.find((d) => d.code === code)?.name ?? code}
          />
          {average !== null && <ReferenceLine y={Math.round(average * 1000) / 10} stroke={INK_400} strokeDasharray="4 4" label={{ value: 'all depots', position: 'right', fontSize: 12, fill: '#667080' }} />}
          <Bar
            dataKey="ratePct"
            fill={BRICK_600}
            isAnimationActive={false}
            maxBarSize={56}
            shape={linkedBar(
              (p) => defectsHref({ depot: row(p).code, repeat: true, reportedFrom: windowFrom }),
              (p) => `${row(p).code}: ${plural(row(p).repeats, 'repeat')} of ${row(p).reported.toLocaleString('en-GB')} reported (${formatPct(row(p).rate)})`,
            )}
          />
        </BarChart>
      )}
    </ChartBox>
  );
}
