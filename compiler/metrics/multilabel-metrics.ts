// Metrics for several labels per example (the sigmoid head): each example has a set of
// gold label indices and a set of predicted ones. Conventions match scikit-learn on
// label-indicator matrices with labelCount columns: 0/0 is 0 (zero_division=0), macro
// averages run over all labelCount labels, subset accuracy needs the sets to match exactly,
// and Hamming loss counts wrong (example, label) cells out of examples × labelCount.
// Repeated indices inside one set count once: these are sets.

import {
  checkInteger,
  checkLabelIndex,
  checkLabelNames,
  checkSameLength,
  divideOrZero,
  type NumberList,
} from "./input-checks.ts";
import { perLabelScores, type LabelScores } from "./classification-metrics.ts";

/** The label indices of one example, in any order. */
export type LabelSet = Int32Array | NumberList;

/** Everything `computeMultilabelMetrics` reports. */
export interface MultilabelMetrics {
  examples: number;
  /** Share of examples whose predicted set equals the gold set. */
  subsetAccuracy: number;
  /** Share of (example, label) cells predicted wrongly. */
  hammingLoss: number;
  /** From true/false positives and negatives summed over labels. */
  microPrecision: number;
  microRecall: number;
  microF1: number;
  /** Unweighted means over all labels. */
  macroPrecision: number;
  macroRecall: number;
  macroF1: number;
  labels: Record<string, LabelScores>;
}

interface MultilabelCounts {
  truePositives: Int32Array;
  falsePositives: Int32Array;
  support: Int32Array;
  exactMatches: number;
  wrongCells: number;
}

// One pass over the examples. Stamps (example index + 1) mark which labels are in the
// current gold and predicted sets, so no per-example allocation and duplicates count once.
function countMultilabel(
  functionName: string,
  gold: readonly LabelSet[],
  predicted: readonly LabelSet[],
  labelCount: number,
): MultilabelCounts {
  checkInteger(functionName, "labelCount", labelCount, 1);
  checkSameLength(functionName, "gold", gold, "predicted", predicted);
  const goldStamp = new Int32Array(labelCount);
  const predictedStamp = new Int32Array(labelCount);
  const truePositives = new Int32Array(labelCount);
  const falsePositives = new Int32Array(labelCount);
  const support = new Int32Array(labelCount);
  let exactMatches = 0;
  let wrongCells = 0;
  for (let i = 0; i < gold.length; i++) {
    const stamp = i + 1;
    const goldSet = gold[i];
    let goldSize = 0;
    for (let j = 0; j < goldSet.length; j++) {
      const label = goldSet[j];
      checkLabelIndex(functionName, `gold[${i}][${j}]`, label, labelCount);
      if (goldStamp[label] !== stamp) {
        goldStamp[label] = stamp;
        goldSize++;
        support[label]++;
      }
    }
    const predictedSet = predicted[i];
    let predictedSize = 0;
    let hits = 0;
    for (let j = 0; j < predictedSet.length; j++) {
      const label = predictedSet[j];
      checkLabelIndex(functionName, `predicted[${i}][${j}]`, label, labelCount);
      if (predictedStamp[label] === stamp) continue;
      predictedStamp[label] = stamp;
      predictedSize++;
      if (goldStamp[label] === stamp) {
        truePositives[label]++;
        hits++;
      } else {
        falsePositives[label]++;
      }
    }
    // Cells that differ: gold-only labels plus predicted-only labels.
    wrongCells += goldSize + predictedSize - 2 * hits;
    if (hits === goldSize && hits === predictedSize) exactMatches++;
  }
  return { truePositives, falsePositives, support, exactMatches, wrongCells };
}

/**
 * Subset accuracy, Hamming loss, micro and macro precision/recall/F1 and per-label scores
 * for predicted label sets. 0/0 counts as 0; macro averages include all `labelCount` labels.
 * @example
 * computeMultilabelMetrics([[1], [0, 1]], [[0, 1], [0, 1]], 2, ["billing", "urgent"]).subsetAccuracy // 0.5
 */
export function computeMultilabelMetrics(
  gold: readonly LabelSet[],
  predicted: readonly LabelSet[],
  labelCount: number,
  labelNames: readonly string[],
): MultilabelMetrics {
  const fn = "computeMultilabelMetrics";
  checkLabelNames(fn, labelCount, labelNames);
  const counts = countMultilabel(fn, gold, predicted, labelCount);
  const examples = gold.length;

  const predictedCount = counts.truePositives.map((truePositives, l) => truePositives + counts.falsePositives[l]);
  const perLabel = perLabelScores(labelNames, counts.truePositives, predictedCount, counts.support);
  let allTruePositives = 0;
  let allPredicted = 0;
  let allGold = 0;
  for (let l = 0; l < labelCount; l++) {
    allTruePositives += counts.truePositives[l];
    allPredicted += predictedCount[l];
    allGold += counts.support[l];
  }

  return {
    examples,
    subsetAccuracy: divideOrZero(counts.exactMatches, examples),
    hammingLoss: divideOrZero(counts.wrongCells, examples * labelCount),
    microPrecision: divideOrZero(allTruePositives, allPredicted),
    microRecall: divideOrZero(allTruePositives, allGold),
    microF1: divideOrZero(2 * allTruePositives, allPredicted + allGold),
    macroPrecision: perLabel.macroPrecision,
    macroRecall: perLabel.macroRecall,
    macroF1: perLabel.macroF1,
    labels: perLabel.labels,
  };
}

/**
 * Share of examples whose predicted label set equals the gold set exactly. No examples gives 0.
 * @example subsetAccuracy([[1], [0, 1]], [[0, 1], [0, 1]], 2) // 0.5
 */
export function subsetAccuracy(gold: readonly LabelSet[], predicted: readonly LabelSet[], labelCount: number): number {
  const counts = countMultilabel("subsetAccuracy", gold, predicted, labelCount);
  return divideOrZero(counts.exactMatches, gold.length);
}

/**
 * Share of (example, label) cells where prediction and gold disagree, out of
 * examples × labelCount. No examples gives 0.
 * @example hammingLoss([[1], [0, 1]], [[], []], 2) // 0.75
 */
export function hammingLoss(gold: readonly LabelSet[], predicted: readonly LabelSet[], labelCount: number): number {
  const counts = countMultilabel("hammingLoss", gold, predicted, labelCount);
  return divideOrZero(counts.wrongCells, gold.length * labelCount);
}
