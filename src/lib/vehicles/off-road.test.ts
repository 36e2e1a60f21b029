import { describe, expect, it } from 'vitest';
import { checkReturnToService, unverifiedForRelease, type OffRoadDefectInput } from './off-road';

const lifter = (ref: string, over: Partial<OffRoadDefectInput> = {}): OffRoadDefectInput => ({ ref, status: 'awaiting_parts', moduleFunction: 'window_lifter', verified: false, ...over });

describe('unverifiedForRelease', () => {
  it('keeps open window-lifter, door-module and harness defects without a complete verification', () => {
    const list = [
      lifter('DF-1'),
      lifter('DF-2', { moduleFunction: 'door_control', status: 'repaired' }),
      lifter('DF-3', { moduleFunction: 'harness', status: 'reported' }),
      lifter('DF-4', { moduleFunction: 'lock_actuator' }), // no verification needed for a lock actuator
      lifter('DF-5', { verified: true }), // verified already
      lifter('DF-6', { status: 'closed' }), // not open
      lifter('DF-7', { status: 'cancelled' }),
    ];
    expect(unverifiedForRelease(list).map((d) => d.ref)).toEqual(['DF-1', 'DF-2', 'DF-3']);
  });
  it('is empty for no defects', () => {
    expect(unverifiedForRelease([])).toEqual([]);
  });
});

describe('checkReturnToService', () => {
  it('asks for a reason of at least three characters', () => {
    expect(checkReturnToService({ reason: '  ', confirmUnverified: false, openDefects: [] })).toEqual({
      ok: false,
      code: 'reason_required',
      message: 'Say in a few words why the vehicle can go back into service.',
    });
    expect(checkReturnToService({ reason: null, confirmUnverified: true, openDefects: [] }).ok).toBe(false);
    expect(checkReturnToService({ reason: 'ok', confirmUnverified: false, openDefects: [] }).ok).toBe(false);
    expect(checkReturnToService({ reason: 'Repaired', confirmUnverified: false, openDefects: [] })).toEqual({ ok: true });
  });
  it('refuses an unconfirmed release with open defects that need the verification, naming them', () => {
    const r = checkReturnToService({ reason: 'Door taped shut, runs on the other doors', confirmUnverified: false, openDefects: [lifter('DF-26-00366'), lifter('DF-9', { moduleFunction: 'mirror' })] });
    expect(r).toEqual({
      ok: false,
      code: 'unverified',
      refs: ['DF-26-00366'],
      message:
        'Open defect DF-26-00366 still needs the release verification (window re-initialised, automatic closing reverses on an obstruction). Confirm that the vehicle goes back into service anyway.',
    });
    const two = checkReturnToService({ reason: 'Needed for the weekend', confirmUnverified: false, openDefects: [lifter('DF-1'), lifter('DF-2')] });
    expect(two.ok === false && two.message.startsWith('Open defects DF-1, DF-2 still need')).toBe(true);
  });
  it('lets a confirmed release through, and one with only other open defects', () => {
    expect(checkReturnToService({ reason: 'Needed for the weekend', confirmUnverified: true, openDefects: [lifter('DF-1')] })).toEqual({ ok: true });
    expect(checkReturnToService({ reason: 'Mirror only', confirmUnverified: false, openDefects: [lifter('DF-1', { moduleFunction: 'mirror' })] })).toEqual({ ok: true });
  });
});
