import { describe, it, expect } from "vitest";
import { computeMultilabelMetrics, hammingLoss, subsetAccuracy } from "../../../compiler/metrics/index.ts";

// Label-indicator rows from the scikit-learn docs are written here as sets of column indices:
// [[0, 1], [1, 1]] → [[1], [0, 1]].

describe("hammingLoss", () => {
  it("matches the scikit-learn hamming_loss multilabel docstring example", () => {
    // scikit-learn API reference, sklearn.metrics.hamming_loss docstring:
    // hamming_loss(np.array([[0, 1], [1, 1]]), np.zeros((2, 2))) → 0.75
    expect(hammingLoss([[1], [0, 1]], [[], []], 2)).toBe(0.75);
  });

  it("returns 0 for no examples", () => {
    // Project convention (0/0 = 0), documented in multilabel-metrics.ts.
    expect(hammingLoss([], [], 3)).toBe(0);
  });
});

describe("subsetAccuracy", () => {
  it("matches the scikit-learn accuracy_score multilabel docstring example", () => {
    // scikit-learn API reference, sklearn.metrics.accuracy_score docstring:
    // accuracy_score(np.array([[0, 1], [1, 1]]), np.ones((2, 2))) → 0.5
    expect(subsetAccuracy([[1], [0, 1]], [[0, 1], [0, 1]], 2)).toBe(0.5);
  });

  it("ignores label order and repeats within a set", () => {
    // Sets, not lists: scikit-learn compares indicator rows, where order and repeats cannot appear.
    expect(subsetAccuracy([[2, 0]], [[0, 2, 2]], 3)).toBe(1);
  });
});

describe("computeMultilabelMetrics", () => {
  it("matches the scikit-learn f1_score multilabel docstring per-label scores", () => {
    // scikit-learn 1.x API reference, sklearn.metrics.f1_score docstring (multilabel classification):
    // y_true = [[0, 0, 0], [1, 1, 1], [0, 1, 1]], y_pred = [[0, 0, 0], [1, 1, 1], [1, 1, 0]]
    // f1_score(y_true, y_pred, average=None) → array([0.66666667, 1., 0.66666667])
    const result = computeMultilabelMetrics([[], [0, 1, 2], [1, 2]], [[], [0, 1, 2], [0, 1]], 3, ["a", "b", "c"]);
    expect(result.labels.a.f1).toBeCloseTo(0.66666667, 8);
    expect(result.labels.b.f1).toBe(1);
    expect(result.labels.c.f1).toBeCloseTo(0.66666667, 8);
    expect(result.macroF1).toBeCloseTo((2 / 3 + 1 + 2 / 3) / 3, 12);
  });

  it("matches the per-label counts of the scikit-learn multilabel_confusion_matrix docstring", () => {
    // scikit-learn API reference, sklearn.metrics.multilabel_confusion_matrix docstring:
    // y_true = [[1, 0, 1], [0, 1, 0]], y_pred = [[1, 0, 0], [0, 1, 1]] →
    // [[[1, 0], [0, 1]], [[1, 0], [0, 1]], [[0, 1], [1, 0]]]  (each [[tn, fp], [fn, tp]]).
    // So labels 0 and 1 have tp = 1, label 2 has fp = 1 and fn = 1; summed tp = 2, fp = 1, fn = 1.
    const result = computeMultilabelMetrics([[0, 2], [1]], [[0], [1, 2]], 3, ["a", "b", "c"]);
    expect(result.labels.a).toEqual({ precision: 1, recall: 1, f1: 1, support: 1 });
    expect(result.labels.b).toEqual({ precision: 1, recall: 1, f1: 1, support: 1 });
    expect(result.labels.c).toEqual({ precision: 0, recall: 0, f1: 0, support: 1 });
    expect(result.microPrecision).toBeCloseTo(2 / 3, 12);
    expect(result.microRecall).toBeCloseTo(2 / 3, 12);
    expect(result.microF1).toBeCloseTo(2 / 3, 12);
    expect(result.macroPrecision).toBeCloseTo(2 / 3, 12);
  });

  it("derives Hamming loss and subset accuracy from the same multilabel_confusion_matrix example", () => {
    // Same docstring data: fp + fn = 2 wrong cells of 2 × 3, and neither row matches exactly.
    const result = computeMultilabelMetrics([[0, 2], [1]], [[0], [1, 2]], 3, ["a", "b", "c"]);
    expect(result.hammingLoss).toBeCloseTo(2 / 6, 12);
    expect(result.subsetAccuracy).toBe(0);
  });

  it("counts a label repeated inside one set once", () => {
    // Sets semantics (indicator rows in scikit-learn): [1, 1] is the same as [1].
    const once = computeMultilabelMetrics([[1]], [[1]], 2, ["a", "b"]);
    const repeated = computeMultilabelMetrics([[1, 1]], [[1, 1, 1]], 2, ["a", "b"]);
    expect(repeated).toEqual(once);
  });

  it("rejects a gold label outside the label range, naming example and position", () => {
    expect(() => computeMultilabelMetrics([[0], [1, 4]], [[0], [1]], 2, ["a", "b"])).toThrow(
      /gold\[1\]\[1\] = 4, expected an integer label index in \[0, 2\)/,
    );
  });

  it("rejects gold and predicted lists of different lengths", () => {
    expect(() => computeMultilabelMetrics([[0]], [], 2, ["a", "b"])).toThrow(/gold has 1 entries but predicted has 0/);
  });
});
