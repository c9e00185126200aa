// The numeric ranges a model file may hold: the ranges the compiler can produce, with a
// margin. The loader refuses anything outside them and the writer checks its own output
// against them, so a file that loads can only give finite scores (see the bound below).
//
// Why these bounds are enough: with non-negative row weights, the hidden vector (or the
// logit vector of logit rows) is a weighted mean of dequantized rows, so |hidden_j| ≤
// max |row value × row scale| ≤ 2^24 · 2^8. A logit is then at most dims (≤ 1024) ×
// 2^24 (output weight × scale) × 2^32 + 2^24, divided by a temperature ≥ 0.05: about 2^72,
// far inside float64. Softmax subtracts the largest logit and sigmoid saturates, so
// finite logits give finite scores.

/** Temperature scaling's search range (compiler/metrics/temperature-scaling.ts uses these). */
export const TEMPERATURE_MIN = 0.05;
export const TEMPERATURE_MAX = 20;
/** The temperature search may land a rounding step outside its range. */
const TEMPERATURE_SLACK = 1e-9;

/** Largest magnitude of any stored float: rows, output weights, scales, bias (training produces values below ~100). */
export const MAX_STORED_MAGNITUDE = 2 ** 24;
/**
 * TF-IDF weights are ln((1 + n) / (1 + df)) + 1: from 1 up to about 23 for 2^31 examples.
 * Stored weights may lie in [0, MAX_ROW_WEIGHT]; version 2's weightStep (largest weight /
 * 65535) in [MIN_WEIGHT_STEP, MAX_WEIGHT_STEP], so a u16 step decodes to at most 65535.
 */
export const MAX_ROW_WEIGHT = 65535;
export const MIN_WEIGHT_STEP = 2 ** -24;
export const MAX_WEIGHT_STEP = 1;

/** Most rules a policy may hold, and the deepest nesting of metrics and provenance. */
export const MAX_POLICY_RULES = 4096;
export const MAX_METADATA_DEPTH = 32;

/** True when `t` is a temperature the compiler can write. */
export function isValidTemperature(t: unknown): t is number {
  return typeof t === "number" && t >= TEMPERATURE_MIN * (1 - TEMPERATURE_SLACK) && t <= TEMPERATURE_MAX * (1 + TEMPERATURE_SLACK);
}

/** True when `step` is a weight step the compiler can write. */
export function isValidWeightStep(step: unknown): step is number {
  return typeof step === "number" && step >= MIN_WEIGHT_STEP && step <= MAX_WEIGHT_STEP;
}

/** True when `value` is a probability-like threshold: a number in [0, 1] (NaN fails). */
export function isUnitInterval(value: unknown): value is number {
  return typeof value === "number" && value >= 0 && value <= 1;
}

/** Index of the first stored float outside ±MAX_STORED_MAGNITUDE (NaN and ±Infinity included), or -1. */
export function firstOutOfRange(values: Float32Array, min = -MAX_STORED_MAGNITUDE, max = MAX_STORED_MAGNITUDE): number {
  for (let i = 0; i < values.length; i++) {
    const value = values[i];
    if (!(value >= min && value <= max)) return i;
  }
  return -1;
}
