// Symmetric 8-bit quantization with one scale per row: value ≈ q × scale, q ∈ [−127, 127].
// Per-row scales keep rare, small rows as precise as large ones (the usual choice for
// embedding tables; common practice, no source). Scales are taken from the one-byte codes
// the file stores (runtime/format/format.ts, rowScaleOfCode): the smallest code scale covering
// max|row| / 127, so what is rounded against is exactly what the runtime multiplies by.

import { ROW_SCALE_CODE_BIAS, ROW_SCALE_CODE_STEPS, rowScaleOfCode } from "../../runtime/format/format.ts";

/** The smallest row scale code whose scale is at least `needed` (> 0). */
export function rowScaleCodeCovering(needed: number): number {
  let code = Math.max(1, Math.ceil(ROW_SCALE_CODE_STEPS * Math.log2(needed)) + ROW_SCALE_CODE_BIAS);
  while (code <= 255 && rowScaleOfCode(code) < needed) code++;
  while (code > 1 && rowScaleOfCode(code - 1) >= needed) code--;
  if (code > 255) throw new Error(`a weight of ${needed * 127} is beyond what an int8 row scale code can hold (at most ${rowScaleOfCode(255) * 127})`);
  return code;
}

/**
 * Quantizes a rowCount × width float matrix.
 * @example quantizeRows(new Float32Array([0.5, -1]), 2) // { values: Int8Array [64, -127]-ish, scales: [≈1/127] }
 */
export function quantizeRows(matrix: Float32Array, width: number): { values: Int8Array; scales: Float32Array } {
  const rowCount = matrix.length / width;
  const values = new Int8Array(matrix.length);
  const scales = new Float32Array(rowCount);
  for (let row = 0; row < rowCount; row++) {
    const base = row * width;
    let maxAbs = 0;
    for (let j = 0; j < width; j++) maxAbs = Math.max(maxAbs, Math.abs(matrix[base + j]));
    if (maxAbs === 0) continue; // scale 0 (code 0), values 0
    const scale = rowScaleOfCode(rowScaleCodeCovering(maxAbs / 127));
    scales[row] = scale;
    for (let j = 0; j < width; j++) values[base + j] = Math.max(-127, Math.min(127, Math.round(matrix[base + j] / scale)));
  }
  return { values, scales };
}

/** Back to floats (for fine-tuning on what the runtime will see). */
export function dequantizeRows(values: Int8Array, scales: Float32Array, width: number): Float32Array {
  const out = new Float32Array(values.length);
  for (let row = 0; row < scales.length; row++) {
    const base = row * width;
    for (let j = 0; j < width; j++) out[base + j] = values[base + j] * scales[row];
  }
  return out;
}
