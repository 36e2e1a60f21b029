/**
 * Failures against expectation by build month (recharts): bars are the failures of vehicles built in each month
 * of the band, the line is what the module's rate gives for their vehicle-years, and the shaded span is the
 * cohort's build range. Every month of the range is on the axis; a month with no vehicles of the band is a gap,
 * so the axis never looks evenly filled when it is not. A fixed width (for print) or the container's width.
 */
import { Bar, CartesianGrid, ComposedChart, Legend, Line, ReferenceArea, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { CohortMonth } from '@/lib/patterns/types';
import { fillBuildMonths, type ChartMonth } from '@/lib/patterns/chart-data';
import { formatCount } from '@/lib/patterns/explain';
import { formatMonth } from '@/lib/patterns/records';

type Props = {
  months: CohortMonth[];
  buildFrom: string;
  buildTo: string;
  /** What the expectation's rate is ("the fleet's rate", "your depots' rate"). */
  rateName?: string;
  /** Fixed pixel width (print); the container's width when absent. */
  width?: number;
  height?: number;
  /** Turn off the hover tooltip (print). */
  static?: boolean;
};

const AXIS = { fontSize: 11, fill: '#4d5665' };
const tick = (m: string) => formatMonth(m).replace(/ \d{2}(\d{2})$/, ' $1');

type Point = ChartMonth & { cohortFailures: number; otherFailures: number };

function TooltipBody({ active, payload }: { active?: boolean; payload?: { payload: Point }[] }) {
  const p = payload?.[0]?.payload;
  if (!active || !p) return null;
  return (
    <div className="rounded-md border border-ink-200 bg-white px-3 py-2 text-xs shadow-md">
      <div className="font-semibold text-ink-900">
        Built {formatMonth(p.month)} {p.inCohort && <span className="badge-brick ml-1">in the group</span>}
      </div>
      {p.empty ? (
        <div className="text-ink-500">No vehicles of this band were built this month.</div>
      ) : (
        <>
          <div>
            {formatCount(p.failures, 'failure')}, {p.expected?.toFixed(1)} expected
          </div>
          <div className="text-ink-500">
            {formatCount(p.vehicles, 'vehicle')}, {p.vehicleYears.toFixed(1)} vehicle-years
          </div>
        </>
      )}
    </div>
  );
}

/** The chart; `aria-label` sums it up for screen readers. */
export function RateChart({ months, buildFrom, buildTo, rateName = "the fleet's rate", width, height = 300, static: isStatic = false }: Props) {
  const inCohort = months.filter((m) => m.inCohort);
  const data: Point[] = fillBuildMonths(months, { buildFrom, buildTo }).map((m) => ({
    ...m,
    cohortFailures: m.inCohort ? m.failures : 0,
    otherFailures: m.inCohort ? 0 : m.failures,
  }));
  const empty = data.filter((m) => m.empty).length;
  const label = `Failures by build month against the expectation at ${rateName}; the group ${formatMonth(buildFrom)} to ${formatMonth(buildTo)} has ${inCohort.reduce((s, m) => s + m.failures, 0)} failures against ${inCohort
    .reduce((s, m) => s + m.expected, 0)
    .toFixed(1)} expected${empty ? `; ${formatCount(empty, 'month')} without vehicles of the band` : ''}.`;
  // Two stacked series (one of them 0 in each month) colour the cohort's months and give the legend both meanings.
  const chart = (
    <ComposedChart data={data} margin={{ top: 8, right: 12, bottom: 22, left: 8 }} width={width} height={width ? height : undefined}>
      <CartesianGrid stroke="#eceef1" vertical={false} />
      <XAxis
        dataKey="month"
        tickFormatter={tick}
        tick={AXIS}
        interval="preserveStartEnd"
        minTickGap={16}
        label={{ value: 'Build month', position: 'insideBottom', offset: -14, fontSize: 12, fill: '#37404d' }}
      />
      <YAxis allowDecimals={false} tick={AXIS} width={40} label={{ value: 'Failures', angle: -90, position: 'insideLeft', offset: 4, fontSize: 12, fill: '#37404d', style: { textAnchor: 'middle' } }} />
      <ReferenceArea x1={buildFrom} x2={buildTo} fill="#f7dcd7" fillOpacity={0.6} ifOverflow="extendDomain" />
      {!isStatic && <Tooltip content={<TooltipBody />} cursor={{ fill: '#d5ecec', fillOpacity: 0.4 }} />}
      <Legend position="top" height={28} iconSize={10} wrapperStyle={{ fontSize: 12 }} itemSorter={null} />
      <Bar dataKey="cohortFailures" stackId="f" name="Failures, the group's months" fill="#b23a2b" isAnimationActive={false} maxBarSize={18} />
      <Bar dataKey="otherFailures" stackId="f" name="Failures, other months" fill="#8c95a3" isAnimationActive={false} maxBarSize={18} />
      <Line dataKey="expected" name={`Expected at ${rateName}`} type="stepAfter" stroke="#1a5559" strokeWidth={2} dot={false} connectNulls={false} isAnimationActive={false} />
    </ComposedChart>
  );
  return (
    <figure role="img" aria-label={label} className="m-0">
      {width ? chart : <ResponsiveContainer width="100%" height={height}>{chart}</ResponsiveContainer>}
    </figure>
  );
}
