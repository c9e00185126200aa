// Exact two-sided binomial test of H0: p = 1/2, the test McNemar's exact version runs on the
// discordant pairs. With m = min(k, n − k), the two tails are mirror images, so
//   p-value = min(1, 2 · P(X ≤ m)) = min(1, 2 · Σ_{i≤m} C(n, i) / 2ⁿ).
// C(n, i) overflows and 2⁻ⁿ underflows long before n = 10⁶, and the naive log,
// log C(n, m) − n·ln 2, subtracts two numbers near 7·10⁵ and keeps only ~8 digits. So the
// largest tail term P(X = m) is computed with Loader's saddle-point form (C. Loader, "Fast
// and Accurate Computation of Binomial Probabilities", 2000; the method behind R's dbinom;
// citation from memory), whose pieces are all small numbers:
//   ln P(X = m) = stirlerr(n) − stirlerr(m) − stirlerr(n−m) − bd0(m, n/2) − bd0(n−m, n/2)
//                 − ½ ln(2π m (n−m) / n)
// with stirlerr(x) = ln x! − (x + ½) ln x + x − ½ ln 2π and bd0(x, μ) = x ln(x/μ) + μ − x.
// The rest of the tail is that term times Σ of ratios C(n, i−1)/C(n, i) = i/(n − i + 1),
// summed downward until the remaining terms cannot change the sum.

import { checkInteger } from "./input-checks.ts";
import { metricsInputError } from "./metrics-input-error.ts";

const HALF_LOG_TWO_PI = 0.5 * Math.log(2 * Math.PI);

// Stirling-series coefficients 1/12, 1/360, 1/1260, 1/1680, 1/1188 (from B₂ₖ / (2k(2k−1))).
const S0 = 1 / 12;
const S1 = 1 / 360;
const S2 = 1 / 1260;
const S3 = 1 / 1680;
const S4 = 1 / 1188;

// Error of Stirling's approximation to ln x!, for integer x ≥ 1.
function stirlingError(x: number): number {
  if (x <= 15) {
    // Small x: direct, the sum of at most 14 logs loses nothing that matters.
    let logFactorial = 0;
    for (let k = 2; k <= x; k++) logFactorial += Math.log(k);
    return logFactorial - (x + 0.5) * Math.log(x) + x - HALF_LOG_TWO_PI;
  }
  const xx = x * x;
  if (x > 500) return (S0 - S1 / xx) / x;
  if (x > 80) return (S0 - (S1 - S2 / xx) / xx) / x;
  if (x > 35) return (S0 - (S1 - (S2 - S3 / xx) / xx) / xx) / x;
  return (S0 - (S1 - (S2 - (S3 - S4 / xx) / xx) / xx) / xx) / x;
}

// x ln(x/μ) + μ − x without cancellation when x is near μ: with v = (x − μ)/(x + μ) it equals
// (x − μ)·v + 2x·Σ_{j≥1} v^(2j+1)/(2j+1).
function deviancePart(x: number, mean: number): number {
  if (Math.abs(x - mean) < 0.1 * (x + mean)) {
    const v = (x - mean) / (x + mean);
    let sum = (x - mean) * v;
    let power = 2 * x * v;
    const vv = v * v;
    for (let j = 1; j < 1000; j++) {
      power *= vv;
      const next = sum + power / (2 * j + 1);
      if (next === sum) break;
      sum = next;
    }
    return sum;
  }
  return x * Math.log(x / mean) + mean - x;
}

// ln P(X = x) for X ~ Binomial(n, 1/2), 0 ≤ x ≤ n.
function logBinomialHalfProbability(x: number, n: number): number {
  if (x === 0 || x === n) return -n * Math.LN2;
  const mean = n / 2;
  const logCore =
    stirlingError(n) -
    stirlingError(x) -
    stirlingError(n - x) -
    deviancePart(x, mean) -
    deviancePart(n - x, mean);
  return logCore - 0.5 * (Math.log(2 * Math.PI) + Math.log(x) + Math.log1p(-x / n));
}

/**
 * Two-sided exact binomial p-value for `successes` out of `trials` under p = 1/2:
 * min(1, 2·P(X ≤ min(k, n−k))). Zero trials gives 1. Accurate for n in the millions.
 * @example binomialTestTwoSided(3, 16) // 0.021270751953125
 */
export function binomialTestTwoSided(successes: number, trials: number): number {
  const fn = "binomialTestTwoSided";
  checkInteger(fn, "trials", trials, 0);
  checkInteger(fn, "successes", successes, 0);
  if (successes > trials) {
    throw metricsInputError("bad-argument", fn, `successes = ${successes} exceeds trials = ${trials}`);
  }
  const m = Math.min(successes, trials - successes);
  // When m = n/2 each tail holds more than half the mass, so the doubled sum exceeds 1.
  if (2 * m >= trials) return 1;

  let term = 1;
  let sum = 1;
  for (let i = m; i > 0; i--) {
    term *= i / (trials - i + 1);
    sum += term;
    if (term < sum * 1e-17) break;
  }
  return Math.min(1, 2 * Math.exp(logBinomialHalfProbability(m, trials)) * sum);
}
