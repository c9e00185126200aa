// Single-label metrics from gold and predicted label indices: accuracy, per-label
// precision/recall/F1, the three usual F1 averages and the confusion matrix.
// Conventions follow scikit-learn's precision_recall_fscore_support so numbers can be
// compared with it: a ratio whose denominator is 0 is 0 (its zero_division=0 setting),
// and averages run over every label in labelNames, present in the data or not (as
// scikit-learn does when given labels=...). Such absent labels pull macro averages down.

import {
  checkLabelIndex,
  checkLabelNames,
  checkSameLength,
  divideOrZero,
  type NumberList,
} from "./input-checks.ts";

/** Precision, recall, F1 and support (gold count) of one label. */
export interface LabelScores {
  precision: number;
  recall: number;
  f1: number;
  support: number;
}

/**
 * One label's precision, recall and F1 from its counts (0 where a ratio would be 0/0).
 * @example labelScoresFromCounts(2, 4, 3) // { precision: 0.5, recall: 0.667, f1: 0.571, support: 3 }
 */
export function labelScoresFromCounts(truePositives: number, predicted: number, support: number): LabelScores {
  return {
    precision: divideOrZero(truePositives, predicted),
    recall: divideOrZero(truePositives, support),
    // 2tp / (2tp + fp + fn) is the harmonic mean of precision and recall without the 0/0 case.
    f1: divideOrZero(2 * truePositives, predicted + support),
    support,
  };
}

/** Per-label scores, by index and by name, and their unweighted (macro) means. */
export interface PerLabelScores {
  scores: LabelScores[];
  labels: Record<string, LabelScores>;
  macroPrecision: number;
  macroRecall: number;
  macroF1: number;
}

/**
 * Scores every label from its counts (single-label and multi-label metrics alike) and
 * averages them with equal weight per label.
 * @example perLabelScores(["ham", "spam"], [3, 1], [4, 1], [3, 2]).macroRecall // (1 + 0.5) / 2
 */
export function perLabelScores(labelNames: readonly string[], truePositives: ArrayLike<number>, predicted: ArrayLike<number>, support: ArrayLike<number>): PerLabelScores {
  const scores: LabelScores[] = [];
  const labels: Record<string, LabelScores> = {};
  let sumPrecision = 0;
  let sumRecall = 0;
  let sumF1 = 0;
  for (let l = 0; l < labelNames.length; l++) {
    const label = labelScoresFromCounts(truePositives[l], predicted[l], support[l]);
    scores.push(label);
    labels[labelNames[l]] = label;
    sumPrecision += label.precision;
    sumRecall += label.recall;
    sumF1 += label.f1;
  }
  const count = labelNames.length;
  return { scores, labels, macroPrecision: sumPrecision / count, macroRecall: sumRecall / count, macroF1: sumF1 / count };
}

/** Everything `computeClassificationMetrics` reports. */
export interface ClassificationMetrics {
  examples: number;
  accuracy: number;
  /** Unweighted mean over all labels in labelNames. */
  macroPrecision: number;
  macroRecall: number;
  macroF1: number;
  /** From summed counts; for single-label data it equals accuracy. */
  microF1: number;
  /** Means weighted by support (gold count). */
  weightedPrecision: number;
  weightedRecall: number;
  weightedF1: number;
  labels: Record<string, LabelScores>;
  /** confusion[gold][predicted] = number of examples. */
  confusion: number[][];
}

/**
 * Accuracy, per-label precision/recall/F1/support, macro/micro/weighted averages and the
 * confusion matrix of single-label predictions. 0/0 counts as 0 (scikit-learn zero_division=0);
 * averages include every label in `labelNames`; no examples gives all zeros.
 * @example
 * computeClassificationMetrics([0, 1, 1], [0, 1, 0], 2, ["ham", "spam"]).accuracy // 2/3
 */
export function computeClassificationMetrics(
  gold: Int32Array | NumberList,
  predicted: Int32Array | NumberList,
  labelCount: number,
  labelNames: readonly string[],
): ClassificationMetrics {
  const fn = "computeClassificationMetrics";
  checkLabelNames(fn, labelCount, labelNames);
  checkSameLength(fn, "gold", gold, "predicted", predicted);

  const confusion: number[][] = [];
  for (let g = 0; g < labelCount; g++) confusion.push(new Array<number>(labelCount).fill(0));
  const examples = gold.length;
  let correct = 0;
  for (let i = 0; i < examples; i++) {
    const g = gold[i];
    const p = predicted[i];
    checkLabelIndex(fn, `gold[${i}]`, g, labelCount);
    checkLabelIndex(fn, `predicted[${i}]`, p, labelCount);
    confusion[g][p]++;
    if (g === p) correct++;
  }

  // Column sums are how often each label was predicted; row sums are its support.
  const predictedCount = new Array<number>(labelCount).fill(0);
  for (let g = 0; g < labelCount; g++) {
    for (let p = 0; p < labelCount; p++) predictedCount[p] += confusion[g][p];
  }

  const truePositives = confusion.map((row, l) => row[l]);
  const support = confusion.map((row) => row.reduce((sum, count) => sum + count, 0));
  const perLabel = perLabelScores(labelNames, truePositives, predictedCount, support);
  let weightedPrecision = 0;
  let weightedRecall = 0;
  let weightedF1 = 0;
  for (let l = 0; l < labelCount; l++) {
    const { precision, recall, f1 } = perLabel.scores[l];
    weightedPrecision += precision * support[l];
    weightedRecall += recall * support[l];
    weightedF1 += f1 * support[l];
  }

  // Micro: every example adds one prediction and one gold label, so summed tp/(tp+fp) and
  // tp/(tp+fn) are both correct/examples, and so is their harmonic mean.
  const accuracy = divideOrZero(correct, examples);
  return {
    examples,
    accuracy,
    macroPrecision: perLabel.macroPrecision,
    macroRecall: perLabel.macroRecall,
    macroF1: perLabel.macroF1,
    microF1: divideOrZero(2 * correct, 2 * examples),
    weightedPrecision: divideOrZero(weightedPrecision, examples),
    weightedRecall: divideOrZero(weightedRecall, examples),
    weightedF1: divideOrZero(weightedF1, examples),
    labels: perLabel.labels,
    confusion,
  };
}
