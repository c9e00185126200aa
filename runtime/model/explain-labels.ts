// Explanations: each logit split exactly into per-feature contributions plus the bias. They
// re-run the featurizer with names, so they allocate; classification never calls this.

import { createFeatureBuffer, type Featurizer } from "../featurizer/featurizer.ts";
import type { LabelTree } from "./label-tree.ts";
import type { Explanation, LabelExplanation, ModelParts } from "./model-types.ts";

/** What explainLabels reads of the text just scored. */
export interface ScoredText {
  parts: ModelParts;
  featurizer: Featurizer;
  tree: LabelTree | null;
  /** The scores and logits of the text, as scoring left them. */
  scores: Float32Array;
  logits: Float64Array;
}

/** Explains the text just scored (its scores and logits are read from `scored`). */
export function explainLabels(scored: ScoredText, text: string, labelIndexes: number[], featureCount: number): Explanation {
  const { index, rows, rowScales, rowWeights, outputWeights, outputScales, outputBias, header } = scored.parts;
  const named = createFeatureBuffer(256, true);
  scored.featurizer.featurize(text, named);
  const scores = scored.scores.slice();
  const dims = header.dims;
  const width = outputWeights === null ? header.outputCount : dims; // values per row
  const inverseTemperature = 1 / header.calibration.temperature;
  let totalWeight = 0;
  let unknown = 0;
  for (let f = 0; f < named.count; f++) {
    const row = index.rowOf(named.slots[f]);
    if (row < 0) unknown++;
    else totalWeight += rowWeights === null ? 1 : rowWeights[row];
  }
  const labels: LabelExplanation[] = [];
  for (const k of labelIndexes) {
    if (k < 0) continue;
    // For a tree head the label's path has several output rows; explain the softmax/sigmoid
    // row when there is one per label, else the first inner node on the path.
    const outputRow = header.head === "tree" ? (scored.tree as LabelTree).firstNodeOf(k) : k;
    const byName = new Map<string, number>();
    const foldedFrom = new Map<string, Set<string>>();
    const outputScale = outputScales === null ? 1 : outputScales[outputRow];
    for (let f = 0; f < named.count; f++) {
      const row = index.rowOf(named.slots[f]);
      if (row < 0) continue;
      const weight = rowWeights === null ? 1 : rowWeights[row];
      const rowScale = rowScales === null ? 1 : rowScales[row];
      let dot = 0;
      if (outputWeights === null) dot = rows[row * width + outputRow];
      else for (let j = 0; j < dims; j++) dot += outputWeights[outputRow * dims + j] * rows[row * dims + j];
      const contribution = ((weight * rowScale * outputScale * dot) / totalWeight) * inverseTemperature;
      const name = (named.names as string[])[f];
      byName.set(name, (byName.get(name) ?? 0) + contribution);
      const source = named.sources?.[f];
      if (source) foldedFrom.set(name, (foldedFrom.get(name) ?? new Set()).add(source));
    }
    const features = [...byName.entries()]
      .map(([feature, contribution]) => {
        const sources = foldedFrom.get(feature);
        return sources ? { feature, contribution, foldedFrom: [...sources] } : { feature, contribution };
      })
      .sort((a, b) => Math.abs(b.contribution) - Math.abs(a.contribution) || (a.feature < b.feature ? -1 : 1))
      .slice(0, featureCount);
    const bias = outputBias[outputRow] * inverseTemperature;
    labels.push({ label: header.labels[k], score: scores[k], logit: scored.logits[outputRow], bias, features });
  }
  return { labels, tokenCount: named.tokenCount, truncated: named.truncated, unknownFeatures: unknown };
}
