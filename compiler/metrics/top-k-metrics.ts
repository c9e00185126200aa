// Precision@k and recall@k for ranked label lists: how many of a model's k best-scored
// labels are gold, per example, averaged over examples. Definitions as in information
// retrieval (e.g. torchmetrics RetrievalPrecision / RetrievalRecall with top_k and their
// defaults): precision@k divides by k even when fewer than k labels are ranked, and an
// example with no gold labels scores 0 recall (0/0 = 0, as everywhere in compiler/metrics).

import { checkInteger, checkSameLength, type NumberList } from "./input-checks.ts";
import { metricsInputError } from "./metrics-input-error.ts";
import type { LabelSet } from "./multilabel-metrics.ts";

/**
 * Label indices ordered by descending score; equal scores keep the lower index first.
 * @example rankLabelsByScore([0.2, 0.3, 0.5]) // Int32Array [2, 1, 0]
 */
export function rankLabelsByScore(scores: Float32Array | Float64Array | NumberList): Int32Array {
  const order = new Int32Array(scores.length);
  for (let i = 0; i < order.length; i++) {
    if (Number.isNaN(scores[i])) {
      throw metricsInputError("bad-number", "rankLabelsByScore", `scores[${i}] is NaN, expected a number`);
    }
    order[i] = i;
  }
  // The explicit index tie-break keeps the order defined whatever the engine's sort does.
  return order.sort((a, b) => scores[b] - scores[a] || a - b);
}

// Gold labels found among the first k ranked labels of each example.
function hitsInTopK(functionName: string, gold: readonly LabelSet[], ranked: readonly LabelSet[], k: number): Int32Array {
  checkInteger(functionName, "k", k, 1);
  checkSameLength(functionName, "gold", gold, "ranked", ranked);
  const hits = new Int32Array(gold.length);
  for (let i = 0; i < gold.length; i++) {
    const goldSet = new Set<number>();
    for (let j = 0; j < gold[i].length; j++) goldSet.add(gold[i][j]);
    const seen = new Set<number>();
    const list = ranked[i];
    const depth = Math.min(k, list.length);
    for (let r = 0; r < depth; r++) {
      const label = list[r];
      if (seen.has(label)) {
        throw metricsInputError(
          "bad-label",
          functionName,
          `ranked[${i}][${r}] = ${label} repeats a label ranked higher; expected each label at most once`,
        );
      }
      seen.add(label);
      if (goldSet.has(label)) hits[i]++;
    }
  }
  return hits;
}

/**
 * Mean over examples of |top-k ranked ∩ gold| / k. `ranked[i]` lists label indices best
 * first (see `rankLabelsByScore`). No examples gives 0.
 * @example precisionAtK([[2], [1, 3]], [[2, 1, 0], [2, 1, 3, 0]], 2) // 0.5
 */
export function precisionAtK(gold: readonly LabelSet[], ranked: readonly LabelSet[], k: number): number {
  const hits = hitsInTopK("precisionAtK", gold, ranked, k);
  let sum = 0;
  for (let i = 0; i < hits.length; i++) sum += hits[i] / k;
  return hits.length === 0 ? 0 : sum / hits.length;
}

/**
 * Mean over examples of |top-k ranked ∩ gold| / |gold|; an example without gold labels
 * counts 0. No examples gives 0.
 * @example recallAtK([[2], [1, 3]], [[2, 1, 0], [2, 1, 3, 0]], 2) // 0.75
 */
export function recallAtK(gold: readonly LabelSet[], ranked: readonly LabelSet[], k: number): number {
  const hits = hitsInTopK("recallAtK", gold, ranked, k);
  let sum = 0;
  for (let i = 0; i < hits.length; i++) {
    const goldSize = new Set(Array.from(gold[i])).size;
    sum += goldSize === 0 ? 0 : hits[i] / goldSize;
  }
  return hits.length === 0 ? 0 : sum / hits.length;
}
