// Honest numbers for a model on labelled data: it scores each text through the runtime
// (exactly what ships), then computes metrics with compiler/metrics.

import type { Model } from "../../runtime/model/model.ts";
import { topLabel } from "../../runtime/model/rank-labels.ts";
import { computeClassificationMetrics, expectedCalibrationError, logLoss, type LabelScores } from "../metrics/index.ts";

/** A text with its gold labels (the readers' Example satisfies this). */
export interface LabelledText {
  text: string;
  labels: string[];
  /** Rows of one origin (a document, a thread, a source) share a group; splits keep a group together. */
  group?: string;
}

/** Scores of many texts: row i of `scores` (labelCount wide) belongs to text i. */
export interface ScoredSet {
  scores: Float32Array;
  labelCount: number;
  count: number;
  /** Mean microseconds per text for featurize + score. */
  usPerDoc: number;
}

/**
 * Scores texts with the model (the runtime's own code path).
 * @example scoreTexts(model, ["hello"]).scores
 */
export function scoreTexts(model: Model, texts: readonly string[]): ScoredSet {
  const labelCount = model.labels.length;
  const scores = new Float32Array(texts.length * labelCount);
  const row = new Float32Array(labelCount);
  const started = performance.now();
  for (let i = 0; i < texts.length; i++) {
    model.scoreInto(texts[i], row);
    scores.set(row, i * labelCount);
  }
  const elapsed = performance.now() - started;
  return { scores, labelCount, count: texts.length, usPerDoc: texts.length > 0 ? (elapsed * 1000) / texts.length : 0 };
}

export interface EvaluationReport {
  examples: number;
  accuracy: number;
  macroF1: number;
  microF1: number;
  weightedF1: number;
  logLoss: number;
  /** Expected calibration error of the top score, 15 equal-width bins. */
  ece: number;
  labels: Record<string, LabelScores>;
  /** confusion[gold][predicted], in `confusionLabels` order. */
  confusion: number[][];
  confusionLabels: string[];
  usPerDoc: number;
  /** Examples whose gold label the model does not know (left out of the metrics). */
  unknownLabelExamples: number;
  unknownLabels: string[];
}

/** Gold label index of each example (first label), or -1 when the model lacks it. */
export function goldIndexes(model: Model, examples: readonly LabelledText[]): { gold: Int32Array; unknown: Set<string> } {
  const index = new Map(model.labels.map((label, i) => [label, i]));
  const gold = new Int32Array(examples.length);
  const unknown = new Set<string>();
  examples.forEach((example, i) => {
    const k = index.get(example.labels[0]);
    if (k === undefined) {
      gold[i] = -1;
      unknown.add(example.labels[0]);
    } else gold[i] = k;
  });
  return { gold, unknown };
}

/**
 * Accuracy, macro/micro F1, per-label precision/recall/F1, confusion, log-loss, ECE, speed.
 * @example evaluateModel(model, [{ text: "refund please", labels: ["billing"] }]).accuracy
 */
export function evaluateModel(model: Model, examples: readonly LabelledText[], scored?: ScoredSet): EvaluationReport {
  const { gold, unknown } = goldIndexes(model, examples);
  const known: number[] = [];
  for (let i = 0; i < gold.length; i++) if (gold[i] >= 0) known.push(i);
  const set = scored ?? scoreTexts(model, examples.map((e) => e.text));
  return metricsFromScores(model.labels, set, gold, known, unknown, set.usPerDoc);
}

/** The top label of each of the `known` rows of a texts × labels score array, its score, and whether it is the gold label. */
export interface TopLabelRows {
  predicted: Int32Array;
  /** The top score as stored (callers that bin it clamp float rounding into [0, 1]). */
  confidence: Float64Array;
  correct: Uint8Array;
}

/**
 * Reads the top label of every known row once, for the metrics, the calibration summary and the report.
 * @example topLabelRows(set.scores, labels.length, gold, [0, 1]).correct // Uint8Array [1, 0]
 */
export function topLabelRows(scores: ArrayLike<number>, labelCount: number, gold: Int32Array, known: readonly number[]): TopLabelRows {
  const predicted = new Int32Array(known.length);
  const confidence = new Float64Array(known.length);
  const correct = new Uint8Array(known.length);
  known.forEach((i, n) => {
    const best = topLabel(scores, i * labelCount, labelCount);
    predicted[n] = best;
    confidence[n] = scores[i * labelCount + best];
    correct[n] = best === gold[i] ? 1 : 0;
  });
  return { predicted, confidence, correct };
}

/** Metrics over the `known` rows of a scored set. */
export function metricsFromScores(labels: readonly string[], set: ScoredSet, gold: Int32Array, known: number[], unknown: Set<string>, usPerDoc: number): EvaluationReport {
  const k = labels.length;
  const { predicted, confidence, correct } = topLabelRows(set.scores, k, gold, known);
  const goldKnown = new Int32Array(known.length);
  const goldProbability = new Float64Array(known.length);
  known.forEach((i, n) => {
    goldKnown[n] = gold[i];
    goldProbability[n] = set.scores[i * k + gold[i]];
  });
  const metrics = computeClassificationMetrics(goldKnown, predicted, k, labels);
  return {
    examples: known.length,
    accuracy: metrics.accuracy,
    macroF1: metrics.macroF1,
    microF1: metrics.microF1,
    weightedF1: metrics.weightedF1,
    logLoss: known.length > 0 ? logLoss(goldProbability) : 0,
    ece: known.length > 0 ? expectedCalibrationError(confidence, correct, 15) : 0,
    labels: metrics.labels,
    confusion: metrics.confusion,
    confusionLabels: [...labels],
    usPerDoc,
    unknownLabelExamples: gold.length - known.length,
    unknownLabels: [...unknown].sort(),
  };
}
