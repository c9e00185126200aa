// Wilson score interval for a binomial proportion (E. B. Wilson, "Probable inference, the law
// of succession, and statistical inference", JASA 22:209–212, 1927): the set of p whose score
// test |p̂ − p| / √(p(1 − p)/n) ≤ z does not reject. Solving the quadratic gives
//   center = (p̂ + z²/2n) / (1 + z²/n)
//   half   = z / (1 + z²/n) · √(p̂(1 − p̂)/n + z²/4n²)
// Unlike p̂ ± z√(p̂(1−p̂)/n) it stays inside [0, 1] and is not zero-width at 0 or n successes.

import { checkInteger } from "./input-checks.ts";
import { metricsInputError } from "./metrics-input-error.ts";

/** Two-sided 95% normal quantile, Φ⁻¹(0.975). */
export const Z_95 = 1.959963984540054;

/** A confidence interval [low, high]. */
export interface Interval {
  low: number;
  high: number;
}

/**
 * Wilson score interval for `successes` out of `trials` at normal quantile `z` (default 95%).
 * Zero trials gives { low: 0, high: 1 }.
 * @example wilsonInterval(13, 16) // ≈ { low: 0.5699, high: 0.9341 }
 */
export function wilsonInterval(successes: number, trials: number, z = Z_95): Interval {
  const fn = "wilsonInterval";
  checkInteger(fn, "trials", trials, 0);
  if (!(successes >= 0 && successes <= trials)) {
    throw metricsInputError("bad-argument", fn, `successes = ${successes}, expected a number in [0, trials = ${trials}]`);
  }
  if (!(z > 0 && Number.isFinite(z))) {
    throw metricsInputError("bad-argument", fn, `z = ${z}, expected a finite number > 0`);
  }
  if (trials === 0) return { low: 0, high: 1 };
  const proportion = successes / trials;
  const zSquaredOverN = (z * z) / trials;
  const denominator = 1 + zSquaredOverN;
  const center = (proportion + zSquaredOverN / 2) / denominator;
  const half =
    (z / denominator) * Math.sqrt((proportion * (1 - proportion)) / trials + zSquaredOverN / (4 * trials));
  // Clamp away rounding: at 0 or n successes one end is exactly 0 or 1 in exact arithmetic.
  return {
    low: successes === 0 ? 0 : Math.max(0, center - half),
    high: successes === trials ? 1 : Math.min(1, center + half),
  };
}
