import { describe, it, expect } from "vitest";
import { binomialTestTwoSided } from "../../../compiler/metrics/index.ts";

function expectRelativelyClose(actual: number, expected: number, tolerance: number): void {
  expect(Math.abs(actual / expected - 1)).toBeLessThan(tolerance);
}

describe("binomialTestTwoSided", () => {
  it("matches the contingencytables exact binomial test for 13 of 16", () => {
    // R package contingencytables, tests/testthat/test-ch2.R (stored repository
    // ocbe-uio/contingencytables): Exact_binomial_test_1x2(X = 13, n = 16, pi0 = 0.5) → "P = 0.02127".
    // Exactly 2·(1 + 16 + 120 + 560)/2¹⁶ = 1394/65536 = 0.021270751953125.
    expect(binomialTestTwoSided(13, 16)).toBeCloseTo(0.02127, 5);
    expectRelativelyClose(binomialTestTwoSided(13, 16), 1394 / 65536, 1e-13);
  });

  it("is symmetric in successes and failures", () => {
    // Under p = 1/2 the distribution is symmetric, so k and n − k give the same p-value.
    expect(binomialTestTwoSided(3, 16)).toBe(binomialTestTwoSided(13, 16));
  });

  it("stays accurate for a million trials near the center", () => {
    // mpmath 1.3.0 at 40 digits, exact tail sum from C(10⁶, 499000)/2^(10⁶):
    // 2·P(X ≤ 499000) = 0.04560829986538208642. SciPy 1.17.1 scipy.stats.binomtest agrees to 2e-13.
    expectRelativelyClose(binomialTestTwoSided(499_000, 1_000_000), 0.04560829986538208642, 1e-11);
  });

  it("stays accurate for a million trials far in the tail", () => {
    // mpmath 1.3.0 at 40 digits, as above: 2·P(X ≤ 490000) = 5.5443632876992246035e-89.
    expectRelativelyClose(binomialTestTwoSided(490_000, 1_000_000), 5.5443632876992246035e-89, 1e-11);
  });

  it("matches an exact rational tail for a thousand trials", () => {
    // Python integers: 2·Σ_{i≤100} C(1000, i) / 2¹⁰⁰⁰ = 1.3403435580012592e-161 (exact Fraction, then float).
    expectRelativelyClose(binomialTestTwoSided(100, 1000), 1.3403435580012592e-161, 1e-11);
  });

  it("returns 1 when successes are exactly half the trials", () => {
    // 2·P(X ≤ n/2) > 1, capped at 1 by the min(1, ·) doubling rule.
    expect(binomialTestTwoSided(8, 16)).toBe(1);
  });

  it("returns 1 for zero trials", () => {
    // Nothing observed, nothing to reject (P(X ≤ 0) = 1 for n = 0).
    expect(binomialTestTwoSided(0, 0)).toBe(1);
  });

  it("rejects more successes than trials", () => {
    expect(() => binomialTestTwoSided(5, 4)).toThrow(/successes = 5 exceeds trials = 4/);
  });
});
