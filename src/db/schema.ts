/**
 * Seepline database schema (SQLite through Drizzle).
 *
 * Edit this file, then run `npm run db:generate` to write a new migration into drizzle/ — never edit the
 * generated SQL by hand. Conventions: instants are integer milliseconds since the Unix epoch (UTC) in
 * columns named `…At`; calendar dates are ISO text (`YYYY-MM-DD`, or `YYYY-MM` for a build month given
 * without a day) in columns named `…Date`; money is integer minor units (`…Minor`) with the currency held
 * in settings; booleans are 0/1 integers.
 */
import { sql } from 'drizzle-orm';
import { index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';

export const ROLES = ['admin', 'manager', 'supervisor', 'technician', 'viewer'] as const;
export const MODULE_FUNCTIONS = [
  'window_lifter',
  'lock_actuator',
  'door_control',
  'mirror',
  'harness',
  'switch',
  'other',
] as const;
export const PARKING = ['indoor', 'outdoor', 'mixed'] as const;
export const POSITIONS = ['FL', 'FR', 'RL', 'RR', 'SL', 'SR', 'TG'] as const;
export const MOISTURE = ['none', 'traces', 'corrosion', 'standing_water'] as const;
export const ROOT_CAUSES = ['water_ingress', 'connector', 'wiring', 'mechanical', 'sensor', 'software', 'unknown'] as const;
export const DEFECT_STATUSES = [
  'reported',
  'diagnosing',
  'awaiting_parts',
  'repaired',
  'verified',
  'closed',
  'cancelled',
] as const;
export const ATTACHMENT_KINDS = ['photo', 'trace', 'document'] as const;

const createdAt = () =>
  integer('created_at')
    .notNull()
    .default(sql`(unixepoch('subsec') * 1000)`);
const updatedAt = () =>
  integer('updated_at')
    .notNull()
    .default(sql`(unixepoch('subsec') * 1000)`);

export const depots = sqliteTable('depots', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  code: text('code').notNull().unique(),
  name: text('name').notNull(),
  region: text('region'),
  coastal: integer('coastal', { mode: 'boolean' }).notNull().default(false),
  rainDaysPerYear: integer('rain_days_per_year').notNull(),
  meanRhPct: real('mean_rh_pct').notNull(),
  washBay: integer('wash_bay', { mode: 'boolean' }).notNull().default(false),
  inspectionSlotsPerDay: integer('inspection_slots_per_day'),
  timezone: text('timezone'),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
});

export const users = sqliteTable('users', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  role: text('role', { enum: ROLES }).notNull(),
  passwordHash: text('password_hash').notNull(),
  /** A viewer may be given every depot; admins and managers always see every depot. */
  allDepots: integer('all_depots', { mode: 'boolean' }).notNull().default(false),
  active: integer('active', { mode: 'boolean' }).notNull().default(true),
  lastSignInAt: integer('last_sign_in_at'),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
});

export const userDepots = sqliteTable(
  'user_depots',
  {
    userId: integer('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    depotId: integer('depot_id')
      .notNull()
      .references(() => depots.id, { onDelete: 'cascade' }),
  },
  (t) => [primaryKey({ columns: [t.userId, t.depotId] })],
);

export const apiTokens = sqliteTable(
  'api_tokens',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    userId: integer('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    label: text('label').notNull(),
    /** SHA-256 of the whole token, hex. The token itself is shown once and never stored. */
    tokenHash: text('token_hash').notNull().unique(),
    /** First characters of the token, to recognise it in the list. */
    prefix: text('prefix').notNull(),
    lastUsedAt: integer('last_used_at'),
    revokedAt: integer('revoked_at'),
    createdAt: createdAt(),
  },
  (t) => [index('api_tokens_user_idx').on(t.userId)],
);

/** Failed sign-in attempts per e-mail address, for throttling. */
export const signInThrottle = sqliteTable('sign_in_throttle', {
  key: text('key').primaryKey(),
  failures: integer('failures').notNull().default(0),
  windowStartAt: integer('window_start_at').notNull(),
  lockedUntilAt: integer('locked_until_at'),
});

export const modules = sqliteTable('modules', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  code: text('code').notNull().unique(),
  name: text('name').notNull(),
  function: text('function', { enum: MODULE_FUNCTIONS }).notNull(),
  partNumber: text('part_number'),
  supplier: text('supplier'),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
});

export const vehicles = sqliteTable(
  'vehicles',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    vin: text('vin').notNull().unique(),
    fleetNumber: text('fleet_number'),
    registration: text('registration'),
    make: text('make'),
    model: text('model'),
    body: text('body'),
    /** `YYYY-MM` or `YYYY-MM-DD`, as given. */
    buildDate: text('build_date').notNull(),
    /** Always `YYYY-MM`: the build month used by the recurrence engine. */
    buildMonth: text('build_month').notNull(),
    inServiceDate: text('in_service_date').notNull(),
    retiredDate: text('retired_date'),
    depotId: integer('depot_id')
      .notNull()
      .references(() => depots.id),
    parking: text('parking', { enum: PARKING }).notNull(),
    washesPerMonth: real('washes_per_month').notNull(),
    modelYear: integer('model_year'),
    /** Set while the vehicle is off road for a defect or inspection. */
    offRoadSinceAt: integer('off_road_since_at'),
    /** Registration and fleet number without separators (src/lib/vehicles/search-key.ts), written with every vehicle write. */
    searchKey: text('search_key'),
    version: integer('version').notNull().default(1),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index('vehicles_depot_idx').on(t.depotId),
    index('vehicles_fleet_number_idx').on(t.fleetNumber),
    index('vehicles_registration_idx').on(t.registration),
    index('vehicles_build_month_idx').on(t.buildMonth),
    index('vehicles_build_date_idx').on(t.buildDate),
    index('vehicles_in_service_idx').on(t.inServiceDate),
    index('vehicles_make_model_idx').on(t.make, t.model),
  ],
);

/**
 * Each time a vehicle was off road: from when to when (open while it still is), who took it off and why, who put
 * it back into service and why, and the open defects it went back with (those still needing the release
 * verification listed apart). `vehicles.off_road_since_at` stays the current state; this is the history shown
 * on the vehicle's page (docs/decisions/015-times-currency-off-road.md).
 */
export const vehicleOffRoad = sqliteTable(
  'vehicle_off_road',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    vehicleId: integer('vehicle_id')
      .notNull()
      .references(() => vehicles.id, { onDelete: 'cascade' }),
    fromAt: integer('from_at').notNull(),
    /** Null while the vehicle is still off road. */
    toAt: integer('to_at'),
    reason: text('reason'),
    startedById: integer('started_by_id').references(() => users.id, { onDelete: 'set null' }),
    /** Who took it off road when there is no user (`seed`, `import`, `cli`), or null when not recorded. */
    startedActor: text('started_actor'),
    returnReason: text('return_reason'),
    endedById: integer('ended_by_id').references(() => users.id, { onDelete: 'set null' }),
    endedActor: text('ended_actor'),
    /** Refs of the defects still open when it went back into service, space-separated. */
    openDefectsAtReturn: text('open_defects_at_return'),
    /** Refs of those that still needed the release verification (window re-initialised, auto-reverse checked). */
    unverifiedAtReturn: text('unverified_at_return'),
  },
  (t) => [index('vehicle_off_road_vehicle_idx').on(t.vehicleId, t.fromAt)],
);

export const defects = sqliteTable(
  'defects',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    ref: text('ref').notNull().unique(),
    vehicleId: integer('vehicle_id')
      .notNull()
      .references(() => vehicles.id),
    /** The vehicle's depot when the defect was reported; depot scope is checked against this. */
    depotId: integer('depot_id')
      .notNull()
      .references(() => depots.id),
    moduleId: integer('module_id')
      .notNull()
      .references(() => modules.id),
    position: text('position', { enum: POSITIONS }).notNull(),
    status: text('status', { enum: DEFECT_STATUSES }).notNull().default('reported'),
    reportedAt: integer('reported_at').notNull(),
    /** The reported_at text as given on import (date-only or date-time), for faithful round trips. */
    reportedAtText: text('reported_at_text'),
    symptom: text('symptom'),
    /** Normalised fault codes, space-separated (`B1234 B1234-13`); also broken out in defect_codes. */
    dtcs: text('dtcs'),
    moisture: text('moisture', { enum: MOISTURE }),
    rootCause: text('root_cause', { enum: ROOT_CAUSES }),
    action: text('action'),
    odometerKm: integer('odometer_km'),
    membraneCondition: text('membrane_condition'),
    sealCondition: text('seal_condition'),
    drainCondition: text('drain_condition'),
    connectorCondition: text('connector_condition'),
    labourMinutes: integer('labour_minutes'),
    costMinor: integer('cost_minor'),
    notes: text('notes'),
    /** Who noticed the fault when it is not the person who entered it (a driver, another depot). */
    reporterName: text('reporter_name'),
    reportedById: integer('reported_by_id').references(() => users.id),
    assignedToId: integer('assigned_to_id').references(() => users.id),
    verifiedReinit: integer('verified_reinit', { mode: 'boolean' }),
    verifiedReversal: integer('verified_reversal', { mode: 'boolean' }),
    verifiedById: integer('verified_by_id').references(() => users.id),
    verifiedAt: integer('verified_at'),
    /** How the release check was done (free text, e.g. "test rod at the top of travel"). */
    verificationNote: text('verification_note'),
    repeatOfId: integer('repeat_of_id'),
    closedAt: integer('closed_at'),
    closedAtText: text('closed_at_text'),
    version: integer('version').notNull().default(1),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index('defects_vehicle_idx').on(t.vehicleId),
    index('defects_depot_status_idx').on(t.depotId, t.status),
    index('defects_module_idx').on(t.moduleId),
    index('defects_reported_idx').on(t.reportedAt),
    uniqueIndex('defects_natural_key').on(t.vehicleId, t.reportedAt, t.position, t.moduleId),
  ],
);

export const defectCodes = sqliteTable(
  'defect_codes',
  {
    defectId: integer('defect_id')
      .notNull()
      .references(() => defects.id, { onDelete: 'cascade' }),
    seq: integer('seq').notNull(),
    code: text('code').notNull(),
    failureType: text('failure_type'),
  },
  (t) => [primaryKey({ columns: [t.defectId, t.seq] }), index('defect_codes_code_idx').on(t.code)],
);

export const defectParts = sqliteTable(
  'defect_parts',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    defectId: integer('defect_id')
      .notNull()
      .references(() => defects.id, { onDelete: 'cascade' }),
    partNumber: text('part_number').notNull(),
    description: text('description'),
    quantity: integer('quantity').notNull().default(1),
    unitCostMinor: integer('unit_cost_minor'),
  },
  (t) => [index('defect_parts_defect_idx').on(t.defectId)],
);

export const attachments = sqliteTable(
  'attachments',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    defectId: integer('defect_id').references(() => defects.id, { onDelete: 'set null' }),
    depotId: integer('depot_id').references(() => depots.id),
    kind: text('kind', { enum: ATTACHMENT_KINDS }).notNull(),
    sha256: text('sha256').notNull(),
    mime: text('mime').notNull(),
    bytes: integer('bytes').notNull(),
    originalName: text('original_name'),
    storedPath: text('stored_path').notNull(),
    width: integer('width'),
    height: integer('height'),
    /** JSON of the analysis for a trace capture. */
    analysis: text('analysis'),
    /** A photo's thumbnail under UPLOAD_DIR (kind `photo`). */
    thumbPath: text('thumb_path'),
    /** What a photo shows, in the uploader's words. */
    caption: text('caption'),
    createdById: integer('created_by_id').references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index('attachments_defect_idx').on(t.defectId), index('attachments_sha_idx').on(t.sha256)],
);

/**
 * Every status change of a defect: from, to, who and when (the defect page's timeline). Written by the
 * workflow (src/server/defect-workflow.ts) in the same transaction as the change and its audit rows.
 */
export const defectTransitions = sqliteTable(
  'defect_transitions',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    defectId: integer('defect_id')
      .notNull()
      .references(() => defects.id, { onDelete: 'cascade' }),
    fromStatus: text('from_status', { enum: DEFECT_STATUSES }).notNull(),
    toStatus: text('to_status', { enum: DEFECT_STATUSES }).notNull(),
    at: integer('at').notNull(),
    userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
    /** Who acted when there is no user: `import`, `seed`, `cli`, `system`. */
    actor: text('actor'),
    /** Why (required when cancelling or re-opening). */
    reason: text('reason'),
  },
  (t) => [index('defect_transitions_defect_idx').on(t.defectId, t.at)],
);

/** One row per changed field (or one per event with field null): who, when, what, old → new. */
export const auditLog = sqliteTable(
  'audit_log',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    at: integer('at').notNull(),
    userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
    /** Who acted when there is no user: `cli`, `import`, `seed`, `system`. */
    actor: text('actor'),
    entity: text('entity').notNull(),
    entityId: text('entity_id').notNull(),
    action: text('action').notNull(),
    field: text('field'),
    oldValue: text('old_value'),
    newValue: text('new_value'),
  },
  (t) => [index('audit_entity_idx').on(t.entity, t.entityId), index('audit_at_idx').on(t.at)],
);

/** Key/value settings an admin can change (repeat window, currency, …). */
export const settings = sqliteTable('settings', {
  key: text('key').primaryKey(),
  value: text('value').notNull(),
});

export const PATTERN_STATUSES = ['new', 'acknowledged', 'campaign_planned', 'resolved', 'dismissed'] as const;
/** What a fleet manager decides for a cohort (the "campaign planned" status carries one). */
export const CAMPAIGN_KINDS = ['inspect_cohort', 'washing_practice', 'new_membranes', 'reseal_connectors', 'replace_module', 'other'] as const;

/**
 * One synchronisation of the pattern records from the fleet-wide report (as of a day, on a data version).
 * A record whose `last_sync_id` is not the latest sync was not found in the latest report.
 */
export const patternSyncs = sqliteTable('pattern_syncs', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  at: integer('at').notNull(),
  asOf: text('as_of').notNull(),
  /** Fingerprint of the fleet data the report was computed on (see src/server/patterns.ts). */
  dataVersion: text('data_version').notNull(),
  byUserId: integer('by_user_id').references(() => users.id, { onDelete: 'set null' }),
  cohortsTested: integer('cohorts_tested').notNull(),
  cohortsSignificant: integer('cohorts_significant').notNull(),
  recordsCreated: integer('records_created').notNull(),
  recordsUpdated: integer('records_updated').notNull(),
});

/**
 * A pattern the recurrence engine found fleet-wide, kept so that people can act on it (docs/decisions/011).
 * Identity: module type + exposure band (`key`) and a build range that overlaps the engine's latest window for
 * that key; a window that no longer overlaps starts a new record. The latest figures are columns (for lists and
 * filters) and a JSON snapshot (the cohort with its months, vehicles and failures, for the pattern page); the
 * `acted_*` columns hold the figures when a person last changed the status, so that a changed cohort shows.
 */
export const patternRecords = sqliteTable(
  'pattern_records',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    /** `${moduleCode}:${band}`; several records may share it over time (different, non-overlapping ranges). */
    key: text('key').notNull(),
    moduleCode: text('module_code').notNull(),
    exposureBand: text('exposure_band').notNull(),
    /** Engine cohort id of the latest report that matched (includes the build range). */
    cohortId: text('cohort_id').notNull(),
    buildFrom: text('build_from').notNull(),
    buildTo: text('build_to').notNull(),
    /** Range when the record was created. */
    firstBuildFrom: text('first_build_from').notNull(),
    firstBuildTo: text('first_build_to').notNull(),
    vehicles: integer('vehicles').notNull(),
    failures: integer('failures').notNull(),
    expected: real('expected').notNull(),
    rateRatio: real('rate_ratio'),
    ciLow: real('ci_low'),
    ciHigh: real('ci_high'),
    qValue: real('q_value').notNull(),
    moistureShare: real('moisture_share').notNull(),
    repeatVehicles: integer('repeat_vehicles').notNull(),
    significant: integer('significant', { mode: 'boolean' }).notNull(),
    waterIngress: integer('water_ingress', { mode: 'boolean' }).notNull().default(false),
    status: text('status', { enum: PATTERN_STATUSES }).notNull().default('new'),
    /** The note or reason given with the latest status change (required for dismissed). */
    statusReason: text('status_reason'),
    statusById: integer('status_by_id').references(() => users.id, { onDelete: 'set null' }),
    statusAt: integer('status_at'),
    campaignKind: text('campaign_kind', { enum: CAMPAIGN_KINDS }),
    campaignNote: text('campaign_note'),
    /** `YYYY-MM-DD`. */
    campaignTargetDate: text('campaign_target_date'),
    /** Figures when a person last acted (or when first recorded): the baseline of "changed since". */
    actedAt: integer('acted_at').notNull(),
    actedFailures: integer('acted_failures').notNull(),
    actedBuildFrom: text('acted_build_from').notNull(),
    actedBuildTo: text('acted_build_to').notNull(),
    /** JSON: the engine cohort, its module baseline and the report's method, as of `snapshot_as_of`. */
    snapshot: text('snapshot').notNull(),
    snapshotAsOf: text('snapshot_as_of').notNull(),
    lastSyncId: integer('last_sync_id').references(() => patternSyncs.id),
    firstSeenAt: integer('first_seen_at').notNull(),
    lastSeenAt: integer('last_seen_at').notNull(),
    version: integer('version').notNull().default(1),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index('pattern_records_key_idx').on(t.key), index('pattern_records_status_idx').on(t.status)],
);
