/**
 * Moisture-exposure index of a vehicle and its band, and observed time per vehicle.
 *
 * The index is a sum of points (0–10) with fixed, documented thresholds, so a vehicle's band never depends on
 * which fleet happens to be loaded (docs/patterns-method.md "Exposure"):
 *   coastal depot 2 · rain days/year ≥ 150: 2, ≥ 100: 1 · mean RH ≥ 80 %: 2, ≥ 70 %: 1 ·
 *   parking outdoor 2, mixed 1, indoor 0 · washing: effective washes/month = washes × 1.5 at a depot with a wash
 *   bay (pressure washing on site), else × 1; ≥ 8: 2, ≥ 4: 1.
 * Bands: low 0–3, medium 4–6, high 7–10.
 */
import { DAYS_PER_YEAR, toDayNumber } from './calendar';
import type { ExposureBand, Parking, PatternsDepot, PatternsVehicle } from './types';

/** Fixed thresholds of the exposure index (points per factor and band limits). */
export const EXPOSURE_THRESHOLDS = Object.freeze({
  coastalPoints: 2,
  /** Rain days per year at or above which 1 / 2 points are given. */
  rainDaysPerYear: Object.freeze([100, 150] as const),
  /** Mean relative humidity (%) at or above which 1 / 2 points are given. */
  meanRhPct: Object.freeze([70, 80] as const),
  parkingPoints: Object.freeze({ indoor: 0, mixed: 1, outdoor: 2 } as const),
  /** Effective washes per month at or above which 1 / 2 points are given. */
  effectiveWashesPerMonth: Object.freeze([4, 8] as const),
  /** Multiplier on washes per month when the depot has a wash bay (pressure washing on site). */
  washBayFactor: 1.5,
  /** Lowest index of the medium and of the high band. */
  bandMinIndex: Object.freeze({ medium: 4, high: 7 } as const),
  maxIndex: 10,
});

/** Points per factor and the total. */
export interface ExposureScore {
  index: number;
  band: ExposureBand;
  points: { coastal: number; rain: number; humidity: number; parking: number; washing: number };
}

function stepPoints(value: number, limits: readonly [number, number]): number {
  return value >= limits[1] ? 2 : value >= limits[0] ? 1 : 0;
}

/** Band of an index: low 0–3, medium 4–6, high 7–10. */
export function bandForExposureIndex(index: number): ExposureBand {
  if (index >= EXPOSURE_THRESHOLDS.bandMinIndex.high) return 'high';
  if (index >= EXPOSURE_THRESHOLDS.bandMinIndex.medium) return 'medium';
  return 'low';
}

/** Depot facts the index uses. */
export type ExposureDepot = Pick<PatternsDepot, 'coastal' | 'rainDaysPerYear' | 'meanRhPct' | 'washBay'>;
/** Vehicle facts the index uses. */
export type ExposureVehicle = { parking: Parking; washesPerMonth: number };

/** Moisture-exposure index (0–10), its points per factor and its band, for a vehicle at a depot. */
export function computeExposureScore(depot: ExposureDepot, vehicle: ExposureVehicle): ExposureScore {
  const t = EXPOSURE_THRESHOLDS;
  const effectiveWashes = vehicle.washesPerMonth * (depot.washBay ? t.washBayFactor : 1);
  const points = {
    coastal: depot.coastal ? t.coastalPoints : 0,
    rain: stepPoints(depot.rainDaysPerYear, t.rainDaysPerYear),
    humidity: stepPoints(depot.meanRhPct, t.meanRhPct),
    parking: t.parkingPoints[vehicle.parking] ?? 0,
    washing: stepPoints(effectiveWashes, t.effectiveWashesPerMonth),
  };
  const index = points.coastal + points.rain + points.humidity + points.parking + points.washing;
  return { index, band: bandForExposureIndex(index), points };
}

/** The index alone (same points as computeExposureScore, without allocating). */
export function computeExposureIndex(depot: ExposureDepot, parking: Parking, washesPerMonth: number): number {
  const t = EXPOSURE_THRESHOLDS;
  return (
    (depot.coastal ? t.coastalPoints : 0) +
    stepPoints(depot.rainDaysPerYear, t.rainDaysPerYear) +
    stepPoints(depot.meanRhPct, t.meanRhPct) +
    (t.parkingPoints[parking] ?? 0) +
    stepPoints(washesPerMonth * (depot.washBay ? t.washBayFactor : 1), t.effectiveWashesPerMonth)
  );
}

/** Observed days and vehicle-years of one vehicle up to asOf. */
export interface VehicleObservation {
  startDay: number;
  /** min(retired, asOf) as a day number. */
  endDay: number;
  /** endDay − startDay, at least 0. */
  observedDays: number;
  vehicleYears: number;
}

/**
 * Observation window of a vehicle: from its in-service date to its retirement or asOf, whichever is first;
 * vehicle-years = days / 365.25 (0 when it entered service on or after asOf, or retired before entering).
 */
export function computeVehicleObservation(
  vehicle: Pick<PatternsVehicle, 'inServiceDate' | 'retiredDate'>,
  asOfDay: number,
): VehicleObservation {
  const startDay = toDayNumber(vehicle.inServiceDate);
  const retiredDay = vehicle.retiredDate ? toDayNumber(vehicle.retiredDate) : Number.POSITIVE_INFINITY;
  const endDay = Math.min(retiredDay, asOfDay);
  const observedDays = Math.max(0, endDay - startDay);
  return { startDay, endDay, observedDays, vehicleYears: observedDays / DAYS_PER_YEAR };
}
