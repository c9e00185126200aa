import { describe, it, expect } from "vitest";
import { fitTemperature, TEMPERATURE_MIN } from "../../../compiler/metrics/index.ts";

// Independent reference: mean NLL of softmax(logits / T), written out directly.
function meanNll(logits: ArrayLike<number>, gold: ArrayLike<number>, k: number, temperature: number): number {
  let total = 0;
  for (let i = 0; i < gold.length; i++) {
    const row = Array.from({ length: k }, (_, j) => logits[i * k + j] / temperature);
    const max = Math.max(...row);
    const logSum = max + Math.log(row.reduce((s, v) => s + Math.exp(v - max), 0));
    total += logSum - row[gold[i]];
  }
  return total / gold.length;
}

describe("fitTemperature", () => {
  it("finds the closed-form temperature for three two-class examples", () => {
    // Hand derivation: every row has logits [1, 0]; gold labels are 0, 0, 1.
    // p(label 0) = σ(1/T), so NLL(T) = −(1/3)·[2 ln σ(1/T) + ln(1 − σ(1/T))], minimized where
    // σ(1/T) = 2/3 (the empirical rate), i.e. 1/T = logit(2/3) = ln 2, so T = 1/ln 2 ≈ 1.442695.
    const fit = fitTemperature(new Float32Array([1, 0, 1, 0, 1, 0]), new Int32Array([0, 0, 1]), 3, 2);
    expect(fit.temperature).toBeCloseTo(1 / Math.LN2, 9);
  });

  it("reports the NLL at T = 1 and at the fitted temperature", () => {
    // Same data. NLL(1) = −(2/3) ln σ(1) − (1/3) ln(1 − σ(1)), σ(1) = 0.7310585786300049:
    //   (2/3)(0.3132616875) + (1/3)(1.3132616875) = 0.6465950208.
    // NLL(1/ln 2) = entropy of (2/3, 1/3) = ln 3 − (2/3) ln 2 = 0.6365141683 < NLL(1).
    const fit = fitTemperature(new Float32Array([1, 0, 1, 0, 1, 0]), new Int32Array([0, 0, 1]), 3, 2);
    expect(fit.nllBefore).toBeCloseTo(0.6465950208, 9);
    expect(fit.nllAfter).toBeCloseTo(Math.log(3) - (2 / 3) * Math.LN2, 12);
  });

  it("sharpens an under-confident model with a temperature below one", () => {
    // Hand derivation: ten rows [1, 0], nine with gold 0. Optimum σ(1/T) = 0.9, so 1/T = ln 9,
    // T = 1/ln 9 ≈ 0.4551196.
    const logits = new Float32Array(20);
    for (let i = 0; i < 10; i++) logits[2 * i] = 1;
    const gold = new Int32Array(10);
    gold[9] = 1;
    expect(fitTemperature(logits, gold, 10, 2).temperature).toBeCloseTo(1 / Math.log(9), 9);
  });

  it("zeroes the NLL derivative on a three-class example", () => {
    // Hand derivation: d/dT [−ln softmax(z/T)_gold] = (z_gold − E_p[z]) / T², so at the optimum
    // Σ_i (z_i,gold − E_p_i[z_i]) = 0. Checked here with a softmax written out independently,
    // plus NLL(T) ≤ NLL(1) and NLL(T) ≤ NLL(T · 1.01), NLL(T / 1.01).
    const logits = new Float32Array([2.0, 0.5, -1.0, 0.2, 1.5, 0.1, 3.0, -0.5, 0.4, 0.3, 0.2, 1.1]);
    const gold = new Int32Array([0, 2, 0, 1]);
    const { temperature, nllAfter } = fitTemperature(logits, gold, 4, 3);
    let derivativeSum = 0;
    for (let i = 0; i < 4; i++) {
      const row = [0, 1, 2].map((j) => logits[i * 3 + j]);
      const weights = row.map((z) => Math.exp(z / temperature));
      const total = weights.reduce((s, w) => s + w, 0);
      const expected = row.reduce((s, z, j) => s + (z * weights[j]) / total, 0);
      derivativeSum += row[gold[i]] - expected;
    }
    expect(Math.abs(derivativeSum)).toBeLessThan(1e-12);
    expect(nllAfter).toBeCloseTo(meanNll(logits, gold, 3, temperature), 12);
    expect(nllAfter).toBeLessThanOrEqual(meanNll(logits, gold, 3, 1));
    expect(nllAfter).toBeLessThanOrEqual(meanNll(logits, gold, 3, temperature * 1.01));
    expect(nllAfter).toBeLessThanOrEqual(meanNll(logits, gold, 3, temperature / 1.01));
  });

  it("stops at the lower bound when every example is right with a margin", () => {
    // Hand derivation: with all arg-maxes correct, NLL falls monotonically as T → 0, so the
    // minimizer over [0.05, 20] is the bound 0.05.
    const fit = fitTemperature(new Float32Array([2, 0, 0, 2]), new Int32Array([0, 1]), 2, 2);
    expect(fit.temperature).toBeCloseTo(TEMPERATURE_MIN, 6);
  });

  it("rejects logits whose length is not n × k", () => {
    expect(() => fitTemperature(new Float32Array(5), new Int32Array(3), 3, 2)).toThrow(/logits has 5 values, expected n × k = 6/);
  });

  it("rejects a gold label outside the k classes", () => {
    expect(() => fitTemperature(new Float32Array(4), new Int32Array([0, 2]), 2, 2)).toThrow(/gold\[1\] = 2/);
  });

  it("rejects a non-finite logit, naming its row and label", () => {
    expect(() => fitTemperature(new Float32Array([0, Infinity]), new Int32Array([0]), 1, 2)).toThrow(/row 0, label 1/);
  });
});
