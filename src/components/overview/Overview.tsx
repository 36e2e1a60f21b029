/**
 * The Overview island (the landing page), per role: a technician's own open work first; then open work in the
 * caller's depots (by depot and status), vehicles off road, what has been open for long, the repeat rate and
 * its monthly trend, the module types with most defects, repeats per depot and per module type; managers and
 * admins also get the cross-depot comparison. Every figure links to the Defects list filtered to what it counts.
 */
import type { ReactNode } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { Plus } from 'lucide-react';
import { useIslandQueryClient } from '@/lib/client/query-client';
import { STATUS_BADGE, STATUS_LABELS, POSITION_LABELS } from '@/components/labels';
import { formatCalendarDate, formatDepotDate, formatDepotInstant, formatInstantDate, plural } from '@/components/defects/format';
import { windowLabel } from '@/lib/overview/windows';
import { OPEN_STATUSES, type OverviewDefect, type OverviewPatterns, type OverviewResponse } from '@/lib/contracts/overview';
import { formatBuildRange } from '@/lib/patterns/records';
import { formatCount, formatExpected, formatTimes } from '@/lib/patterns/explain';
import { BAND_LABELS, PATTERN_STATUS_BADGE, PATTERN_STATUS_LABELS, VERDICT_BADGE, VERDICT_LABELS } from '@/components/patterns/labels';
import { defectsHref } from '@/lib/overview/links';
import { DepotRepeatChart, ModuleChart, RepeatTrendChart, STATUS_COLOURS, StatusDepotChart } from './charts';
import { formatPct, formatPer100 } from './format';
import { useOverview } from './queries';

type Props = {
  /** The figures the server computed for this request (the query's initial data). */
  initial: OverviewResponse;
  /** How the caller's scope reads, e.g. "All depots" or "Gullhaven Quay (GHQ)". */
  scopeText: string;
  /** Show "Report a defect" (roles with defect:write). */
  canReport: boolean;
};

const fmt = (n: number) => n.toLocaleString('en-GB');

function Figure({ label, value, sub, href, testId }: { label: string; value: ReactNode; sub?: ReactNode; href: string; testId: string }) {
  return (
    <a href={href} className="card card-pad block transition-colors hover:border-estuary-400 hover:bg-estuary-50/40" data-testid={testId}>
      <div className="text-xs font-semibold tracking-wide text-ink-500 uppercase">{label}</div>
      <div className="mt-1 text-3xl font-bold text-ink-900 tabular-nums" data-testid={`${testId}-value`}>
        {value}
      </div>
      {sub && <div className="mt-0.5 text-sm text-ink-500">{sub}</div>}
    </a>
  );
}

function Section({ title, sub, children, className = '', actions }: { title: string; sub?: string; children: ReactNode; className?: string; actions?: ReactNode }) {
  const id = `ov-${title.toLowerCase().replace(/[^a-z0-9]+/g, '-')}`;
  return (
    <section className={`card ${className}`} aria-labelledby={id}>
      <div className="flex flex-wrap items-baseline justify-between gap-x-3 border-b border-ink-200 px-4 py-3">
        <div>
          <h2 id={id}>{title}</h2>
          {sub && <p className="text-sm text-ink-500">{sub}</p>}
        </div>
        {actions}
      </div>
      <div className="p-3 sm:p-4">{children}</div>
    </section>
  );
}

function RepeatMark({ d }: { d: OverviewDefect }) {
  if (d.repeatOfId === null) return null;
  return (
    <a className="badge-brick hover:underline" href={`/defects/${d.repeatOfId}`} title={`Repeat of ${d.repeatOfRef ?? 'an earlier defect'}`}>
      Repeat{d.repeatOfRef ? <span className="mono font-normal">of {d.repeatOfRef}</span> : null}
    </a>
  );
}

function DefectShortList({ rows, caption, empty }: { rows: OverviewDefect[]; caption: string; empty: string }) {
  return (
    <div className="table-wrap">
      <table className="data-table">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr>
            <th>Ref</th>
            <th>Vehicle</th>
            <th>Door / module</th>
            <th className="hidden lg:table-cell">Symptom</th>
            <th>Status</th>
            <th className="text-right">Open for</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((d) => (
            <tr key={d.id} data-row-href={`/defects/${d.id}`}>
              <td className="whitespace-nowrap">
                <a className="link mono" href={`/defects/${d.id}`}>
                  {d.ref}
                </a>
                <div className="mt-0.5">
                  <RepeatMark d={d} />
                </div>
              </td>
              <td className="whitespace-nowrap">
                <a className="link" href={`/vehicles/${encodeURIComponent(d.vin)}`}>
                  {d.fleetNumber ?? d.vin}
                </a>
                <span className="ml-2 text-ink-500">{d.depotCode}</span>
              </td>
              <td className="whitespace-nowrap">
                <abbr className="no-underline" title={POSITION_LABELS[d.position]}>
                  {d.position}
                </abbr>{' '}
                <span className="text-ink-500">{d.moduleCode}</span>
              </td>
              <td className="hidden max-w-[18rem] truncate lg:table-cell" title={d.symptom ?? undefined}>
                {d.symptom ?? <span className="text-ink-400">–</span>}
              </td>
              <td>
                <span className={STATUS_BADGE[d.status] ?? 'badge-neutral'}>{STATUS_LABELS[d.status] ?? d.status}</span>
              </td>
              <td className="text-right whitespace-nowrap tabular-nums" title={`Reported ${formatDepotInstant(d.reportedAt, d.depotTimeZone)}`}>
                {d.ageDays} d
              </td>
            </tr>
          ))}
          {rows.length === 0 && (
            <tr>
              <td colSpan={6} className="text-ink-500">
                {empty}
              </td>
            </tr>
          )}
        </tbody>
      </table>
    </div>
  );
}

function PatternsSection({ p, manages }: { p: OverviewPatterns; manages: boolean }) {
  const analysed = p.lastSyncAt ? `last analysed ${formatInstantDate(p.lastSyncAt, 'UTC')}` : 'not analysed yet';
  const sub =
    p.open === 0
      ? `Cohorts of vehicles whose doors fail above the fleet rate · ${analysed}`
      : `${fmt(p.open)} open · ${fmt(p.needsAttention)} need${p.needsAttention === 1 ? 's' : ''} a look · ${fmt(p.waterIngressOpen)} water ingress${p.overdue ? ` · ${fmt(p.overdue)} campaign${p.overdue === 1 ? '' : 's'} overdue` : ''} · ${analysed}`;
  // A supervisor's figures are their depots' own (docs/decisions/013); say so on the columns.
  const mine = p.items.some((i) => i.figuresScope === 'depots');
  return (
    <Section
      title="Patterns to act on"
      sub={sub}
      actions={
        <a className="link" href="/patterns">
          All patterns
        </a>
      }
    >
      {p.items.length === 0 ? (
        <p className="text-sm text-ink-600">
          {p.lastSyncAt === null
            ? manages
              ? 'Open Patterns to run the first analysis of the fleet.'
              : 'Pattern records appear here once a fleet manager has opened Patterns.'
            : 'No open pattern: no cohort fails significantly above the fleet rate, or every one has been dealt with.'}
        </p>
      ) : (
        <div className="table-wrap">
          <table className="data-table">
            <caption className="sr-only">Open patterns, those needing a look first</caption>
            <thead>
              <tr>
                <th>Pattern</th>
                <th>Built</th>
                <th className="text-right" title={mine ? 'How many times as often as the rest of the vehicles at your depots' : 'How many times as often as the rest of the fleet'}>
                  {mine ? 'Rate vs rest of your depots' : 'Rate vs rest of fleet'}
                </th>
                <th className="text-right" title={mine ? "Failures at your depots against what your depots' rate gives" : "Failures against what the fleet's rate gives"}>
                  {mine ? 'Failures in your depots' : 'Failures vs expected'}
                </th>
                <th>Verdict</th>
                <th>Status</th>
              </tr>
            </thead>
            <tbody>
              {p.items.map((r) => {
                const verdict = r.waterIngress ? 'water_ingress' : r.significant ? 'significant_dry' : 'not_significant';
                return (
                  <tr key={r.id}>
                    <td>
                      <a className="link" href={`/patterns/${r.id}`}>
                        {r.moduleCode}
                      </a>{' '}
                      <span className="text-ink-500">{BAND_LABELS[r.exposureBand as 'low'] ?? r.exposureBand} exposure</span>
                      {r.moduleName && <div className="text-xs text-ink-500">{r.moduleName}</div>}
                    </td>
                    <td className="whitespace-nowrap">{formatBuildRange(r)}</td>
                    <td className="text-right font-semibold tabular-nums">{r.rateRatio === null ? '–' : formatTimes(r.rateRatio)}</td>
                    <td className="text-right whitespace-nowrap tabular-nums">
                      {fmt(r.failures)} <span className="text-ink-500">vs {formatExpected(r.expected)}</span>
                      {r.figuresScope === 'depots' && <div className="text-xs text-ink-500">on {formatCount(r.vehicles, 'vehicle')}</div>}
                    </td>
                    <td>
                      <span className={VERDICT_BADGE[verdict]}>{VERDICT_LABELS[verdict]}</span>
                    </td>
                    <td>
                      <span className={PATTERN_STATUS_BADGE[r.status as 'new'] ?? 'badge-neutral'}>{PATTERN_STATUS_LABELS[r.status as 'new'] ?? r.status}</span>
                      {r.overdue && (
                        <div className="mt-0.5">
                          <span className="badge-brick" title={r.campaignTargetDate ? `Target date ${formatCalendarDate(r.campaignTargetDate)}` : undefined}>
                            Campaign overdue
                          </span>
                        </div>
                      )}
                      {r.changes.length > 0 && <div className="mt-0.5 text-xs text-amber-800">Changed: {r.changes.join('; ')}</div>}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
    </Section>
  );
}

function CountLink({ n, href, label }: { n: number; href: string; label: string }) {
  return (
    <a className="link inline-flex min-h-10 min-w-10 items-center justify-end tabular-nums" href={href} aria-label={label}>
      {fmt(n)}
    </a>
  );
}

function OverviewBody({ initial, scopeText, canReport }: Props) {
  const o = useOverview(initial);
  const manages = o.role === 'manager' || o.role === 'admin';
  const since = o.windowFrom;
  const asOf = formatDepotDate(o.asOf, 'UTC');
  // The exact window of the repeat and module figures: whole calendar months, the last one still running.
  const first = o.trend[0]?.month ?? since.slice(0, 7);
  const last = o.trend[o.trend.length - 1];
  const span = windowLabel(first, last?.month ?? first, false);
  const windowText = windowLabel(first, last?.month ?? first, last?.partial ?? false);

  const mine = o.mine && (
    <Section
      title="My open work"
      sub="Open defects assigned to you or reported by you, oldest first"
      className="border-estuary-300"
      actions={
        <a className="link" href={defectsHref({ mine: true, open: true })} data-testid="mine-all">
          All {fmt(o.mine.total)} of mine
        </a>
      }
    >
      <DefectShortList rows={o.mine.items} caption="My open defects, oldest first" empty="Nothing open is assigned to you or reported by you." />
    </Section>
  );

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>Overview</h1>
          <p className="text-sm text-ink-500">
            {scopeText} · as of {asOf}
            {o.role === 'viewer' ? ' · read only' : ''}
          </p>
        </div>
        {canReport && (
          <a className="btn-primary" href="/defects/new">
            <Plus size={16} aria-hidden="true" /> Report a defect
          </a>
        )}
      </div>

      {mine}

      <section className={`grid grid-cols-2 gap-3 ${o.mine ? 'md:grid-cols-3 xl:grid-cols-5' : 'lg:grid-cols-4'}`} aria-label="Key figures">
        {o.mine && (
          <Figure label="My open defects" value={fmt(o.mine.total)} sub="assigned to or reported by you" href={defectsHref({ mine: true, open: true })} testId="kpi-mine" />
        )}
        <Figure label="Open defects" value={fmt(o.openTotal)} sub={o.allDepots ? 'all depots' : 'in your depots'} href={defectsHref({ open: true })} testId="kpi-open" />
        <Figure
          label={`Open over ${o.staleDays} days`}
          value={fmt(o.openStale)}
          sub={o.openTotal ? `${formatPct(o.openStale / o.openTotal)} of open` : 'nothing open'}
          href={defectsHref({ open: true, olderThanDays: o.staleDays, sort: 'reportedAt' })}
          testId="kpi-stale"
        />
        <Figure
          label="Vehicles off road"
          value={fmt(o.offRoad)}
          sub={`of ${fmt(o.vehiclesInService)} in service`}
          href="/vehicles?status=off_road&sort=offRoadSince"
          testId="kpi-offroad"
        />
        <Figure
          label="Repeat rate"
          value={formatPct(o.window.rate)}
          sub={`${plural(o.window.repeats, 'repeat')} of ${fmt(o.window.reported)} reported · ${windowText}`}
          href={defectsHref({ repeat: true, reportedFrom: since })}
          testId="kpi-repeat"
        />
      </section>

      {o.patterns && <PatternsSection p={o.patterns} manages={manages} />}

      <div className="grid gap-5 lg:grid-cols-3">
        <Section title="Open defects by depot and status" sub="Click a segment to list those defects" className="lg:col-span-2">
          <StatusDepotChart depots={o.depots} />
        </Section>
        <Section title="Open by status">
          <ul className="space-y-2.5">
            {OPEN_STATUSES.map((s) => {
              const n = o.openByStatus[s];
              const pct = o.openTotal ? (n / o.openTotal) * 100 : 0;
              return (
                <li key={s}>
                  <a href={defectsHref({ status: s })} className="block rounded-md px-1 py-1 hover:bg-ink-50" aria-label={`${STATUS_LABELS[s]}: ${fmt(n)} open`}>
                    <div className="flex items-center justify-between text-sm">
                      <span className={STATUS_BADGE[s]}>{STATUS_LABELS[s]}</span>
                      <span className="font-semibold tabular-nums">{fmt(n)}</span>
                    </div>
                    <div className="mt-1 h-2 rounded bg-ink-100">
                      <div className="h-2 rounded" style={{ width: `${pct}%`, background: STATUS_COLOURS[s] }} />
                    </div>
                  </a>
                </li>
              );
            })}
          </ul>
        </Section>
      </div>

      <div className="grid gap-5 lg:grid-cols-2">
        <Section
          title="Repeat rate by month"
          sub={`${windowText} · repeats: same vehicle, door and module function within ${o.repeatWindowDays} days of an earlier repair`}
        >
          <RepeatTrendChart trend={o.trend} average={o.window.rate} span={span} />
        </Section>
        <Section title="Module types with most defects" sub={`Reported ${windowText}`}>
          {o.modules.length ? <ModuleChart modules={o.modules} windowFrom={since} span={span} /> : <p className="text-sm text-ink-500">No defects reported {span}.</p>}
        </Section>
      </div>

      {manages && o.depots.length > 1 && (
        <Section title="Depot comparison" sub={`Repeat rate per depot, ${windowText}, against all depots together`}>
          <DepotRepeatChart depots={o.depots} windowFrom={since} average={o.window.rate} span={span} />
        </Section>
      )}

      <div className="grid gap-5 xl:grid-cols-2">
        <Section title="Repeats by depot" sub={windowText}>
          <div className="table-wrap">
            <table className="data-table">
              <caption className="sr-only">Repeats by depot, {span}</caption>
              <thead>
                <tr>
                  <th>Depot</th>
                  <th className="text-right">Reported</th>
                  <th className="text-right">Repeats</th>
                  <th className="text-right">Rate</th>
                  <th className="text-right">Open</th>
                  {manages && <th className="text-right">Open / 100 veh.</th>}
                </tr>
              </thead>
              <tbody>
                {o.depots.map((d) => (
                  <tr key={d.code}>
                    <td>
                      <span className="font-semibold">{d.code}</span> <span className="text-ink-500">{d.name}</span>
                    </td>
                    <td className="text-right">
                      <CountLink n={d.reported} href={defectsHref({ depot: d.code, reportedFrom: since })} label={`${d.code}: ${fmt(d.reported)} reported`} />
                    </td>
                    <td className="text-right">
                      <CountLink n={d.repeats} href={defectsHref({ depot: d.code, repeat: true, reportedFrom: since })} label={`${d.code}: ${plural(d.repeats, 'repeat')}`} />
                    </td>
                    <td className="text-right tabular-nums">{formatPct(d.rate)}</td>
                    <td className="text-right">
                      <CountLink n={d.openTotal} href={defectsHref({ depot: d.code, open: true })} label={`${d.code}: ${fmt(d.openTotal)} open`} />
                    </td>
                    {manages && <td className="text-right tabular-nums">{formatPer100(d.openTotal, d.vehiclesInService)}</td>}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Section>
        <Section title="Repeats by module type" sub={`${windowText}, most reported first`}>
          <div className="table-wrap">
            <table className="data-table">
              <caption className="sr-only">Repeats by module type, {span}</caption>
              <thead>
                <tr>
                  <th>Module type</th>
                  <th className="text-right">Reported</th>
                  <th className="text-right">Repeats</th>
                  <th className="text-right">Rate</th>
                </tr>
              </thead>
              <tbody>
                {o.modules.map((m) => (
                  <tr key={m.code}>
                    <td>
                      <span className="font-semibold whitespace-nowrap">{m.code}</span> <span className="text-ink-500">{m.name}</span>
                    </td>
                    <td className="text-right">
                      <CountLink n={m.reported} href={defectsHref({ module: m.code, reportedFrom: since })} label={`${m.code}: ${fmt(m.reported)} reported`} />
                    </td>
                    <td className="text-right">
                      <CountLink n={m.repeats} href={defectsHref({ module: m.code, repeat: true, reportedFrom: since })} label={`${m.code}: ${plural(m.repeats, 'repeat')}`} />
                    </td>
                    <td className="text-right tabular-nums">{formatPct(m.rate)}</td>
                  </tr>
                ))}
                {o.modules.length === 0 && (
                  <tr>
                    <td colSpan={4} className="text-ink-500">
                      No defects reported {span}.
                    </td>
                  </tr>
                )}
              </tbody>
            </table>
          </div>
        </Section>
      </div>

      <Section
        title="Oldest open defects"
        actions={
          <a className="link" href={defectsHref({ open: true, sort: 'reportedAt' })}>
            All open, oldest first
          </a>
        }
      >
        <DefectShortList rows={o.oldest} caption="Oldest open defects" empty="Nothing open." />
      </Section>
    </div>
  );
}

/** Island root. */
export default function Overview(props: Props) {
  const queryClient = useIslandQueryClient();
  return (
    <QueryClientProvider client={queryClient}>
      <OverviewBody {...props} />
    </QueryClientProvider>
  );
}
