/**
 * Mean cumulative function curves (recharts): the average number of failures per vehicle up to each age, as steps,
 * with the 95% limits (robust Lawless–Nadeau variance) as dashed steps of the same colour. The curves share one
 * age axis (mergeStepCurves) so hovering shows every curve's value at that age; each curve stops where fewer than
 * MCF_MIN_AT_RISK vehicles are still observed, and the age axis ticks whole years.
 */
import { CartesianGrid, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { McfPointJson } from '@/lib/contracts/patterns';
import { MCF_MIN_AT_RISK, mergeStepCurves, niceTicks, trimMcfTail, yearTicks, type MergedRow, type StepPoint } from '@/lib/patterns/chart-data';

/** One curve to draw. */
export type McfCurve = { key: string; label: string; colour: string; heavy?: boolean; points: McfPointJson[] };

type Props = {
  curves: McfCurve[];
  width?: number;
  height?: number;
  static?: boolean;
  /** What the chart compares, for screen readers ("by exposure band"). */
  subject: string;
};

/** Most points drawn per curve; longer curves are thinned (every k-th step, the last kept). */
export const MCF_MAX_POINTS = 300;

const AXIS = { fontSize: 11, fill: '#4d5665' };
const TITLE = { fontSize: 12, fill: '#37404d' };

/** A curve as steps from (0, 0), cut where few vehicles remain, thinned to MCF_MAX_POINTS, ages in years. */
export function mcfSteps(points: McfPointJson[]): { steps: StepPoint[]; dropped: number } {
  const { points: kept, dropped } = trimMcfTail(points);
  const step = Math.max(1, Math.ceil(kept.length / MCF_MAX_POINTS));
  const steps: StepPoint[] = [{ x: 0, y: 0, lower: 0, upper: 0, atRisk: points[0]?.atRisk ?? 0 }];
  for (let i = 0; i < kept.length; i++) {
    if (i % step !== 0 && i !== kept.length - 1) continue;
    const p = kept[i]!;
    steps.push({ x: p.ageDays / 365.25, y: p.mcf, lower: p.lower, upper: p.upper, atRisk: p.atRisk });
  }
  return { steps, dropped };
}

function TooltipBody({ active, payload, curves }: { active?: boolean; payload?: { payload: MergedRow }[]; curves: McfCurve[] }) {
  const row = payload?.[0]?.payload;
  if (!active || !row) return null;
  return (
    <div className="rounded-md border border-ink-200 bg-white px-3 py-2 text-xs shadow-md">
      <div className="mb-1 font-semibold text-ink-900">At {row.x.toFixed(1)} years in service</div>
      {curves.map((c) =>
        row[c.key] === null || row[c.key] === undefined ? null : (
          <div key={c.key} className="flex items-baseline gap-1.5">
            <span aria-hidden="true" className="inline-block h-2 w-2 rounded-full" style={{ background: c.colour }} />
            <span>
              <span className="font-semibold">{c.label}</span>: {(row[c.key] as number).toFixed(2)} failures per vehicle (95% {(row[`${c.key}Lower`] as number).toFixed(2)}–
              {(row[`${c.key}Upper`] as number).toFixed(2)}), {row[`${c.key}AtRisk`]} vehicles observed
            </span>
          </div>
        ),
      )}
    </div>
  );
}

/** The chart. */
export function McfChart({ curves, width, height = 300, static: isStatic = false, subject }: Props) {
  const drawn = curves.map((c) => ({ ...c, ...mcfSteps(c.points) })).filter((c) => c.steps.length > 1);
  const rows = mergeStepCurves(drawn.map((c) => ({ key: c.key, points: c.steps })));
  const maxX = rows.length ? rows[rows.length - 1]!.x : 1;
  const maxY = Math.max(0, ...drawn.flatMap((c) => c.steps.map((p) => p.upper)));
  const yTicks = niceTicks(maxY);
  const summary = drawn
    .map((c) => {
      const last = c.steps[c.steps.length - 1]!;
      return `${c.label}: ${last.y.toFixed(2)} failures per vehicle by ${last.x.toFixed(1)} years`;
    })
    .join('; ');
  const chart = (
    <LineChart data={rows} margin={{ top: 8, right: 12, bottom: 22, left: 14 }} width={width} height={width ? height : undefined}>
      <CartesianGrid stroke="#eceef1" />
      <XAxis
        dataKey="x"
        type="number"
        domain={[0, maxX]}
        ticks={yearTicks(maxX)}
        tick={AXIS}
        label={{ value: 'Years in service', position: 'insideBottom', offset: -14, ...TITLE }}
      />
      <YAxis
        tick={AXIS}
        width={44}
        domain={[0, yTicks[yTicks.length - 1]!]}
        ticks={yTicks}
        label={{ value: 'Failures per vehicle', angle: -90, position: 'insideLeft', offset: -2, ...TITLE, style: { textAnchor: 'middle' } }}
      />
      {!isStatic && <Tooltip content={<TooltipBody curves={drawn} />} />}
      <Legend position="top" height={28} iconSize={10} wrapperStyle={{ fontSize: 12 }} itemSorter={null} />
      {drawn.flatMap((c) => [
        <Line key={`${c.key}-mcf`} dataKey={c.key} name={c.label} type="stepAfter" stroke={c.colour} strokeWidth={c.heavy ? 3 : 2} dot={false} connectNulls={false} isAnimationActive={false} />,
        <Line key={`${c.key}-lo`} dataKey={`${c.key}Lower`} name={`${c.label} 95% limits`} legendType="none" type="stepAfter" stroke={c.colour} strokeWidth={1} strokeDasharray="4 3" dot={false} connectNulls={false} isAnimationActive={false} tooltipType="none" />,
        <Line key={`${c.key}-hi`} dataKey={`${c.key}Upper`} name={`${c.label} upper limit`} legendType="none" type="stepAfter" stroke={c.colour} strokeWidth={1} strokeDasharray="4 3" dot={false} connectNulls={false} isAnimationActive={false} tooltipType="none" />,
      ])}
    </LineChart>
  );
  return (
    <figure role="img" aria-label={`Mean cumulative function ${subject}, with 95% limits; each curve stops where fewer than ${MCF_MIN_AT_RISK} vehicles are still observed. ${summary}.`} className="m-0">
      {width ? chart : <ResponsiveContainer width="100%" height={height}>{chart}</ResponsiveContainer>}
    </figure>
  );
}
