/**
 * The Overview's charts (recharts). Every bar segment and trend point is a real SVG link to the Defects list
 * filtered to the defects it counts, with an accessible name saying what it counts, so a chart can be clicked,
 * tabbed through and read by a screen reader. Charts render after the container is measured (nothing on the
 * server), in a box of fixed height so the page does not jump.
 */
import type { ReactNode } from 'react';
import { Bar, BarChart, CartesianGrid, Legend, Line, LineChart, ReferenceLine, Tooltip, XAxis, YAxis, type BarShapeProps } from 'recharts';
import { STATUS_LABELS } from '@/components/labels';
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
  const height = Math.max(180, 56 + data.length * 44);
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

/** Repeat rate per month (line, %) over the reported count (bars); a point opens that month's repeats. */
export function RepeatTrendChart({ trend, average }: { trend: OverviewMonth[]; average: number | null }) {
  const data = trend.map((m) => ({ ...m, label: formatMonth(m.month), ratePct: m.rate === null ? null : Math.round(m.rate * 1000) / 10 }));
  const height = 260;
  const ticks = percentTicks(Math.max(0, ...data.map((m) => m.ratePct ?? 0), average === null ? 0 : average * 100));
  return (
    <ChartBox height={height} label="Repeat rate by month, last 12 months">
      {(width) => (
        <LineChart width={width} height={height} data={data} margin={{ top: 12, right: 84, bottom: 4, left: 0 }}>
          <CartesianGrid vertical={false} stroke={INK_200} />
          <XAxis dataKey="label" tick={AXIS} interval={width < 560 ? 1 : 0} />
          <YAxis tick={AXIS} unit="%" width={48} ticks={ticks} domain={[0, ticks[ticks.length - 1]!]} />
          <Tooltip
            formatter={(_v, _n, item) => {
              const m = item.payload as OverviewMonth;
              return [`${formatPct(m.rate)} (${m.repeats} of ${m.reported})`, 'Repeat rate'];
            }}
          />
          {average !== null && <ReferenceLine y={Math.round(average * 1000) / 10} stroke={INK_400} strokeDasharray="4 4" label={{ value: '12-month rate', position: 'right', fontSize: 12, fill: '#667080' }} />}
          <Line
            type="linear"
            dataKey="ratePct"
            stroke={BRICK_600}
            strokeWidth={2}
            connectNulls
            isAnimationActive={false}
            dot={(p) => {
              const m = data[p.index];
              if (!m || m.ratePct === null || p.cx == null || p.cy == null) return <g key={p.index} />;
              return (
                <a key={p.index} href={defectsHref({ repeat: true, reportedFrom: m.from, reportedTo: m.to })} aria-label={`${m.label}: ${m.repeats} repeats of ${m.reported} reported (${formatPct(m.rate)})`} className="chart-link">
                  <circle cx={p.cx} cy={p.cy} r={9} fill="transparent" />
                  <circle cx={p.cx} cy={p.cy} r={4.5} fill="#fff" stroke={BRICK_600} strokeWidth={2} />
                </a>
              );
            }}
            activeDot={false}
          />
        </LineChart>
      )}
    </ChartBox>
  );
}

/** Module types with the most defects reported in the window (bars: repeats and the rest). */
export function ModuleChart({ modules, windowFrom, limit = 8 }: { modules: OverviewModule[]; windowFrom: string; limit?: number }) {
  const data = modules.slice(0, limit).map((m) => ({ ...m, others: m.reported - m.repeats }));
  const height = Math.max(160, 48 + data.length * 34);
  const row = (p: BarShapeProps) => p.payload as OverviewModule;
  return (
    <ChartBox height={height} label="Module types with the most defects, last 12 months">
      {(width) => (
        <BarChart width={width} height={height} data={data} layout="vertical" margin={{ top: 4, right: 16, bottom: 4, left: 4 }} barCategoryGap={6}>
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
              (p) => `${row(p).code}: ${row(p).reported} reported since ${windowFrom}`,
            )}
          />
          <Bar
            dataKey="repeats"
            stackId="m"
            fill={BRICK_600}
            isAnimationActive={false}
            shape={linkedBar(
              (p) => defectsHref({ module: row(p).code, repeat: true, reportedFrom: windowFrom }),
              (p) => `${row(p).code}: ${row(p).repeats} repeats since ${windowFrom}`,
            )}
          />
        </BarChart>
      )}
    </ChartBox>
  );
}

/** Repeat rate per depot against the rate of every depot shown (the cross-depot comparison). */
export function DepotRepeatChart({ depots, windowFrom, average }: { depots: OverviewDepot[]; windowFrom: string; average: number | null }) {
  const data = depots.map((d) => ({ ...d, ratePct: d.rate === null ? 0 : Math.round(d.rate * 1000) / 10 }));
  const height = 240;
  const row = (p: BarShapeProps) => p.payload as OverviewDepot;
  const ticks = percentTicks(Math.max(0, ...data.map((d) => d.ratePct)));
  return (
    <ChartBox height={height} label="Repeat rate by depot, last 12 months">
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
              (p) => `${row(p).code}: ${row(p).repeats} repeats of ${row(p).reported} reported (${formatPct(row(p).rate)})`,
            )}
          />
        </BarChart>
      )}
    </ChartBox>
  );
}
