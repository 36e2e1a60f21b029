// The lifecycle rules are the product's own (docs/decisions/008-defect-workflow.md); these tests pin them
// with literal cases so that a changed rule fails here first.
import { describe, expect, it } from 'vitest';
import {
  DEFECT_STATUS_VALUES,
  canEditRecord,
  checkTransition,
  findTransition,
  nextSteps,
  requiresSafetyVerification,
  verificationComplete,
  type DefectStatus,
  type TransitionContext,
  type WorkflowRole,
} from './transitions';

const done = { reinitialised: true, reversalVerified: true, byUserId: 7, atMs: 1_700_000_000_000 };
const ready: Omit<TransitionContext, 'role'> = { moduleFunction: 'lock_actuator', hasAction: true, hasRootCause: true, verification: null, reason: 'duplicate' };
const ctx = (role: WorkflowRole, over: Partial<TransitionContext> = {}): TransitionContext => ({ ...ready, role, ...over });

// Every pair the lifecycle allows, and who may take it.
const ALLOWED: Array<[DefectStatus, DefectStatus, 'workers' | 'supervisors']> = [
  ['reported', 'diagnosing', 'workers'],
  ['diagnosing', 'awaiting_parts', 'workers'],
  ['diagnosing', 'repaired', 'workers'],
  ['awaiting_parts', 'diagnosing', 'workers'],
  ['awaiting_parts', 'repaired', 'workers'],
  ['repaired', 'verified', 'workers'],
  ['repaired', 'closed', 'workers'],
  ['repaired', 'diagnosing', 'workers'],
  ['verified', 'closed', 'workers'],
  ['verified', 'diagnosing', 'workers'],
  ['reported', 'cancelled', 'supervisors'],
  ['diagnosing', 'cancelled', 'supervisors'],
  ['awaiting_parts', 'cancelled', 'supervisors'],
  ['repaired', 'cancelled', 'supervisors'],
  ['verified', 'cancelled', 'supervisors'],
  ['closed', 'diagnosing', 'supervisors'],
  ['cancelled', 'reported', 'supervisors'],
];

const WHO: Record<'workers' | 'supervisors', Record<WorkflowRole, boolean>> = {
  workers: { admin: true, manager: true, supervisor: true, technician: true, viewer: false },
  supervisors: { admin: true, manager: true, supervisor: true, technician: false, viewer: false },
};

describe('checkTransition: the allowed pairs and roles', () => {
  const roles: WorkflowRole[] = ['admin', 'manager', 'supervisor', 'technician', 'viewer'];
  it.each(ALLOWED.flatMap(([from, to, who]) => roles.map((role) => [from, to, role, WHO[who][role]] as const)))(
    '%s → %s as %s: allowed %s',
    (from, to, role, allowed) => {
      const r = checkTransition(from, to, ctx(role, { verification: done }));
      expect(r.ok).toBe(allowed);
      if (!r.ok) expect(r.code).toBe('forbidden');
    },
  );

  it('refuses every pair not in the list, for every role, naming where it can go', () => {
    const allowedKeys = new Set(ALLOWED.map(([f, t]) => `${f}>${t}`));
    let refused = 0;
    for (const from of DEFECT_STATUS_VALUES) {
      for (const to of DEFECT_STATUS_VALUES) {
        if (allowedKeys.has(`${from}>${to}`)) continue;
        const r = checkTransition(from, to, ctx('admin', { verification: done }));
        expect(r.ok, `${from} → ${to}`).toBe(false);
        if (!r.ok) expect(r.code).toBe('not_allowed');
        refused++;
      }
    }
    expect(refused).toBe(7 * 7 - ALLOWED.length);
  });

  it('explains a refused jump', () => {
    const r = checkTransition('reported', 'closed', ctx('technician'));
    expect(r).toEqual({
      ok: false,
      code: 'not_allowed',
      message: 'A reported defect cannot be moved to closed. From reported it can go to: diagnosing, cancelled.',
      allowed: ['diagnosing', 'cancelled'],
    });
  });

  it('names who may cancel', () => {
    const r = checkTransition('diagnosing', 'cancelled', ctx('technician'));
    expect(r).toEqual({ ok: false, code: 'forbidden', message: '"Cancel defect" is for depot supervisors, fleet managers and admins.' });
  });
});

describe('requirements', () => {
  it('cancelling, re-opening and restoring need a reason (blank does not count)', () => {
    for (const [from, to] of [['reported', 'cancelled'], ['closed', 'diagnosing'], ['cancelled', 'reported']] as const) {
      const r = checkTransition(from, to, ctx('supervisor', { reason: '   ' }));
      expect(r.ok).toBe(false);
      if (!r.ok && r.code === 'needs') expect(r.missing).toEqual(['reason']);
      expect(checkTransition(from, to, ctx('supervisor', { reason: 'Wrong vehicle' })).ok).toBe(true);
    }
  });
  it('marking repaired needs the action written down', () => {
    const r = checkTransition('diagnosing', 'repaired', ctx('technician', { hasAction: false }));
    expect(r).toMatchObject({ ok: false, code: 'needs', missing: ['action'] });
  });
  it('closing needs the root cause', () => {
    const r = checkTransition('verified', 'closed', ctx('technician', { hasRootCause: false }));
    expect(r).toMatchObject({ ok: false, code: 'needs', missing: ['root_cause'], message: 'Record the root cause before closing.' });
  });
});

describe('the safety verification gate', () => {
  it.each([
    ['window_lifter', true],
    ['door_control', true],
    ['harness', true],
    ['lock_actuator', false],
    ['mirror', false],
    ['switch', false],
    ['other', false],
  ])('%s needs the release verification: %s', (fn, needed) => {
    expect(requiresSafetyVerification(fn)).toBe(needed);
    for (const [from, to] of [['repaired', 'verified'], ['repaired', 'closed'], ['verified', 'closed']] as const) {
      const r = checkTransition(from, to, ctx('technician', { moduleFunction: fn, verification: null }));
      expect(r.ok, `${fn} ${from} → ${to}`).toBe(!needed);
      if (!r.ok) expect(r).toMatchObject({ code: 'needs', missing: ['safety_verification'] });
    }
  });
  it('says what the verification is when it refuses to close a window lifter', () => {
    const r = checkTransition('repaired', 'closed', ctx('technician', { moduleFunction: 'window_lifter' }));
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.message).toBe(
        "This defect is on a window lifter: record the release verification before closing it — the window re-initialised per the vehicle maker's procedure and automatic closing seen to reverse on an obstruction, by whom and when.",
      );
    }
  });
  it('an incomplete record does not count', () => {
    expect(verificationComplete(done)).toBe(true);
    expect(verificationComplete({ ...done, reversalVerified: false })).toBe(false);
    expect(verificationComplete({ ...done, reinitialised: null })).toBe(false);
    expect(verificationComplete({ ...done, byUserId: null })).toBe(false);
    expect(verificationComplete({ ...done, atMs: null })).toBe(false);
    expect(verificationComplete(null)).toBe(false);
    const r = checkTransition('verified', 'closed', ctx('technician', { moduleFunction: 'door_control', verification: { ...done, reversalVerified: false } }));
    expect(r.ok).toBe(false);
  });
  it('lists root cause before the verification when both are missing', () => {
    const r = checkTransition('repaired', 'closed', ctx('technician', { moduleFunction: 'harness', hasRootCause: false }));
    expect(r).toMatchObject({ ok: false, missing: ['root_cause', 'safety_verification'] });
  });
});

describe('effects', () => {
  it('closing sets closed_at, re-opening clears it and the verification, stepping back clears the verification', () => {
    expect(findTransition('verified', 'closed')?.effects).toEqual({ closes: true });
    expect(findTransition('repaired', 'closed')?.effects).toEqual({ closes: true });
    expect(findTransition('closed', 'diagnosing')?.effects).toEqual({ clearsClosedAt: true, clearsVerification: true });
    expect(findTransition('repaired', 'diagnosing')?.effects).toEqual({ clearsVerification: true });
    expect(findTransition('verified', 'diagnosing')?.effects).toEqual({ clearsVerification: true });
    expect(findTransition('reported', 'diagnosing')?.effects).toEqual({ claims: true });
    expect(findTransition('verified', 'cancelled')?.effects).toEqual({});
  });
});

describe('nextSteps', () => {
  it('offers a technician the forward step first and never cancel', () => {
    const steps = nextSteps('diagnosing', ctx('technician', { hasAction: false }));
    expect(steps.map((s) => [s.rule.to, s.missing])).toEqual([
      ['repaired', ['action']],
      ['awaiting_parts', []],
    ]);
  });
  it('offers a supervisor cancel as well', () => {
    expect(nextSteps('reported', ctx('supervisor')).map((s) => s.rule.key)).toEqual(['start_diagnosis', 'cancel']);
  });
  it('offers a viewer nothing, and nobody anything that is not in the lifecycle', () => {
    for (const s of DEFECT_STATUS_VALUES) expect(nextSteps(s, ctx('viewer'))).toEqual([]);
    expect(nextSteps('closed', ctx('technician'))).toEqual([]);
    expect(nextSteps('closed', ctx('manager')).map((s) => s.rule.key)).toEqual(['reopen']);
  });
  it('shows the verification as the blocker of closing a repaired window lifter', () => {
    const steps = nextSteps('repaired', ctx('technician', { moduleFunction: 'window_lifter' }));
    expect(steps.map((s) => [s.rule.key, s.missing])).toEqual([
      ['verify', ['safety_verification']],
      ['close', ['safety_verification']],
      ['reject_repair', []],
    ]);
  });
});

describe('canEditRecord', () => {
  it.each([
    ['diagnosing', 'technician', true],
    ['verified', 'technician', true],
    ['closed', 'technician', false],
    ['cancelled', 'technician', false],
    ['closed', 'supervisor', true],
    ['cancelled', 'manager', true],
    ['reported', 'viewer', false],
    ['closed', 'viewer', false],
  ] as const)('%s as %s: %s', (status, role, expected) => {
    expect(canEditRecord(status, role)).toBe(expected);
  });
});
