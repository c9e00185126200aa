// Per-label thresholds of the sigmoid head: each label is predicted when its score reaches
// the threshold that maximized its F1 on the validation split (a common choice for
// multi-label classifiers; common practice, no source). A label with fewer than three
// validation positives keeps 0.5, since a threshold fitted to one or two examples is noise.

import type { LabelledText, ScoredSet } from "../evaluate/evaluate.ts";
import { precisionRecallCurve } from "../metrics/index.ts";

/** One threshold per label, in label order. */
export function chooseSigmoidThresholds(scored: ScoredSet, validation: readonly LabelledText[], labels: readonly string[]): number[] {
  const k = scored.labelCount;
  return labels.map((label, index) => {
    const positives = Uint8Array.from(validation, (e) => (e.labels.includes(label) ? 1 : 0));
    if (positives.reduce((a, b) => a + b, 0) < 3) return 0.5;
    const scores = Float64Array.from({ length: scored.count }, (_, i) => scored.scores[i * k + index]);
    let best = 0.5;
    let bestF1 = -1;
    for (const point of precisionRecallCurve(scores, positives)) {
      const f1 = point.precision + point.recall > 0 ? (2 * point.precision * point.recall) / (point.precision + point.recall) : 0;
      if (f1 > bestF1) {
        bestF1 = f1;
        best = point.threshold;
      }
    }
    return Math.min(Math.max(best, 0.01), 0.99);
  });
}
