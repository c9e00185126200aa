// Stratified holdout: each label keeps its share in both parts, so a rare label is
// still scored on validation. Single-label examples are grouped by label; several-label
// examples by their first label.

import { createRandom, shuffleInPlace } from "./random.ts";

/**
 * Indexes of the training and validation parts.
 * @example stratifiedSplit([0, 0, 1, 1], 0.5, 7) // { train: [...2 indexes], validation: [...2 indexes] }
 */
export function stratifiedSplit(labelOfExample: ArrayLike<number>, holdout: number, seed: number): { train: Int32Array; validation: Int32Array } {
  const byLabel = new Map<number, number[]>();
  for (let i = 0; i < labelOfExample.length; i++) {
    const group = byLabel.get(labelOfExample[i]);
    if (group) group.push(i);
    else byLabel.set(labelOfExample[i], [i]);
  }
  const random = createRandom(seed ^ 0x5bd1e995);
  const train: number[] = [];
  const validation: number[] = [];
  for (const label of [...byLabel.keys()].sort((a, b) => a - b)) {
    const group = byLabel.get(label) as number[];
    shuffleInPlace(group, random);
    // At least one validation example per label when the label has two or more.
    let take = Math.round(group.length * holdout);
    if (holdout > 0 && take === 0 && group.length >= 2) take = 1;
    for (let i = 0; i < group.length; i++) (i < take ? validation : train).push(group[i]);
  }
  train.sort((a, b) => a - b);
  validation.sort((a, b) => a - b);
  return { train: Int32Array.from(train), validation: Int32Array.from(validation) };
}
