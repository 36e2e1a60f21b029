/**
 * The sections a pattern page and a group page share: why the group is (or is not) flagged in plain words, the
 * chart by build month, what the failures were (by root cause and moisture), whether it is water, how failures
 * grow with age (MCF) and whether they come faster, the exact statistics one click deeper, and the failures and
 * vehicles behind it. Figures are whatever the page was given: the fleet's, or the reader's depots' only.
 */
import { useMemo, useState } from 'react';
import { Check, Droplets, X } from 'lucide-react';
import type { CohortView, McfResponse, PatternDefectRow, PatternRecordDetail, PatternVehicleRow } from '@/lib/contracts/patterns';
import type { ExposureBand, ModuleBaseline, PatternsReport } from '@/lib/patterns/types';
import { computeFailureBreakdown, describeFailureBreakdown, NOT_RECORDED, PART_FAULT_CAUSES, type BreakdownRow } from '@/lib/patterns/breakdown';
import { explainCohort, explainTrend, formatCount, formatExpected, formatRatio, formatShare, formatTimes } from '@/lib/patterns/explain';
import { formatBuildRange, formatDay, formatMonth } from '@/lib/patterns/records';
import { MCF_MIN_AT_RISK } from '@/lib/patterns/chart-data';

import { MOISTURE_LABELS, PARKING_LABELS, POSITION_LABELS, ROOT_CAUSE_LABELS, STATUS_LABELS } from '@/components/labels';
import { BAND_COLOURS, BAND_LABELS, COMPARE_COLOURS, TRACE_VERDICT_LABELS } from './labels';
import { McfChart, type McfCurve } from './McfChart';
import { RateChart } from './RateChart';

/** What the shared sections need. */
export type CohortPageData = {
  /** What the page is about: a pattern record or a group of the report (names the lists). */
  noun: 'pattern' | 'group';
  cohort: CohortView;
  baseline: ModuleBaseline | null;
  method: PatternsReport['method'];
  module: PatternRecordDetail['module'];
  /** The day the figures are as of. */
  asOf: string;
  /** Whose data the figures are: every depot, or the reader's depots (named). */
  scope: 'all' | 'depots';
  depotCodes: string[] | null;
  vehicleList: PatternVehicleRow[];
  defectList: PatternDefectRow[];
  /** Groups tested in the report (for the statistics), when known. */
  cohortsTested?: number;
};

/** Filter of the failures table set from the breakdown. */
export type FailureFilter = { by: 'rootCause' | 'moisture'; key: string } | null;

const VEHICLES_SHOWN = 25;

const causeLabel = (k: string) => (k === NOT_RECORDED ? 'Not recorded' : (ROOT_CAUSE_LABELS[k] ?? k));
const moistureLabel = (k: string) => (k === NOT_RECORDED ? 'Not recorded' : (MOISTURE_LABELS[k] ?? k));

function Figure({ label, value, detail }: { label: string; value: string; detail?: string }) {
  return (
    <div className="rounded-md border border-ink-200 bg-ink-50 px-3 py-2">
      <div className="text-xs font-semibold tracking-wide text-ink-500 uppercase">{label}</div>
      <div className={`font-bold text-ink-900 ${value.length > 6 ? 'text-lg leading-snug' : 'text-2xl'}`}>{value}</div>
      {detail && <div className="text-xs text-ink-600">{detail}</div>}
    </div>
  );
}

/** Who the figures are about, in words ("every depot", "your depots (GHQ)"). */
export function scopeWords(d: Pick<CohortPageData, 'scope' | 'depotCodes'>): string {
  return d.scope === 'all' ? 'every depot' : `your depots (${(d.depotCodes ?? []).join(', ') || 'none'})`;
}

/** "Why it is flagged": the figures and the plain sentences. `lead` goes first (e.g. whose figures these are). */
export function WhySection({ d, lead, onShowBreakdown }: { d: CohortPageData; lead?: React.ReactNode; onShowBreakdown: () => void }) {
  const c = d.cohort;
  const mine = d.scope === 'depots';
  const e = explainCohort(c, mine ? 'depots' : 'fleet');
  const b = computeFailureBreakdown(d.defectList);
  const chanceFigure = c.search
    ? { label: 'Chance?', value: !c.significant ? 'Could be chance' : c.search.qValue < 0.001 ? 'Far beyond chance' : 'Unlikely', detail: c.significant ? 'flagged' : 'not flagged' }
    : { label: 'Fleet-wide', value: c.significant ? 'Flagged' : 'Not flagged', detail: 'decided on the whole fleet' };
  const rateName = mine ? "your depots' rate" : "the fleet's rate";
  return (
    <section className="card card-pad space-y-3" aria-labelledby="h-why">
      <h2 id="h-why">{c.significant || !c.search ? 'Why it is flagged' : 'Why it is not flagged'}</h2>
      {lead}
      <div className="grid grid-cols-2 gap-2 md:grid-cols-4">
        <Figure label="Failures" value={c.failures.toLocaleString('en-GB')} detail={`${formatExpected(c.expected)} expected at ${rateName}${c.ratioToFleet === null ? '' : ` (${formatTimes(c.ratioToFleet)})`}`} />
        <Figure
          label={mine ? 'Against the rest of your depots' : 'Against the rest of the fleet'}
          value={c.rateRatio === null ? '–' : formatTimes(c.rateRatio)}
          detail={c.rateRatio === null ? 'nothing to compare with' : `as often; 95% ${formatRatio(c.ciLow)}–${c.ciHigh === null ? '∞' : formatRatio(c.ciHigh)}×`}
        />
        <Figure {...chanceFigure} />
        <Figure label="Water found" value={c.diagnosedFailures ? formatShare(c.moistureShare) : '–'} detail={c.diagnosedFailures ? `of diagnosed; rest ${formatShare(c.moistureShareRest)}` : 'none diagnosed'} />
      </div>
      <p>{e.rate}</p>
      {e.chance && <p>{e.chance}</p>}
      {e.repeats && <p>{e.repeats}</p>}
      <p className="text-sm text-ink-700">
        Every defect reported on {c.moduleCode} of these vehicles counts as a failure of the module, whatever its root cause turned out to be.{' '}
        {b.total > 0 && <>{describeFailureBreakdown(b, causeLabel)} </>}
        <button type="button" className="link" onClick={onShowBreakdown}>
          What the failures were
        </button>
      </p>
    </section>
  );
}

/** The chart of failures against expectation by build month. */
export function ChartSection({ d }: { d: CohortPageData }) {
  const c = d.cohort;
  const band = BAND_LABELS[c.exposureBand].toLowerCase();
  const mine = d.scope === 'depots';
  return (
    <section className="card card-pad" aria-labelledby="h-chart">
      <h2 id="h-chart">Failures against expectation by build month</h2>
      <p className="mb-2 text-sm text-ink-600">
        Vehicles with {band} moisture exposure{mine ? ' at your depots' : ''}, by the month they were built. Red bars are the group's months (
        {formatBuildRange(c)}); the line is what {mine ? "your depots' rate" : "the fleet's rate"} for {c.moduleCode} gives for each month's vehicle-years.
        Months in which no such vehicle was built are left empty.
      </p>
      <RateChart months={c.byMonth} buildFrom={c.buildFrom} buildTo={c.buildTo} rateName={mine ? "your depots' rate" : "the fleet's rate"} />
    </section>
  );
}

function BreakdownTable({ caption, rows, label, total, onShow, partFaults }: { caption: string; rows: BreakdownRow[]; label: (k: string) => string; total: number; onShow: (key: string) => void; partFaults?: boolean }) {
  const what = caption.startsWith('By root') ? 'Root cause' : 'Moisture found';
  return (
    <table className="data-table">
      <caption className="px-3 pb-1 text-left text-sm font-semibold text-ink-800">{caption}</caption>
      <thead>
        <tr>
          <th scope="col" className="whitespace-nowrap">
            {what}
          </th>
          <th scope="col" className="text-right" title="Select a count to list those failures below">
            Failures
          </th>
          <th scope="col" className="text-right">
            Share
          </th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.key}>
            <td className="py-1 align-middle whitespace-nowrap">
              {label(r.key)}
              {partFaults && PART_FAULT_CAUSES.includes(r.key) && <span className="badge-brick ml-1.5">part fault</span>}
            </td>
            <td className="py-0 text-right align-middle">
              <button type="button" className="link min-h-10 min-w-10 px-1 tabular-nums" onClick={() => onShow(r.key)} aria-label={`${label(r.key)}: show the ${formatCount(r.count, 'failure')}`}>
                {r.count}
              </button>
            </td>
            <td className="py-1 text-right align-middle tabular-nums">{formatShare(r.share)}</td>
          </tr>
        ))}
        {total === 0 && (
          <tr>
            <td colSpan={3} className="text-ink-500">
              No failures.
            </td>
          </tr>
        )}
      </tbody>
    </table>
  );
}

/** What the failures were: by root cause and by moisture finding, each row opening the failures list filtered. */
export function BreakdownSection({ d, onFilter }: { d: CohortPageData; onFilter: (f: FailureFilter) => void }) {
  const b = useMemo(() => computeFailureBreakdown(d.defectList), [d.defectList]);
  const c = d.cohort;
  return (
    <section className="card card-pad space-y-3" aria-labelledby="h-breakdown" id="breakdown">
      <h2 id="h-breakdown">What the failures were</h2>
      <p className="text-sm text-ink-700">
        A failure here is any defect reported on {c.moduleCode} of a vehicle in the group — the module's own faults, and also repairs whose cause turned out
        to be water, a connector, wiring or software. {b.total > 0 && describeFailureBreakdown(b, causeLabel)}
        {d.scope === 'depots' && ' Counted at your depots only.'} Select a count to list those failures.
      </p>
      <div className="grid gap-4 lg:grid-cols-2">
        <div className="table-wrap">
          <BreakdownTable caption="By root cause" rows={b.byRootCause} label={causeLabel} total={b.total} partFaults onShow={(key) => onFilter({ by: 'rootCause', key })} />
        </div>
        <div className="table-wrap">
          <BreakdownTable caption="By moisture found" rows={b.byMoisture} label={moistureLabel} total={b.total} onShow={(key) => onFilter({ by: 'moisture', key })} />
        </div>
      </div>
    </section>
  );
}

/** Is it water? The moisture evidence and the three conditions of the rule, in plain words. */
export function WaterSection({ d }: { d: CohortPageData }) {
  const c = d.cohort;
  const e = explainCohort(c, d.scope === 'depots' ? 'depots' : 'fleet');
  return (
    <section className="card card-pad space-y-3" aria-labelledby="h-water">
      <h2 id="h-water">Is it water?</h2>
      <p>{e.moisture}</p>
      <ul className="space-y-1.5" aria-label="The water-ingress rule">
        {e.waterRule.map((rule) => (
          <li key={rule.label} className="flex items-start gap-2">
            {rule.met ? <Check size={18} className="mt-0.5 shrink-0 text-moss-600" aria-label="met" /> : <X size={18} className="mt-0.5 shrink-0 text-brick-600" aria-label="not met" />}
            <span>
              {rule.label} <span className="text-sm text-ink-500">— {rule.detail}</span>
            </span>
          </li>
        ))}
      </ul>
      <p className={c.waterIngress ? 'font-semibold text-seep-700' : 'font-semibold text-ink-800'}>{e.waterVerdict}</p>
    </section>
  );
}

const COMPARE_LABELS = { cohort: 'This group', rest: 'Rest of its band' } as const;

/** Failures as vehicles age: the MCF (this group against the rest of its band, or by band) and the trend. */
export function AgeingSection({ d, mcf }: { d: CohortPageData; mcf: { data?: McfResponse; error: Error | null } }) {
  const c = d.cohort;
  const [view, setView] = useState<'compare' | 'bands'>('compare');
  const band = BAND_LABELS[c.exposureBand].toLowerCase();
  const where = d.scope === 'depots' ? ' at your depots' : '';
  const compareCurves: McfCurve[] = (mcf.data?.compare?.series ?? []).map((s) => ({ key: s.key, label: s.key === 'cohort' ? `${COMPARE_LABELS.cohort} (${formatBuildRange(c)})` : `${COMPARE_LABELS.rest} (${band} exposure)`, colour: COMPARE_COLOURS[s.key], heavy: s.key === 'cohort', points: s.points }));
  const bandCurves: McfCurve[] = (mcf.data?.series ?? [])
    .filter((s) => s.points.length > 0)
    .map((s) => ({ key: s.key, label: s.key === 'all' ? 'All vehicles' : `${BAND_LABELS[s.key as ExposureBand]} exposure`, colour: BAND_COLOURS[s.key], heavy: s.key === c.exposureBand, points: s.points }));
  const trend = explainTrend(c.trend, 'in this group');
  const moduleTrend = d.baseline ? explainTrend(d.baseline.trend, `of ${c.moduleCode} across ${d.scope === 'depots' ? 'your depots' : 'the fleet'}`) : null;
  return (
    <section className="card card-pad space-y-3" aria-labelledby="h-mcf">
      <h2 id="h-mcf">Failures as vehicles age</h2>
      <p className="text-sm text-ink-600">
        The average number of {c.moduleCode} failures per vehicle up to each age in service{where}, with dashed 95% limits. A curve that climbs faster fails
        more; one that bends upwards means failures come faster as vehicles age. Each curve stops where fewer than {MCF_MIN_AT_RISK} vehicles are still
        observed at that age.
      </p>
      <div className="flex flex-wrap gap-2" role="group" aria-label="Curves to compare">
        <button type="button" className={view === 'compare' ? 'btn-secondary' : 'btn-ghost'} aria-pressed={view === 'compare'} onClick={() => setView('compare')}>
          This group against the rest of its band
        </button>
        <button type="button" className={view === 'bands' ? 'btn-secondary' : 'btn-ghost'} aria-pressed={view === 'bands'} onClick={() => setView('bands')}>
          All {c.moduleCode} by exposure band
        </button>
      </div>
      {mcf.data ? (
        view === 'compare' ? (
          <McfChart curves={compareCurves} subject={`of this group against the rest of the ${band} exposure band`} />
        ) : (
          <McfChart curves={bandCurves} subject="by exposure band" />
        )
      ) : mcf.error ? (
        <p className="text-sm text-brick-700">The curves could not be loaded: {mcf.error.message}</p>
      ) : (
        <progress className="h-2 w-full accent-estuary-600" aria-label="Loading the curves" />
      )}
      <h3>Are failures accelerating?</h3>
      <p>{trend.plain}</p>
      {moduleTrend && <p className="text-sm text-ink-600">{moduleTrend.plain}</p>}
    </section>
  );
}

/** The exact statistics, one click deeper, and where the method is explained. */
export function StatisticsSection({ d }: { d: CohortPageData }) {
  const c = d.cohort;
  const mine = d.scope === 'depots';
  const e = explainCohort(c, mine ? 'depots' : 'fleet');
  const trend = explainTrend(c.trend, 'in this group');
  const rows: [string, string][] = [
    ['Group', `${formatCount(c.vehicles, 'vehicle')}, ${c.vehicleYears.toFixed(1)} vehicle-years, ${formatCount(c.failures, 'failure')} (${c.ratePerVehicleYear.toFixed(3)} per vehicle-year)`],
    [
      mine ? "Your depots' rate of the module" : 'Fleet rate of the module',
      `${c.fleetRatePerVehicleYear.toFixed(4)} failures per vehicle-year${d.baseline ? ` (${d.baseline.failures} failures over ${d.baseline.vehicleYears.toFixed(0)} vehicle-years; Garwood 95% ${d.baseline.rateCiLow.toFixed(4)}–${d.baseline.rateCiHigh.toFixed(4)})` : ''}`,
    ],
    [`Expected at ${mine ? "your depots'" : 'the fleet'} rate`, `${c.expected.toFixed(2)}; failures are ${c.ratioToFleet === null ? '–' : c.ratioToFleet.toFixed(3)} times that (this rate includes the group's own failures)`],
    [mine ? 'Rest of your depots' : 'Rest of the fleet', `${c.restFailures} failures over ${c.restVehicleYears.toFixed(1)} vehicle-years`],
    [
      'Rate ratio against the rest, exact conditional 95% CI',
      `${c.rateRatio === null ? '∞' : c.rateRatio.toFixed(4)} (${c.ciLow.toFixed(4)}–${c.ciHigh === null ? '∞' : c.ciHigh.toFixed(4)}); exact two-sided p ${c.rateRatioPValue.toPrecision(4)} (not adjusted for the search)`,
    ],
  ];
  if (c.search) {
    const s = c.search;
    rows.push(
      ['Build-range scan', `Kulldorff log-likelihood ratio ${s.scanLlr.toFixed(4)}; ${s.scanExpected.toFixed(2)} expected within the band; ${s.windowsTested.toLocaleString('en-GB')} build ranges tested in a band of ${c.bandVehicles} vehicles (${c.bandFailures} failures)`],
      ['Scan p-value', `${s.pValue.toPrecision(4)} by ${s.pValueMethod === 'gumbel' ? 'the Gumbel tail fitted to the replicates' : 'Monte Carlo'} (Monte Carlo p ${s.mcP.toPrecision(4)} over ${s.replicates} replicates${s.gumbelP === null ? '' : `, Gumbel p ${s.gumbelP.toPrecision(4)}`}; seed ${d.method.seed})`],
      ['q-value (Benjamini–Hochberg)', `${s.qValue.toPrecision(4)} across ${d.cohortsTested ? `${d.cohortsTested} groups` : 'every group'} of the report; flagged below ${d.method.fdrLevel}`],
    );
  } else {
    rows.push(['Search', 'None over your depots: the build range is the fleet-wide pattern’s, found and judged on the whole fleet by the fleet managers’ report.']);
  }
  rows.push(['Moisture', e.moistureStat ?? 'No failure diagnosed.'], ['Trend in the group', trend.stat ?? 'Too few failures to test.']);
  if (d.baseline) rows.push([`Trend of ${c.moduleCode}`, explainTrend(d.baseline.trend, '').stat ?? 'Too few failures to test.']);
  return (
    <details className="card card-pad">
      <summary className="cursor-pointer font-semibold text-ink-900">The statistics behind this</summary>
      <div className="mt-3 space-y-3">
        {e.chanceStat && <p className="text-sm">{e.chanceStat}</p>}
        <dl className="grid gap-x-4 gap-y-2 text-sm sm:grid-cols-[13rem_1fr]">
          {rows.map(([k, v]) => (
            <div key={k} className="contents">
              <dt className="text-ink-500">{k}</dt>
              <dd className="text-ink-900 tabular-nums">{v}</dd>
            </div>
          ))}
        </dl>
        <p className="text-sm text-ink-600">
          How the build range is found, what the chance figures mean and how water is decided:{' '}
          <a className="link" href="/patterns/method">
            How Seepline finds patterns
          </a>
          .
        </p>
      </div>
    </details>
  );
}

function matches(d: PatternDefectRow, f: FailureFilter): boolean {
  if (!f) return true;
  const v = f.by === 'rootCause' ? d.rootCause : d.moisture;
  return (v ?? NOT_RECORDED) === f.key;
}

/** The failures behind the group, filterable from the breakdown. */
export function FailuresSection({ d, filter, onFilter }: { d: CohortPageData; filter: FailureFilter; onFilter: (f: FailureFilter) => void }) {
  const rows = d.defectList.filter((x) => matches(x, filter));
  const mine = d.scope === 'depots';
  const filterLabel = filter ? `${filter.by === 'rootCause' ? 'Root cause' : 'Moisture found'}: ${filter.by === 'rootCause' ? causeLabel(filter.key) : moistureLabel(filter.key)}` : null;
  return (
    <section className="card" aria-labelledby="h-defects" id="failures">
      <div className="flex flex-wrap items-baseline justify-between gap-2 border-b border-ink-200 px-4 py-3">
        <h2 id="h-defects">Failures behind this {d.noun}</h2>
        <span className="text-sm text-ink-500">
          {rows.length} of {formatCount(d.cohort.failures, 'failure')}
          {mine ? ' (your depots)' : ''}, oldest first
        </span>
      </div>
      {filterLabel && (
        <div className="flex flex-wrap items-center gap-2 border-b border-ink-200 bg-estuary-50 px-4 py-2 text-sm">
          <span>
            Showing <strong>{filterLabel}</strong>
          </span>
          <button type="button" className="btn-ghost" onClick={() => onFilter(null)}>
            Show all failures
          </button>
        </div>
      )}
      {rows.length ? (
        <div className="table-wrap max-h-[32rem]">
          <table className="data-table">
            <caption className="sr-only">Failures behind this {d.noun}</caption>
            <thead>
              <tr>
                <th scope="col">Defect</th>
                <th scope="col">Vehicle</th>
                <th scope="col">Reported</th>
                <th scope="col">Door</th>
                <th scope="col">Moisture</th>
                <th scope="col">Root cause</th>
                <th scope="col">Action</th>
                <th scope="col">Fault codes</th>
                <th scope="col">Traces</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((x) => (
                <tr key={x.id}>
                  <td className="whitespace-nowrap">
                    <a className="link" href={`/defects/${x.id}`}>
                      {x.ref}
                    </a>
                    <div className="text-xs text-ink-500">{STATUS_LABELS[x.status] ?? x.status}</div>
                  </td>
                  <td className="whitespace-nowrap">
                    <a className="link" href={`/vehicles/${encodeURIComponent(x.vin)}`}>
                      {x.fleetNumber ?? x.vin}
                    </a>
                    <div className="text-xs text-ink-500">{x.depotCode}</div>
                  </td>
                  <td className="whitespace-nowrap">{formatDay(x.reportedAt)}</td>
                  <td title={POSITION_LABELS[x.position]}>{x.position}</td>
                  <td>{x.moisture ? <span className={x.wet ? 'badge-seep' : 'badge-neutral'}>{moistureLabel(x.moisture)}</span> : <span className="text-ink-400">–</span>}</td>
                  <td>{x.rootCause ? causeLabel(x.rootCause) : <span className="text-ink-400">{x.diagnosed ? '–' : 'Not diagnosed'}</span>}</td>
                  <td className="min-w-[16rem] text-xs">{x.action ?? <span className="text-ink-400">–</span>}</td>
                  <td className="mono text-xs whitespace-nowrap">{x.dtcs.join(' ') || '–'}</td>
                  <td>
                    {x.traces.length === 0 ? (
                      <span className="text-ink-400">–</span>
                    ) : (
                      <div className="flex flex-wrap gap-1">
                        {x.traces.map((t) => (
                          <span key={t.id} className={t.verdict === 'healthy' ? 'badge-moss' : 'badge-brick'} title={t.fileName ?? undefined}>
                            {TRACE_VERDICT_LABELS[t.verdict] ?? t.verdict}
                          </span>
                        ))}
                      </div>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : (
        <p className="px-4 py-6 text-sm text-ink-500">{filter ? 'None with this finding.' : mine ? 'None at your depots.' : 'No failures.'}</p>
      )}
    </section>
  );
}

/** The vehicles of the group. */
export function VehiclesSection({ d }: { d: CohortPageData }) {
  const [all, setAll] = useState(false);
  const rows = d.vehicleList;
  const shown = all ? rows : rows.slice(0, VEHICLES_SHOWN);
  return (
    <section className="card" aria-labelledby="h-vehicles">
      <div className="flex flex-wrap items-baseline justify-between gap-2 border-b border-ink-200 px-4 py-3">
        <h2 id="h-vehicles">Vehicles in this {d.noun}</h2>
        <span className="text-sm text-ink-500">
          {rows.length} of {formatCount(d.cohort.vehicles, 'vehicle')}
          {d.scope === 'depots' ? ' (your depots)' : ''}, most failures first
        </span>
      </div>
      {rows.length === 0 ? (
        <p className="px-4 py-6 text-sm text-ink-500">None at your depots.</p>
      ) : (
        <>
          <div className="table-wrap max-h-[32rem]">
            <table className="data-table">
              <caption className="sr-only">Vehicles in this {d.noun}</caption>
              <thead>
                <tr>
                  <th scope="col">Vehicle</th>
                  <th scope="col">Depot</th>
                  <th scope="col">Built</th>
                  <th scope="col">Parking</th>
                  <th scope="col" className="text-right">
                    Washes / month
                  </th>
                  <th scope="col" className="text-right">
                    Exposure
                  </th>
                  <th scope="col" className="text-right" title="Failures of this module on the vehicle; “2+” marks vehicles that failed twice or more">
                    Failures
                  </th>
                </tr>
              </thead>
              <tbody>
                {shown.map((v) => (
                  <tr key={v.id}>
                    <td className="whitespace-nowrap">
                      <a className="link" href={`/vehicles/${encodeURIComponent(v.vin)}`}>
                        {v.fleetNumber ?? v.vin}
                      </a>
                      <div className="mono text-xs text-ink-500">{v.vin}</div>
                    </td>
                    <td>{v.depotCode}</td>
                    <td className="whitespace-nowrap">{formatMonth(v.buildMonth)}</td>
                    <td>{PARKING_LABELS[v.parking] ?? v.parking}</td>
                    <td className="text-right tabular-nums">{v.washesPerMonth}</td>
                    <td className="text-right tabular-nums" title={`${BAND_LABELS[v.exposureBand]} exposure band`}>
                      {v.exposureIndex}/10
                    </td>
                    <td className="text-right whitespace-nowrap tabular-nums">
                      {v.failures}
                      {v.repeat && (
                        <span className="badge-amber ml-1.5" title="Failed twice or more">
                          2+
                        </span>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {rows.length > VEHICLES_SHOWN && (
            <div className="border-t border-ink-200 px-4 py-2">
              <button type="button" className="btn-ghost" onClick={() => setAll(!all)}>
                {all ? `Show the first ${VEHICLES_SHOWN}` : `Show all ${rows.length} vehicles`}
              </button>
            </div>
          )}
        </>
      )}
    </section>
  );
}

/** Scroll a section into view (after React has rendered a filter change). */
export function scrollToSection(id: string): void {
  requestAnimationFrame(() => document.getElementById(id)?.scrollIntoView({ behavior: 'smooth', block: 'start' }));
}

/** "Water found" for lists: the share with a drop icon, plain text (not a link). */
export function WetShare({ share }: { share: number }) {
  return (
    <span className="inline-flex items-center gap-1 whitespace-nowrap">
      <Droplets size={14} aria-hidden="true" className={share >= 0.5 ? 'text-seep-600' : 'text-ink-400'} />
      {formatShare(share)}
    </span>
  );
}

