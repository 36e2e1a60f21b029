/**
 * Putting a vehicle back into service (docs/decisions/015-times-currency-off-road.md). Pure rules the server
 * applies and the vehicle page explains: a person must say why (a short reason), and must confirm explicitly when
 * an open defect on the vehicle still needs the release verification (window re-initialised and automatic closing
 * seen to reverse on an obstruction), because the product's rule is that the vehicle is not released before it.
 */
import { OPEN_STATUS_VALUES, requiresSafetyVerification, type DefectStatus } from '../defects/transitions';

/** Shortest and longest reason accepted, in characters (after trimming). */
export const OFF_ROAD_REASON_MIN = 3;
export const OFF_ROAD_REASON_MAX = 500;

/** An open defect of the vehicle as the rule needs it. */
export type OffRoadDefectInput = {
  ref: string;
  status: DefectStatus;
  moduleFunction: string;
  /** Both checks of the release verification recorded (by someone, at a time). */
  verified: boolean;
};

/** Defects that still need the release verification: open, on a window lifter, door module or harness, not verified. */
export function unverifiedForRelease<T extends OffRoadDefectInput>(defects: readonly T[]): T[] {
  return defects.filter((d) => OPEN_STATUS_VALUES.includes(d.status) && requiresSafetyVerification(d.moduleFunction) && !d.verified);
}

/** Why a return to service is refused, with the words the screen and the API show. */
export type ReturnRefusal =
  | { ok: false; code: 'reason_required'; message: string }
  | { ok: false; code: 'unverified'; message: string; refs: string[] };

/**
 * Check a return to service: the reason given (trimmed), whether the person confirmed the unverified defects, and
 * the vehicle's open defects.
 */
export function checkReturnToService(input: { reason: string | null | undefined; confirmUnverified: boolean; openDefects: readonly OffRoadDefectInput[] }): { ok: true } | ReturnRefusal {
  const reason = (input.reason ?? '').trim();
  if (reason.length < OFF_ROAD_REASON_MIN) {
    return { ok: false, code: 'reason_required', message: 'Say in a few words why the vehicle can go back into service.' };
  }
  const blocking = unverifiedForRelease(input.openDefects);
  if (blocking.length > 0 && !input.confirmUnverified) {
    const refs = blocking.map((d) => d.ref);
    return {
      ok: false,
      code: 'unverified',
      refs,
      message: `${refs.length === 1 ? `Open defect ${refs[0]} still needs` : `Open defects ${refs.join(', ')} still need`} the release verification (window re-initialised, automatic closing reverses on an obstruction). Confirm that the vehicle goes back into service anyway.`,
    };
  }
  return { ok: true };
}
