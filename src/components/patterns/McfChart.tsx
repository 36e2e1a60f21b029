/**
 * Mean cumulative function curves by exposure band (recharts): the average number of failures per vehicle up to
 * each age, as steps, with the 95% limits (robust Lawless–Nadeau variance) as dashed steps of the same colour.
 */
import { CartesianGrid, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { McfResponse } from '@/lib/contracts/patterns';
import { BAND_COLOURS, BAND_LABELS } from './labels';

type Series = McfResponse['series'][number];
type Props = {
  series: Series[];
  /** Series key to draw heavier (the cohort's band). */
  highlight?: string;
  width?: number;
  height?: number;
  static?: boolean;
};

/** Most points drawn per curve; longer curves are thinned (every k-th step, the last kept). */
export const MCF_MAX_POINTS = 300;

type Point = { ageYears: number; mcf: number; lower: number; upper: number; atRisk: number };

/** The curve as steps from (0, 0), thinned to MCF_MAX_POINTS. */
export function mcfPoints(s: Series): Point[] {
  const all = s.points;
  const step = Math.max(1, Math.ceil(all.length / MCF_MAX_POINTS));
  const out: Point[] = [{ ageYears: 0, mcf: 0, lower: 0, upper: 0, atRisk: all[0]?.atRisk ?? 0 }];
  for (let i = 0; i < all.length; i++) {
    if (i % step !== 0 && i !== all.length - 1) continue;
    const p = all[i]!;
    out.push({ ageYears: p.ageDays / 365.25, mcf: p.mcf, lower: p.lower, upper: p.upper, atRisk: p.atRisk });
  }
  return out;
}

const label = (key: string) => (key === 'all' ? 'All vehicles' : `${BAND_LABELS[key as 'low']} exposure`);

function TooltipBody({ active, payload }: { active?: boolean; payload?: { name?: string; payload: Point; dataKey?: string }[] }) {
  const items = (payload ?? []).filter((p) => p.dataKey === 'mcf');
  if (!active || items.length === 0) return null;
  return (
    <div className="rounded-md border border-ink-200 bg-white px-3 py-2 text-xs shadow-md">
      {items.map((p) => (
        <div key={p.name}>
          <span className="font-semibold">{p.name}</span> at {p.payload.ageYears.toFixed(1)} years: {p.payload.mcf.toFixed(3)} failures per vehicle (95%{' '}
          {p.payload.lower.toFixed(3)}–{p.payload.upper.toFixed(3)}), {p.payload.atRisk} vehicles observed
        </div>
      ))}
    </div>
  );
}

/** The chart. */
export function McfChart({ series, highlight, width, height = 300, static: isStatic = false }: Props) {
  const drawn = series.filter((s) => s.points.length > 0);
  const summary = drawn.map((s) => `${label(s.key)}: ${(s.points[s.points.length - 1]?.mcf ?? 0).toFixed(2)} failures per vehicle by ${((s.points[s.points.length - 1]?.ageDays ?? 0) / 365.25).toFixed(1)} years`).join('; ');
  const chart = (
    <LineChart margin={{ top: 16, right: 12, bottom: 14, left: 0 }} width={width} height={width ? height : undefined}>
      <CartesianGrid stroke="#eceef1" />
      <XAxis
        dataKey="ageYears"
        type="number"
        domain={[0, 'dataMax']}
        tickFormatter={(v: number) => `${Math.round(v * 10) / 10}`}
        tick={{ fontSize: 11, fill: '#4d5665' }}
        label={{ value: 'Years in service', position: 'insideBottom', offset: -8, fontSize: 11, fill: '#4d5665' }}
        allowDuplicatedCategory={false}
      />
      <YAxis tick={{ fontSize: 11, fill: '#4d5665' }} width={40} tickFormatter={(v: number) => v.toFixed(2)} />
      {!isStatic && <Tooltip content={<TooltipBody />} />}
      <Legend position="top" height={26} iconSize={10} wrapperStyle={{ fontSize: 12 }} itemSorter={null} />
      {drawn.flatMap((s) => {
        const data = mcfPoints(s);
        const colour = BAND_COLOURS[s.key];
        const heavy = highlight === s.key;
        return [
          <Line key={`${s.key}-mcf`} data={data} dataKey="mcf" name={label(s.key)} type="stepAfter" stroke={colour} strokeWidth={heavy ? 3 : 2} dot={false} isAnimationActive={false} />,
          <Line key={`${s.key}-lo`} data={data} dataKey="lower" name={`${label(s.key)} 95% limits`} legendType="none" type="stepAfter" stroke={colour} strokeWidth={1} strokeDasharray="4 3" dot={false} isAnimationActive={false} />,
          <Line key={`${s.key}-hi`} data={data} dataKey="upper" name={`${label(s.key)} upper`} legendType="none" type="stepAfter" stroke={colour} strokeWidth={1} strokeDasharray="4 3" dot={false} isAnimationActive={false} />,
        ];
      })}
    </LineChart>
  );
  return (
    <figure role="img" aria-label={`Mean cumulative function by exposure band with 95% limits. ${summary}.`} className="m-0">
      {width ? chart : <ResponsiveContainer width="100%" height={height}>{chart}</ResponsiveContainer>}
    </figure>
  );
}
