// What a tune trial is scored by, measured on the compiled model.

import type { Model } from "../../runtime/model/model.ts";
import { evaluateModel, scoreTexts, type LabelledText } from "../evaluate/evaluate.ts";
import { OBJECTIVES } from "./tune-defaults.ts";
import { precisionRecallCurve, thresholdForTargetPrecision } from "../metrics/index.ts";

export type TuneMetric = { kind: "macro-f1" } | { kind: "accuracy" } | { kind: "recall"; label: string; precision: number };

/**
 * Parses --objective and --at-precision: "macro-f1", "accuracy", or "recall" of one label
 * at the threshold that reaches a precision ("spam=0.99").
 * @example parseObjective("recall", "spam=0.99") // { kind: "recall", label: "spam", precision: 0.99 }
 */
export function parseObjective(objective: string, atPrecision?: string): TuneMetric {
  if (objective === "macro-f1" || objective === "accuracy") {
    if (atPrecision !== undefined) throw new Error(`--at-precision goes with --objective recall, not ${objective}`);
    return { kind: objective };
  }
  if (objective !== "recall") throw new Error(`--objective: expected ${OBJECTIVES.join(", ")}, got "${objective}"`);
  if (atPrecision === undefined) throw new Error('--objective recall needs --at-precision label=P, e.g. --at-precision spam=0.99');
  const match = /^\s*([^=]+?)\s*=\s*(0?\.\d+)\s*$/.exec(atPrecision);
  if (!match) throw new Error(`--at-precision: expected label=P with P between 0 and 1, e.g. spam=0.99, got "${atPrecision}"`);
  return { kind: "recall", label: match[1], precision: Number(match[2]) };
}

/** How an objective reads in output: "macro-f1", "recall of spam at precision 0.99". */
export function describeObjective(metric: TuneMetric): string {
  return metric.kind === "recall" ? `recall of ${metric.label} at precision ${metric.precision}` : metric.kind;
}

/** Scores a model on validation data (higher is better). */
export function scoreModel(model: Model, validation: readonly LabelledText[], metric: TuneMetric): number {
  if (metric.kind === "recall") {
    const index = model.labels.indexOf(metric.label);
    if (index < 0) throw new Error(`--at-precision: label "${metric.label}" is not in the data (known: ${model.labels.join(", ")})`);
    const scored = scoreTexts(model, validation.map((e) => e.text));
    const k = scored.labelCount;
    const scores = Float64Array.from({ length: scored.count }, (_, i) => scored.scores[i * k + index]);
    const positives = Uint8Array.from(validation, (e) => (e.labels.includes(metric.label) ? 1 : 0));
    const point = thresholdForTargetPrecision(precisionRecallCurve(scores, positives), metric.precision, 5);
    return point ? point.recall : 0;
  }
  const report = evaluateModel(model, validation);
  return metric.kind === "accuracy" ? report.accuracy : report.macroF1;
}

/** Mean µs per classify call over `texts` (after one warm-up pass), in this process. */
export function microsecondsPerDoc(model: Model, texts: readonly string[]): number {
  for (const text of texts) model.classify(text);
  const started = performance.now();
  let rounds = 0;
  do {
    for (const text of texts) model.classify(text);
    rounds++;
  } while (performance.now() - started < 50);
  return ((performance.now() - started) * 1000) / (rounds * texts.length);
}
