import { describe, it, expect } from "vitest";
import { wilsonInterval } from "../../../compiler/metrics/index.ts";

describe("wilsonInterval", () => {
  it("matches the contingencytables package's Wilson score interval for 13 of 16", () => {
    // R package contingencytables (companion to Fagerland, Lydersen & Laake, "Statistical
    // Analysis of Contingency Tables", 2017), tests/testthat/test-ch2.R, read in the stored
    // repository ocbe-uio/contingencytables: Wilson_score_CI_1x2(X = 13, n = 16) →
    // "estimate = 0.8125 (95% CI 0.5699 to 0.9341)".
    const { low, high } = wilsonInterval(13, 16);
    expect(low).toBeCloseTo(0.5699, 4);
    expect(high).toBeCloseTo(0.9341, 4);
  });

  it("matches Newcombe's table of Wilson intervals", () => {
    // R. G. Newcombe, "Two-sided confidence intervals for the single proportion: comparison of
    // seven methods", Statistics in Medicine 17:857–872, 1998, worked examples for method 3
    // (citation, table and values from memory):
    // 81/263 → 0.2553–0.3662, 15/148 → 0.0624–0.1605, 0/20 → 0–0.1611, 1/29 → 0.0061–0.1718.
    const cases: [number, number, number, number][] = [
      [81, 263, 0.2553, 0.3662],
      [15, 148, 0.0624, 0.1605],
      [0, 20, 0, 0.1611],
      [1, 29, 0.0061, 0.1718],
    ];
    for (const [successes, trials, low, high] of cases) {
      const interval = wilsonInterval(successes, trials);
      expect(interval.low).toBeCloseTo(low, 4);
      expect(interval.high).toBeCloseTo(high, 4);
    }
  });

  it("returns the whole unit interval for zero trials", () => {
    // With no data every proportion is plausible (convention stated in the brief and in wilson-interval.ts).
    expect(wilsonInterval(0, 0)).toEqual({ low: 0, high: 1 });
  });

  it("ends exactly at 0 for no successes and exactly at 1 for all successes", () => {
    // Wilson 1927: at p̂ = 0 the score interval's lower root is exactly 0 (and 1 at p̂ = 1).
    expect(wilsonInterval(0, 20).low).toBe(0);
    expect(wilsonInterval(20, 20).high).toBe(1);
  });

  it("narrows for a smaller normal quantile", () => {
    // z = 1.6448536269514722 is Φ⁻¹(0.95), a 90% interval, which must sit inside the 95% one
    // (common practice, no source).
    const ninety = wilsonInterval(13, 16, 1.6448536269514722);
    const ninetyFive = wilsonInterval(13, 16);
    expect(ninety.low).toBeGreaterThan(ninetyFive.low);
    expect(ninety.high).toBeLessThan(ninetyFive.high);
  });

  it("rejects more successes than trials", () => {
    expect(() => wilsonInterval(5, 4)).toThrow(/successes = 5, expected a number in \[0, trials = 4\]/);
  });

  it("rejects a fractional trial count", () => {
    expect(() => wilsonInterval(1, 2.5)).toThrow(/trials = 2.5, expected an integer ≥ 0/);
  });
});
