// The best labels of a score row: the top one (argmax) and the `top` best, best first. Every
// argmax of a score row in the project, runtime and compiler alike, is `topLabel`.

/**
 * Index of the highest of `width` scores starting at `start`, so one row of a flat
 * texts × labels array needs no copy. Ties go to the lower index, and so does a NaN (it is
 * never greater than anything); callers that must fail closed on NaN check before.
 * @example topLabel(new Float32Array([0.1, 0.7, 0.2])) // → 1
 * @example topLabel(scores, i * labelCount, labelCount) // the top label of text i
 */
export function topLabel(scores: ArrayLike<number>, start = 0, width = scores.length - start): number {
  let best = 0;
  for (let k = 1; k < width; k++) if (scores[start + k] > scores[start + best]) best = k;
  return best;
}

/** Indexes of the `top` highest scores, best first (ties: lower index first). */
export function rankLabels(scores: Float32Array, top: number): number[] {
  const count = Math.min(top, scores.length);
  const order: number[] = [];
  for (let k = 0; k < scores.length; k++) {
    if (order.length === count && scores[k] <= scores[order[count - 1]]) continue;
    let position = order.length === count ? count - 1 : order.length;
    order[position] = k;
    while (position > 0 && scores[order[position]] > scores[order[position - 1]]) {
      const swap = order[position - 1];
      order[position - 1] = order[position];
      order[position] = swap;
      position--;
    }
  }
  return order;
}
