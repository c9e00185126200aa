import { describe, it, expect } from "vitest";
import { computeClassificationMetrics, MetricsInputError } from "../../../compiler/metrics/index.ts";

// scikit-learn API reference (1.x), sklearn.metrics.f1_score / precision_score / recall_score
// docstring examples (read in the stored scikit-learn source, sklearn/metrics/_classification.py):
//   y_true = [0, 1, 2, 0, 1, 2], y_pred = [0, 2, 1, 0, 0, 1]
//   f1 macro 0.26..., micro 0.33..., weighted 0.26..., per class [0.8, 0, 0]
//   precision macro 0.22..., per class [0.66..., 0, 0]; recall macro 0.33..., per class [1, 0, 0]
// The docs print truncated values; 4/15 = (0.8 + 0 + 0)/3 and 2/9 = (2/3)/3 are their exact forms.
const F1_DOC_GOLD = [0, 1, 2, 0, 1, 2];
const F1_DOC_PREDICTED = [0, 2, 1, 0, 0, 1];
const NAMES_3 = ["a", "b", "c"];

describe("computeClassificationMetrics", () => {
  it("matches the scikit-learn f1_score docstring averages", () => {
    const result = computeClassificationMetrics(F1_DOC_GOLD, F1_DOC_PREDICTED, 3, NAMES_3);
    expect(result.macroF1).toBeCloseTo(4 / 15, 12); // docs: 0.26...
    expect(result.microF1).toBeCloseTo(1 / 3, 12); // docs: 0.33...
    expect(result.weightedF1).toBeCloseTo(4 / 15, 12); // docs: 0.26...
  });

  it("matches the scikit-learn f1_score docstring per-class scores", () => {
    const result = computeClassificationMetrics(F1_DOC_GOLD, F1_DOC_PREDICTED, 3, NAMES_3);
    // docs: f1 array([0.8, 0., 0.]), precision array([0.66..., 0., 0.]), recall array([1., 0., 0.])
    expect(result.labels.a).toEqual({ precision: 2 / 3, recall: 1, f1: 0.8, support: 2 });
    expect(result.labels.b).toEqual({ precision: 0, recall: 0, f1: 0, support: 2 });
    expect(result.labels.c).toEqual({ precision: 0, recall: 0, f1: 0, support: 2 });
  });

  it("matches the scikit-learn precision_score and recall_score docstring macro averages", () => {
    const result = computeClassificationMetrics(F1_DOC_GOLD, F1_DOC_PREDICTED, 3, NAMES_3);
    expect(result.macroPrecision).toBeCloseTo(2 / 9, 12); // docs: 0.22...
    expect(result.weightedPrecision).toBeCloseTo(2 / 9, 12); // docs: 0.22...
    expect(result.macroRecall).toBeCloseTo(1 / 3, 12); // docs: 0.33...
    expect(result.weightedRecall).toBeCloseTo(1 / 3, 12); // docs: 0.33...
  });

  it("matches the scikit-learn confusion_matrix docstring example with rows as gold labels", () => {
    // scikit-learn API reference, sklearn.metrics.confusion_matrix docstring:
    // y_true = [2, 0, 2, 2, 0, 1], y_pred = [0, 0, 2, 2, 0, 2] → [[2, 0, 0], [0, 0, 1], [1, 0, 2]]
    const result = computeClassificationMetrics([2, 0, 2, 2, 0, 1], [0, 0, 2, 2, 0, 2], 3, NAMES_3);
    expect(result.confusion).toEqual([
      [2, 0, 0],
      [0, 0, 1],
      [1, 0, 2],
    ]);
  });

  it("matches the scikit-learn classification_report docstring table", () => {
    // scikit-learn API reference, sklearn.metrics.classification_report docstring:
    // y_true = [0, 1, 2, 2, 2], y_pred = [0, 0, 2, 2, 1], printed to 2 decimals:
    //   class 0: 0.50 1.00 0.67 1; class 1: 0.00 0.00 0.00 1; class 2: 1.00 0.67 0.80 3
    //   accuracy 0.60; macro avg 0.50 0.56 0.49; weighted avg 0.70 0.60 0.61
    const result = computeClassificationMetrics([0, 1, 2, 2, 2], [0, 0, 2, 2, 1], 3, ["class 0", "class 1", "class 2"]);
    const rows = ["class 0", "class 1", "class 2"].map((name) => result.labels[name]);
    const expected = [
      [0.5, 1.0, 0.67, 1],
      [0.0, 0.0, 0.0, 1],
      [1.0, 0.67, 0.8, 3],
    ];
    rows.forEach((row, i) => {
      expect(row.precision).toBeCloseTo(expected[i][0], 2);
      expect(row.recall).toBeCloseTo(expected[i][1], 2);
      expect(row.f1).toBeCloseTo(expected[i][2], 2);
      expect(row.support).toBe(expected[i][3]);
    });
    expect(result.accuracy).toBeCloseTo(0.6, 12);
    expect([result.macroPrecision, result.macroRecall, result.macroF1].map((x) => Math.round(x * 100) / 100)).toEqual([
      0.5, 0.56, 0.49,
    ]);
    expect(
      [result.weightedPrecision, result.weightedRecall, result.weightedF1].map((x) => Math.round(x * 100) / 100),
    ).toEqual([0.7, 0.6, 0.61]);
  });

  it("reports micro F1 equal to accuracy for single-label predictions", () => {
    // scikit-learn API reference, sklearn.metrics.accuracy_score docstring:
    // y_pred = [0, 2, 1, 3], y_true = [0, 1, 2, 3] → 0.5. Micro F1 equals accuracy for
    // single-label data (classification_report docstring: micro average "corresponds to accuracy").
    const result = computeClassificationMetrics([0, 1, 2, 3], [0, 2, 1, 3], 4, ["a", "b", "c", "d"]);
    expect(result.accuracy).toBe(0.5);
    expect(result.microF1).toBe(0.5);
  });

  it("sets precision to 0 for a label that is never predicted", () => {
    // scikit-learn API reference, sklearn.metrics.precision_score docstring:
    // y_true = [0, 1, 2, 0, 1, 2], y_pred = [0, 0, 0, 0, 0, 0] → array([0.33..., 0., 0.])
    // with the default zero_division acting as 0.
    const result = computeClassificationMetrics(F1_DOC_GOLD, [0, 0, 0, 0, 0, 0], 3, NAMES_3);
    expect(result.labels.a.precision).toBeCloseTo(1 / 3, 12);
    expect(result.labels.b.precision).toBe(0);
    expect(result.labels.c.precision).toBe(0);
  });

  it("sets recall to 0 for a label that never occurs in gold", () => {
    // scikit-learn API reference, sklearn.metrics.recall_score docstring:
    // y_true = [0, 0, 0, 0, 0, 0], y_pred = [0, 2, 1, 0, 0, 1] → array([0.5, 0., 0.])
    const result = computeClassificationMetrics([0, 0, 0, 0, 0, 0], F1_DOC_PREDICTED, 3, NAMES_3);
    expect(result.labels.a.recall).toBe(0.5);
    expect(result.labels.b.recall).toBe(0);
    expect(result.labels.c.recall).toBe(0);
  });

  it("counts a label absent from the data as a zero in the macro average", () => {
    // scikit-learn f1_score docstring, parameter labels: "labels not present in the data will
    // result in 0 components in a macro average". Adding a fourth, unused label to the
    // f1_score example therefore gives macro F1 = 0.8 / 4; weighted F1 is unchanged (support 0).
    const result = computeClassificationMetrics(F1_DOC_GOLD, F1_DOC_PREDICTED, 4, ["a", "b", "c", "unused"]);
    expect(result.macroF1).toBeCloseTo(0.2, 12);
    expect(result.weightedF1).toBeCloseTo(4 / 15, 12);
    expect(result.labels.unused).toEqual({ precision: 0, recall: 0, f1: 0, support: 0 });
  });

  it("gives the same result for Int32Array and plain array input", () => {
    // Same data as the scikit-learn f1_score docstring example; only the container differs.
    const fromArrays = computeClassificationMetrics(F1_DOC_GOLD, F1_DOC_PREDICTED, 3, NAMES_3);
    const fromTyped = computeClassificationMetrics(
      Int32Array.from(F1_DOC_GOLD),
      Int32Array.from(F1_DOC_PREDICTED),
      3,
      NAMES_3,
    );
    expect(fromTyped).toEqual(fromArrays);
  });

  it("returns zero scores and an all-zero confusion matrix for no examples", () => {
    // Project convention (0/0 = 0 throughout compiler/metrics), documented in classification-metrics.ts.
    const result = computeClassificationMetrics([], [], 2, ["a", "b"]);
    expect(result.examples).toBe(0);
    expect([result.accuracy, result.macroF1, result.microF1, result.weightedF1]).toEqual([0, 0, 0, 0]);
    expect(result.confusion).toEqual([
      [0, 0],
      [0, 0],
    ]);
  });

  it("rejects a predicted label outside the label range, naming the index", () => {
    expect(() => computeClassificationMetrics([0, 1, 1], [0, 1, 5], 2, ["a", "b"])).toThrow(
      /predicted\[2\] = 5, expected an integer label index in \[0, 2\)/,
    );
  });

  it("rejects gold and predicted lists of different lengths", () => {
    expect(() => computeClassificationMetrics([0, 1], [0], 2, ["a", "b"])).toThrow(MetricsInputError);
    expect(() => computeClassificationMetrics([0, 1], [0], 2, ["a", "b"])).toThrow(/gold has 2 entries but predicted has 1/);
  });

  it("rejects label names that do not match the label count", () => {
    expect(() => computeClassificationMetrics([0], [0], 3, ["a", "b"])).toThrow(/labelNames has 2 names but labelCount is 3/);
  });

  it("rejects repeated label names", () => {
    expect(() => computeClassificationMetrics([0], [0], 2, ["a", "a"])).toThrow(/labelNames\[1\] = "a" repeats/);
  });
});
