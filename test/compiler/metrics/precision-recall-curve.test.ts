import { describe, it, expect } from "vitest";
import {
  precisionRecallCurve,
  thresholdForTargetPrecision,
  thresholdForTargetRecall,
} from "../../../compiler/metrics/index.ts";

// scikit-learn 1.x API reference, sklearn.metrics.precision_recall_curve docstring (read in
// stored copies of sklearn/metrics/_ranking.py): y_true = [0, 0, 1, 1], y_scores = [0.1, 0.4, 0.35, 0.8]
//   precision  [0.5, 0.66666667, 0.5, 1., 1.]
//   recall     [1., 1., 0.5, 0.5, 0.]
//   thresholds [0.1, 0.35, 0.4, 0.8]
// scikit-learn lists increasing thresholds and appends a (precision 1, recall 0) end point;
// this curve lists decreasing thresholds without it, so the expected rows are reversed.
const DOC_SCORES = [0.1, 0.4, 0.35, 0.8];
const DOC_POSITIVES = [false, false, true, true];

describe("precisionRecallCurve", () => {
  it("matches the scikit-learn precision_recall_curve docstring example", () => {
    const curve = precisionRecallCurve(DOC_SCORES, DOC_POSITIVES);
    expect(curve.map((p) => p.threshold)).toEqual([0.8, 0.4, 0.35, 0.1]);
    expect(curve.map((p) => p.recall)).toEqual([0.5, 0.5, 1, 1]);
    const precision = curve.map((p) => p.precision);
    [1, 0.5, 0.66666667, 0.5].forEach((expected, i) => expect(precision[i]).toBeCloseTo(expected, 8));
  });

  it("reports true and false positive counts at each threshold", () => {
    // Same docstring data; counts behind the precision values above (score ≥ threshold is positive).
    const curve = precisionRecallCurve(DOC_SCORES, DOC_POSITIVES);
    expect(curve.map((p) => [p.truePositives, p.falsePositives])).toEqual([
      [1, 0],
      [1, 1],
      [2, 1],
      [2, 2],
    ]);
  });

  it("merges tied scores into one point", () => {
    // scikit-learn's precision_recall_curve yields one threshold per distinct score (from memory).
    // By hand: at 0.5 both tied examples count (tp 1, fp 1); at 0.2 all three (tp 2, fp 1).
    const curve = precisionRecallCurve([0.5, 0.5, 0.2], [1, 0, 1]);
    expect(curve.map((p) => [p.threshold, p.truePositives, p.falsePositives])).toEqual([
      [0.5, 1, 1],
      [0.2, 2, 1],
    ]);
  });

  it("accepts Float32Array scores and Uint8Array labels", () => {
    // The scikit-learn docstring data again; float32 thresholds are the float32 roundings of the scores.
    const curve = precisionRecallCurve(new Float32Array(DOC_SCORES), new Uint8Array([0, 0, 1, 1]));
    expect(curve.map((p) => p.threshold)).toEqual([0.8, 0.4, 0.35, 0.1].map(Math.fround));
    expect(curve.map((p) => p.recall)).toEqual([0.5, 0.5, 1, 1]);
  });

  it("reports recall 0 when there are no positives", () => {
    // 0/0 = 0 convention of compiler/metrics (scikit-learn instead warns and uses 1).
    const curve = precisionRecallCurve([0.3, 0.7], [false, false]);
    expect(curve.map((p) => [p.precision, p.recall])).toEqual([
      [0, 0],
      [0, 0],
    ]);
  });

  it("rejects a NaN score, naming the index", () => {
    expect(() => precisionRecallCurve([0.2, NaN], [true, false])).toThrow(/scores\[1\] is NaN/);
  });

  it("rejects a label other than true, false, 0 or 1", () => {
    expect(() => precisionRecallCurve([0.2], [2])).toThrow(/positives\[0\] = 2/);
  });
});

describe("thresholdForTargetPrecision", () => {
  // All expectations below are read off the scikit-learn docstring curve above.
  const curve = precisionRecallCurve(DOC_SCORES, DOC_POSITIVES);

  it("picks the threshold with the most recall among those meeting the precision target", () => {
    // Precision ≥ 0.6 holds at 0.8 (recall 0.5) and 0.35 (recall 1): 0.35 wins.
    expect(thresholdForTargetPrecision(curve, 0.6)?.threshold).toBe(0.35);
  });

  it("prefers the higher threshold when recall ties", () => {
    // Precision ≥ 0.5 holds everywhere; recall 1 at both 0.35 and 0.1, and 0.35 has fewer false positives.
    expect(thresholdForTargetPrecision(curve, 0.5)?.threshold).toBe(0.35);
  });

  it("finds the only threshold with perfect precision", () => {
    expect(thresholdForTargetPrecision(curve, 1)?.threshold).toBe(0.8);
  });

  it("returns null when the only qualifying point predicts fewer positives than minSupport", () => {
    // Precision 1 holds only at 0.8, where a single example is predicted positive.
    expect(thresholdForTargetPrecision(curve, 1, 2)).toBeNull();
  });

  it("rejects a target outside [0, 1]", () => {
    expect(() => thresholdForTargetPrecision(curve, 1.5)).toThrow(/target = 1.5, expected a number in \[0, 1\]/);
  });
});

describe("thresholdForTargetRecall", () => {
  const curve = precisionRecallCurve(DOC_SCORES, DOC_POSITIVES);

  it("picks the most precise threshold among those meeting the recall target", () => {
    // Recall 1 holds at 0.35 (precision 0.667) and 0.1 (precision 0.5): 0.35 wins.
    expect(thresholdForTargetRecall(curve, 1)?.threshold).toBe(0.35);
  });

  it("takes the highest precise threshold for a low recall target", () => {
    // Recall ≥ 0.5 holds everywhere; precision is highest (1) at 0.8.
    expect(thresholdForTargetRecall(curve, 0.5)?.threshold).toBe(0.8);
  });

  it("returns null when no threshold reaches the recall target", () => {
    // No positives means recall 0 at every threshold.
    expect(thresholdForTargetRecall(precisionRecallCurve([0.3, 0.7], [0, 0]), 0.5)).toBeNull();
  });
});
