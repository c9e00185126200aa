// Explanations: each logit split exactly into per-feature contributions plus the bias, from
// the features a text was scored with. The features are grouped by slot (one row of the
// model, however many times or under however many names it occurs), and only the features
// shown are named, so a text of one enormous word costs its slots, not a string per n-gram.

import type { FeatureBuffer, Featurizer } from "../featurizer/featurizer.ts";
import type { LabelTree } from "./label-tree.ts";
import type { Explanation, FeatureContribution, LabelExplanation, ModelParts } from "./model-types.ts";

/** What a text was scored with: the features (with origins, from `featurizer`'s last call) and their scores. */
export interface ScoredFeatures {
  parts: ModelParts;
  featurizer: Featurizer;
  tree: LabelTree | null;
  buffer: FeatureBuffer;
  scores: Float32Array;
  logits: Float64Array;
}

/** For each label of `labelIndexes`, its `featureCount` largest contributions (by size). */
export function explainLabels(scored: ScoredFeatures, labelIndexes: number[], featureCount: number): Explanation {
  const { index, rows, rowScales, rowWeights, outputWeights, outputScales, outputBias, header } = scored.parts;
  const { buffer, featurizer } = scored;
  const dims = header.dims;
  const width = outputWeights === null ? header.outputCount : dims; // values per row
  const inverseTemperature = 1 / header.calibration.temperature;
  // Per distinct known slot: its row, the summed weight of its occurrences, and its features.
  const bySlot = new Map<number, { row: number; weight: number; features: number[] }>();
  let totalWeight = 0;
  let unknown = 0;
  for (let f = 0; f < buffer.count; f++) {
    const slot = buffer.slots[f];
    const known = bySlot.get(slot);
    if (known !== undefined) {
      known.weight += rowWeights === null ? 1 : rowWeights[known.row];
      totalWeight += rowWeights === null ? 1 : rowWeights[known.row];
      known.features.push(f);
      continue;
    }
    const row = index.rowOf(slot);
    if (row < 0) {
      unknown++;
      continue;
    }
    const weight = rowWeights === null ? 1 : rowWeights[row];
    totalWeight += weight;
    bySlot.set(slot, { row, weight, features: [f] });
  }
  const groups = [...bySlot.values()];
  const labels: LabelExplanation[] = [];
  for (const k of labelIndexes) {
    if (k < 0) continue;
    // For a tree head the label's path has several output rows; explain the softmax/sigmoid
    // row when there is one per label, else the first inner node on the path.
    const outputRow = header.head === "tree" ? (scored.tree as LabelTree).firstNodeOf(k) : k;
    const outputScale = outputScales === null ? 1 : outputScales[outputRow];
    const contributions = groups.map((group) => {
      const rowScale = rowScales === null ? 1 : rowScales[group.row];
      let dot = 0;
      if (outputWeights === null) dot = rows[group.row * width + outputRow];
      else for (let j = 0; j < dims; j++) dot += outputWeights[outputRow * dims + j] * rows[group.row * dims + j];
      return { group, contribution: ((group.weight * rowScale * outputScale * dot) / totalWeight) * inverseTemperature };
    });
    // Ties go to the feature met first in the text, so only the shown features are named.
    const features = contributions
      .sort((a, b) => Math.abs(b.contribution) - Math.abs(a.contribution) || a.group.features[0] - b.group.features[0])
      .slice(0, featureCount)
      .map(({ group, contribution }) => described(featurizer, buffer, group.features, namesOf(featurizer, buffer, group.features), contribution));
    const bias = outputBias[outputRow] * inverseTemperature;
    labels.push({ label: header.labels[k], score: scored.scores[k], logit: scored.logits[outputRow], bias, features });
  }
  return { labels, tokenCount: buffer.tokenCount, truncated: buffer.truncated, unknownFeatures: unknown };
}

/**
 * The name of a slot's features: one name, or the distinct names joined by " | " when
 * different n-grams share the slot (a hash collision: the model cannot tell them apart).
 * Names repeat per occurrence, so only the first few occurrences are read.
 */
function namesOf(featurizer: Featurizer, buffer: FeatureBuffer, features: number[]): string {
  const first = featurizer.nameOf(buffer, features[0]);
  if (features.length === 1) return first;
  const names = new Set([first]);
  for (let i = 1; i < features.length && i < 64; i++) names.add(featurizer.nameOf(buffer, features[i]));
  return [...names].join(" | ");
}

/** A shown feature: its name, contribution, and the original spans it was folded from, if any. */
function described(featurizer: Featurizer, buffer: FeatureBuffer, features: number[], feature: string, contribution: number): FeatureContribution {
  const sources = new Set<string>();
  for (let i = 0; i < features.length && i < 64; i++) {
    const source = featurizer.sourceOf(buffer, features[i]);
    if (source !== null) sources.add(source);
  }
  return sources.size > 0 ? { feature, contribution, foldedFrom: [...sources] } : { feature, contribution };
}
