/**
 * Trend tests for repairable systems (REFERENCES.md section 2): the Laplace test and the MIL-HDBK-189 test,
 * combined over several systems each observed on (0, T_q] (Kvaløy 1998), and the power-law (Crow–AMSAA) shape
 * estimate. Time truncation by default; failure truncation ends each system at its last event and drops it.
 *
 * Laplace: U = (Σ t − Σ N_q T_q/2) / √(Σ N_q T_q²/12) ~ N(0,1); U > 0 means failures come faster later.
 * MIL-HDBK-189: χ² = 2 Σ ln(T_q/t) ~ χ²(2N); a small χ² means failures come faster later.
 */
import chisquareCdf from '@stdlib/stats-base-dists-chisquare-cdf';
import { normalTwoSidedP } from './stats';

/** One system: observed on (0, endTime], failures at eventTimes (each ≤ endTime). */
export interface TrendSystem {
  endTime: number;
  eventTimes: readonly number[];
}

/** How observation of each system ends. */
export type Truncation = 'time' | 'failure';

interface PreparedSystem {
  end: number;
  times: number[];
}

function prepare(systems: readonly TrendSystem[], truncation: Truncation): PreparedSystem[] {
  const out: PreparedSystem[] = [];
  for (const s of systems) {
    const times = s.eventTimes.filter((t) => t > 0 && t <= s.endTime);
    if (truncation === 'failure') {
      if (times.length === 0) continue;
      // Observation ends at the last event, which is dropped (one of possibly tied last events).
      let lastIndex = 0;
      for (let i = 1; i < times.length; i++) if ((times[i] as number) > (times[lastIndex] as number)) lastIndex = i;
      const last = times[lastIndex] as number;
      times.splice(lastIndex, 1);
      out.push({ end: last, times });
    } else if (s.endTime > 0) {
      out.push({ end: s.endTime, times });
    }
  }
  return out;
}

/** Laplace trend test result. */
export interface LaplaceTrend {
  u: number;
  pTwoSided: number;
  events: number;
  systems: number;
}

/** Combined Laplace test; null when no events count. */
export function computeLaplaceTrend(systems: readonly TrendSystem[], truncation: Truncation = 'time'): LaplaceTrend | null {
  const prepared = prepare(systems, truncation);
  let sumT = 0;
  let centre = 0;
  let variance = 0;
  let events = 0;
  for (const s of prepared) {
    const n = s.times.length;
    if (n === 0) continue;
    for (const t of s.times) sumT += t;
    centre += (n * s.end) / 2;
    variance += (n * s.end * s.end) / 12;
    events += n;
  }
  if (events === 0 || !(variance > 0)) return null;
  const u = (sumT - centre) / Math.sqrt(variance);
  return { u, pTwoSided: normalTwoSidedP(u), events, systems: prepared.length };
}

/** MIL-HDBK-189 trend test result. */
export interface MilHdbkTrend {
  chiSquare: number;
  df: number;
  /** P(χ² ≤ x): small means failures come faster later (increasing intensity). */
  pIncreasing: number;
  /** P(χ² ≥ x): small means failures come slower later. */
  pDecreasing: number;
  pTwoSided: number;
  events: number;
  systems: number;
}

/** Combined MIL-HDBK-189 test; null when no events count. */
export function computeMilHdbkTrend(systems: readonly TrendSystem[], truncation: Truncation = 'time'): MilHdbkTrend | null {
  const prepared = prepare(systems, truncation);
  let chiSquare = 0;
  let events = 0;
  for (const s of prepared) {
    for (const t of s.times) chiSquare += 2 * Math.log(s.end / t);
    events += s.times.length;
  }
  if (events === 0) return null;
  const df = 2 * events;
  const lower = chisquareCdf(chiSquare, df);
  const upper = 1 - lower;
  return {
    chiSquare,
    df,
    pIncreasing: lower,
    pDecreasing: upper,
    pTwoSided: Math.min(1, 2 * Math.min(lower, upper)),
    events,
    systems: prepared.length,
  };
}

/** Power-law NHPP fit: intensity λβt^(β−1). */
export interface PowerLawFit {
  beta: number;
  /** (N−1)/N·β̂ (N = events counted; M under failure truncation). */
  betaUnbiased: number;
  lambda: number;
  events: number;
}

/**
 * Power-law fit conditional on each system's event count (Crow 1975): β̂ = N / Σ_q Σ_i ln(T_q/t_iq) (= 2N/χ² of the
 * MIL-HDBK test, so 2Nβ/β̂ ~ χ²(2N) exactly), λ̂ = N / Σ_q T_q^β̂. With equal end times this is Crow's MLE.
 * Failure truncation counts M = Σ(N_q − 1) events. Null when fewer than 2 events count.
 */
export function fitPowerLawNhpp(systems: readonly TrendSystem[], truncation: Truncation = 'time'): PowerLawFit | null {
  const prepared = prepare(systems, truncation);
  let events = 0;
  let sumLog = 0;
  for (const s of prepared) {
    events += s.times.length;
    for (const t of s.times) sumLog += Math.log(s.end / t);
  }
  if (events < 2 || !(sumLog > 0)) return null;
  const beta = events / sumLog;
  let sumEndPow = 0;
  for (const s of prepared) sumEndPow += Math.pow(s.end, beta);
  return { beta, betaUnbiased: ((events - 1) / events) * beta, lambda: events / sumEndPow, events };
}
