/**
 * The audit trail of a defect (island): every change, who made it and when, field by field with old → new,
 * kept current as the person works on the page (it reads the shared defect record). A status step is one
 * row with its reason (src/lib/defects/audit-rows.ts); people and records referred to by id are named.
 */
import { QueryClientProvider } from '@tanstack/react-query';
import { useIslandQueryClient } from '@/components/defect-workflow/island-client';
import type { DefectRecord } from '@/lib/contracts/defects';
import { MOISTURE_LABELS, POSITION_LABELS, ROOT_CAUSE_LABELS, STATUS_LABELS } from '@/components/labels';
import { formatInstant, formatMinutes, formatMoneyMinor } from '@/components/defects/format';
import { ACTION_LABELS, CONDITION_LABELS, FIELD_LABELS, WHO_LABELS } from '@/components/defect-fields/labels';
import { VERDICT_LABELS } from '@/components/traces/labels';
import { collapseAuditRows } from '@/lib/defects/audit-rows';
import { useDefect } from './queries';

type Props = { initial: DefectRecord; timeZone: string | null };

const short = (v: string) => (v.length > 80 ? `${v.slice(0, 80)}…` : v);

/** An audit value in words: instants as dates, money, minutes and enumerations by their labels. */
export function auditValue(field: string | null, v: string | null, timeZone: string | null, currency?: string | null): string {
  if (v === null || v === '') return '–';
  if (field && /At$/.test(field) && /^\d{10,}$/.test(v)) return formatInstant(new Date(Number(v)).toISOString(), timeZone);
  if (field === 'costMinor' && /^-?\d+$/.test(v)) return formatMoneyMinor(Number(v), currency);
  if (field === 'labourMinutes' && /^\d+$/.test(v)) return formatMinutes(Number(v));
  if (field === 'status') return STATUS_LABELS[v] ?? v;
  if (field === 'moisture') return MOISTURE_LABELS[v] ?? v;
  if (field === 'rootCause') return ROOT_CAUSE_LABELS[v] ?? v;
  if (field === 'position') return POSITION_LABELS[v] ?? v;
  if (field && field in CONDITION_LABELS) return CONDITION_LABELS[field as keyof typeof CONDITION_LABELS][v] ?? v;
  if (field?.startsWith('verified') && (v === 'true' || v === 'false' || v === '1' || v === '0')) return v === 'true' || v === '1' ? 'Yes' : 'No';
  return short(v);
}

/** The stored note of a trace upload ("healthy (door-fl.csv)") in words: "Healthy · door-fl.csv". */
export function traceNote(v: string | null): string {
  if (!v) return '–';
  const m = /^([a-z_]+) \((.*)\)$/.exec(v);
  if (!m) return short(v);
  const verdict = VERDICT_LABELS[m[1] as keyof typeof VERDICT_LABELS] ?? m[1];
  return `${verdict} · ${m[2]}`;
}

function Trail({ initial, timeZone }: Props) {
  const { data: r } = useDefect(initial);
  const rows = collapseAuditRows(r.audit);
  return (
    <section className="card" aria-labelledby="h-audit">
      <div className="flex flex-wrap items-baseline justify-between gap-2 border-b border-ink-200 px-4 py-3">
        <h2 id="h-audit">Audit trail</h2>
        <span className="text-sm text-ink-500">Every change, newest first</span>
      </div>
      <div className="table-wrap">
        <table className="data-table">
          <caption className="sr-only">Changes to {r.ref}, newest first</caption>
          <thead>
            <tr>
              <th scope="col">When</th>
              <th scope="col">Who</th>
              <th scope="col">What</th>
              <th scope="col">Change</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((a) => (
              <tr key={a.id}>
                <td className="whitespace-nowrap">{formatInstant(a.at, timeZone)}</td>
                <td>{a.userName ?? WHO_LABELS[a.who] ?? a.who}</td>
                <td>
                  {ACTION_LABELS[a.action] ?? a.action}
                  {a.field && a.action !== 'transition' && <span className="text-ink-600"> · {FIELD_LABELS[a.field] ?? a.field}</span>}
                  {a.field === 'reason' && <span className="text-ink-600"> · reason</span>}
                </td>
                <td className="text-sm wrap-anywhere">
                  {a.action === 'trace:add' ? (
                    <span className="text-ink-700">{traceNote(a.newValue)}</span>
                  ) : a.field && a.field !== 'reason' ? (
                    <span>
                      <span className="text-ink-500" title={a.oldValue ?? undefined}>
                        {a.oldLabel ?? auditValue(a.field, a.oldValue, timeZone, r.currency)}
                      </span>{' '}
                      <span aria-label="changed to">→</span>{' '}
                      <span className="text-ink-900" title={a.newValue ?? undefined}>
                        {a.newLabel ?? auditValue(a.field, a.newValue, timeZone, r.currency)}
                      </span>
                      {a.reason && <span className="mt-0.5 block text-ink-600">“{a.reason}”</span>}
                    </span>
                  ) : (
                    <span className="text-ink-600" title={a.newValue ?? undefined}>
                      {auditValue(null, a.newValue ?? a.oldValue, timeZone, r.currency)}
                    </span>
                  )}
                </td>
              </tr>
            ))}
            {r.audit.length === 0 && (
              <tr>
                <td colSpan={4} className="text-ink-500">
                  No changes recorded.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
    </section>
  );
}

/** Island root. */
export default function AuditTrail(props: Props) {
  const client = useIslandQueryClient();
  return (
    <QueryClientProvider client={client}>
      <Trail {...props} />
    </QueryClientProvider>
  );
}
