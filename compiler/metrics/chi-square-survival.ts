// Upper tail of the chi-square distribution with one degree of freedom. A χ²(1) variable is
// the square of a standard normal Z, so P(χ² > x) = P(|Z| > √x) = erfc(√(x/2)).

import { complementaryErrorFunction } from "./complementary-error-function.ts";
import { metricsInputError } from "./metrics-input-error.ts";

/**
 * P(X > statistic) for X ~ chi-square with 1 degree of freedom; statistic must be ≥ 0.
 * @example chiSquareSurvivalOneDegree(3.841458820694124) // ≈ 0.05
 */
export function chiSquareSurvivalOneDegree(statistic: number): number {
  if (!(statistic >= 0)) {
    throw metricsInputError(
      "bad-number",
      "chiSquareSurvivalOneDegree",
      `statistic = ${statistic}, expected a number ≥ 0`,
    );
  }
  return complementaryErrorFunction(Math.sqrt(statistic / 2));
}
