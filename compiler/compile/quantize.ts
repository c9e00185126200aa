// Symmetric 8-bit quantization with one scale per row: value ≈ q × scale, q ∈ [−127, 127],
// scale = max|row| / 127. Per-row scales keep rare, small rows as precise as large ones
// (the usual choice for embedding tables; common practice, no source).

/**
 * Quantizes a rowCount × dims float matrix.
 * @example quantizeRows(new Float32Array([0.5, -1]), 2) // { values: Int8Array [64, -127], scales: [1/127] }
 */
export function quantizeRows(matrix: Float32Array, dims: number): { values: Int8Array; scales: Float32Array } {
  const rowCount = matrix.length / dims;
  const values = new Int8Array(matrix.length);
  const scales = new Float32Array(rowCount);
  for (let row = 0; row < rowCount; row++) {
    const base = row * dims;
    let maxAbs = 0;
    for (let j = 0; j < dims; j++) maxAbs = Math.max(maxAbs, Math.abs(matrix[base + j]));
    const scale = maxAbs / 127;
    scales[row] = scale;
    if (scale === 0) continue;
    // Divide by the stored (float32) scale, so dequantization uses exactly what was rounded against.
    const stored = scales[row];
    for (let j = 0; j < dims; j++) values[base + j] = Math.max(-127, Math.min(127, Math.round(matrix[base + j] / stored)));
  }
  return { values, scales };
}

/** Back to floats (for fine-tuning on what the runtime will see). */
export function dequantizeRows(values: Int8Array, scales: Float32Array, dims: number): Float32Array {
  const out = new Float32Array(values.length);
  for (let row = 0; row < scales.length; row++) {
    const base = row * dims;
    for (let j = 0; j < dims; j++) out[base + j] = values[base + j] * scales[row];
  }
  return out;
}
