/**
 * Plain-words explanation of a cohort for fleet managers (the pattern page and the evidence pack say the same
 * thing): how much more often it fails — against the fleet's rate and against the rest of the fleet, the two ratios
 * named apart — whether that could be chance, whether the moisture evidence points to water, and whether failures
 * come faster with age. The first level has no statistics jargon; each part also carries the exact figures for the
 * level one click deeper ("The statistics behind this"). Edit with docs/patterns-method.md when a rule changes.
 */
import { FDR_LEVEL, TREND_ALPHA, WATER_SHARE_ALPHA, WATER_SHARE_MIN } from './rules';
import type { CohortFigures, ModuleTrend } from './types';

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** A probability for the statistics level: two significant figures, or "3.1×10⁻⁷" below 0.001; "< 10⁻¹⁶" at the floor. */
export function formatProbability(p: number): string {
  if (!Number.isFinite(p)) return '–';
  if (p >= 0.9995) return '1';
  if (p >= 0.001) return String(Number(p.toPrecision(2)));
  if (p < 1e-16) return '< 10⁻¹⁶';
  const [mant, exp] = p.toExponential(1).split('e');
  const e = String(Number(exp)).replace(/./g, (ch) => SUPERSCRIPT[ch] ?? ch);
  return `${mant}×10${e}`;
}

/** "p = 0.03", or "p < 10⁻¹⁶" at the floor. */
export function formatStat(name: string, p: number): string {
  const f = formatProbability(p);
  return f.startsWith('<') ? `${name} ${f}` : `${name} = ${f}`;
}

/**
 * A ratio for reading, one rule everywhere: two significant figures ("3.9", "0.94"), whole numbers from 10 ("10",
 * "19"); "∞" when unbounded.
 */
export function formatRatio(x: number | null): string {
  if (x === null || !Number.isFinite(x)) return '∞';
  if (x >= 9.95) return x.toFixed(0);
  if (x >= 1) return x.toFixed(1);
  return Number(x.toPrecision(2)).toFixed(x >= 0.1 ? 2 : 3);
}

/** A ratio with its sign of times, "3.9×". */
export function formatTimes(x: number | null): string {
  return `${formatRatio(x)}×`;
}

/** A share as a whole percentage, "87%". */
export function formatShare(x: number | null): string {
  return x === null ? '–' : `${Math.round(x * 100)}%`;
}

/** An expected count for reading: one decimal below 10, whole above ("16.8" stays "17"). */
export function formatExpected(x: number): string {
  return x < 10 ? x.toFixed(1) : x.toFixed(0);
}

/** "1 vehicle", "2 vehicles", "1,204 failures". */
export function formatCount(n: number, one: string, many = `${one}s`): string {
  return `${n.toLocaleString('en-GB')} ${n === 1 ? one : many}`;
}

/** The facts the explanation reads: a cohort's figures, its verdict, and the scan when one was run. */
export type ExplainCohort = Pick<
  CohortFigures,
  | 'moduleCode'
  | 'vehicles'
  | 'failures'
  | 'expected'
  | 'ratioToFleet'
  | 'rateRatio'
  | 'ciLow'
  | 'ciHigh'
  | 'diagnosedFailures'
  | 'moistureFailures'
  | 'moistureShare'
  | 'moistureShareRest'
  | 'restDiagnosedFailures'
  | 'restMoistureFailures'
  | 'moistureP'
  | 'repeatVehicles'
> & {
  significant: boolean;
  waterIngress: boolean;
  /** The scan's p and q; null when the figures are a record's range read over some depots (nothing searched). */
  search: { pValue: number; qValue: number } | null;
};

/** Whose figures are explained: the whole fleet the report covers, or the reader's depots. */
export type ExplainScope = 'fleet' | 'depots';

/** One condition of the water-ingress rule and whether the cohort meets it. */
export interface RuleCheck {
  label: string;
  met: boolean;
  /** In plain words (first level). */
  detail: string;
  /** The exact statistic behind it (one level deeper). */
  stat: string;
}

/** The explanation of a cohort. */
export interface PatternExplanation {
  /** How much more often it fails, with both ratios named (plain words). */
  rate: string;
  /** Whether that could be chance after the search, in plain words; null when nothing was searched. */
  chance: string | null;
  /** The same with the exact p and q (deeper level); null when nothing was searched. */
  chanceStat: string | null;
  /** Vehicles that failed twice or more (one sentence, or null when none). */
  repeats: string | null;
  /** The moisture evidence in plain words. */
  moisture: string;
  /** The moisture comparison with its exact test (deeper level); null when nothing is diagnosed. */
  moistureStat: string | null;
  /** The three conditions of the water-ingress rule. */
  waterRule: RuleCheck[];
  /** Why it is or is not called water ingress. */
  waterVerdict: string;
}

/** Below this q a cohort is "far beyond chance" in words (it is significant below FDR_LEVEL). */
const FAR_BEYOND_CHANCE = 0.001;

/** Explain a cohort in plain words (see the file comment). */
export function explainCohort(c: ExplainCohort, scope: ExplainScope = 'fleet'): PatternExplanation {
  const mine = scope === 'depots';
  const fleetRate = mine ? `your depots' rate for ${c.moduleCode}` : `the fleet's rate for ${c.moduleCode}`;
  const rest = mine ? 'the rest of the vehicles at your depots' : 'the rest of the fleet';
  const times = c.ratioToFleet === null ? null : `${formatRatio(c.ratioToFleet)} times that`;
  const first = `${formatCount(c.failures, 'failure')} on ${formatCount(c.vehicles, 'vehicle')}, where ${formatExpected(c.expected)} would be expected at ${fleetRate}${times ? ` (${times})` : ''}.`;
  const interval = c.ciHigh === null ? `at least ${formatRatio(c.ciLow)} times` : `between ${formatRatio(c.ciLow)} and ${formatRatio(c.ciHigh)} times`;
  const second =
    c.vehicles === 0
      ? ''
      : c.rateRatio === null
        ? ` ${rest[0]!.toUpperCase()}${rest.slice(1)} had none, so there is no rate to compare them with.`
        : ` Compared with ${rest} (every vehicle outside this group), they fail ${formatRatio(c.rateRatio)} times as often (95% confidence: ${interval}); the two figures differ because the ${mine ? "depots'" : "fleet's"} rate includes these vehicles' own failures.`;
  const rate = `${first}${second}`;

  let chance: string | null = null;
  let chanceStat: string | null = null;
  if (c.search) {
    const { pValue, qValue } = c.search;
    chance = c.significant
      ? qValue < FAR_BEYOND_CHANCE
        ? 'Far beyond chance: even allowing for every build range searched and every group tested, a cluster this strong would almost never appear by chance, so it is flagged.'
        : 'Unlikely to be chance: even allowing for every build range searched and every group tested, a cluster this strong would seldom appear by chance, so it is flagged.'
      : 'Could well be chance: once every build range searched and every group tested is allowed for, a cluster this strong turns up by chance too often to be called a pattern, so it is not flagged.';
    chanceStat = `If build month made no difference, a cluster this strong would turn up by chance with probability ${formatProbability(pValue)} (scan p, allowing for the build ranges searched); across all groups tested the false-discovery-adjusted value is ${formatStat('q', qValue)}, ${qValue < FDR_LEVEL ? 'below' : 'not below'} the ${FDR_LEVEL} the report requires.`;
  }
  const repeats = c.repeatVehicles > 0 ? `${formatCount(c.repeatVehicles, 'vehicle')} of the group failed twice or more.` : null;

  const others = "this module's other diagnosed failures";
  const restShare = c.moistureShareRest === null ? null : `${formatShare(c.moistureShareRest)} of ${others}`;
  const found = `water was found in ${c.moistureFailures} of the ${formatCount(c.diagnosedFailures, 'diagnosed failure')} (${formatShare(c.moistureShare)})`;
  let moisture: string;
  if (c.diagnosedFailures === 0) moisture = 'None of these failures has been diagnosed yet, so there is no moisture evidence either way.';
  else if (restShare === null) moisture = `${cap(found)}; no other failures of this module have been diagnosed to compare with.`;
  else if (c.moistureShareRest !== null && c.moistureShare <= c.moistureShareRest) moisture = `Not wetter than the rest: ${found}, against ${restShare}.`;
  else if (c.moistureP < WATER_SHARE_ALPHA)
    moisture = `${cap(found)}, against ${restShare} — ${c.moistureP < FAR_BEYOND_CHANCE ? 'far more often than chance would explain' : 'more often than chance would explain'}.`;
  else moisture = `${cap(found)}, against ${restShare}: somewhat more often, but not clearly more than chance would give.`;
  const moistureStat =
    c.diagnosedFailures === 0
      ? null
      : `${c.moistureFailures} wet of ${c.diagnosedFailures} diagnosed in the group; ${c.restMoistureFailures} of ${c.restDiagnosedFailures} in the rest of the module's failures; one-sided Fisher exact test ${formatStat('p', c.moistureP)} (the chance of the group being at least this much wetter if water played no special part).`;

  const wetter = c.diagnosedFailures > 0 && c.moistureP < WATER_SHARE_ALPHA;
  const waterRule: RuleCheck[] = [
    {
      label: c.search ? `Fails above ${mine ? "your depots'" : 'the fleet'} rate, beyond chance` : 'Flagged by the fleet-wide report',
      met: c.significant,
      detail: c.significant ? 'yes' : 'no',
      stat: c.search ? `${formatStat('q', c.search.qValue)} (needs < ${FDR_LEVEL})` : 'decided on the whole fleet',
    },
    {
      label: `At least ${formatShare(WATER_SHARE_MIN)} of diagnosed failures show water`,
      met: c.diagnosedFailures > 0 && c.moistureShare >= WATER_SHARE_MIN,
      detail: c.diagnosedFailures > 0 ? `${formatShare(c.moistureShare)} (${c.moistureFailures} of ${c.diagnosedFailures})` : 'none diagnosed',
      stat: c.diagnosedFailures > 0 ? `${c.moistureFailures} of ${c.diagnosedFailures}` : '–',
    },
    {
      label: "Wetter than the module's other failures, beyond chance",
      met: wetter,
      detail: c.diagnosedFailures === 0 ? 'none diagnosed' : `${formatShare(c.moistureShare)} against ${formatShare(c.moistureShareRest)}`,
      stat: `${formatStat('p', c.moistureP)} (needs < ${WATER_SHARE_ALPHA})`,
    },
  ];
  const unmet = waterRule.filter((r) => !r.met).map((r) => r.label.charAt(0).toLowerCase() + r.label.slice(1));
  // Without a search of its own (a record's range read over some depots) the verdict is the fleet-wide one.
  const fleetVerdict = c.search === null;
  const waterVerdict = c.waterIngress
    ? fleetVerdict
      ? 'Called water ingress on the whole fleet: most of its diagnosed failures show water, more often than the rest of this module’s failures.'
      : `Called water ingress: the group fails far above ${mine ? "your depots'" : 'the fleet'} rate, most of its diagnosed failures show water, and more often than the rest of this module’s failures.`
    : !c.significant
      ? 'Not called water ingress: the group is not flagged, so no verdict on its cause is given.'
      : fleetVerdict
        ? 'Not called water ingress on the whole fleet — a pattern that fails dry. Look for another cause (mechanical wear, a supplier batch, wiring).'
        : `Not called water ingress — a pattern that fails dry. It does not meet: ${unmet.join('; ')}. Look for another cause (mechanical wear, a supplier batch, wiring).`;
  return { rate, chance, chanceStat, repeats, moisture, moistureStat, waterRule, waterVerdict };
}

function cap(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** The trend in plain words (first level) and the exact tests (deeper level). */
export interface TrendExplanation {
  /** Are failures coming faster as the vehicles age? In words, without statistics. */
  plain: string;
  /** The tests and their figures; null when there are too few failures to test. */
  stat: string | null;
}

/** Trend tests in plain words: are failures coming faster as the vehicles age? `subject`: "in this group". */
export function explainTrend(t: ModuleTrend, subject: string): TrendExplanation {
  if (t.laplaceU === null || t.events < 2) return { plain: `Too few failures ${subject} to tell whether they come faster with age.`, stat: null };
  const stat = `Laplace U = ${t.laplaceU.toFixed(2)}, ${formatStat('p', t.laplacePTwoSided ?? 1)}; MIL-HDBK-189 χ² = ${(t.milHdbkChiSquare ?? 0).toFixed(1)} on ${t.milHdbkDf} degrees of freedom, ${formatStat('p', t.milHdbkPTwoSided ?? 1)}; power-law shape β = ${t.beta === null ? '–' : t.beta.toFixed(2)}. A trend is called only when both tests reject a steady rate at ${TREND_ALPHA} (two-sided) in the same direction.`;
  if (t.direction === 'increasing') return { plain: `Failures ${subject} are coming faster as these vehicles age.`, stat };
  if (t.direction === 'decreasing') return { plain: `Failures ${subject} are coming more slowly as these vehicles age.`, stat };
  const laplaceSays = (t.laplacePTwoSided ?? 1) < TREND_ALPHA;
  const milSays = (t.milHdbkPTwoSided ?? 1) < TREND_ALPHA;
  if (laplaceSays !== milSays) {
    // MIL-HDBK-189 points to faster failures when β > 1 (χ² below its 2N degrees of freedom).
    const faster = laplaceSays ? t.laplaceU > 0 : (t.beta ?? 1) > 1;
    return { plain: `Not clear: one of the two tests hints that failures ${subject} come ${faster ? 'faster' : 'more slowly'} as the vehicles age, the other does not.`, stat };
  }
  return { plain: `No clear sign that failures ${subject} come faster or slower as the vehicles age.`, stat };
}
