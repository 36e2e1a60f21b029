/**
 * The defect lifecycle: which status changes exist, who may make each, and what each needs first.
 * Pure: the server enforces it (src/server/defect-workflow.ts) and the defect page uses it to offer only the
 * steps the person may take. The rules and their reasons are in docs/decisions/008-defect-workflow.md.
 *
 *   reported → diagnosing → (awaiting_parts ⇄ diagnosing) → repaired → verified → closed
 *   any open status → cancelled (supervisors and above); closed → diagnosing (re-open) and
 *   cancelled → reported (restore), supervisors and above; viewers never change anything.
 *
 * Safety rule: a defect on a module whose function is window_lifter, door_control or harness (the door's
 * wiring) may be marked verified or closed only with the release verification recorded: the window
 * re-initialised per the vehicle maker's procedure and automatic closing seen to reverse on an obstruction,
 * with who and when. Seepline records that check; it certifies nothing.
 */

export const DEFECT_STATUS_VALUES = ['reported', 'diagnosing', 'awaiting_parts', 'repaired', 'verified', 'closed', 'cancelled'] as const;
/** A defect's status. */
export type DefectStatus = (typeof DEFECT_STATUS_VALUES)[number];
/** Statuses in which work is still to do. */
export const OPEN_STATUS_VALUES: readonly DefectStatus[] = ['reported', 'diagnosing', 'awaiting_parts', 'repaired', 'verified'];

/** The roles of src/lib/auth/permissions.ts (repeated here so that the engine stays free of imports). */
export type WorkflowRole = 'admin' | 'manager' | 'supervisor' | 'technician' | 'viewer';

/** People who work defects: technicians, supervisors, managers and admins. */
export const WORKER_ROLES: readonly WorkflowRole[] = ['admin', 'manager', 'supervisor', 'technician'];
/** Supervisors and above: cancel, re-open, restore, and change closed records. */
export const SUPERVISOR_ROLES: readonly WorkflowRole[] = ['admin', 'manager', 'supervisor'];

/** Module functions whose repair must be verified before release (see the file header). */
export const SAFETY_VERIFIED_FUNCTIONS = ['window_lifter', 'door_control', 'harness'] as const;

/** What a step needs before it is allowed. */
export type Requirement = 'reason' | 'action' | 'root_cause' | 'safety_verification';

/** A named step of the workflow. */
export type TransitionKey =
  | 'start_diagnosis'
  | 'await_parts'
  | 'resume_diagnosis'
  | 'mark_repaired'
  | 'reject_repair'
  | 'verify'
  | 'close'
  | 'reopen_work'
  | 'cancel'
  | 'reopen'
  | 'restore';

/** One allowed status change. */
export interface TransitionRule {
  key: TransitionKey;
  from: DefectStatus;
  to: DefectStatus;
  /** Button text. */
  label: string;
  roles: readonly WorkflowRole[];
  /** Checked in this order; `safety_verification` only for SAFETY_VERIFIED_FUNCTIONS. */
  needs: readonly Requirement[];
  /** Side effects the server applies with the change. */
  effects: {
    /** Set closed_at to the time of the change. */
    closes?: boolean;
    /** Clear closed_at. */
    clearsClosedAt?: boolean;
    /** Clear the verification record (the repair it verified is being redone). */
    clearsVerification?: boolean;
    /** Assign the defect to the person taking this step when nobody has it yet. */
    claims?: boolean;
  };
  /** A forward step on the way to closing (shown as the primary button). */
  forward: boolean;
}

const OPEN_FOR_CANCEL: readonly DefectStatus[] = OPEN_STATUS_VALUES;

/** Every allowed transition. Anything not listed is refused. */
export const TRANSITIONS: readonly TransitionRule[] = [
  { key: 'start_diagnosis', from: 'reported', to: 'diagnosing', label: 'Start diagnosis', roles: WORKER_ROLES, needs: [], effects: { claims: true }, forward: true },
  { key: 'await_parts', from: 'diagnosing', to: 'awaiting_parts', label: 'Waiting for parts', roles: WORKER_ROLES, needs: [], effects: { claims: true }, forward: false },
  { key: 'mark_repaired', from: 'diagnosing', to: 'repaired', label: 'Mark repaired', roles: WORKER_ROLES, needs: ['action'], effects: { claims: true }, forward: true },
  { key: 'resume_diagnosis', from: 'awaiting_parts', to: 'diagnosing', label: 'Back to diagnosis', roles: WORKER_ROLES, needs: [], effects: {}, forward: false },
  { key: 'mark_repaired', from: 'awaiting_parts', to: 'repaired', label: 'Parts fitted: mark repaired', roles: WORKER_ROLES, needs: ['action'], effects: { claims: true }, forward: true },
  { key: 'verify', from: 'repaired', to: 'verified', label: 'Record verification', roles: WORKER_ROLES, needs: ['safety_verification'], effects: {}, forward: true },
  { key: 'close', from: 'repaired', to: 'closed', label: 'Close', roles: WORKER_ROLES, needs: ['root_cause', 'safety_verification'], effects: { closes: true }, forward: false },
  { key: 'reject_repair', from: 'repaired', to: 'diagnosing', label: 'Fault not cleared', roles: WORKER_ROLES, needs: [], effects: { clearsVerification: true }, forward: false },
  { key: 'close', from: 'verified', to: 'closed', label: 'Close and release', roles: WORKER_ROLES, needs: ['root_cause', 'safety_verification'], effects: { closes: true }, forward: true },
  { key: 'reopen_work', from: 'verified', to: 'diagnosing', label: 'Fault came back', roles: WORKER_ROLES, needs: [], effects: { clearsVerification: true }, forward: false },
  ...OPEN_FOR_CANCEL.map(
    (from): TransitionRule => ({ key: 'cancel', from, to: 'cancelled', label: 'Cancel defect', roles: SUPERVISOR_ROLES, needs: ['reason'], effects: {}, forward: false }),
  ),
  {
    key: 'reopen',
    from: 'closed',
    to: 'diagnosing',
    label: 'Re-open',
    roles: SUPERVISOR_ROLES,
    needs: ['reason'],
    effects: { clearsClosedAt: true, clearsVerification: true },
    forward: false,
  },
  { key: 'restore', from: 'cancelled', to: 'reported', label: 'Restore', roles: SUPERVISOR_ROLES, needs: ['reason'], effects: {}, forward: false },
];

/** True for a known status text. */
export function isDefectStatus(s: string): s is DefectStatus {
  return (DEFECT_STATUS_VALUES as readonly string[]).includes(s);
}

/** True when a defect on a module of this function needs the release verification. */
export function requiresSafetyVerification(moduleFunction: string): boolean {
  return (SAFETY_VERIFIED_FUNCTIONS as readonly string[]).includes(moduleFunction);
}

/** Who may change the recorded fields (report, findings, parts, photos) of a defect in this status. */
export function canEditRecord(status: DefectStatus, role: WorkflowRole): boolean {
  return (OPEN_STATUS_VALUES.includes(status) ? WORKER_ROLES : SUPERVISOR_ROLES).includes(role);
}

/** The rule for a change, or null when the lifecycle has no such step. */
export function findTransition(from: DefectStatus, to: DefectStatus): TransitionRule | null {
  return TRANSITIONS.find((t) => t.from === from && t.to === to) ?? null;
}

/** The verification record as stored (all null when none was recorded). */
export interface VerificationState {
  reinitialised: boolean | null;
  reversalVerified: boolean | null;
  byUserId: number | null;
  atMs: number | null;
}

/** True when the release verification is complete: both checks passed, by a person, at a time. */
export function verificationComplete(v: VerificationState | null | undefined): boolean {
  return !!v && v.reinitialised === true && v.reversalVerified === true && v.byUserId !== null && v.atMs !== null;
}

/** What the engine needs to know about the defect and the request. */
export interface TransitionContext {
  role: WorkflowRole;
  moduleFunction: string;
  /** The action (what was done) is written down. */
  hasAction: boolean;
  /** A root cause is recorded. */
  hasRootCause: boolean;
  /** The verification that will be on the defect after this request (stored, or supplied with it). */
  verification: VerificationState | null;
  /** The reason given with the request. */
  reason: string | null;
}

/** Why a step is refused. */
export type TransitionRefusal =
  | { ok: false; code: 'not_allowed'; message: string; allowed: DefectStatus[] }
  | { ok: false; code: 'forbidden'; message: string }
  | { ok: false; code: 'needs'; message: string; missing: Requirement[] };

/** The outcome of checking a step. */
export type TransitionCheck = { ok: true; rule: TransitionRule } | TransitionRefusal;

const STATUS_WORDS: Record<DefectStatus, string> = {
  reported: 'reported',
  diagnosing: 'diagnosing',
  awaiting_parts: 'awaiting parts',
  repaired: 'repaired',
  verified: 'verified',
  closed: 'closed',
  cancelled: 'cancelled',
};

const FUNCTION_WORDS: Record<string, string> = {
  window_lifter: 'window lifter',
  door_control: 'door control module',
  harness: 'door harness',
};

/** The requirements of a rule that apply to a module function (the safety check only where it applies). */
export function requirementsFor(rule: TransitionRule, moduleFunction: string): Requirement[] {
  return rule.needs.filter((n) => n !== 'safety_verification' || requiresSafetyVerification(moduleFunction));
}

/** The requirements of a step that are not met yet. */
export function missingRequirements(rule: TransitionRule, ctx: Omit<TransitionContext, 'role'>): Requirement[] {
  return requirementsFor(rule, ctx.moduleFunction).filter((n) => {
    switch (n) {
      case 'reason':
        return !ctx.reason || ctx.reason.trim() === '';
      case 'action':
        return !ctx.hasAction;
      case 'root_cause':
        return !ctx.hasRootCause;
      case 'safety_verification':
        return !verificationComplete(ctx.verification);
    }
  });
}

/** A sentence saying what a missing requirement asks for. */
export function requirementMessage(n: Requirement, rule: TransitionRule, moduleFunction: string): string {
  switch (n) {
    case 'reason':
      return `Say why (a reason is required to ${rule.label.toLowerCase()}).`;
    case 'action':
      return 'Write down the action (what was done) before marking the defect repaired.';
    case 'root_cause':
      return 'Record the root cause before closing.';
    case 'safety_verification': {
      const what = FUNCTION_WORDS[moduleFunction] ?? moduleFunction;
      const step = rule.to === 'closed' ? 'closing it' : 'marking it verified';
      return (
        `This defect is on a ${what}: record the release verification before ${step} — the window re-initialised ` +
        "per the vehicle maker's procedure and automatic closing seen to reverse on an obstruction, by whom and when."
      );
    }
  }
}

/** Check one status change for a person and a defect. */
export function checkTransition(from: DefectStatus, to: DefectStatus, ctx: TransitionContext): TransitionCheck {
  const rule = findTransition(from, to);
  if (!rule) {
    const allowed = TRANSITIONS.filter((t) => t.from === from).map((t) => t.to);
    const next = allowed.length ? `From ${STATUS_WORDS[from]} it can go to: ${allowed.map((s) => STATUS_WORDS[s]).join(', ')}.` : '';
    return { ok: false, code: 'not_allowed', message: `A ${STATUS_WORDS[from]} defect cannot be moved to ${STATUS_WORDS[to]}. ${next}`.trim(), allowed };
  }
  if (!rule.roles.includes(ctx.role)) {
    const who = rule.roles === SUPERVISOR_ROLES ? 'depot supervisors, fleet managers and admins' : 'technicians, supervisors, fleet managers and admins';
    return { ok: false, code: 'forbidden', message: `"${rule.label}" is for ${who}.` };
  }
  const missing = missingRequirements(rule, ctx);
  if (missing.length) {
    return { ok: false, code: 'needs', message: missing.map((n) => requirementMessage(n, rule, ctx.moduleFunction)).join(' '), missing };
  }
  return { ok: true, rule };
}

/** A step offered to a person, with what still blocks it. */
export interface NextStep {
  rule: TransitionRule;
  missing: Requirement[];
}

/** The steps a person may take from a status (role-filtered), forward steps first, each with its blockers. */
export function nextSteps(from: DefectStatus, ctx: TransitionContext): NextStep[] {
  return TRANSITIONS.filter((t) => t.from === from && t.roles.includes(ctx.role))
    .map((rule) => ({ rule, missing: missingRequirements(rule, { ...ctx, reason: 'given in the dialog' }) }))
    .sort((a, b) => Number(b.rule.forward) - Number(a.rule.forward));
}
