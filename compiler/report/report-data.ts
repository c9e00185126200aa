// Everything the report draws, computed once from the model and the labelled data: scores
// through the runtime (what ships), the evaluation, per-label precision–recall curves with
// their operating points, the reliability bins and the most confident mistakes.

import type { Model } from "../../runtime/model/model.ts";
import type { PolicyRule } from "../../runtime/model/policy.ts";
import { evaluateModel, goldIndexes, scoreTexts, topLabelRows, type EvaluationReport, type LabelledText } from "../evaluate/evaluate.ts";
import { expectedCalibrationError, precisionRecallCurve, reliabilityBins, type CurvePoint, type ReliabilityBin } from "../metrics/index.ts";

/** Equal-width confidence bins of the reliability diagram (Guo et al. 2017 use 15). */
export const RELIABILITY_BIN_COUNT = 15;
/** How many of the most confident mistakes the report lists. */
export const MISTAKES_LISTED = 10;

/** A labelled text, optionally with the line of the data file it came from. */
export type ReportExample = LabelledText & { line?: number };

/** One marked point on a label's precision–recall curve, measured on the given data. */
export interface OperatingPoint {
  /** "rule": a policy threshold; "review": the start of a rule's review band; "argmax": the top label; "threshold": a sigmoid head's own threshold. */
  kind: "rule" | "review" | "argmax" | "threshold";
  /** How people read it, e.g. "block at ≥ 0.850" or "top label (argmax)". */
  name: string;
  /** The same in a few characters for the chart's key, e.g. "block ≥ 0.850" or "argmax". */
  shortName: string;
  /** Null for argmax, which has no single score threshold. */
  threshold: number | null;
  precision: number;
  recall: number;
  /** Texts predicted as the label at this point, and how many of them were right. */
  predicted: number;
  truePositives: number;
}

/** What the report knows about one label. */
export interface LabelReport {
  label: string;
  index: number;
  curve: CurvePoint[];
  /** Share of examples carrying the label (the precision of a classifier that says yes to everything). */
  prevalence: number;
  positives: number;
  points: OperatingPoint[];
  rule: PolicyRule | null;
}

/** A wrong top label given with high confidence: often a labelling error worth a look. */
export interface ConfidentMistake {
  text: string;
  line: number | null;
  gold: string;
  predicted: string;
  confidence: number;
}

export interface ReportData {
  model: Model;
  evaluation: EvaluationReport;
  labels: LabelReport[];
  bins: ReliabilityBin[];
  ece: number;
  mistakes: ConfidentMistake[];
  /** Examples that went into the numbers (those whose first label the model knows). */
  scoredExamples: number;
}

/**
 * Scores `examples` with `model` and derives everything the report draws. A given
 * `evaluation` (for the same model and examples) is reused instead of being recomputed.
 * @example collectReportData(model, [{ text: "refund please", labels: ["billing"] }]).evaluation.accuracy
 */
export function collectReportData(model: Model, examples: readonly ReportExample[], evaluation?: EvaluationReport): ReportData {
  const labels = model.labels;
  const labelCount = labels.length;
  const scored = scoreTexts(model, examples.map((e) => e.text));
  const report = evaluation ?? evaluateModel(model, examples, scored);
  const { gold } = goldIndexes(model, examples);
  const known: number[] = [];
  for (let i = 0; i < gold.length; i++) if (gold[i] >= 0) known.push(i);

  const { confidence, correct, predicted } = topLabelRows(scored.scores, labelCount, gold, known);
  // Scores are float32; clamp so rounding can never leave [0, 1].
  for (let n = 0; n < confidence.length; n++) confidence[n] = Math.min(1, Math.max(0, confidence[n]));

  const labelReports = labels.map((label, k) => {
    const scores = new Float64Array(known.length);
    const positives = new Uint8Array(known.length);
    let positiveCount = 0;
    known.forEach((i, n) => {
      scores[n] = scored.scores[i * labelCount + k];
      // Every gold label counts for the curve, so several-label data gets honest curves too.
      positives[n] = examples[i].labels.includes(label) ? 1 : 0;
      positiveCount += positives[n];
    });
    const rule = model.meta.policy?.rules.find((r) => r.label === label) ?? null;
    return {
      label,
      index: k,
      curve: precisionRecallCurve(scores, positives),
      prevalence: known.length > 0 ? positiveCount / known.length : 0,
      positives: positiveCount,
      points: operatingPoints(model, k, rule, scores, positives, positiveCount, predicted),
      rule,
    };
  });

  const mistakes: ConfidentMistake[] = [];
  known.forEach((i, n) => {
    if (correct[n] === 0) mistakes.push({ text: examples[i].text, line: examples[i].line ?? null, gold: labels[gold[i]], predicted: labels[predicted[n]], confidence: confidence[n] });
  });
  mistakes.sort((a, b) => b.confidence - a.confidence);

  return {
    model,
    evaluation: report,
    labels: labelReports,
    bins: reliabilityBins(confidence, correct, RELIABILITY_BIN_COUNT),
    ece: expectedCalibrationError(confidence, correct, RELIABILITY_BIN_COUNT),
    mistakes: mistakes.slice(0, MISTAKES_LISTED),
    scoredExamples: known.length,
  };
}

/** The points to mark on label k's curve: its policy rule (and review band), or the default decision. */
function operatingPoints(model: Model, k: number, rule: PolicyRule | null, scores: Float64Array, positives: Uint8Array, positiveCount: number, predicted: Int32Array): OperatingPoint[] {
  const points: OperatingPoint[] = [];
  if (rule) {
    const verb = rule.action === "route" && rule.routeTo ? `route to ${rule.routeTo}` : rule.action;
    points.push({ kind: "rule", name: `${verb} at ≥ ${rule.threshold.toFixed(3)}`, shortName: `${rule.action} ≥ ${rule.threshold.toFixed(3)}`, ...atThreshold(scores, positives, positiveCount, rule.threshold) });
    if (rule.reviewFrom !== undefined && rule.reviewFrom < rule.threshold) {
      points.push({ kind: "review", name: `review from ≥ ${rule.reviewFrom.toFixed(3)}`, shortName: `review ≥ ${rule.reviewFrom.toFixed(3)}`, ...atThreshold(scores, positives, positiveCount, rule.reviewFrom) });
    }
    return points;
  }
  if (model.meta.head === "sigmoid") {
    const threshold = model.meta.thresholds?.[k] ?? 0.5;
    points.push({ kind: "threshold", name: `label threshold ≥ ${threshold.toFixed(3)}`, shortName: `threshold ≥ ${threshold.toFixed(3)}`, ...atThreshold(scores, positives, positiveCount, threshold) });
    return points;
  }
  let truePositives = 0;
  let count = 0;
  for (let n = 0; n < predicted.length; n++) {
    if (predicted[n] !== k) continue;
    count++;
    truePositives += positives[n];
  }
  points.push({ kind: "argmax", name: "top label (argmax)", shortName: "argmax", threshold: null, predicted: count, truePositives, precision: count > 0 ? truePositives / count : 0, recall: positiveCount > 0 ? truePositives / positiveCount : 0 });
  return points;
}

/** Precision and recall when score ≥ threshold counts as the label (0/0 = 0, as in compiler/metrics). */
function atThreshold(scores: Float64Array, positives: Uint8Array, positiveCount: number, threshold: number): Omit<OperatingPoint, "kind" | "name" | "shortName"> {
  let truePositives = 0;
  let count = 0;
  for (let n = 0; n < scores.length; n++) {
    if (scores[n] < threshold) continue;
    count++;
    truePositives += positives[n];
  }
  return { threshold, predicted: count, truePositives, precision: count > 0 ? truePositives / count : 0, recall: positiveCount > 0 ? truePositives / positiveCount : 0 };
}
