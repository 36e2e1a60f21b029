/**
 * The Patterns table island: the report as of a day over the caller's depots, one row per cohort, evidence first
 * (rate ratio with interval, failures against expected, q-value, moisture share), each with its pattern record's
 * status. Filters, sort and the as-of day live in the URL. For fleet managers and admins it first brings the
 * pattern records up to date with today's fleet-wide report (docs/decisions/011).
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { RefreshCw } from 'lucide-react';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { useUrlState } from '@/lib/client/url-state';
import { formatDay } from '@/lib/patterns/records';
import type { PatternsReportCohort, PatternStatusValue } from '@/lib/contracts/patterns';
import { DataTable } from '@/components/ui/DataTable';
import { SelectField, Toggle } from '@/components/defects/FilterControls';
import { formatInstant } from '@/components/defects/format';
import { useContainerWidth } from '@/components/defects/use-container-width';
import { formatCount } from '@/lib/patterns/explain';
import { PATTERNS_WIDE_MIN_PX, patternColumns, patternColumnsCompact, RATIO_HELP, sortCohorts } from './columns';
import { PATTERN_STATUS_LABELS } from './labels';
import { usePatternsReport, useSyncPatterns } from './queries';

type Props = {
  /** The page's query string at render time. */
  initialParams: Record<string, string>;
  /** Whether the caller may act on patterns (managers, admins): they sync the records on opening. */
  canWrite: boolean;
  /** Today (UTC) as the server sees it, `YYYY-MM-DD`. */
  today: string;
  /** Depot codes the figures cover, or null for every depot. */
  scopeDepots: string[] | null;
};

const FILTER_KEYS = ['status', 'module', 'water', 'all'] as const;
const PAGE_SIZE = 50;

/**
 * Keep a row under the filters of the URL. Groups that are not significant are hidden unless asked for; today, one
 * that still has its pattern record stays (the record shows it is no longer significant), but on a past day the
 * filter holds for every row.
 */
export function filterCohorts(rows: PatternsReportCohort[], f: { status?: string; module?: string; water?: string; all?: string }, isToday = true): PatternsReportCohort[] {
  return rows.filter((c) => {
    if (f.all !== '1' && !c.significant && !(isToday && c.record)) return false;
    if (f.module && c.moduleCode !== f.module) return false;
    if (f.water && c.verdict !== f.water) return false;
    if (f.status) {
      if (f.status === 'none') return c.record === null;
      if (f.status === 'changed') return c.record?.changed === true;
      if (c.record?.status !== f.status) return false;
    }
    return true;
  });
}

function Progress({ label }: { label: string }) {
  return (
    <div className="card card-pad" role="status" aria-live="polite">
      <p className="mb-2 text-sm font-semibold text-ink-700">{label}</p>
      <progress className="h-2 w-full accent-estuary-600" aria-label={label} />
      <p className="mt-2 text-xs text-ink-500">Every module type and exposure band is scanned over its build months with 999 random replicates; on a large fleet this takes a second or two.</p>
    </div>
  );
}

function PatternsList({ initialParams, canWrite, today, scopeDepots }: Props) {
  const [state, update] = useUrlState(initialParams);
  const asOf = state.asOf && /^\d{4}-\d{2}-\d{2}$/.test(state.asOf) ? state.asOf : '';
  const isToday = !asOf || asOf === today;
  const sync = useSyncPatterns();
  const started = useRef(false);
  useEffect(() => {
    if (canWrite && !started.current) {
      started.current = true;
      sync.mutate();
    }
  }, [canWrite, sync]);
  // Managers see record statuses only once the records are up to date; others (and past days) read at once.
  const ready = !canWrite || !isToday || sync.isSuccess || sync.isError;
  const report = usePatternsReport(asOf, ready);
  const [boxRef, width] = useContainerWidth<HTMLDivElement>();
  const ctx = useMemo(() => ({ asOf: isToday ? '' : asOf }), [isToday, asOf]);
  const columns = useMemo(() => (width !== null && width < PATTERNS_WIDE_MIN_PX ? patternColumnsCompact(ctx) : patternColumns(ctx)), [width, ctx]);
  // A click on Refresh gets its own answer ("checked just now…"); the automatic sync on opening says less.
  const [manualCheck, setManualCheck] = useState<number | null>(null);
  const sort = state.sort || 'qValue';
  const page = Math.max(1, Number(state.page) || 1);

  const cohorts = report.data?.cohorts ?? [];
  const filtered = useMemo(() => sortCohorts(filterCohorts(cohorts, state, isToday), sort), [cohorts, state, sort, isToday]);
  const shown = filtered.slice((page - 1) * PAGE_SIZE, page * PAGE_SIZE);
  const modulesSeen = useMemo(() => [...new Set(cohorts.map((c) => c.moduleCode))].sort(), [cohorts]);
  const significant = cohorts.filter((c) => c.significant).length;
  const water = cohorts.filter((c) => c.waterIngress).length;
  const filteredOn = FILTER_KEYS.some((k) => state[k]);
  const hiddenNotSignificant = state.all === '1' ? 0 : cohorts.filter((c) => !c.significant && !(isToday && c.record)).length;
  const syncText = sync.isPending
    ? manualCheck
      ? 'Checking for new data…'
      : 'Updating pattern records…'
    : sync.isError
      ? `Records not updated: ${sync.error.message}`
      : sync.data
        ? manualCheck
          ? sync.data.upToDate
            ? `Checked at ${new Date(manualCheck).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' })}: nothing new since the records were last updated (${formatInstant(sync.data.at)}).`
            : `Checked at ${new Date(manualCheck).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' })}: ${formatCount(sync.data.created, 'new pattern')}, ${formatCount(sync.data.updated, 'record')} refreshed.`
          : sync.data.upToDate
            ? `Records up to date (last updated ${formatInstant(sync.data.at)})`
            : `Records updated: ${formatCount(sync.data.created, 'new pattern')}, ${formatCount(sync.data.updated, 'record')} refreshed`
        : '';
  const emptyText =
    cohorts.length === 0
      ? 'No module type has failures in your depots yet, so there is nothing to compare.'
      : filteredOn
        ? 'No group matches these filters.'
        : 'No flagged group: no build range of any module type fails clearly above the fleet rate.';

  return (
    <div className="space-y-3" ref={boxRef}>
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div className="min-w-0">
          <h1>Patterns</h1>
          <p className="text-sm text-ink-500" aria-live="polite">
            {report.data
              ? `As of ${formatDay(report.data.asOf)} · ${formatCount(report.data.counts.cohortsTested, 'group')} tested over ${formatCount(report.data.counts.vehiclesObserved, 'vehicle')} · ${significant} significant, ${water} water ingress`
              : 'Cohorts of door modules that fail far above the fleet rate, and whether water is the reason'}
          </p>
          <p className="text-sm">
            <a className="link" href="/patterns/method">
              How Seepline finds patterns
            </a>
          </p>
        </div>
        {canWrite && (
          <div className="flex items-center gap-2 text-sm text-ink-600">
            <span aria-live="polite" role="status">
              {syncText}
            </span>
            <button
              type="button"
              className="btn-secondary"
              onClick={() => {
                setManualCheck(Date.now());
                sync.mutate();
              }}
              disabled={sync.isPending}
            >
              <RefreshCw size={16} aria-hidden="true" /> Refresh records
            </button>
          </div>
        )}
      </div>

      {scopeDepots && (
        <p className="rounded-md border border-seep-100 bg-seep-50 px-3 py-2 text-sm text-seep-700">
          Figures cover your depots only ({scopeDepots.join(', ') || 'none'}). Status and campaigns are decided fleet-wide by fleet managers; a pattern
          page shows the pattern's build range with the figures of your depots.
        </p>
      )}

      <form className="card card-pad flex flex-wrap items-end gap-3" role="search" aria-label="Filter patterns" onSubmit={(e) => e.preventDefault()}>
        <SelectField
          label="Status"
          value={state.status ?? ''}
          onChange={(status) => update({ status })}
          options={[
            ...(Object.keys(PATTERN_STATUS_LABELS) as PatternStatusValue[]).map((s) => ({ value: s, label: PATTERN_STATUS_LABELS[s] })),
            { value: 'changed', label: 'Changed since last action' },
            { value: 'none', label: 'No record' },
          ]}
        />
        <SelectField label="Module" value={state.module ?? ''} onChange={(module) => update({ module })} options={modulesSeen.map((m) => ({ value: m, label: m }))} />
        <SelectField
          label="Water"
          value={state.water ?? ''}
          onChange={(water) => update({ water })}
          options={[
            { value: 'water_ingress', label: 'Water ingress' },
            { value: 'significant_dry', label: 'Significant, dry' },
            { value: 'not_significant', label: 'Not significant' },
          ]}
        />
        <div className="min-w-[10rem] flex-[1_1_10rem]">
          <label htmlFor="patterns-as-of" className="field-label">
            As of
          </label>
          <input
            id="patterns-as-of"
            type="date"
            className="input"
            max={today}
            value={asOf || today}
            onChange={(e) => update({ asOf: e.target.value && e.target.value !== today ? e.target.value : undefined })}
          />
        </div>
        <Toggle label="Show groups that are not significant" checked={state.all === '1'} onChange={(v) => update({ all: v ? '1' : undefined })} />
        {filteredOn && (
          <button type="button" className="btn-ghost" onClick={() => update(Object.fromEntries(FILTER_KEYS.map((k) => [k, undefined])))}>
            Clear filters
          </button>
        )}
      </form>

      {!isToday && (
        <p className="rounded-md border border-amber-100 bg-amber-50 px-3 py-2 text-sm text-amber-800">
          Figures as the data stood on {formatDay(asOf)}. A status is shown when a flagged group belongs to a pattern record, and it is today's
          status; each row opens its group as of {formatDay(asOf)}.{' '}
          <button type="button" className="link" onClick={() => update({ asOf: undefined })}>
            Back to today
          </button>
        </p>
      )}

      {!report.data && !report.error ? (
        <Progress label={sync.isPending ? 'Updating pattern records from today’s report…' : 'Computing the patterns report…'} />
      ) : report.data && filtered.length === 0 ? (
        <div className="card card-pad text-center text-ink-600" role="status">
          {emptyText}
        </div>
      ) : (
        <DataTable
          caption="Patterns"
          columns={columns}
          data={shown}
          total={filtered.length}
          page={page}
          pageSize={PAGE_SIZE}
          sort={sort}
          onSort={(s) => update({ sort: s })}
          onPage={(p) => update({ page: String(p) }, false)}
          loading={report.isFetching && report.isPlaceholderData}
          error={report.error ? report.error.message : null}
          emptyText={emptyText}
        />
      )}
      {report.data && hiddenNotSignificant > 0 && (
        <p className="text-sm text-ink-500">
          {hiddenNotSignificant} {hiddenNotSignificant === 1 ? 'group is' : 'groups are'} not significant and hidden;{' '}
          <button type="button" className="link" onClick={() => update({ all: '1' })}>
            show them
          </button>
          .
        </p>
      )}

      <details className="card card-pad text-sm text-ink-700">
        <summary className="cursor-pointer font-semibold text-ink-900">How to read this table</summary>
        <div className="mt-2 space-y-2">
          <p>
            For each module type and moisture-exposure band (low, medium, high — from the depot's climate, parking and washing), Seepline searches every run of
            consecutive build months for the one whose failures most exceed the rate. Each row is that build range; open a row to see why it is or is not
            flagged.
          </p>
          <p>Two figures say how much more often a group fails, and they are not the same:</p>
          <ul className="list-disc space-y-1 pl-5">
            <li>
              <strong>Rate vs rest</strong> (rate ratio): {RATIO_HELP.rateRatio.replace(/^Rate ratio against the rest: /, '')}
            </li>
            <li>
              <strong>Failures vs expected</strong>: {RATIO_HELP.expected.replace(/^Failures against expected: /, '')} The second line gives it as a ratio; it is
              smaller than the rate ratio for a group that fails more, because the fleet's rate includes the group's own failures.
            </li>
          </ul>
          <p>
            <strong>q-value</strong>: the chance-finding probability after paying for the search over build ranges and for testing every group; below 0.05 is{' '}
            <em>flagged</em>. <strong>Water found</strong>: the share of diagnosed failures where water was found, against the module's other failures.{' '}
            <strong>Vehicles failing twice or more</strong>: {RATIO_HELP.repeat}
          </p>
          <p>
            <strong>Water ingress</strong> is called when a group is flagged, at least half of its diagnosed failures show water, and more often than the
            module's other failures beyond chance. A flagged group that fails dry points to another cause.
          </p>
          <p>
            <a className="link" href="/patterns/method">
              How Seepline finds patterns
            </a>{' '}
            explains the method in full.
          </p>
        </div>
      </details>
    </div>
  );
}

/** Island root. */
export default function PatternsView(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <PatternsList {...props} />
    </QueryClientProvider>
  );
}
