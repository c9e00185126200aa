import { describe, it, expect } from "vitest";
import { expectedCalibrationError, reliabilityBins } from "../../../compiler/metrics/index.ts";

// torchmetrics API reference, BinaryCalibrationError docstring example (read in stored
// torchmetrics source): preds = [0.25, 0.25, 0.55, 0.75, 0.75], target = [0, 0, 1, 1, 1],
// n_bins=2 → norm='l1' 0.2900, norm='max' 0.3167.
// By hand: bin (0, 0.5] holds 0.25, 0.25 (accuracy 0, confidence 0.25);
// bin (0.5, 1] holds 0.55, 0.75, 0.75 (accuracy 1, confidence 2.05/3 = 0.68333...).
// ECE = 2/5 · 0.25 + 3/5 · (1 − 0.68333...) = 0.1 + 0.19 = 0.29; max gap = 0.31666...
const DOC_CONFIDENCES = [0.25, 0.25, 0.55, 0.75, 0.75];
const DOC_CORRECT = [0, 0, 1, 1, 1];

describe("expectedCalibrationError", () => {
  it("matches the torchmetrics BinaryCalibrationError l1 docstring example", () => {
    expect(expectedCalibrationError(DOC_CONFIDENCES, DOC_CORRECT, 2)).toBeCloseTo(0.29, 12);
  });

  it("accepts booleans and typed arrays for the same data", () => {
    // Same torchmetrics example as above, other containers.
    const correct = DOC_CORRECT.map((x) => x === 1);
    expect(expectedCalibrationError(new Float64Array(DOC_CONFIDENCES), correct, 2)).toBeCloseTo(0.29, 12);
  });

  it("is zero when every bin's accuracy equals its mean confidence", () => {
    // Guo et al. 2017, §2: perfect calibration means accuracy equals confidence in each bin.
    // Ten examples at confidence 0.8, eight of them correct.
    const confidences = new Array(10).fill(0.8);
    const correct = [1, 1, 1, 1, 1, 1, 1, 1, 0, 0];
    expect(expectedCalibrationError(confidences, correct)).toBeCloseTo(0, 12);
  });

  it("returns 0 for no examples", () => {
    // Project convention (empty sum), documented in calibration.ts.
    expect(expectedCalibrationError([], [])).toBe(0);
  });

  it("rejects a confidence above one, naming the index", () => {
    expect(() => expectedCalibrationError([0.5, 1.2], [1, 0])).toThrow(/confidences\[1\] = 1.2, expected a number in \[0, 1\]/);
  });

  it("rejects a correctness value other than 0, 1, true or false", () => {
    expect(() => expectedCalibrationError([0.5], [2])).toThrow(/correct\[0\] = 2, expected true, false, 0 or 1/);
  });
});

describe("reliabilityBins", () => {
  it("matches the torchmetrics BinaryCalibrationError max-norm docstring example", () => {
    const bins = reliabilityBins(DOC_CONFIDENCES, DOC_CORRECT, 2);
    const largestGap = Math.max(...bins.filter((b) => b.count > 0).map((b) => Math.abs(b.accuracy - b.meanConfidence)));
    expect(largestGap).toBeCloseTo(0.3167, 4);
  });

  it("reports count, mean confidence and accuracy per bin", () => {
    // Hand arithmetic for the torchmetrics example, shown at the top of this file.
    const bins = reliabilityBins(DOC_CONFIDENCES, DOC_CORRECT, 2);
    expect(bins.map((b) => [b.low, b.high, b.count, b.accuracy])).toEqual([
      [0, 0.5, 2, 0],
      [0.5, 1, 3, 1],
    ]);
    expect(bins[0].meanConfidence).toBe(0.25);
    expect(bins[1].meanConfidence).toBeCloseTo(2.05 / 3, 12);
  });

  it("puts a confidence on a bin edge into the lower bin", () => {
    // Guo et al. 2017, §2: bin m is the half-open interval ((m−1)/M, m/M] (definition from memory).
    // 0.5 with two bins belongs to (0, 0.5]; 11/15 with fifteen bins to bin 10, (10/15, 11/15].
    expect(reliabilityBins([0.5], [1], 2).map((b) => b.count)).toEqual([1, 0]);
    expect(reliabilityBins([11 / 15], [1], 15)[10].count).toBe(1);
  });

  it("puts a confidence on a bin edge into the lower bin even when the product rounds above it", () => {
    // Same half-open bins. 0.28 is the double 7/25, the upper edge of bin 6 of 25, although
    // 0.28 · 25 rounds to 7.000000000000001.
    expect(0.28 * 25).toBeGreaterThan(7);
    expect(reliabilityBins([0.28], [1], 25)[6].count).toBe(1);
  });

  it("puts a confidence just above a bin edge into the upper bin despite rounding", () => {
    // Same half-open bins. 0.7333333333333334 is the double just above 11/15 = 0.7333333333333333,
    // so it belongs to bin 11, (11/15, 12/15], although 0.7333333333333334 · 15 rounds to exactly 11.
    expect(0.7333333333333334 * 15).toBe(11);
    expect(reliabilityBins([0.7333333333333334], [1], 15)[11].count).toBe(1);
  });

  it("puts confidence 0 into the first bin and confidence 1 into the last", () => {
    // 0 lies in no half-open bin (i/B, (i+1)/B]; the convention stated in calibration.ts puts it in bin 0.
    expect(reliabilityBins([0, 1], [0, 1], 4).map((b) => b.count)).toEqual([1, 0, 0, 1]);
  });

  it("uses fifteen bins by default", () => {
    // Guo et al. 2017 use M = 15 bins in their experiments (from memory); the default follows.
    expect(reliabilityBins([0.5], [1])).toHaveLength(15);
  });

  it("rejects a bin count below one", () => {
    expect(() => reliabilityBins([0.5], [1], 0)).toThrow(/binCount = 0, expected an integer ≥ 1/);
  });
});
