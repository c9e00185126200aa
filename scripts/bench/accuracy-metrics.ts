// Scores predicted labels against gold labels for `npm run bench:accuracy`, the same way
// for every system (Sluice through its runtime, scikit-learn through its predictions), with
// compiler/metrics. Every test row counts, including rows whose label the training part
// never had (a system cannot predict it, so they are errors for everyone). Macro averages
// run over the labels of the training part and the test part together.
import { computeClassificationMetrics, computeMultilabelMetrics } from "../../compiler/metrics/index.ts";

export interface AccuracyScores {
  /** Single-label: share of rows predicted right. Multi-label: subset accuracy (exact set). */
  accuracy: number;
  macroF1: number;
  /** Multi-label only (single-label micro-F1 equals accuracy). */
  microF1: number | null;
}

function labelIndex(labels: Iterable<string>): Map<string, number> {
  return new Map([...new Set(labels)].sort().map((label, i) => [label, i]));
}

/**
 * Accuracy and macro-F1 of single-label predictions.
 * @example scoreSingleLabel(["a", "b"], ["a", "a"], ["a", "b"]).accuracy // 0.5
 */
export function scoreSingleLabel(gold: readonly string[], predicted: readonly string[], trainLabels: readonly string[]): AccuracyScores {
  if (gold.length !== predicted.length) throw new Error(`scoreSingleLabel: ${gold.length} gold labels but ${predicted.length} predictions`);
  const index = labelIndex([...trainLabels, ...gold, ...predicted]);
  const names = [...index.keys()];
  const metrics = computeClassificationMetrics(
    Int32Array.from(gold, (l) => index.get(l) as number),
    Int32Array.from(predicted, (l) => index.get(l) as number),
    names.length,
    names,
  );
  return { accuracy: metrics.accuracy, macroF1: metrics.macroF1, microF1: null };
}

/**
 * Subset accuracy, micro-F1 and macro-F1 of multi-label predictions.
 * @example scoreMultiLabel([["a", "b"]], [["a"]], ["a", "b"]).microF1 // 0.667
 */
export function scoreMultiLabel(gold: readonly (readonly string[])[], predicted: readonly (readonly string[])[], trainLabels: readonly string[]): AccuracyScores {
  if (gold.length !== predicted.length) throw new Error(`scoreMultiLabel: ${gold.length} gold sets but ${predicted.length} predictions`);
  const index = labelIndex([...trainLabels, ...gold.flat(), ...predicted.flat()]);
  const names = [...index.keys()];
  const toSets = (sets: readonly (readonly string[])[]) => sets.map((set) => set.map((l) => index.get(l) as number));
  const metrics = computeMultilabelMetrics(toSets(gold), toSets(predicted), names.length, names);
  return { accuracy: metrics.subsetAccuracy, macroF1: metrics.macroF1, microF1: metrics.microF1 };
}
