/**
 * The group page island: one module type × exposure band of the report as of a day, read only — the same sections
 * as a pattern page, computed from the report (significant or not), so that anyone reading Patterns can see why a
 * group is or is not flagged. When the group belongs to a pattern record, it links there (today's status).
 */
import { useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { formatBuildRange, formatDay } from '@/lib/patterns/records';

import { BAND_LABELS, PATTERN_STATUS_BADGE, PATTERN_STATUS_LABELS, VERDICT_BADGE, VERDICT_LABELS } from './labels';
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
import { useMcf, usePatternGroup } from './queries';

type Props = {
  moduleCode: string;
  band: string;
  /** `YYYY-MM-DD`, or empty for today. */
  asOf: string;
};

function Group({ moduleCode, band, asOf }: Props) {
  const q = usePatternGroup(moduleCode, band, asOf);
  const g = q.data;
  const mcf = useMcf(g ? g.cohort.moduleCode : '', g?.asOf ?? '', g ? { band: g.cohort.exposureBand, buildFrom: g.cohort.buildFrom, buildTo: g.cohort.buildTo } : undefined);
  const [filter, setFilter] = useState<FailureFilter>(null);
  const back = `/patterns${asOf ? `?asOf=${encodeURIComponent(asOf)}&all=1` : '?all=1'}`;
  if (q.error) {
    return (
      <div className="card card-pad mx-auto mt-6 max-w-xl text-center" role="alert">
        <h1 className="mb-2">Group not available</h1>
        <p className="text-ink-600">{q.error.message}</p>
        <p className="mt-4">
          <a className="btn-primary" href={back}>
            Back to Patterns
          </a>
        </p>
      </div>
    );
  }
  if (!g) {
    return (
      <div className="card card-pad" role="status">
        <p className="mb-2 text-sm font-semibold text-ink-700">Computing the report for this group…</p>
        <progress className="h-2 w-full accent-estuary-600" aria-label="Loading the group" />
      </div>
    );
  }
  const c = g.cohort;
  const d: CohortPageData = {
    noun: 'group',
    cohort: c,
    baseline: g.baseline,
    method: g.method,
    module: g.module,
    asOf: g.asOf,
    scope: g.scope,
    depotCodes: g.depotCodes,
    vehicleList: g.vehicleList,
    defectList: g.defectList,
    cohortsTested: g.cohortsTested,
  };
  const past = g.asOf !== g.today;
  const title = `${c.moduleCode} ${g.module.name ? g.module.name.charAt(0).toLowerCase() + g.module.name.slice(1) : ''}`.trim();
  const showFailures = (f: FailureFilter) => {
    setFilter(f);
    scrollToSection('failures');
  };
  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-sm">
        <a className="link" href={back}>
          Patterns{past ? ` as of ${formatDay(g.asOf)}` : ''}
        </a>{' '}
        <span className="text-ink-400">/</span>{' '}
        <span className="text-ink-600">
          {c.moduleCode} · {BAND_LABELS[c.exposureBand]} exposure
        </span>
      </nav>
      <header className="space-y-1.5">
        <h1>
          {title}, {BAND_LABELS[c.exposureBand].toLowerCase()} moisture exposure: built {formatBuildRange(c)}
        </h1>
        <div className="flex flex-wrap items-center gap-2">
          <span className={VERDICT_BADGE[c.verdict]}>{VERDICT_LABELS[c.verdict]}</span>
          <span className="badge-neutral">Group of the report · read only</span>
        </div>
        <p className="text-sm text-ink-600">
          Figures as of {formatDay(g.asOf)} over {scopeWords(d)}. Every module type and exposure band is searched for its build range that fails
          most above the rate; this is that range for {c.moduleCode} in the {BAND_LABELS[c.exposureBand].toLowerCase()} band.
        </p>
      </header>

      <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="min-w-0 space-y-4">
          <WhySection d={d} onShowBreakdown={() => scrollToSection('breakdown')} />
          <ChartSection d={d} />
          <BreakdownSection d={d} onFilter={showFailures} />
          <WaterSection d={d} />
          <AgeingSection d={d} mcf={{ data: mcf.data, error: mcf.error }} />
          <StatisticsSection d={d} />
        </div>
        <aside className="min-w-0 space-y-4">
          <section className="card card-pad space-y-3" aria-labelledby="h-record">
            <h2 id="h-record">Pattern record</h2>
            {g.record ? (
              <>
                <p className="text-sm">
                  This group belongs to pattern {g.record.id}.{past ? ' Its status is today’s; the pattern page shows the figures it was last updated with.' : ''}
                </p>
                <div className="flex flex-wrap items-center gap-2">
                  <span className={PATTERN_STATUS_BADGE[g.record.status]}>
                    {past ? 'Today: ' : ''}
                    {PATTERN_STATUS_LABELS[g.record.status]}
                  </span>
                  {g.record.overdue && <span className="badge-brick">Campaign overdue</span>}
                </div>
                <a className="btn-secondary" href={`/patterns/${g.record.id}`}>
                  Open pattern {g.record.id}
                </a>
              </>
            ) : (
              <p className="text-sm text-ink-600">
                {c.significant
                  ? past
                    ? 'No pattern record matches this group. Records are kept from today’s report only.'
                    : 'Not recorded yet: a fleet manager opening Patterns records it.'
                  : 'Not a pattern record: only groups that are flagged become records that fleet managers act on.'}
              </p>
            )}
          </section>
        </aside>
      </div>

      <FailuresSection d={d} filter={filter} onFilter={setFilter} />
      <VehiclesSection d={d} />
    </div>
  );
}

/** Island root. */
export default function GroupDetail(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <Group {...props} />
    </QueryClientProvider>
  );
}
