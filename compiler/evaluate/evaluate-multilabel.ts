// Metrics for sigmoid-head models, where an example may carry several labels. The predicted
// set of a text is what model.classify(text) returns without `top`: every label whose score
// reaches its threshold (model.meta.thresholds, 0.5 when absent). Rankings for precision@k /
// recall@k order all labels by score. The formulas live in compiler/metrics.

import type { Model } from "../../runtime/model/model.ts";
import { scoreTexts, type LabelledText, type ScoredSet } from "./evaluate.ts";
import { computeMultilabelMetrics, precisionAtK, rankLabelsByScore, recallAtK, type LabelScores, type MultilabelMetrics } from "../metrics/index.ts";

/** Per-label scores plus the threshold the predictions used. */
export interface MultilabelLabelReport extends LabelScores {
  threshold: number;
}

export interface MultilabelEvaluationReport extends Omit<MultilabelMetrics, "labels"> {
  /** Mean over examples of |top-k ∩ gold| / k (divides by k even when fewer labels exist). */
  precisionAt1: number;
  precisionAt3: number;
  /** Mean over examples of |top-k ∩ gold| / |gold|. */
  recallAt1: number;
  recallAt3: number;
  labels: Record<string, MultilabelLabelReport>;
  usPerDoc: number;
  /** Examples with a gold label the model does not know (left out of the metrics). */
  unknownLabelExamples: number;
  unknownLabels: string[];
}

/**
 * Subset accuracy, Hamming loss, micro/macro precision/recall/F1 at the model's thresholds,
 * precision@k and recall@k (k = 1, 3) and per-label scores.
 * @example evaluateMultilabel(model, [{ text: "refund, urgent!", labels: ["billing", "urgent"] }]).subsetAccuracy
 */
export function evaluateMultilabel(model: Model, examples: readonly LabelledText[], scored?: ScoredSet): MultilabelEvaluationReport {
  const labels = model.labels;
  const k = labels.length;
  const index = new Map(labels.map((label, i) => [label, i]));
  const thresholds = model.meta.thresholds ?? labels.map(() => 0.5);
  const set = scored ?? scoreTexts(model, examples.map((e) => e.text));
  const unknown = new Set<string>();
  const gold: number[][] = [];
  const predicted: number[][] = [];
  const ranked: Int32Array[] = [];
  examples.forEach((example, i) => {
    const missing = example.labels.filter((label) => !index.has(label));
    if (missing.length > 0) {
      for (const label of missing) unknown.add(label);
      return;
    }
    gold.push(example.labels.map((label) => index.get(label) as number));
    const row = set.scores.subarray(i * k, (i + 1) * k);
    const chosen: number[] = [];
    for (let j = 0; j < k; j++) if (row[j] >= thresholds[j]) chosen.push(j);
    predicted.push(chosen);
    ranked.push(rankLabelsByScore(row));
  });
  const metrics = computeMultilabelMetrics(gold, predicted, k, labels);
  const perLabel: Record<string, MultilabelLabelReport> = {};
  labels.forEach((label, j) => {
    perLabel[label] = { ...metrics.labels[label], threshold: thresholds[j] };
  });
  return {
    examples: gold.length,
    subsetAccuracy: metrics.subsetAccuracy,
    hammingLoss: metrics.hammingLoss,
    microPrecision: metrics.microPrecision,
    microRecall: metrics.microRecall,
    microF1: metrics.microF1,
    macroPrecision: metrics.macroPrecision,
    macroRecall: metrics.macroRecall,
    macroF1: metrics.macroF1,
    precisionAt1: precisionAtK(gold, ranked, 1),
    precisionAt3: precisionAtK(gold, ranked, 3),
    recallAt1: recallAtK(gold, ranked, 1),
    recallAt3: recallAtK(gold, ranked, 3),
    labels: perLabel,
    usPerDoc: set.usPerDoc,
    unknownLabelExamples: examples.length - gold.length,
    unknownLabels: [...unknown].sort(),
  };
}
