import { describe, it, expect } from "vitest";
import { chiSquareSurvivalOneDegree, complementaryErrorFunction } from "../../../compiler/metrics/index.ts";

function expectRelativelyClose(actual: number, expected: number, tolerance: number): void {
  expect(Math.abs(actual / expected - 1)).toBeLessThan(tolerance);
}

// Reference erfc values. At 0.25, 0.5, 0.75, 1, 2, 3, 4, 5 and 10: 30-digit values quoted in
// public special-function test suites (read in stored sources, e.g. erfc(1) =
// 0.15729920705028513066, erfc(2) = 0.0046777349810472658379), rounded to 17 digits.
// At 1.5, 1.99 and 26: SciPy 1.17.1 scipy.special.erfc, which also agrees with all the others
// to 1e-15. Leading digits agree with Abramowitz & Stegun (1964) Table 7.1 (from memory).
const ERFC_REFERENCE: [number, number][] = [
  [0.25, 0.72367360983176307],
  [0.5, 0.47950012218695346],
  [0.75, 0.28884436634648487],
  [1, 0.15729920705028513],
  [1.5, 0.033894853524689273],
  [1.99, 0.004888586800383002],
  [2, 0.0046777349810472658],
  [3, 2.2090496998585441e-5],
  [4, 1.5417257900280019e-8],
  [5, 1.5374597944280349e-12],
  [10, 2.0884875837625447e-45],
  [26, 5.663192408856145e-296],
];

describe("complementaryErrorFunction", () => {
  it("matches reference values from the center to the far tail", () => {
    for (const [x, expected] of ERFC_REFERENCE) expectRelativelyClose(complementaryErrorFunction(x), expected, 1e-13);
  });

  it("uses erfc(−x) = 2 − erfc(x) for negative arguments", () => {
    // A&S 7.1.9 symmetry (formula number from memory); erfc(−1) = 1.8427007929497149 (SciPy 1.17.1).
    expectRelativelyClose(complementaryErrorFunction(-1), 1.8427007929497149, 1e-15);
  });

  it("is exactly 1 at zero and 0 at infinity", () => {
    // erfc(0) = 1 and erfc(∞) = 0 by definition.
    expect(complementaryErrorFunction(0)).toBe(1);
    expect(complementaryErrorFunction(Infinity)).toBe(0);
  });
});

describe("chiSquareSurvivalOneDegree", () => {
  it("matches R's pchisq for McNemar's corrected statistic on Agresti's approval data", () => {
    // R session output (stored public R script): tstat = (abs(150 - 86) - 1)^2 / (150 + 86);
    // pchisq(tstat, 1, lower.tail = F) → 4.114562e-05.
    expectRelativelyClose(chiSquareSurvivalOneDegree(63 ** 2 / 236), 4.114562e-5, 1e-6);
  });

  it("matches R's pchisq for the uncorrected statistic on the same data", () => {
    // Same R session: tstat = (150 - 86)^2 / (150 + 86); pchisq(tstat, 1, lower.tail = F) → 3.099293e-05.
    expectRelativelyClose(chiSquareSurvivalOneDegree(64 ** 2 / 236), 3.099293e-5, 1e-6);
  });

  it("gives 0.05 at the square of the 97.5% normal quantile", () => {
    // χ²(1) is Z²; Φ⁻¹(0.975) = 1.959963984540054, so P(χ² > 1.959963984540054²) = 0.05
    // (common practice, no source).
    expect(chiSquareSurvivalOneDegree(1.959963984540054 ** 2)).toBeCloseTo(0.05, 14);
  });

  it("rejects a negative statistic", () => {
    expect(() => chiSquareSurvivalOneDegree(-1)).toThrow(/statistic = -1, expected a number ≥ 0/);
  });
});
