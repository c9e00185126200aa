// Expected calibration error and reliability-diagram bins, as defined by Guo, Pleiss, Sun
// & Weinberger, "On Calibration of Modern Neural Networks", ICML 2017, §2: split [0, 1]
// into B equal-width bins, bin m holding confidences in ((m−1)/B, m/B]; then
// ECE = Σ_m (|B_m| / N) · |acc(B_m) − conf(B_m)|.
// Here bins are numbered from 0: bin i holds (i/B, (i+1)/B], and confidence 0 (which
// belongs to no half-open bin) goes into bin 0. Edges are compared as the doubles i/B, so
// a confidence equal to an edge value lands in the lower bin.

import { checkInteger, checkSameLength, checkUnitInterval, type NumberList } from "./input-checks.ts";
import { metricsInputError } from "./metrics-input-error.ts";

/** One bin of a reliability diagram. Empty bins report 0 mean confidence and 0 accuracy. */
export interface ReliabilityBin {
  /** Bin edges: the bin holds confidences in (low, high] (bin 0 also holds 0). */
  low: number;
  high: number;
  count: number;
  meanConfidence: number;
  /** Share of the bin's examples that were correct. */
  accuracy: number;
}

/** Whether each example was classified correctly: booleans or 0/1. */
export type CorrectnessList = Uint8Array | readonly boolean[] | NumberList;

// Index of the bin holding `confidence`: the i with i/B < confidence ≤ (i+1)/B.
function binIndex(confidence: number, binCount: number): number {
  let i = Math.ceil(confidence * binCount) - 1;
  // The product can round across an edge either way: 0.28 · 25 = 7.000000000000001 although 0.28
  // is the edge 7/25, and 0.7333333333333334 (just above 11/15) · 15 = 11 exactly. Step back or
  // forward so the comparison with the edge doubles decides.
  if (i > 0 && confidence <= i / binCount) i--;
  else if (i < binCount - 1 && confidence > (i + 1) / binCount) i++;
  return Math.max(0, Math.min(binCount - 1, i));
}

/**
 * Per-bin count, mean confidence and accuracy over `binCount` equal-width bins of [0, 1]
 * (bin i holds (i/B, (i+1)/B], confidence 0 goes into bin 0), for drawing a reliability diagram.
 * @example
 * reliabilityBins([0.25, 0.75], [false, true], 2)[0]
 * // { low: 0, high: 0.5, count: 1, meanConfidence: 0.25, accuracy: 0 }
 */
export function reliabilityBins(
  confidences: Float32Array | Float64Array | NumberList,
  correct: CorrectnessList,
  binCount = 15,
): ReliabilityBin[] {
  const fn = "reliabilityBins";
  checkInteger(fn, "binCount", binCount, 1);
  checkSameLength(fn, "confidences", confidences, "correct", correct);
  const counts = new Float64Array(binCount);
  const confidenceSums = new Float64Array(binCount);
  const correctCounts = new Float64Array(binCount);
  for (let i = 0; i < confidences.length; i++) {
    const confidence = confidences[i];
    checkUnitInterval(fn, `confidences[${i}]`, confidence);
    const bin = binIndex(confidence, binCount);
    counts[bin]++;
    confidenceSums[bin] += confidence;
    const outcome = correct[i];
    if (outcome !== true && outcome !== false && outcome !== 0 && outcome !== 1) {
      throw metricsInputError("bad-number", fn, `correct[${i}] = ${String(outcome)}, expected true, false, 0 or 1`);
    }
    if (outcome === true || outcome === 1) correctCounts[bin]++;
  }
  const bins: ReliabilityBin[] = [];
  for (let b = 0; b < binCount; b++) {
    const count = counts[b];
    bins.push({
      low: b / binCount,
      high: (b + 1) / binCount,
      count,
      meanConfidence: count === 0 ? 0 : confidenceSums[b] / count,
      accuracy: count === 0 ? 0 : correctCounts[b] / count,
    });
  }
  return bins;
}

/**
 * Expected calibration error (Guo et al. 2017): Σ over bins of (n_b / N)·|accuracy_b − meanConfidence_b|,
 * with `binCount` equal-width bins as in `reliabilityBins`. No examples gives 0.
 * @example expectedCalibrationError([0.25, 0.25, 0.55, 0.75, 0.75], [0, 0, 1, 1, 1], 2) // ≈ 0.29
 */
export function expectedCalibrationError(
  confidences: Float32Array | Float64Array | NumberList,
  correct: CorrectnessList,
  binCount = 15,
): number {
  const bins = reliabilityBins(confidences, correct, binCount);
  const total = confidences.length;
  if (total === 0) return 0;
  let error = 0;
  for (const bin of bins) {
    if (bin.count > 0) error += (bin.count / total) * Math.abs(bin.accuracy - bin.meanConfidence);
  }
  return error;
}
