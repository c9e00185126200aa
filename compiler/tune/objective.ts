// What a tune trial is scored by, measured on the compiled model.

import type { Model } from "../../runtime/model/model.ts";
import { evaluateModel, scoreTexts, type LabelledText } from "../evaluate/evaluate.ts";
import { precisionRecallCurve, thresholdForTargetPrecision } from "../metrics/index.ts";

export type TuneMetric = { kind: "macro-f1" } | { kind: "accuracy" } | { kind: "recall-at-precision"; label: string; precision: number };

/**
 * Parses --metric: "macro-f1", "accuracy" or "recall-at-precision:spam=0.99".
 * @example parseMetric("recall-at-precision:spam=0.99") // { kind: "recall-at-precision", label: "spam", precision: 0.99 }
 */
export function parseMetric(text: string): TuneMetric {
  if (text === "macro-f1" || text === "accuracy") return { kind: text };
  const match = /^recall-at-precision:([^=]+)=(0?\.\d+)$/.exec(text);
  if (match) return { kind: "recall-at-precision", label: match[1], precision: Number(match[2]) };
  throw new Error(`--metric: expected macro-f1, accuracy or recall-at-precision:<label>=<precision>, got "${text}"`);
}

/** Scores a model on validation data (higher is better). */
export function scoreModel(model: Model, validation: readonly LabelledText[], metric: TuneMetric): number {
  if (metric.kind === "recall-at-precision") {
    const index = model.labels.indexOf(metric.label);
    if (index < 0) throw new Error(`--metric: label "${metric.label}" is not in the data (known: ${model.labels.join(", ")})`);
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
