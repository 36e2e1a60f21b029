/** Labels of the defect workflow's own values (door conditions, audit fields and actions, verification). */
import type { ConditionField } from '@/lib/contracts/defects';

/** What each condition value means, per part of the door. */
export const CONDITION_LABELS: Record<ConditionField, Record<string, string>> = {
  membraneCondition: { ok: 'Intact', loose: 'Loose or unsealed', damaged: 'Torn or damaged', missing: 'Missing' },
  sealCondition: { ok: 'Good', worn: 'Worn or flattened', damaged: 'Damaged' },
  drainCondition: { ok: 'Clear', partly_blocked: 'Partly blocked', blocked: 'Blocked' },
  connectorCondition: { ok: 'Clean and dry', corroded: 'Corroded', water_inside: 'Water inside', damaged: 'Damaged pins or housing' },
};

/** The part of the door each condition field describes. */
export const CONDITION_FIELD_LABELS: Record<ConditionField, string> = {
  membraneCondition: 'Membrane',
  sealCondition: 'Door seal',
  drainCondition: 'Drain holes',
  connectorCondition: 'Connector',
};

/** Field names in the audit trail and the conflict view. */
export const FIELD_LABELS: Record<string, string> = {
  status: 'Status',
  reason: 'Reason',
  symptom: 'Symptom',
  dtcs: 'Fault codes',
  moisture: 'Moisture found',
  rootCause: 'Root cause',
  root_cause: 'Root cause',
  action: 'Action',
  odometerKm: 'Odometer',
  odometer_km: 'Odometer',
  closedAt: 'Closed',
  closed_at: 'Closed',
  position: 'Door',
  moduleId: 'Module',
  moduleCode: 'Module type',
  reportedAt: 'Reported',
  reporterName: 'Reported by',
  labourMinutes: 'Labour',
  costMinor: 'Cost',
  parts: 'Parts',
  repeatOfId: 'Repeat of',
  membraneCondition: 'Membrane',
  sealCondition: 'Door seal',
  drainCondition: 'Drain holes',
  connectorCondition: 'Connector',
  notes: 'Notes',
  assignedToId: 'Assigned to',
  verifiedReinit: 'Window re-initialised',
  verifiedReversal: 'Auto-reverse checked',
  verifiedById: 'Verified by',
  verifiedAt: 'Verified',
  verificationNote: 'How it was checked',
  vehicleId: 'Vehicle',
  depotId: 'Depot',
};

/** Audit actions in words. */
export const ACTION_LABELS: Record<string, string> = {
  create: 'Reported',
  'import:create': 'Imported',
  update: 'Changed',
  'import:update': 'Changed by import',
  transition: 'Status',
  delete: 'Deleted',
  'photo:add': 'Photo added',
  'photo:remove': 'Photo removed',
  'trace:add': 'Scope trace added',
};

/** System actors in words. */
export const WHO_LABELS: Record<string, string> = { seed: 'Demo data', import: 'Import', cli: 'Command line', system: 'System' };
