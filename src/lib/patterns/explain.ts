/**
 * Plain-words explanation of a cohort for fleet managers (the pattern page and the evidence pack say the same
 * thing): how much more often it fails, how unlikely that is by chance after the search, whether the moisture
 * evidence points to water and why, and whether failures come faster with age. Numbers stay exact one click
 * deeper; here they are rounded for reading. Edit with docs/patterns-method.md when a rule changes.
 */
import { FDR_LEVEL, TREND_ALPHA, WATER_SHARE_ALPHA, WATER_SHARE_MIN } from './rules';
import type { ModuleTrend, PatternCohort } from './types';

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** A probability for reading: two significant figures, or "3.1×10⁻⁷" below 0.001; "< 10⁻¹⁶" at the floor. */
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

/** A rate ratio for reading: "3.9" (two significant figures below 10, whole numbers above). */
export function formatRatio(x: number | null): string {
  if (x === null) return '∞';
  if (!Number.isFinite(x)) return '∞';
  if (x >= 10) return x.toFixed(0);
  return x.toFixed(x >= 1 ? 1 : 2);
}

/** A share as a whole percentage, "87%". */
export function formatShare(x: number | null): string {
  return x === null ? '–' : `${Math.round(x * 100)}%`;
}

/** The facts the explanation reads (a subset of the engine's cohort). */
export type ExplainCohort = Pick<
  PatternCohort,
  | 'moduleCode'
  | 'exposureBand'
  | 'vehicles'
  | 'failures'
  | 'expected'
  | 'rateRatio'
  | 'ciLow'
  | 'ciHigh'
  | 'pValue'
  | 'qValue'
  | 'significant'
  | 'waterIngress'
  | 'diagnosedFailures'
  | 'moistureFailures'
  | 'moistureShare'
  | 'moistureShareRest'
  | 'restDiagnosedFailures'
  | 'restMoistureFailures'
  | 'moistureP'
  | 'repeatVehicles'
>;

/** One condition of the water-ingress rule and whether the cohort meets it. */
export interface RuleCheck {
  label: string;
  met: boolean;
  detail: string;
}

/** The explanation of a cohort. */
export interface PatternExplanation {
  /** How much more often it fails (one sentence). */
  rate: string;
  /** Whether that could be chance, after the search (one sentence). */
  chance: string;
  /** Repeat vehicles (one sentence, or null when none). */
  repeats: string | null;
  /** The moisture evidence in words. */
  moisture: string;
  /** The three conditions of the water-ingress rule. */
  waterRule: RuleCheck[];
  /** Why it is or is not called water ingress. */
  waterVerdict: string;
}

const plural = (n: number, one: string, many = `${one}s`) => `${n.toLocaleString('en-GB')} ${n === 1 ? one : many}`;

/** Explain a cohort in plain words (see the file comment). */
export function explainCohort(c: ExplainCohort): PatternExplanation {
  const expected = c.expected < 10 ? c.expected.toFixed(1) : c.expected.toFixed(0);
  const interval = c.ciHigh === null ? `at least ${formatRatio(c.ciLow)} times` : `between ${formatRatio(c.ciLow)} and ${formatRatio(c.ciHigh)} times`;
  const rate =
    c.rateRatio === null
      ? `${plural(c.failures, 'failure')} on ${plural(c.vehicles, 'vehicle')} where ${expected} would be expected at the fleet's rate, and none on the rest of the fleet.`
      : `${plural(c.failures, 'failure')} on ${plural(c.vehicles, 'vehicle')} where ${expected} would be expected at the fleet's rate: these vehicles fail ${formatRatio(c.rateRatio)} times as often as the rest of the fleet (95% confidence: ${interval}).`;
  const chance = c.significant
    ? `If build month made no difference, a cluster this strong would turn up by chance with probability ${formatProbability(c.pValue)}, even allowing for every build range searched; across all groups tested the false-discovery-adjusted value is ${formatStat('q', c.qValue)}, below the ${FDR_LEVEL} the report requires, so this is flagged.`
    : `A cluster this strong would turn up by chance with probability ${formatProbability(c.pValue)} once every build range searched is allowed for (${formatStat('q', c.qValue)} across all groups tested), which is not below ${FDR_LEVEL}: it could well be chance, so it is not flagged.`;
  const repeats = c.repeatVehicles > 0 ? `${plural(c.repeatVehicles, 'vehicle')} failed more than once.` : null;

  const rest = c.moistureShareRest === null ? 'no other failures of this module have been diagnosed' : `${formatShare(c.moistureShareRest)} (${c.restMoistureFailures} of ${c.restDiagnosedFailures}) of this module's other diagnosed failures`;
  const moisture =
    c.diagnosedFailures === 0
      ? `None of these failures has been diagnosed yet, so there is no moisture evidence either way.`
      : `Water was found (moisture traces, corrosion or standing water, or a root cause of water ingress) in ${c.moistureFailures} of the ${plural(c.diagnosedFailures, 'diagnosed failure')} (${formatShare(c.moistureShare)}), against ${rest}. The chance of a difference at least this large if water played no special part is ${formatStat('p', c.moistureP)} (one-sided Fisher exact test).`;

  const waterRule: RuleCheck[] = [
    { label: 'Significant after false-discovery control', met: c.significant, detail: `${formatStat('q', c.qValue)} (needs < ${FDR_LEVEL})` },
    {
      label: `At least ${formatShare(WATER_SHARE_MIN)} of diagnosed failures show water`,
      met: c.diagnosedFailures > 0 && c.moistureShare >= WATER_SHARE_MIN,
      detail: c.diagnosedFailures > 0 ? `${formatShare(c.moistureShare)} (${c.moistureFailures} of ${c.diagnosedFailures})` : 'none diagnosed',
    },
    { label: "Wetter than the module's other failures", met: c.moistureP < WATER_SHARE_ALPHA, detail: `${formatStat('p', c.moistureP)} (needs < ${WATER_SHARE_ALPHA})` },
  ];
  const unmet = waterRule.filter((r) => !r.met).map((r) => r.label.charAt(0).toLowerCase() + r.label.slice(1));
  const waterVerdict = c.waterIngress
    ? 'Called water ingress: the cohort is significant, most of its diagnosed failures show water, and more often than the rest of this module’s failures.'
    : !c.significant
      ? 'Not called water ingress: the cohort is not significant, so no verdict on its cause is given.'
      : `Not called water ingress — a significant but dry pattern. It fails: ${unmet.join('; ')}. Look for another cause (mechanical wear, a supplier batch, wiring).`;
  return { rate, chance, repeats, moisture, waterRule, waterVerdict };
}

/** Trend tests in plain words: are failures coming faster as the vehicles age? */
export function explainTrend(t: ModuleTrend, subject: string): string {
  if (t.laplaceU === null || t.events < 2) return `Too few failures ${subject} to test whether they come faster with age.`;
  const figures = `Laplace U = ${t.laplaceU.toFixed(2)}, ${formatStat('p', t.laplacePTwoSided ?? 1)}; MIL-HDBK-189 χ² = ${(t.milHdbkChiSquare ?? 0).toFixed(1)} on ${t.milHdbkDf} degrees of freedom, ${formatStat('p', t.milHdbkPTwoSided ?? 1)}; power-law shape β = ${t.beta === null ? '–' : t.beta.toFixed(2)}`;
  if (t.direction === 'increasing') return `Yes: failures ${subject} come faster as the vehicles age — both tests reject a steady rate (${figures}).`;
  if (t.direction === 'decreasing') return `No, the opposite: failures ${subject} come more slowly as the vehicles age — both tests reject a steady rate (${figures}).`;
  const laplaceSays = (t.laplacePTwoSided ?? 1) < TREND_ALPHA;
  const milSays = (t.milHdbkPTwoSided ?? 1) < TREND_ALPHA;
  if (laplaceSays !== milSays) {
    // MIL-HDBK-189 points to faster failures when β > 1 (χ² below its 2N degrees of freedom).
    const faster = laplaceSays ? t.laplaceU > 0 : (t.beta ?? 1) > 1;
    const [one, other] = laplaceSays ? ['Laplace', 'MIL-HDBK-189'] : ['MIL-HDBK-189', 'Laplace'];
    return `Not clear: the ${one} test points to failures ${subject} coming ${faster ? 'faster' : 'more slowly'} with age but the ${other} test does not, and both must agree before a trend is called (${figures}).`;
  }
  return `No clear sign: failures ${subject} come at a steady rate as far as the tests can tell (${figures}).`;
}
