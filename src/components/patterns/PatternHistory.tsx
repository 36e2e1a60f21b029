/**
 * A pattern record's history, one entry per action: a status move with its note, a campaign revision with only the
 * fields it changed, a change the report found (build range, verdict), or the pattern being found.
 */
import type { PatternHistoryRow } from '@/lib/contracts/patterns';
import { formatDay } from '@/lib/patterns/records';
import { formatInstant } from '@/components/defects/format';
import { CAMPAIGN_KIND_LABELS, PATTERN_STATUS_LABELS } from './labels';

const FIELDS: Record<string, string> = {
  note: 'Note',
  reason: 'Reason',
  campaignKind: 'Campaign',
  campaignNote: 'What it does',
  campaignTargetDate: 'Target date',
  buildRange: 'Build range',
  verdict: 'Verdict',
};

function value(field: string, v: string | null): string {
  if (v === null) return '–';
  if (field === 'status') return PATTERN_STATUS_LABELS[v as 'new'] ?? v;
  if (field === 'campaignKind') return CAMPAIGN_KIND_LABELS[v as 'other'] ?? v;
  if (field === 'campaignTargetDate') return formatDay(v);
  if (field === 'buildRange') return v.replace('..', ' to ');
  return v;
}

function title(h: PatternHistoryRow): string {
  if (h.action === 'found') return 'Found';
  if (h.action === 'campaign_revised') return 'Campaign revised';
  if (h.action === 'report') return 'The report changed';
  const s = h.changes.find((c) => c.field === 'status');
  return s ? `${value('status', s.oldValue)} → ${value('status', s.newValue)}` : 'Changed';
}

/** The list, newest first. */
export function PatternHistory({ rows }: { rows: PatternHistoryRow[] }) {
  if (rows.length === 0) return <p className="text-sm text-ink-500">No history yet.</p>;
  return (
    <ol className="space-y-2 text-sm" aria-label="History of this pattern">
      {rows.map((h) => (
        <li key={h.id} className="border-l-2 border-ink-200 pl-3">
          <div className="text-xs text-ink-500">
            {formatInstant(h.at)} · {h.who === 'system' ? 'Seepline (from the report)' : h.who}
          </div>
          <div className="font-semibold text-ink-900">{title(h)}</div>
          {h.text && <div>{h.text}</div>}
          {h.changes
            .filter((c) => c.field !== 'status')
            .map((c) => (
              <div key={c.field}>
                <span className="text-ink-600">{FIELDS[c.field] ?? c.field}:</span>{' '}
                {c.oldValue !== null && c.field !== 'note' && c.field !== 'reason' && (
                  <>
                    <span className="text-ink-500 line-through">{value(c.field, c.oldValue)}</span> →{' '}
                  </>
                )}
                {value(c.field, c.newValue)}
              </div>
            ))}
        </li>
      ))}
    </ol>
  );
}
