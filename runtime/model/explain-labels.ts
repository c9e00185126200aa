// Explanations: each logit split exactly into per-feature contributions plus the bias, from
// the features a text was scored with. The features are grouped by slot (one row of the
// model, however many times it occurs), and each known slot is named once, so a text of one
// enormous word costs its distinct known slots, not a string per n-gram.

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
    let group = bySlot.get(slot);
    if (group === undefined) {
      const row = index.rowOf(slot);
      if (row < 0) {
        unknown++;
        continue;
      }
      group = { row, weight: 0, features: [] };
      bySlot.set(slot, group);
    }
    const weight = rowWeights === null ? 1 : rowWeights[group.row];
    group.weight += weight;
    totalWeight += weight;
    group.features.push(f);
  }
  // Slots whose features read alike (a token "free" and the character 4-gram "free" inside
  // "·free·") are shown as one feature, as a reader sees them: one name, the summed contribution.
  const byName = new Map<string, { rows: { row: number; weight: number }[]; features: number[] }>();
  for (const group of bySlot.values()) {
    const name = namesOf(featurizer, buffer, group.features);
    const named = byName.get(name);
    if (named === undefined) byName.set(name, { rows: [group], features: [...group.features] });
    else {
      named.rows.push(group);
      for (const f of group.features) named.features.push(f);
    }
  }
  const shown = [...byName.entries()];
  const labels: LabelExplanation[] = [];
  for (const k of labelIndexes) {
    if (k < 0) continue;
    // For a tree head the label's path has several output rows; explain the softmax/sigmoid
    // row when there is one per label, else the first inner node on the path.
    const outputRow = header.head === "tree" ? (scored.tree as LabelTree).firstNodeOf(k) : k;
    const outputScale = outputScales === null ? 1 : outputScales[outputRow];
    const contributionOf = (row: number, weight: number): number => {
      const rowScale = rowScales === null ? 1 : rowScales[row];
      let dot = 0;
      if (outputWeights === null) dot = rows[row * width + outputRow];
      else for (let j = 0; j < dims; j++) dot += outputWeights[outputRow * dims + j] * rows[row * dims + j];
      return ((weight * rowScale * outputScale * dot) / totalWeight) * inverseTemperature;
    };
    const features = shown
      .map(([feature, named]) => ({ feature, named, contribution: named.rows.reduce((sum, r) => sum + contributionOf(r.row, r.weight), 0) }))
      .sort((a, b) => Math.abs(b.contribution) - Math.abs(a.contribution) || (a.feature < b.feature ? -1 : 1))
      .slice(0, featureCount)
      .map(({ feature, named, contribution }) => described(featurizer, buffer, named.features, feature, contribution));
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
