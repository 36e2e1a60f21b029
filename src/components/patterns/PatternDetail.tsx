/**
 * The pattern page island: why a cohort is flagged, in plain words first (rate, chance, water, ageing), the chart
 * of failures against expectation by build month, the MCF curves by exposure band, the status with its actions and
 * history, and the vehicles and defects behind it. The exact statistics sit one click deeper.
 */
import { useEffect, useRef, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { Check, X } from 'lucide-react';
import { useIslandQueryClient } from '@/lib/client/query-client';
import type { PatternRecordDetail } from '@/lib/contracts/patterns';
import { explainCohort, explainTrend, formatProbability, formatRatio, formatShare } from '@/lib/patterns/explain';
import { formatBuildRange } from '@/lib/patterns/records';
import { formatCalendarDate, formatInstant, formatInstantDate } from '@/components/defects/format';
import { MOISTURE_LABELS, POSITION_LABELS, ROOT_CAUSE_LABELS, STATUS_LABELS } from '@/components/labels';
import { BAND_LABELS, CAMPAIGN_KIND_LABELS, PATTERN_STATUS_BADGE, PATTERN_STATUS_LABELS, TRACE_VERDICT_LABELS, VERDICT_BADGE, VERDICT_LABELS } from './labels';
import { McfChart } from './McfChart';
import { RateChart } from './RateChart';
import { StatusActions } from './StatusActions';
import { useMcf, usePatternRecord, useSyncPatterns } from './queries';

type Props = {
  id: number;
  canWrite: boolean;
};

const VEHICLES_SHOWN = 25;

function Figure({ label, value, detail }: { label: string; value: string; detail?: string }) {
  return (
    <div className="rounded-md border border-ink-200 bg-ink-50 px-3 py-2">
      <div className="text-xs font-semibold tracking-wide text-ink-500 uppercase">{label}</div>
      <div className="text-2xl font-bold text-ink-900">{value}</div>
      {detail && <div className="text-xs text-ink-600">{detail}</div>}
    </div>
  );
}

const HISTORY_FIELDS: Record<string, string> = {
  status: 'Status',
  note: 'Note',
  reason: 'Reason',
  campaignKind: 'Campaign',
  campaignNote: 'Campaign note',
  campaignTargetDate: 'Target date',
  buildRange: 'Build range',
  verdict: 'Verdict',
};

function historyValue(field: string | null, v: string | null): string {
  if (v === null) return '–';
  if (field === 'status') return PATTERN_STATUS_LABELS[v as 'new'] ?? v;
  if (field === 'campaignKind') return CAMPAIGN_KIND_LABELS[v as 'other'] ?? v;
  if (field === 'campaignTargetDate') return formatCalendarDate(v);
  return v;
}

function History({ rows }: { rows: PatternRecordDetail['history'] }) {
  if (rows.length === 0) return <p className="text-sm text-ink-500">No history yet.</p>;
  return (
    <ol className="space-y-2 text-sm">
      {rows.map((h) => (
        <li key={h.id} className="border-l-2 border-ink-200 pl-3">
          <div className="text-xs text-ink-500">
            {formatInstant(h.at)} · {h.who === 'system' ? 'Seepline (from the report)' : h.who}
          </div>
          {h.field ? (
            <div>
              <span className="font-semibold">{HISTORY_FIELDS[h.field] ?? h.field}</span>:{' '}
              {h.oldValue !== null && <span className="text-ink-500 line-through">{historyValue(h.field, h.oldValue)}</span>} {historyValue(h.field, h.newValue)}
            </div>
          ) : (
            <div>{h.action === 'found' ? `Found: ${h.newValue ?? ''}` : (h.newValue ?? h.action)}</div>
          )}
        </li>
      ))}
    </ol>
  );
}

function DefectsTable({ rows, caption }: { rows: PatternRecordDetail['defectList']; caption: string }) {
  return (
    <div className="table-wrap max-h-[32rem]">
      <table className="data-table">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr>
            <th scope="col">Defect</th>
            <th scope="col">Vehicle</th>
            <th scope="col">Reported</th>
            <th scope="col">Door</th>
            <th scope="col">Moisture</th>
            <th scope="col">Root cause</th>
            <th scope="col">Fault codes</th>
            <th scope="col">Traces</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((d) => (
            <tr key={d.id}>
              <td className="whitespace-nowrap">
                <a className="link" href={`/defects/${d.id}`}>
                  {d.ref}
                </a>
                <div className="text-xs text-ink-500">{STATUS_LABELS[d.status] ?? d.status}</div>
              </td>
              <td className="whitespace-nowrap">
                <a className="link" href={`/vehicles/${encodeURIComponent(d.vin)}`}>
                  {d.fleetNumber ?? d.vin}
                </a>
                <div className="text-xs text-ink-500">{d.depotCode}</div>
              </td>
              <td className="whitespace-nowrap">{formatInstantDate(d.reportedAt)}</td>
              <td title={POSITION_LABELS[d.position]}>{d.position}</td>
              <td>
                {d.moisture ? <span className={d.wet ? 'badge-seep' : 'badge-neutral'}>{MOISTURE_LABELS[d.moisture] ?? d.moisture}</span> : <span className="text-ink-400">–</span>}
              </td>
              <td>{d.rootCause ? (ROOT_CAUSE_LABELS[d.rootCause] ?? d.rootCause) : <span className="text-ink-400">{d.diagnosed ? '–' : 'Not diagnosed'}</span>}</td>
              <td className="mono text-xs">{d.dtcs.join(' ') || '–'}</td>
              <td>
                {d.traces.length === 0 ? (
                  <span className="text-ink-400">–</span>
                ) : (
                  <div className="flex flex-wrap gap-1">
                    {d.traces.map((t) => (
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
  );
}

function VehiclesTable({ rows, caption }: { rows: PatternRecordDetail['vehicleList']; caption: string }) {
  const [all, setAll] = useState(false);
  const shown = all ? rows : rows.slice(0, VEHICLES_SHOWN);
  return (
    <>
      <div className="table-wrap max-h-[32rem]">
        <table className="data-table">
          <caption className="sr-only">{caption}</caption>
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
              <th scope="col" className="text-right">
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
                <td className="whitespace-nowrap">{formatCalendarDate(v.buildMonth)}</td>
                <td className="capitalize">{v.parking}</td>
                <td className="text-right tabular-nums">{v.washesPerMonth}</td>
                <td className="text-right tabular-nums" title={`${BAND_LABELS[v.exposureBand]} exposure band`}>
                  {v.exposureIndex}/10
                </td>
                <td className="text-right tabular-nums">
                  {v.failures}
                  {v.repeat && <span className="badge-amber ml-1.5">repeat</span>}
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
  );
}

function Statistics({ r }: { r: PatternRecordDetail }) {
  const c = r.cohort;
  const rows: [string, string][] = [
    ['Cohort', `${c.vehicles} vehicles, ${c.vehicleYears.toFixed(1)} vehicle-years, ${c.failures} failures (${c.ratePerVehicleYear.toFixed(3)} per vehicle-year)`],
    ['Fleet rate of the module', `${c.fleetRatePerVehicleYear.toFixed(4)} failures per vehicle-year${r.baseline ? ` (${r.baseline.failures} failures over ${r.baseline.vehicleYears.toFixed(0)} vehicle-years; Garwood 95% ${r.baseline.rateCiLow.toFixed(4)}–${r.baseline.rateCiHigh.toFixed(4)})` : ''}`],
    ['Expected at the fleet rate', `${c.expected.toFixed(2)} (ratio to the fleet ${c.ratioToFleet === null ? '–' : c.ratioToFleet.toFixed(3)})`],
    ['Rest of the module’s fleet', `${c.restFailures} failures over ${c.restVehicleYears.toFixed(1)} vehicle-years`],
    ['Rate ratio, exact conditional 95% CI', `${c.rateRatio === null ? '∞' : c.rateRatio.toFixed(4)} (${c.ciLow.toFixed(4)}–${c.ciHigh === null ? '∞' : c.ciHigh.toFixed(4)}); exact two-sided p ${c.rateRatioPValue.toPrecision(4)} (not adjusted for the search)`],
    ['Build-range scan', `Kulldorff log-likelihood ratio ${c.scanLlr.toFixed(4)}; ${c.scanExpected.toFixed(2)} expected within the band; ${c.windowsTested.toLocaleString('en-GB')} build ranges tested in a band of ${c.bandVehicles} vehicles (${c.bandFailures} failures)`],
    ['Scan p-value', `${c.pValue.toPrecision(4)} by ${c.pValueMethod === 'gumbel' ? 'the Gumbel tail fitted to the replicates' : 'Monte Carlo'} (Monte Carlo p ${c.mcP.toPrecision(4)} over ${c.replicates} replicates${c.gumbelP === null ? '' : `, Gumbel p ${c.gumbelP.toPrecision(4)}`}; seed ${r.method.seed})`],
    ['q-value (Benjamini–Hochberg)', `${c.qValue.toPrecision(4)}; significant below ${r.method.fdrLevel}`],
    ['Moisture', `${c.moistureFailures} wet of ${c.diagnosedFailures} diagnosed in the cohort; ${c.restMoistureFailures} of ${c.restDiagnosedFailures} in the rest; one-sided Fisher exact p ${c.moistureP.toPrecision(4)}`],
    ['Trend in the cohort', c.trend.laplaceU === null ? 'too few failures' : `Laplace U ${c.trend.laplaceU.toFixed(3)} (p ${formatProbability(c.trend.laplacePTwoSided ?? 1)}); MIL-HDBK-189 χ² ${(c.trend.milHdbkChiSquare ?? 0).toFixed(2)}, df ${c.trend.milHdbkDf} (p ${formatProbability(c.trend.milHdbkPTwoSided ?? 1)}); β ${c.trend.beta?.toFixed(3) ?? '–'}`],
  ];
  return (
    <dl className="grid gap-x-4 gap-y-2 text-sm sm:grid-cols-[minmax(12rem,auto)_1fr]">
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-ink-500">{k}</dt>
          <dd className="text-ink-900 tabular-nums">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

function Detail({ id, canWrite }: Props) {
  // Managers bring the records up to date first (cheap when nothing changed), then read the record.
  const sync = useSyncPatterns();
  const started = useRef(false);
  useEffect(() => {
    if (canWrite && !started.current) {
      started.current = true;
      sync.mutate();
    }
  }, [canWrite, sync]);
  const ready = !canWrite || sync.isSuccess || sync.isError;
  const q = usePatternRecord(id, ready);
  const r = q.data;
  const mcf = useMcf(r?.moduleCode ?? '', r?.snapshotAsOf ?? '');
  if (q.error) {
    return (
      <div className="card card-pad mx-auto mt-6 max-w-xl text-center" role="alert">
        <h1 className="mb-2">Pattern not available</h1>
        <p className="text-ink-600">{q.error.message}</p>
        <p className="mt-4">
          <a className="btn-primary" href="/patterns">
            Back to Patterns
          </a>
        </p>
      </div>
    );
  }
  if (!r) {
    return (
      <div className="card card-pad" role="status">
        <p className="mb-2 text-sm font-semibold text-ink-700">{sync.isPending ? 'Updating pattern records from today’s report…' : 'Loading the pattern…'}</p>
        <progress className="h-2 w-full accent-estuary-600" aria-label="Loading the pattern" />
      </div>
    );
  }
  const c = r.cohort;
  const e = explainCohort(c);
  const title = `${r.moduleCode} ${r.module.name ? r.module.name.charAt(0).toLowerCase() + r.module.name.slice(1) : ''}`.trim();
  const band = BAND_LABELS[r.exposureBand].toLowerCase();
  const scopeNote = r.scope === 'depots' ? ' at your depots' : '';
  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-sm">
        <a className="link" href="/patterns">
          Patterns
        </a>{' '}
        <span className="text-ink-400">/</span>{' '}
        <span className="text-ink-600">
          {r.moduleCode} · {BAND_LABELS[r.exposureBand]} exposure · {formatBuildRange(r)}
        </span>
      </nav>
      <header className="space-y-1.5">
        <h1>
          {title}, built {formatBuildRange(r)}, {band} moisture exposure
        </h1>
        <div className="flex flex-wrap items-center gap-2">
          <span className={VERDICT_BADGE[c.verdict]}>{VERDICT_LABELS[c.verdict]}</span>
          <span className={PATTERN_STATUS_BADGE[r.status]}>{PATTERN_STATUS_LABELS[r.status]}</span>
          {r.changes.summary.map((s) => (
            <span key={s} className="badge-amber">
              {s}
            </span>
          ))}
        </div>
        <p className="text-sm text-ink-600">
          Pattern {r.id} · figures as of {formatCalendarDate(r.snapshotAsOf)} over every depot · first found {formatInstantDate(r.firstSeenAt)}
          {r.module.partNumber && ` · part ${r.module.partNumber}`}
          {r.module.supplier && ` · supplier ${r.module.supplier}`}
        </p>
      </header>

      <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="min-w-0 space-y-4">
          <section className="card card-pad space-y-3" aria-labelledby="h-why">
            <h2 id="h-why">Why it is flagged</h2>
            <div className="grid grid-cols-2 gap-2 md:grid-cols-4">
              <Figure label="Rate ratio" value={`${formatRatio(c.rateRatio)}×`} detail={`95% ${formatRatio(c.ciLow)}–${c.ciHigh === null ? '∞' : formatRatio(c.ciHigh)}`} />
              <Figure label="Failures" value={String(c.failures)} detail={`${c.expected.toFixed(1)} expected`} />
              <Figure label="q-value" value={formatProbability(c.qValue)} detail={c.significant ? 'significant (< 0.05)' : 'not significant'} />
              <Figure label="Moisture" value={formatShare(c.moistureShare)} detail={`wet; rest ${formatShare(c.moistureShareRest)}`} />
            </div>
            <p>{e.rate}</p>
            <p>{e.chance}</p>
            {e.repeats && <p>{e.repeats}</p>}
          </section>

          <section className="card card-pad" aria-labelledby="h-chart">
            <h2 id="h-chart">Failures against expectation by build month</h2>
            <p className="mb-2 text-sm text-ink-600">
              Vehicles with {band} moisture exposure, by the month they were built. Red bars are the cohort's months ({formatBuildRange(r)}); the line is what
              the fleet's rate for {r.moduleCode} gives for each month's vehicle-years.
            </p>
            <RateChart months={c.byMonth} buildFrom={c.buildFrom} buildTo={c.buildTo} />
          </section>

          <section className="card card-pad space-y-3" aria-labelledby="h-water">
            <h2 id="h-water">Is it water?</h2>
            <p>{e.moisture}</p>
            <ul className="space-y-1.5" aria-label="The water-ingress rule">
              {e.waterRule.map((rule) => (
                <li key={rule.label} className="flex items-start gap-2">
                  {rule.met ? (
                    <Check size={18} className="mt-0.5 shrink-0 text-moss-600" aria-label="met" />
                  ) : (
                    <X size={18} className="mt-0.5 shrink-0 text-brick-600" aria-label="not met" />
                  )}
                  <span>
                    {rule.label} <span className="text-sm text-ink-500">— {rule.detail}</span>
                  </span>
                </li>
              ))}
            </ul>
            <p className={c.waterIngress ? 'font-semibold text-seep-700' : 'font-semibold text-ink-800'}>{e.waterVerdict}</p>
          </section>

          <section className="card card-pad space-y-3" aria-labelledby="h-mcf">
            <h2 id="h-mcf">Failures as vehicles age</h2>
            <p className="text-sm text-ink-600">
              Mean cumulative function of {r.moduleCode}
              {scopeNote}: the average number of failures per vehicle up to each age, one curve per exposure band, with dashed 95% limits. A band whose
              curve climbs faster fails more; a curve that bends upwards means failures come faster as vehicles age.
            </p>
            {mcf.data ? (
              <McfChart series={mcf.data.series} highlight={r.exposureBand} />
            ) : mcf.error ? (
              <p className="text-sm text-brick-700">The curves could not be loaded: {mcf.error.message}</p>
            ) : (
              <progress className="h-2 w-full accent-estuary-600" aria-label="Loading the curves" />
            )}
            <h3>Are failures accelerating?</h3>
            <p>{explainTrend(c.trend, 'in this cohort')}</p>
            {r.baseline && <p className="text-sm text-ink-600">{explainTrend(r.baseline.trend, `of ${r.moduleCode} across the fleet`)}</p>}
          </section>

          <details className="card card-pad">
            <summary className="cursor-pointer font-semibold text-ink-900">The statistics behind this</summary>
            <div className="mt-3 space-y-3">
              <Statistics r={r} />
              <p className="text-xs text-ink-500">
                Method: build ranges found by a one-dimensional Kulldorff scan (Poisson model) over the band's build months, its significance by{' '}
                {r.method.replicates} seeded Monte Carlo replicates; exact conditional rate ratio against the rest of the module's fleet; Benjamini–Hochberg
                false-discovery control across every group of the report; one-sided Fisher exact test on moisture; Nelson's mean cumulative function with
                Lawless–Nadeau limits. Full formulas: docs/patterns-method.md.
              </p>
            </div>
          </details>
        </div>

        <aside className="min-w-0 space-y-4">
          <section className="card card-pad space-y-3" aria-labelledby="h-status">
            <h2 id="h-status">Status</h2>
            <div>
              <span className={PATTERN_STATUS_BADGE[r.status]}>{PATTERN_STATUS_LABELS[r.status]}</span>
              {r.statusAt && (
                <span className="ml-2 text-sm text-ink-600">
                  {r.statusBy ? `by ${r.statusBy.name}, ` : ''}
                  {formatInstant(r.statusAt)}
                </span>
              )}
            </div>
            {r.statusReason && <p className="text-sm text-ink-800">“{r.statusReason}”</p>}
            {r.campaign && (
              <div className="rounded-md border border-estuary-100 bg-estuary-50 p-3 text-sm">
                <div className="font-semibold text-estuary-800">{r.status === 'campaign_planned' ? 'Campaign planned' : 'Last campaign'}</div>
                <div className="mt-1">{CAMPAIGN_KIND_LABELS[r.campaign.kind]}</div>
                <div className="mt-1 text-ink-700">{r.campaign.note}</div>
                <div className="mt-1 text-ink-600">Target date {formatCalendarDate(r.campaign.targetDate)}</div>
              </div>
            )}
            {r.changes.changed && (
              <div className="rounded-md border border-amber-100 bg-amber-50 p-3 text-sm text-amber-800">
                <div className="font-semibold">Changed since {r.statusAt ? 'the last action' : 'it was found'} ({formatInstantDate(r.actedAt)})</div>
                <ul className="mt-1 list-disc pl-5">
                  {r.changes.summary.map((s) => (
                    <li key={s}>{s}</li>
                  ))}
                </ul>
              </div>
            )}
            {canWrite ? (
              <StatusActions record={r} />
            ) : (
              <p className="text-sm text-ink-600">Read only: fleet managers and admins decide what to do about a pattern.</p>
            )}
          </section>

          {canWrite && (
            <section className="card card-pad space-y-2" aria-labelledby="h-evidence">
              <h2 id="h-evidence">Warranty evidence</h2>
              <p className="text-sm text-ink-600">A printable pack with the method, figures, charts and trace verdicts, and a CSV of the vehicles and defects.</p>
              <div className="flex flex-wrap gap-2">
                <a className="btn-secondary" href={`/patterns/${r.id}/evidence`}>
                  Open the evidence pack
                </a>
                <a className="btn-ghost" href={`/api/patterns/${r.id}/evidence.csv`} download>
                  Download CSV
                </a>
              </div>
            </section>
          )}

          <section className="card card-pad" aria-labelledby="h-history">
            <h2 id="h-history" className="mb-2">
              History
            </h2>
            <History rows={r.history} />
          </section>
        </aside>
      </div>

      <section className="card" aria-labelledby="h-defects">
        <div className="flex flex-wrap items-baseline justify-between gap-2 border-b border-ink-200 px-4 py-3">
          <h2 id="h-defects">Failures behind this pattern</h2>
          <span className="text-sm text-ink-500">
            {r.defectList.length} of {c.failures}
            {r.scope === 'depots' ? ' (your depots)' : ''}, oldest first
          </span>
        </div>
        {r.defectList.length ? <DefectsTable rows={r.defectList} caption="Failures behind this pattern" /> : <p className="px-4 py-6 text-sm text-ink-500">None at your depots.</p>}
      </section>

      <section className="card" aria-labelledby="h-vehicles">
        <div className="flex flex-wrap items-baseline justify-between gap-2 border-b border-ink-200 px-4 py-3">
          <h2 id="h-vehicles">Vehicles in the cohort</h2>
          <span className="text-sm text-ink-500">
            {r.vehicleList.length} of {c.vehicles}
            {r.scope === 'depots' ? ' (your depots)' : ''}, most failures first
          </span>
        </div>
        {r.vehicleList.length ? <VehiclesTable rows={r.vehicleList} caption="Vehicles in the cohort" /> : <p className="px-4 py-6 text-sm text-ink-500">None at your depots.</p>}
      </section>
    </div>
  );
}

/** Island root. */
export default function PatternDetail(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <Detail {...props} />
    </QueryClientProvider>
  );
}
