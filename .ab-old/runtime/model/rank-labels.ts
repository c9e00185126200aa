// The `top` best labels of a score row, best first.

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
