/** Labels, badge styles and chart colours of the Patterns views (statuses, campaigns, verdicts, bands). */
import type { CampaignKind, PatternStatusValue } from '@/lib/contracts/patterns';
import type { CohortVerdict, ExposureBand } from '@/lib/patterns/types';

export const PATTERN_STATUS_LABELS: Record<PatternStatusValue, string> = {
  new: 'New',
  acknowledged: 'Acknowledged',
  campaign_planned: 'Campaign planned',
  resolved: 'Resolved',
  dismissed: 'Dismissed',
};

export const PATTERN_STATUS_BADGE: Record<PatternStatusValue, string> = {
  new: 'badge-amber',
  acknowledged: 'badge-neutral',
  campaign_planned: 'badge-brand',
  resolved: 'badge-moss',
  dismissed: 'badge-neutral',
};

/** What each status move is called on its button. */
export const STATUS_ACTION_LABELS: Record<PatternStatusValue, string> = {
  new: 'New',
  acknowledged: 'Acknowledge',
  campaign_planned: 'Plan a campaign',
  resolved: 'Mark resolved',
  dismissed: 'Dismiss',
};

export const CAMPAIGN_KIND_LABELS: Record<CampaignKind, string> = {
  inspect_cohort: 'Inspect every vehicle in the cohort',
  washing_practice: 'Change washing practice',
  new_membranes: 'Fit new door membranes and seals',
  reseal_connectors: 'Reseal or replace door connectors',
  replace_module: 'Replace the module',
  other: 'Other',
};

export const VERDICT_LABELS: Record<CohortVerdict, string> = {
  water_ingress: 'Water ingress',
  significant_dry: 'Significant, dry',
  not_significant: 'Not significant',
};

export const VERDICT_BADGE: Record<CohortVerdict, string> = {
  water_ingress: 'badge-seep',
  significant_dry: 'badge-brick',
  not_significant: 'badge-neutral',
};

export const BAND_LABELS: Record<ExposureBand, string> = { low: 'Low', medium: 'Medium', high: 'High' };

/** Chart colours of the exposure bands (tokens of src/styles/global.css). */
export const BAND_COLOURS: Record<ExposureBand | 'all', string> = {
  low: '#3f7d34',
  medium: '#b07a10',
  high: '#24528a',
  all: '#1a5559',
};

/** Chart colours of a group against the rest of its band. */
export const COMPARE_COLOURS: Record<'cohort' | 'rest', string> = { cohort: '#b23a2b', rest: '#4d5665' };

/** Trace verdict labels (CONTRACT.md "Traces"). */
export const TRACE_VERDICT_LABELS: Record<string, string> = {
  healthy: 'Healthy',
  channels_shorted: 'Channels shorted',
  channel_stuck: 'Channel stuck',
  low_amplitude: 'Low amplitude',
  intermittent: 'Intermittent',
  phase_error: 'Phase error',
  unknown: 'Unknown',
};
