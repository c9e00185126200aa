// Temperature scaling (Guo, Pleiss, Sun & Weinberger, "On Calibration of Modern Neural
// Networks", ICML 2017): one scalar T > 0 divides every logit; fitted on the validation
// split by minimizing NLL. Softmax is shift-invariant, so log-probabilities stand in for
// the logits. The sigmoid head keeps T = 1 here (its per-label thresholds do that job).

import type { HeadKind } from "../../runtime/format/model-header.ts";
import type { LabelledText, ScoredSet } from "../evaluate/evaluate.ts";
import { expectedCalibrationError, fitTemperature } from "../metrics/index.ts";

export interface CalibrationReport {
  temperature: number;
  eceBefore: number;
  eceAfter: number;
  nllBefore: number;
  nllAfter: number;
}

/** Fits T on scored validation examples; returns T = 1 when there is nothing to fit. */
export function fitCalibration(head: HeadKind, scored: ScoredSet, validation: readonly LabelledText[], labelIndex: Map<string, number>): CalibrationReport {
  const k = scored.labelCount;
  const n = scored.count;
  const logProbabilities = new Float64Array(n * k);
  for (let i = 0; i < n * k; i++) logProbabilities[i] = Math.log(Math.max(scored.scores[i], 1e-30));
  const gold = Int32Array.from(validation, (e) => labelIndex.get(e.labels[0]) ?? 0);
  const eceBefore = topLabelEce(logProbabilities, gold, n, k, 1);
  if (head !== "softmax" || n < 2) return { temperature: 1, eceBefore, eceAfter: eceBefore, nllBefore: NaN, nllAfter: NaN };
  const fit = fitTemperature(logProbabilities, gold, n, k);
  return { temperature: fit.temperature, eceBefore, eceAfter: topLabelEce(logProbabilities, gold, n, k, fit.temperature), nllBefore: fit.nllBefore, nllAfter: fit.nllAfter };
}

/** ECE (15 equal-width bins) of the top label after dividing logits by T. */
export function topLabelEce(logits: Float64Array, gold: Int32Array, n: number, k: number, temperature: number): number {
  const confidence = new Float64Array(n);
  const correct = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    let max = -Infinity;
    let best = 0;
    for (let j = 0; j < k; j++) {
      const z = logits[i * k + j] / temperature;
      if (z > max) {
        max = z;
        best = j;
      }
    }
    let sum = 0;
    for (let j = 0; j < k; j++) sum += Math.exp(logits[i * k + j] / temperature - max);
    confidence[i] = 1 / sum;
    correct[i] = best === gold[i] ? 1 : 0;
  }
  return expectedCalibrationError(confidence, correct, 15);
}
