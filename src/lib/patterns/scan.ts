/**
 * Kulldorff's scan statistic in one dimension (build months), Poisson model, high-rate windows only
 * (REFERENCES.md section 5). Windows are contiguous runs of bins whose size (vehicles) is at most a fraction of the
 * total (default one half); the statistic is the largest log-likelihood ratio, and its significance comes from
 * Monte Carlo replicates of the total case count spread multinomially over the bins by population (seeded).
 *
 * Replicates are cheap: each window's expectation and logs are fixed once per scan, c·ln c comes from a table,
 * and each replicate is one alias-table draw per case plus one pass over the windows (docs/patterns-method.md).
 */
import { createAliasTable, createRandom, drawMultinomialInto } from './rng';

/** Admissible windows over a fixed row of bins. */
export interface ScanLayout {
  bins: number;
  /** Population per bin (the expectation weights: vehicle-years in the report). */
  population: Float64Array;
  totalPopulation: number;
  /** First and last bin (inclusive) of each admissible window; windows are ordered by start, then end. */
  starts: Int32Array;
  ends: Int32Array;
  /** Windows starting at bin s are rowStart[s] .. rowStart[s + 1] − 1; within a row the ends are consecutive bins. */
  rowStart: Int32Array;
  /** Window population / total population. */
  populationShare: Float64Array;
  /** Window size (vehicles in the report). */
  size: Float64Array;
  totalSize: number;
  maxSizeFraction: number;
}

/**
 * Admissible windows: every contiguous run of bins with minSize ≤ size ≤ maxSizeFraction × total size (inclusive,
 * relative tolerance 1e-12) and population share strictly between 0 and 1. `size` defaults to the population.
 * Both bounds depend on the sizes only, never on the cases, so the Monte Carlo replicates scan the same windows.
 */
export function createScanLayout(
  population: ArrayLike<number>,
  size: ArrayLike<number> = population,
  maxSizeFraction = 0.5,
  minSize = 0,
): ScanLayout {
  const bins = population.length;
  if (size.length !== bins) throw new RangeError('population and size must have the same length');
  if (!(maxSizeFraction > 0 && maxSizeFraction <= 1)) throw new RangeError('maxSizeFraction must be in (0, 1]');
  const pop = Float64Array.from(population as ArrayLike<number>);
  const sz = Float64Array.from(size as ArrayLike<number>);
  let totalPopulation = 0;
  let totalSize = 0;
  for (let i = 0; i < bins; i++) {
    if (!((pop[i] as number) >= 0) || !((sz[i] as number) >= 0)) throw new RangeError('population and size must be non-negative');
    totalPopulation += pop[i] as number;
    totalSize += sz[i] as number;
  }
  const limit = maxSizeFraction * totalSize * (1 + 1e-12);
  const rowStart = new Int32Array(bins + 1);
  const starts: number[] = [];
  const ends: number[] = [];
  const shares: number[] = [];
  const sizes: number[] = [];
  for (let s = 0; s < bins; s++) {
    rowStart[s] = starts.length;
    let windowPop = 0;
    let windowSize = 0;
    for (let e = s; e < bins; e++) {
      windowPop += pop[e] as number;
      windowSize += sz[e] as number;
      if (windowSize > limit) break;
      const share = totalPopulation > 0 ? windowPop / totalPopulation : 0;
      // A window with no population, or all of it, is not a proper high-rate window.
      if (share >= 1) break;
      if (!(share > 0) || windowSize < minSize) continue;
      starts.push(s);
      ends.push(e);
      shares.push(share);
      sizes.push(windowSize);
    }
  }
  rowStart[bins] = starts.length;
  return {
    bins,
    population: pop,
    totalPopulation,
    starts: Int32Array.from(starts),
    ends: Int32Array.from(ends),
    rowStart,
    populationShare: Float64Array.from(shares),
    size: Float64Array.from(sizes),
    totalSize,
    maxSizeFraction,
  };
}

/**
 * Poisson log-likelihood ratio of a window with c cases and expectation E out of C (conditional on C):
 * c·ln(c/E) + (C−c)·ln((C−c)/(C−E)) when c > E, else 0.
 */
export function computeScanLlr(cases: number, expected: number, totalCases: number): number {
  if (!(cases > expected)) return 0;
  const rest = totalCases - cases;
  const restExpected = totalCases - expected;
  return cases * Math.log(cases / expected) + (rest > 0 ? rest * Math.log(rest / restExpected) : 0);
}

/** The most likely window. */
export interface ScanWindow {
  start: number;
  end: number;
  cases: number;
  /** C × window population share. */
  expected: number;
  llr: number;
  population: number;
  size: number;
}

/** Fewest cases for which the Gumbel tail is used (the null maximum is too lumpy below). */
export const GUMBEL_MIN_CASES = 20;
/** Replicates evaluated in full before the count filter is set. */
const PILOT_REPLICATES = 20;

/** Observed statistic, its window and its significance. */
export interface ScanOutcome {
  /** null when no admissible window has more cases than expected (or there are no cases). */
  best: ScanWindow | null;
  windowsTested: number;
  totalCases: number;
  replicates: number;
  /** Replicates whose maximum reached the observed maximum. */
  exceedances: number;
  /** (1 + exceedances) / (replicates + 1). */
  mcP: number;
  /** Gumbel tail p fitted to the replicate maxima by the method of moments; null without spread or replicates. */
  gumbelP: number | null;
  /**
   * mcP; when no replicate reached the observed maximum (mcP at its floor 1/(R+1)) and totalCases ≥
   * GUMBEL_MIN_CASES, min(mcP, gumbelP), so that p can go below the Monte Carlo resolution.
   */
  pValue: number;
  pValueMethod: 'monte_carlo' | 'gumbel';
}

/** Per-scan constants: expectations and logs per window and c·ln c per count. */
interface ScanKernel {
  expected: Float64Array;
  lnExpected: Float64Array;
  lnRestExpected: Float64Array;
  xlnx: Float64Array;
  totalCases: number;
}

function createKernel(layout: ScanLayout, totalCases: number): ScanKernel {
  const w = layout.starts.length;
  const expected = new Float64Array(w);
  const lnExpected = new Float64Array(w);
  const lnRestExpected = new Float64Array(w);
  for (let i = 0; i < w; i++) {
    const e = totalCases * (layout.populationShare[i] as number);
    expected[i] = e;
    lnExpected[i] = Math.log(e);
    lnRestExpected[i] = Math.log(totalCases - e);
  }
  const xlnx = new Float64Array(totalCases + 1);
  for (let c = 1; c <= totalCases; c++) xlnx[c] = c * Math.log(c);
  return { expected, lnExpected, lnRestExpected, xlnx, totalCases };
}

/** LLR of window i with c cases, by the one expression every pass uses (so equal counts give equal values). */
function kernelLlr(kernel: ScanKernel, i: number, c: number): number {
  const r = kernel.totalCases - c;
  return (kernel.xlnx[c] as number) - c * (kernel.lnExpected[i] as number) + (kernel.xlnx[r] as number) - r * (kernel.lnRestExpected[i] as number);
}

/**
 * Smallest count per window whose LLR reaches `level` (totalCases + 1 when none does). LLR grows with c above E,
 * so a window can only beat `level` when its count reaches this threshold.
 */
function countThresholds(kernel: ScanKernel, level: number): Int32Array {
  const w = kernel.expected.length;
  const total = kernel.totalCases;
  const out = new Int32Array(w);
  for (let i = 0; i < w; i++) {
    let lo = Math.floor(kernel.expected[i] as number) + 1; // smallest c > E
    let hi = total + 1;
    if (lo > total || kernelLlr(kernel, i, total) < level) {
      out[i] = total + 1;
      continue;
    }
    hi = total;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (kernelLlr(kernel, i, mid) >= level) hi = mid;
      else lo = mid + 1;
    }
    out[i] = lo;
  }
  return out;
}

/**
 * Largest LLR over all windows with more cases than expected, for bin counts (running sums along each row of
 * windows: within a row the ends are consecutive bins). Sets out.index to the best window (−1 when none).
 */
function maxWindowLlrFull(layout: ScanLayout, kernel: ScanKernel, counts: Int32Array, out: { index: number }): number {
  const { bins, ends, rowStart } = layout;
  const { expected, lnExpected, lnRestExpected, xlnx, totalCases } = kernel;
  let best = 0;
  let bestIndex = -1;
  for (let s = 0; s < bins; s++) {
    const rowBegin = rowStart[s] as number;
    const rowEnd = rowStart[s + 1] as number;
    if (rowBegin === rowEnd) continue;
    let e = ends[rowBegin] as number;
    let c = 0;
    for (let b = s; b < e; b++) c += counts[b] as number;
    for (let i = rowBegin; i < rowEnd; i++, e++) {
      c += counts[e] as number;
      if (c > (expected[i] as number)) {
        const r = totalCases - c;
        const llr = (xlnx[c] as number) - c * (lnExpected[i] as number) + (xlnx[r] as number) - r * (lnRestExpected[i] as number);
        if (llr > best) {
          best = llr;
          bestIndex = i;
        }
      }
    }
  }
  out.index = bestIndex;
  return best;
}

/**
 * Same maximum, evaluating only windows whose count reaches minCount (a cheap, well-predicted integer test).
 * Exact whenever the true maximum reaches the level minCount was built for.
 */
function maxWindowLlrFiltered(layout: ScanLayout, kernel: ScanKernel, counts: Int32Array, minCount: Int32Array): number {
  const { bins, ends, rowStart } = layout;
  const { lnExpected, lnRestExpected, xlnx, totalCases } = kernel;
  let best = 0;
  for (let s = 0; s < bins; s++) {
    const rowBegin = rowStart[s] as number;
    const rowEnd = rowStart[s + 1] as number;
    if (rowBegin === rowEnd) continue;
    let e = ends[rowBegin] as number;
    let c = 0;
    for (let b = s; b < e; b++) c += counts[b] as number;
    for (let i = rowBegin; i < rowEnd; i++, e++) {
      c += counts[e] as number;
      if (c >= (minCount[i] as number)) {
        const r = totalCases - c;
        const llr = (xlnx[c] as number) - c * (lnExpected[i] as number) + (xlnx[r] as number) - r * (lnRestExpected[i] as number);
        if (llr > best) best = llr;
      }
    }
  }
  return best;
}

/** Gumbel upper-tail probability of x for location/scale fitted by moments to the sample; null without spread. */
export function computeGumbelTailP(sample: ArrayLike<number>, x: number): number | null {
  const n = sample.length;
  if (n < 2) return null;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += sample[i] as number;
  mean /= n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += ((sample[i] as number) - mean) ** 2;
  const sd = Math.sqrt(ss / (n - 1));
  if (!(sd > 0)) return null;
  const scale = (sd * Math.sqrt(6)) / Math.PI;
  const location = mean - 0.5772156649015329 * scale;
  return -Math.expm1(-Math.exp(-(x - location) / scale));
}

/**
 * Scan observed bin counts over a layout and estimate significance with `replicates` seeded multinomial
 * replicates of the total under the null (cases proportional to population).
 */
export function runPoissonScan(
  layout: ScanLayout,
  cases: ArrayLike<number>,
  options: { replicates: number; seed: number; /** Default true; false evaluates every window of every replicate. */ countFilter?: boolean },
): ScanOutcome {
  if (cases.length !== layout.bins) throw new RangeError('cases must have one count per bin');
  const replicates = options.replicates;
  if (!Number.isInteger(replicates) || replicates < 0) throw new RangeError('replicates must be a non-negative integer');
  let totalCases = 0;
  for (let i = 0; i < cases.length; i++) {
    const c = cases[i] as number;
    if (!Number.isInteger(c) || c < 0) throw new RangeError('cases must be non-negative integers');
    totalCases += c;
  }
  const windowsTested = layout.starts.length;
  const empty: ScanOutcome = {
    best: null, windowsTested, totalCases, replicates: 0, exceedances: 0, mcP: 1, gumbelP: null, pValue: 1,
    pValueMethod: 'monte_carlo',
  };
  if (totalCases === 0 || windowsTested === 0 || !(layout.totalPopulation > 0)) return empty;

  const kernel = createKernel(layout, totalCases);
  const observedCounts = Int32Array.from(cases as ArrayLike<number>);
  const at = { index: -1 };
  const observed = maxWindowLlrFull(layout, kernel, observedCounts, at);
  if (at.index < 0) return empty;
  const i = at.index;
  const start = layout.starts[i] as number;
  const end = layout.ends[i] as number;
  let windowCases = 0;
  for (let b = start; b <= end; b++) windowCases += observedCounts[b] as number;
  const best: ScanWindow = {
    start,
    end,
    cases: windowCases,
    expected: kernel.expected[i] as number,
    llr: observed,
    population: (layout.populationShare[i] as number) * layout.totalPopulation,
    size: layout.size[i] as number,
  };

  const table = createAliasTable(layout.population);
  const random = createRandom(options.seed);
  const counts = new Int32Array(layout.bins);
  const maxima = new Float64Array(replicates);
  // NOTE: equal LLRs reached through different windows may differ in the last bits; count them as reaching.
  const threshold = observed * (1 - 1e-10) - 1e-12;
  // Speed-up that leaves every maximum exact: after a few full pilot replicates, evaluate only windows whose count
  // reaches the level of the smallest pilot maximum; a replicate whose filtered maximum falls below it is redone
  // in full.
  const pilot = Math.min(replicates, PILOT_REPLICATES);
  let floorLevel = Number.POSITIVE_INFINITY;
  let minCount: Int32Array | null = null;
  let exceedances = 0;
  for (let r = 0; r < replicates; r++) {
    counts.fill(0);
    drawMultinomialInto(table, totalCases, random, counts);
    let t: number;
    if (minCount === null) t = maxWindowLlrFull(layout, kernel, counts, at);
    else {
      t = maxWindowLlrFiltered(layout, kernel, counts, minCount);
      if (t < floorLevel) t = maxWindowLlrFull(layout, kernel, counts, at);
    }
    maxima[r] = t;
    if (t >= threshold) exceedances++;
    if (r < pilot) {
      floorLevel = Math.min(floorLevel, t);
      if (r === pilot - 1 && floorLevel > 0 && options.countFilter !== false) minCount = countThresholds(kernel, floorLevel * (1 - 1e-9));
    }
  }
  const mcP = (1 + exceedances) / (replicates + 1);
  const gumbelP = computeGumbelTailP(maxima, observed);
  const useGumbel = gumbelP !== null && exceedances === 0 && totalCases >= GUMBEL_MIN_CASES && gumbelP < mcP;
  return {
    best,
    windowsTested,
    totalCases,
    replicates,
    exceedances,
    mcP,
    gumbelP,
    pValue: useGumbel ? (gumbelP as number) : mcP,
    pValueMethod: useGumbel ? 'gumbel' : 'monte_carlo',
  };
}

/** Input of scanPoisson1d: counts and populations per bin (size defaults to population). */
export interface ScanInput {
  population: ArrayLike<number>;
  cases: ArrayLike<number>;
  size?: ArrayLike<number>;
  /** Default 0.5. */
  maxSizeFraction?: number;
  /** Default 999. */
  replicates?: number;
  /** Default 1. */
  seed?: number;
}

/** One-call 1-D Poisson scan: layout, most likely window and Monte Carlo significance. */
export function scanPoisson1d(input: ScanInput): ScanOutcome {
  const layout = createScanLayout(input.population, input.size ?? input.population, input.maxSizeFraction ?? 0.5);
  return runPoissonScan(layout, input.cases, { replicates: input.replicates ?? 999, seed: input.seed ?? 1 });
}
