// The validation split as the Worker's traffic counts would see it: how often each label is
// the top label, and the top score in tenths of [0, 1] (the same buckets as
// runtime/worker/reviews/traffic-counts.ts). Stored in the model's metrics, so the traffic
// report can compare live traffic with it (population stability) without the data.

import type { Model } from "../../runtime/model/model.ts";
import { scoreBucket } from "../../runtime/worker/reviews/traffic-counts.ts";

export interface ValidationTraffic {
  examples: number;
  /** Top label → how many validation texts had it. */
  labels: Record<string, number>;
  /** Score bucket ("0.0" … "0.9") → how many validation texts had their top score there. */
  topScores: Record<string, number>;
}

/**
 * Counts the top labels and top-score buckets of `texts` under the shipped model.
 * @example validationTraffic(model, ["hello", "WIN a prize"]).labels // { ok: 1, spam: 1 }
 */
export function validationTraffic(model: Model, texts: readonly string[]): ValidationTraffic {
  const labels: Record<string, number> = {};
  const topScores: Record<string, number> = {};
  for (const text of texts) {
    const [top] = model.classify(text, { top: 1 });
    if (top === undefined) continue;
    labels[top.label] = (labels[top.label] ?? 0) + 1;
    const bucket = scoreBucket(top.score);
    topScores[bucket] = (topScores[bucket] ?? 0) + 1;
  }
  return { examples: texts.length, labels, topScores };
}
