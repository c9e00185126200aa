// McNemar's test (Q. McNemar, Psychometrika 12:153–157, 1947; citation from memory) for two
// classifiers scored on the same examples. Only the discordant examples matter:
//   b = live model right, candidate wrong;  c = live model wrong, candidate right.
// Under H0 (equal error rates) b ~ Binomial(b + c, 1/2).
// - b + c < 25: exact two-sided binomial test, p = min(1, 2·Σ_{i≤min(b,c)} C(n,i)/2ⁿ), as in
//   Fagerland, Lydersen & Laake, BMC Med Res Methodol 2013, 13:91 ("McNemar exact conditional";
//   volume and article number from memory).
//   The cut-off 25 is a common rule of thumb for when the normal approximation is good enough
//   (common practice, no source).
// - otherwise: chi-square with Edwards' continuity correction, (|b − c| − 1)² / (b + c), on one
//   degree of freedom. Clamped at 0 when b = c so the p-value is 1, as R's mcnemar.test gets by
//   skipping the correction then.

import { binomialTestTwoSided } from "./binomial-test.ts";
import { chiSquareSurvivalOneDegree } from "./chi-square-survival.ts";
import { checkInteger } from "./input-checks.ts";

/** Below this many discordant pairs the exact test is used. */
export const MCNEMAR_EXACT_BELOW = 25;

/** Result of `mcnemarTest`. */
export interface McNemarResult {
  b: number;
  c: number;
  /** Exact: min(b, c), the binomial tail's cut-off. Chi-square: (|b − c| − 1)² / (b + c). */
  statistic: number;
  pValue: number;
  method: "exact" | "chi-square-corrected";
}

/**
 * McNemar's test on the discordant counts b (live right, candidate wrong) and c (live wrong,
 * candidate right): exact binomial when b + c < 25, else continuity-corrected chi-square.
 * @example mcnemarTest(6, 16).pValue // ≈ 0.052479 (exact)
 */
export function mcnemarTest(b: number, c: number): McNemarResult {
  checkInteger("mcnemarTest", "b", b, 0);
  checkInteger("mcnemarTest", "c", c, 0);
  const discordant = b + c;
  if (discordant < MCNEMAR_EXACT_BELOW) {
    return { b, c, statistic: Math.min(b, c), pValue: binomialTestTwoSided(b, discordant), method: "exact" };
  }
  const corrected = Math.max(0, Math.abs(b - c) - 1);
  const statistic = (corrected * corrected) / discordant;
  return { b, c, statistic, pValue: chiSquareSurvivalOneDegree(statistic), method: "chi-square-corrected" };
}
