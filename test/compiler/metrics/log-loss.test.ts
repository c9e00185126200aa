import { describe, it, expect } from "vitest";
import { logLoss } from "../../../compiler/metrics/index.ts";

describe("logLoss", () => {
  it("matches the scikit-learn log_loss docstring example", () => {
    // scikit-learn API reference, sklearn.metrics.log_loss docstring:
    // log_loss(["spam", "ham", "ham", "spam"], [[.1, .9], [.9, .1], [.8, .2], [.35, .65]]) → 0.21616...
    // Columns are the sorted labels [ham, spam], so the gold-label probabilities are 0.9, 0.9, 0.8, 0.65.
    expect(logLoss([0.9, 0.9, 0.8, 0.65])).toBeCloseTo(0.21616, 5);
  });

  it("clips a zero probability to 1e-15 instead of returning Infinity", () => {
    // scikit-learn log_loss, parameter eps=1e-15: "probabilities are clipped to max(eps, min(1 - eps, p))".
    // −ln(1e-15) = 15·ln 10 = 34.538776394910684.
    expect(logLoss([0])).toBeCloseTo(15 * Math.LN10, 10);
  });

  it("clips a probability of one to 1 − 1e-15", () => {
    // Same clipping rule: −ln(1 − 1e-15) ≈ 1.1e-15 > 0 (1 − 1e-15 rounds to 1 − 9.99e-16 in doubles).
    const loss = logLoss([1]);
    expect(loss).toBeGreaterThan(0);
    expect(loss).toBeLessThan(2e-15);
  });

  it("accepts a Float64Array", () => {
    // Same values as the scikit-learn docstring example above.
    expect(logLoss(new Float64Array([0.9, 0.9, 0.8, 0.65]))).toBeCloseTo(0.21616, 5);
  });

  it("rejects a probability above one, naming the index", () => {
    expect(() => logLoss([0.5, 1.5])).toThrow(/probabilityOfGold\[1\] = 1.5, expected a number in \[0, 1\]/);
  });

  it("rejects NaN", () => {
    expect(() => logLoss([NaN])).toThrow(/probabilityOfGold\[0\] = NaN/);
  });
});
