/**
 * The pattern page island: a pattern record — why it is flagged in plain words first, the chart by build month,
 * what the failures were, whether it is water, how failures grow with age — with its status, campaign, actions and
 * history, and the failures and vehicles behind it. A depot-scoped reader (supervisor) reads every figure over
 * their depots only (docs/decisions/013). The exact statistics sit one click deeper.
 */
import { useEffect, useRef, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { useIslandQueryClient } from '@/lib/client/query-client';
import type { PatternRecordDetail } from '@/lib/contracts/patterns';
import { formatCount } from '@/lib/patterns/explain';
import { formatBuildRange, formatDay } from '@/lib/patterns/records';
import { formatInstant } from '@/components/defects/format';
import { BAND_LABELS, CAMPAIGN_KIND_LABELS, PATTERN_STATUS_BADGE, PATTERN_STATUS_LABELS, VERDICT_BADGE, VERDICT_LABELS } from './labels';
import {
  AgeingSection,
  BreakdownSection,
  ChartSection,
  FailuresSection,
  scopeWords,
  scrollToSection,
  StatisticsSection,
  VehiclesSection,
  WaterSection,
  WhySection,
  type CohortPageData,
  type FailureFilter,
} from './CohortSections';
import { PatternHistory } from './PatternHistory';
import { StatusActions } from './StatusActions';
import { useMcf, usePatternRecord, useSyncPatterns } from './queries';

type Props = {
  id: number;
  canWrite: boolean;
};

/** The campaign box of the status panel: in force (overdue when past its date), or the last one and when it was resolved. */
export function CampaignBox({ r }: { r: Pick<PatternRecordDetail, 'campaign' | 'campaignResolvedAt'> }) {
  const c = r.campaign;
  if (!c) return null;
  const title = c.inForce ? 'Campaign in force' : `Last campaign${r.campaignResolvedAt ? ` (resolved ${formatDay(r.campaignResolvedAt)})` : ' (no longer in force)'}`;
  return (
    <div className={`rounded-md border p-3 text-sm ${c.overdue ? 'border-brick-200 bg-brick-50' : 'border-estuary-100 bg-estuary-50'}`}>
      <div className="flex flex-wrap items-center gap-2">
        <span className="font-semibold text-estuary-800">{title}</span>
        {c.overdue && <span className="badge-brick">Overdue</span>}
      </div>
      <div className="mt-1">{CAMPAIGN_KIND_LABELS[c.kind]}</div>
      <div className="mt-1 text-ink-700">{c.note}</div>
      <div className={`mt-1 ${c.overdue ? 'font-semibold text-brick-700' : 'text-ink-600'}`}>
        Target date {formatDay(c.targetDate)}
        {c.overdue && ' — passed, and the campaign is not resolved'}
      </div>
    </div>
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
  const mcf = useMcf(r?.moduleCode ?? '', r?.snapshotAsOf ?? '', r ? { band: r.exposureBand, buildFrom: r.buildFrom, buildTo: r.buildTo } : undefined);
  const [filter, setFilter] = useState<FailureFilter>(null);
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
  const d: CohortPageData = {
    noun: 'pattern',
    cohort: c,
    baseline: r.baseline,
    method: r.method,
    module: r.module,
    asOf: r.snapshotAsOf,
    scope: r.scope,
    depotCodes: r.depotCodes,
    vehicleList: r.vehicleList,
    defectList: r.defectList,
    cohortsTested: r.cohortsTested ?? undefined,
  };
  const title = `${r.moduleCode} ${r.module.name ? r.module.name.charAt(0).toLowerCase() + r.module.name.slice(1) : ''}`.trim();
  const band = BAND_LABELS[r.exposureBand].toLowerCase();
  const showFailures = (f: FailureFilter) => {
    setFilter(f);
    scrollToSection('failures');
  };
  const lead =
    r.scope === 'depots' ? (
      <p className="rounded-md border border-seep-100 bg-seep-50 px-3 py-2 text-sm text-seep-700">
        Fleet managers found this pattern on the whole fleet and decide what to do about it. Every figure on this page counts only {scopeWords(d)}:{' '}
        {formatCount(c.vehicles, 'vehicle')} of the group and {formatCount(c.failures, 'failure')} reported there.
      </p>
    ) : undefined;
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
          {r.campaign?.overdue && <span className="badge-brick">Campaign overdue</span>}
          {r.changes.summary.map((s) => (
            <span key={s} className="badge-amber">
              {s}
            </span>
          ))}
        </div>
        <p className="text-sm text-ink-600">
          Pattern {r.id} · figures as of {formatDay(r.snapshotAsOf)} over {scopeWords(d)} · first found {formatDay(r.firstSeenAt)}
          {r.module.partNumber && ` · part ${r.module.partNumber}`}
          {r.module.supplier && ` · supplier ${r.module.supplier}`}
        </p>
      </header>

      <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="min-w-0 space-y-4">
          <WhySection d={d} lead={lead} onShowBreakdown={() => scrollToSection('breakdown')} />
          <ChartSection d={d} />
          <BreakdownSection d={d} onFilter={showFailures} />
          <WaterSection d={d} />
          <AgeingSection d={d} mcf={{ data: mcf.data, error: mcf.error }} />
          <StatisticsSection d={d} />
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
            <CampaignBox r={r} />
            {r.changes.changed && (
              <div className="rounded-md border border-amber-100 bg-amber-50 p-3 text-sm text-amber-800">
                <div className="font-semibold">Changed since {r.statusAt ? 'the last action' : 'it was found'} ({formatDay(r.actedAt)})</div>
                <ul className="mt-1 list-disc pl-5">
                  {r.changes.summary.map((s) => (
                    <li key={s}>{s}</li>
                  ))}
                </ul>
              </div>
            )}
            {canWrite ? <StatusActions record={r} /> : <p className="text-sm text-ink-600">Read only: fleet managers and admins decide what to do about a pattern.</p>}
          </section>

          {canWrite && (
            <section className="card card-pad space-y-2" aria-labelledby="h-evidence">
              <h2 id="h-evidence">Warranty evidence</h2>
              <p className="text-sm text-ink-600">A printable pack with the finding, figures, charts and trace verdicts, and a CSV of the vehicles and defects.</p>
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
            <PatternHistory rows={r.history} />
          </section>
        </aside>
      </div>

      <FailuresSection d={d} filter={filter} onFilter={setFilter} />
      <VehiclesSection d={d} />
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
