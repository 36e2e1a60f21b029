/**
 * Failures against expectation by build month (recharts): bars are the failures of vehicles built in each month
 * of the band, the line is what the module's fleet rate gives for their vehicle-years, and the shaded span is the
 * cohort's build range. A fixed width (for print) or the container's width.
 */
import { Bar, CartesianGrid, ComposedChart, Legend, Line, ReferenceArea, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { CohortMonth } from '@/lib/patterns/types';
import { formatBuildMonth } from '@/components/defects/format';

type Props = {
  months: CohortMonth[];
  buildFrom: string;
  buildTo: string;
  /** Fixed pixel width (print); the container's width when absent. */
  width?: number;
  height?: number;
  /** Turn off the hover tooltip (print). */
  static?: boolean;
};

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const tick = (m: string) => `${MONTHS[Number(m.slice(5, 7)) - 1]} ${m.slice(2, 4)}`;

type Point = CohortMonth & { cohortFailures: number; otherFailures: number };

function TooltipBody({ active, payload }: { active?: boolean; payload?: { payload: Point }[] }) {
  const p = payload?.[0]?.payload;
  if (!active || !p) return null;
  return (
    <div className="rounded-md border border-ink-200 bg-white px-3 py-2 text-xs shadow-md">
      <div className="font-semibold text-ink-900">
        Built {formatBuildMonth(p.month)} {p.inCohort && <span className="badge-brick ml-1">in the cohort</span>}
      </div>
      <div>
        {p.failures} failures, {p.expected.toFixed(1)} expected
      </div>
      <div className="text-ink-500">
        {p.vehicles} vehicles, {p.vehicleYears.toFixed(1)} vehicle-years
      </div>
    </div>
  );
}

/** The chart; `aria-label` sums it up for screen readers. */
export function RateChart({ months, buildFrom, buildTo, width, height = 280, static: isStatic = false }: Props) {
  const inCohort = months.filter((m) => m.inCohort);
  const label = `Failures by build month against the fleet-rate expectation; the cohort ${formatBuildMonth(buildFrom)} to ${formatBuildMonth(buildTo)} has ${inCohort.reduce((s, m) => s + m.failures, 0)} failures against ${inCohort
    .reduce((s, m) => s + m.expected, 0)
    .toFixed(1)} expected.`;
  // Two stacked series (one of them 0 in each month) colour the cohort's months and give the legend both meanings.
  const data: Point[] = months.map((m) => ({ ...m, cohortFailures: m.inCohort ? m.failures : 0, otherFailures: m.inCohort ? 0 : m.failures }));
  const chart = (
    <ComposedChart data={data} margin={{ top: 16, right: 12, bottom: 4, left: 0 }} width={width} height={width ? height : undefined}>
      <CartesianGrid stroke="#eceef1" vertical={false} />
      <XAxis dataKey="month" tickFormatter={tick} tick={{ fontSize: 11, fill: '#4d5665' }} interval="preserveStartEnd" minTickGap={14} />
      <YAxis allowDecimals={false} tick={{ fontSize: 11, fill: '#4d5665' }} width={32} />
      <ReferenceArea x1={buildFrom} x2={buildTo} fill="#f7dcd7" fillOpacity={0.6} ifOverflow="extendDomain" />
      {!isStatic && <Tooltip content={<TooltipBody />} cursor={{ fill: '#d5ecec', fillOpacity: 0.4 }} />}
      <Legend position="top" height={26} iconSize={10} wrapperStyle={{ fontSize: 12 }} itemSorter={null} />
      <Bar dataKey="cohortFailures" stackId="f" name="Failures, cohort months" fill="#b23a2b" isAnimationActive={false} maxBarSize={18} />
      <Bar dataKey="otherFailures" stackId="f" name="Failures, other months" fill="#8c95a3" isAnimationActive={false} maxBarSize={18} />
      <Line dataKey="expected" name="Expected at the fleet rate" type="stepAfter" stroke="#1a5559" strokeWidth={2} dot={false} isAnimationActive={false} />
    </ComposedChart>
  );
  return (
    <figure role="img" aria-label={label} className="m-0">
      {width ? chart : <ResponsiveContainer width="100%" height={height}>{chart}</ResponsiveContainer>}
    </figure>
  );
}
