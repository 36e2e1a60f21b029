/** Words and badge styles for trace verdicts and directions, shared by the trace pages and islands. */
import type { Verdict } from '@/lib/traces/verdict';

/** Verdicts in words. */
export const VERDICT_LABELS: Record<Verdict, string> = {
  healthy: 'Healthy',
  channels_shorted: 'Channels shorted',
  channel_stuck: 'Channel stuck',
  low_amplitude: 'Low amplitude',
  intermittent: 'Intermittent',
  phase_error: 'Phase error',
};

/** One line under the verdict: what it means for the window. */
export const VERDICT_SUMMARIES: Record<Verdict, string> = {
  healthy: 'Both hall-sensor signals switch cleanly, a quarter period apart.',
  channels_shorted: 'Both channels carry the same signal: the two lines are bridged.',
  channel_stuck: 'A channel does not switch, so position and direction are lost.',
  low_amplitude: 'A channel does not reach a proper high level.',
  intermittent: 'Pulses go missing or extra short pulses appear.',
  phase_error: 'The channels are not a quarter period apart.',
};

/** Badge class of each verdict (faults that stop the window in brick, doubtful ones in amber). */
export const VERDICT_BADGE: Record<Verdict, string> = {
  healthy: 'badge-moss',
  channels_shorted: 'badge-brick',
  channel_stuck: 'badge-brick',
  low_amplitude: 'badge-amber',
  intermittent: 'badge-amber',
  phase_error: 'badge-amber',
};

/** Panel colours of the verdict banner on the trace page. */
export const VERDICT_PANEL: Record<Verdict, string> = {
  healthy: 'border-moss-600 bg-moss-50 text-moss-700',
  channels_shorted: 'border-brick-600 bg-brick-50 text-brick-700',
  channel_stuck: 'border-brick-600 bg-brick-50 text-brick-700',
  low_amplitude: 'border-amber-600 bg-amber-50 text-amber-800',
  intermittent: 'border-amber-600 bg-amber-50 text-amber-800',
  phase_error: 'border-amber-600 bg-amber-50 text-amber-800',
};

/** Which channel leads, in words. */
export const DIRECTION_LABELS: Record<'a_leads' | 'b_leads' | 'none', string> = {
  a_leads: 'A leads B',
  b_leads: 'B leads A',
  none: 'Cannot be told',
};

/** Channel colours of the plot and the figures table (estuary for A, seep blue for B). */
export const CHANNEL_COLOURS = { a: '#1f6a6f', b: '#3a78c2' } as const;

/** A verdict label for any string (older records, unknown values shown as they are). */
export function verdictLabel(v: string): string {
  return (VERDICT_LABELS as Record<string, string>)[v] ?? v;
}

/** A verdict badge class for any string. */
export function verdictBadge(v: string): string {
  return (VERDICT_BADGE as Record<string, string>)[v] ?? 'badge-neutral';
}
