/**
 * Nelson's nonparametric mean cumulative function with the robust Lawless–Nadeau variance (REFERENCES.md
 * section 1; CONTRACT.md "Mean cumulative function").
 *
 * At each distinct event age t: MCF(t) = MCF(t−) + d(t)/n(t), n(t) = units whose end age ≥ t (a unit whose end age
 * equals t is still at risk: events before censoring). Var(t) = Σ_i [Σ_{t_k ≤ t} δ_i(t_k)(d_i(t_k) − d(t_k)/n(t_k))/n(t_k)]².
 * 95% limits are log-normal, MCF·exp(±z·se/MCF), so the lower limit stays positive (documented choice).
 *
 * The variance is accumulated in one sweep: for a unit still at risk its inner sum is a_i(t) − B(t), with
 * a_i(t) = Σ d_i/n over its own events and B(t) = Σ d/n²; units leave the risk set with their term frozen.
 * So Var(t) = F + S2 − 2·B·S1 + n·B² with S1 = Σ a_i, S2 = Σ a_i² over the risk set and F the frozen terms.
 */
import { normalQuantileStd } from './stats';

/** One unit's history: observed from age 0 to endAgeDays, with its event ages (ties allowed). */
export interface McfUnit {
  id: string | number;
  endAgeDays: number;
  eventAgesDays: number[];
}

/** MCF at one distinct event age. */
export interface McfPoint {
  ageDays: number;
  mcf: number;
  lower: number;
  upper: number;
  /** Units whose end age ≥ ageDays. */
  atRisk: number;
  /** Events at exactly this age (all units). */
  events: number;
  /** Robust (Lawless–Nadeau) variance. */
  variance: number;
  /** Naive Poisson variance Σ d/n², for comparison. */
  varianceNaive: number;
}

/** Options of computeMcf. */
export interface McfOptions {
  /** Two-sided confidence of the limits (default 0.95). */
  confidence?: number;
}

/**
 * Nelson MCF with robust variance and log-normal limits at each distinct event age. Events after a unit's end
 * age or before age 0 are ignored; units with a negative end age are ignored.
 */
export function computeMcf(input: { units: readonly McfUnit[] }, options: McfOptions = {}): McfPoint[] {
  const confidence = options.confidence ?? 0.95;
  if (!(confidence > 0 && confidence < 1)) throw new RangeError('confidence must be in (0, 1)');
  const z = normalQuantileStd(1 - (1 - confidence) / 2);

  const units = input.units.filter((u) => Number.isFinite(u.endAgeDays) && u.endAgeDays >= 0);
  const unitCount = units.length;
  // Events as (age, unit) pairs sorted by age.
  const eventAges: number[] = [];
  const eventUnits: number[] = [];
  units.forEach((u, index) => {
    for (const age of u.eventAgesDays) {
      if (age >= 0 && age <= u.endAgeDays) {
        eventAges.push(age);
        eventUnits.push(index);
      }
    }
  });
  const eventOrder = eventAges.map((_, i) => i).sort((a, b) => (eventAges[a] as number) - (eventAges[b] as number));
  const endOrder = units.map((_, i) => i).sort((a, b) => (units[a] as McfUnit).endAgeDays - (units[b] as McfUnit).endAgeDays);

  const a = new Float64Array(unitCount); // Σ d_i/n over the unit's own events so far
  let atRisk = unitCount;
  let s1 = 0; // Σ a_i over the risk set
  let s2 = 0; // Σ a_i² over the risk set
  let frozen = 0; // Σ (a_i − B(τ_i))² over units that have left
  let b = 0; // Σ d/n²
  let mcf = 0;
  let endCursor = 0;
  const points: McfPoint[] = [];
  const perUnit = new Map<number, number>();

  let k = 0;
  while (k < eventOrder.length) {
    const age = eventAges[eventOrder[k] as number] as number;
    // Units whose end age is before this event age leave the risk set (ties stay: events before censoring).
    while (endCursor < unitCount && (units[endOrder[endCursor] as number] as McfUnit).endAgeDays < age) {
      const i = endOrder[endCursor] as number;
      const ai = a[i] as number;
      frozen += (ai - b) * (ai - b);
      s1 -= ai;
      s2 -= ai * ai;
      atRisk--;
      endCursor++;
    }
    perUnit.clear();
    let d = 0;
    while (k < eventOrder.length && eventAges[eventOrder[k] as number] === age) {
      const unit = eventUnits[eventOrder[k] as number] as number;
      perUnit.set(unit, (perUnit.get(unit) ?? 0) + 1);
      d++;
      k++;
    }
    const n = atRisk;
    for (const [unit, di] of perUnit) {
      const before = a[unit] as number;
      const after = before + di / n;
      a[unit] = after;
      s1 += after - before;
      s2 += after * after - before * before;
    }
    b += d / (n * n);
    mcf += d / n;
    const variance = Math.max(0, frozen + s2 - 2 * b * s1 + n * b * b);
    const se = Math.sqrt(variance);
    const factor = Math.exp((z * se) / mcf);
    points.push({
      ageDays: age,
      mcf,
      lower: mcf / factor,
      upper: mcf * factor,
      atRisk: n,
      events: d,
      variance,
      varianceNaive: b,
    });
  }
  return points;
}
