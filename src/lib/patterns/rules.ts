/**
 * The decision thresholds of the patterns report, in a module of their own so that the islands and the
 * explanation can show them without loading the engine. docs/patterns-method.md states each rule.
 */

/** Cohorts with q below this are significant (Benjamini–Hochberg false-discovery level). */
export const FDR_LEVEL = 0.05;
/** Water ingress needs at least this share of the cohort's diagnosed failures to show water... */
export const WATER_SHARE_MIN = 0.5;
/** ...and that share to exceed the rest of the module's by a one-sided Fisher exact test below this p. */
export const WATER_SHARE_ALPHA = 0.05;
/** Level of the trend tests (two-sided). */
export const TREND_ALPHA = 0.05;
