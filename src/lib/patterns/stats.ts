/**
 * Exact tests and intervals used by the patterns report (REFERENCES.md sections 3 and 4):
 * Garwood Poisson limits, the conditional (binomial) comparison of two Poisson rates with Clopper–Pearson limits
 * mapped to the rate ratio, R's two-sided binomial rule, Benjamini–Hochberg adjustment, and a one-sided Fisher
 * exact test for a share.
 */
import betaQuantile from '@stdlib/stats-base-dists-beta-quantile';
import binomialCdf from '@stdlib/stats-base-dists-binomial-cdf';
import binomialPmf from '@stdlib/stats-base-dists-binomial-pmf';
import chisquareQuantile from '@stdlib/stats-base-dists-chisquare-quantile';
import hypergeometricCdf from '@stdlib/stats-base-dists-hypergeometric-cdf';
import normalCdf from '@stdlib/stats-base-dists-normal-cdf';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';

/** Two-sided limits of an interval. */
export interface Interval {
  lower: number;
  upper: number;
}

function requireConfidence(confidence: number): number {
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`confidence must be in (0, 1), got ${confidence}`);
  return 1 - confidence;
}

function requireCount(name: string, value: number): void {
  if (!Number.isInteger(value) || value < 0) throw new RangeError(`${name} must be a non-negative integer, got ${value}`);
}

/**
 * Garwood (1936) exact two-sided limits for a Poisson count x: [½χ²(α/2; 2x), ½χ²(1−α/2; 2x+2)], lower 0 at x = 0.
 */
export function computeGarwoodInterval(count: number, confidence = 0.95): Interval {
  requireCount('count', count);
  const alpha = requireConfidence(confidence);
  const lower = count === 0 ? 0 : chisquareQuantile(alpha / 2, 2 * count) / 2;
  const upper = chisquareQuantile(1 - alpha / 2, 2 * count + 2) / 2;
  return { lower, upper };
}

/** Clopper–Pearson exact two-sided limits for a binomial proportion x / n (beta quantiles). */
export function computeClopperPearsonInterval(successes: number, trials: number, confidence = 0.95): Interval {
  requireCount('successes', successes);
  requireCount('trials', trials);
  if (successes > trials) throw new RangeError('successes must not exceed trials');
  const alpha = requireConfidence(confidence);
  if (trials === 0) return { lower: 0, upper: 1 };
  const lower = successes === 0 ? 0 : betaQuantile(alpha / 2, successes, trials - successes + 1);
  const upper = successes === trials ? 1 : betaQuantile(1 - alpha / 2, successes + 1, trials - successes);
  return { lower, upper };
}

/** P(X ≥ k) for X ~ Bin(n, p), computed as a lower tail of n − X so that small tails keep their precision. */
export function binomialUpperTail(k: number, trials: number, p: number): number {
  if (k <= 0) return 1;
  if (k > trials) return 0;
  return binomialCdf(trials - k, trials, 1 - p);
}

/** Largest i in [lo, hi] with pred(i) true, for pred true on a prefix of [lo, hi]; lo − 1 when none. */
function lastTrue(lo: number, hi: number, pred: (i: number) => boolean): number {
  let a = lo;
  let b = hi;
  let found = lo - 1;
  while (a <= b) {
    const mid = (a + b) >> 1;
    if (pred(mid)) {
      found = mid;
      a = mid + 1;
    } else {
      b = mid - 1;
    }
  }
  return found;
}

/**
 * Two-sided exact binomial p-value by R's `binom.test` rule: the sum of the probabilities of all outcomes no more
 * likely than the observed one (relative tolerance 1e-7), capped at 1. The binomial pmf is non-decreasing up to
 * floor(np) and non-increasing from ceil(np), so the far-side count is found by bisection.
 */
export function binomialTestTwoSided(successes: number, trials: number, p: number): number {
  requireCount('successes', successes);
  requireCount('trials', trials);
  if (successes > trials) throw new RangeError('successes must not exceed trials');
  if (!(p >= 0 && p <= 1)) throw new RangeError(`p must be in [0, 1], got ${p}`);
  const x = successes;
  const n = trials;
  if (p === 0) return x === 0 ? 1 : 0;
  if (p === 1) return x === n ? 1 : 0;
  const relErr = 1 + 1e-7;
  const d = binomialPmf(x, n, p) * relErr;
  const m = n * p;
  if (x === m) return 1;
  let pValue: number;
  if (x < m) {
    // y = #{i in [ceil(m), n] : pmf(i) <= d}; that set is a suffix [n − y + 1, n].
    const lo = Math.ceil(m);
    const firstSmall = lastTrue(lo, n, (i) => binomialPmf(i, n, p) > d) + 1;
    const y = n - firstSmall + 1;
    pValue = binomialCdf(x, n, p) + binomialUpperTail(n - y + 1, n, p);
  } else {
    // y = #{i in [0, floor(m)] : pmf(i) <= d}; that set is a prefix [0, y − 1].
    const hi = Math.floor(m);
    const y = lastTrue(0, hi, (i) => binomialPmf(i, n, p) <= d) + 1;
    pValue = (y > 0 ? binomialCdf(y - 1, n, p) : 0) + binomialUpperTail(x, n, p);
  }
  return Math.min(1, pValue);
}

/** Result of the exact conditional comparison of two Poisson rates. */
export interface RateComparison {
  /** (x1/t1)/(x2/t2); null when x2 = 0 (unbounded) or when there are no events at all. */
  rateRatio: number | null;
  ciLow: number;
  /** null = unbounded. */
  ciHigh: number | null;
  /** Two-sided p of rate ratio 1 by R's binom.test rule (what R's poisson.test reports). */
  pTwoSided: number;
  /** One-sided p that the first rate is higher: P(X1 ≥ x1 | x1 + x2). */
  pGreater: number;
}

/**
 * Exact conditional comparison of rate x1/t1 with rate x2/t2 (REFERENCES.md section 3): given n = x1 + x2,
 * x1 ~ Bin(n, p) with p = r·t1/(r·t1 + t2). Clopper–Pearson limits on p map to the ratio by r = p/(1−p)·t2/t1;
 * the p-value tests p0 = t1/(t1 + t2) with R's two-sided rule. Agrees with R `poisson.test(c(x1, x2), c(t1, t2))`.
 */
export function compareRatesExact(x1: number, t1: number, x2: number, t2: number, confidence = 0.95): RateComparison {
  requireCount('x1', x1);
  requireCount('x2', x2);
  if (!(t1 > 0 && t2 > 0)) throw new RangeError('exposures must be positive');
  const n = x1 + x2;
  if (n === 0) return { rateRatio: null, ciLow: 0, ciHigh: null, pTwoSided: 1, pGreater: 1 };
  const scale = t2 / t1;
  const cp = computeClopperPearsonInterval(x1, n, confidence);
  const toRatio = (q: number): number | null => (q >= 1 ? null : (q / (1 - q)) * scale);
  const p0 = t1 / (t1 + t2);
  return {
    rateRatio: x2 === 0 ? null : (x1 / t1) / (x2 / t2),
    ciLow: toRatio(cp.lower) ?? 0,
    ciHigh: toRatio(cp.upper),
    pTwoSided: binomialTestTwoSided(x1, n, p0),
    pGreater: binomialUpperTail(x1, n, p0),
  };
}

/**
 * Benjamini–Hochberg (1995) adjusted p-values, in input order: q(i) = min over j ≥ i of min(1, m·p(j)/j) on the
 * ascending order. Equal to R `p.adjust(p, "BH")`.
 */
export function adjustBenjaminiHochberg(pValues: readonly number[]): number[] {
  const m = pValues.length;
  for (const p of pValues) if (!(p >= 0 && p <= 1)) throw new RangeError(`p-values must be in [0, 1], got ${p}`);
  const order = pValues.map((_, i) => i).sort((a, b) => (pValues[a] as number) - (pValues[b] as number) || a - b);
  const adjusted = new Array<number>(m).fill(1);
  let running = 1;
  for (let rank = m; rank >= 1; rank--) {
    const index = order[rank - 1] as number;
    // p·(m/rank) rather than m·p/rank: at rank m the factor is exactly 1, so q is never below p by rounding.
    running = Math.min(running, (pValues[index] as number) * (m / rank));
    adjusted[index] = Math.min(1, running);
  }
  return adjusted;
}

/**
 * One-sided Fisher exact test on the 2×2 table [[a, b], [c, d]] (rows: group, rest; columns: positive, negative):
 * P(A ≥ a) under the hypergeometric null, i.e. the group's positive share is higher than the rest's.
 */
export function fisherExactGreater(a: number, b: number, c: number, d: number): number {
  for (const [name, v] of [['a', a], ['b', b], ['c', c], ['d', d]] as const) requireCount(name, v);
  const total = a + b + c + d;
  const positives = a + c;
  const drawn = a + b;
  if (total === 0 || drawn === 0 || a === 0) return 1;
  // A ≥ a  ⇔  negatives drawn = drawn − A ≤ drawn − a; negatives drawn ~ Hypergeom(total, total − positives, drawn).
  return Math.min(1, hypergeometricCdf(drawn - a, total, total - positives, drawn));
}

/** Two-sided normal p-value 2·(1 − Φ(|z|)). */
export function normalTwoSidedP(z: number): number {
  return 2 * normalCdf(-Math.abs(z), 0, 1);
}

/** Standard normal quantile Φ⁻¹(p). */
export function normalQuantileStd(p: number): number {
  return normalQuantile(p, 0, 1);
}
