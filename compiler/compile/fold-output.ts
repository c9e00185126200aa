// Multiplies the output layer into the feature rows. Scoring is linear up to the softmax or
// sigmoid: logit_k = Σ_f w_f (O_k · row_f) / Σ_f w_f + bias_k, so storing P_f = O · row_f
// (one value per output) gives the same logits while a feature costs outputCount
// multiply-adds instead of dims. Worth it whenever outputCount < dims: with 2-6 labels and
// 16-32 dims the rows shrink 3-12× and scoring speeds up in proportion.

/** Whether a compiled model should store logit rows (see runtime/format/model-header.ts, RowSpace). */
export function shouldFoldOutput(enabled: boolean, head: "softmax" | "sigmoid" | "tree", outputCount: number, dims: number): boolean {
  // The tree head scores only the inner nodes on the paths it visits, so it needs hidden vectors.
  return enabled && head !== "tree" && outputCount < dims;
}

/**
 * rowCount × outputCount matrix of P_f[k] = Σ_j outputs[k·dims + j] · rows[f·dims + j].
 * @example foldOutputLayer(new Float32Array([1, 2]), new Float32Array([3, 4, 1, 0]), 2, 2) // [11, 1]
 */
export function foldOutputLayer(rows: Float32Array, outputs: Float32Array, dims: number, outputCount: number): Float32Array {
  const rowCount = rows.length / dims;
  const folded = new Float32Array(rowCount * outputCount);
  for (let row = 0; row < rowCount; row++) {
    const base = row * dims;
    for (let k = 0; k < outputCount; k++) {
      const outputBase = k * dims;
      let sum = 0;
      for (let j = 0; j < dims; j++) sum += outputs[outputBase + j] * rows[base + j];
      folded[row * outputCount + k] = sum;
    }
  }
  return folded;
}
