// Calibration as shipped and before temperature scaling, from the shipped scores alone.
// The runtime divides logits by T (Guo, Pleiss, Sun & Weinberger, ICML 2017, §4.2), so
//   softmax: p = softmax(z / T)  ⇒  log p = z / T − c  ⇒  softmax(T · log p) = softmax(z),
//   sigmoid: p = σ(z / T)        ⇒  σ(T · logit p) = σ(z),
// and the scores at T = 1 follow without re-scoring. A tree head's label scores are products
// of inner-node sigmoids, which cannot be taken apart from the leaves: no answer there unless T = 1.

import type { HeadKind } from "../../runtime/format/model-header.ts";
import { topLabelRows, type ScoredSet } from "./evaluate.ts";
import { expectedCalibrationError } from "../metrics/index.ts";

/** ECE of the top label (15 equal-width bins), as shipped and at temperature 1. */
export interface CalibrationSummary {
  temperature: number;
  ece: number;
  /** NaN when it cannot be recovered (tree head with T ≠ 1). */
  eceUncalibrated: number;
}

/**
 * The scores the model would give at temperature 1, from its shipped scores; null for a
 * tree head with T ≠ 1. Row-major like ScoredSet.scores.
 * @example undoTemperature(Float32Array.from([0.6, 0.4]), 2, 2, "softmax") // ≈ [0.692, 0.308]
 */
export function undoTemperature(scores: Float32Array | Float64Array, labelCount: number, temperature: number, head: HeadKind): Float64Array | null {
  const result = Float64Array.from(scores);
  if (temperature === 1) return result;
  if (head === "tree") return null;
  if (head === "sigmoid") {
    for (let i = 0; i < result.length; i++) {
      const p = result[i];
      result[i] = 1 / (1 + Math.exp(-temperature * (Math.log(p) - Math.log(1 - p))));
    }
    return result;
  }
  const rows = result.length / labelCount;
  for (let r = 0; r < rows; r++) {
    const base = r * labelCount;
    // Work in logs relative to the row's largest score: exp(T·(log p_j − log p_max)) ≤ 1, no overflow.
    let max = 0;
    for (let j = 0; j < labelCount; j++) if (result[base + j] > max) max = result[base + j];
    const logMax = Math.log(max);
    let sum = 0;
    for (let j = 0; j < labelCount; j++) {
      const value = result[base + j] > 0 ? Math.exp(temperature * (Math.log(result[base + j]) - logMax)) : 0;
      result[base + j] = value;
      sum += value;
    }
    for (let j = 0; j < labelCount; j++) result[base + j] /= sum;
  }
  return result;
}

/**
 * Top-label ECE of the shipped scores and of the same scores with the temperature undone,
 * over the `known` rows (gold[i] ≥ 0).
 * @example calibrationSummary(scored, gold, known, 1.3, "softmax").eceUncalibrated
 */
export function calibrationSummary(set: ScoredSet, gold: Int32Array, known: readonly number[], temperature: number, head: HeadKind): CalibrationSummary {
  const ece = topLabelEce(set.scores, set.labelCount, gold, known);
  const uncalibrated = undoTemperature(set.scores, set.labelCount, temperature, head);
  return { temperature, ece, eceUncalibrated: uncalibrated === null ? NaN : topLabelEce(uncalibrated, set.labelCount, gold, known) };
}

function topLabelEce(scores: Float32Array | Float64Array, labelCount: number, gold: Int32Array, known: readonly number[]): number {
  if (known.length === 0) return 0;
  const { confidence, correct } = topLabelRows(scores, labelCount, gold, known);
  // Clamp float rounding (a renormalized 1.0000000000000002) into [0, 1] for the binning.
  for (let n = 0; n < confidence.length; n++) confidence[n] = Math.min(1, confidence[n]);
  return expectedCalibrationError(confidence, correct, 15);
}
