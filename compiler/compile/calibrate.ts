// Temperature scaling (Guo, Pleiss, Sun & Weinberger, "On Calibration of Modern Neural
// Networks", ICML 2017): one scalar T > 0 divides every logit; fitted on the validation
// split by minimizing NLL (log loss). Softmax is shift-invariant, so log-probabilities stand
// in for the logits. The sigmoid head keeps T = 1 here (its per-label thresholds do that job).
//
// A temperature fitted on little evidence does harm: with a few dozen validation examples and
// one or two errors the NLL optimum runs to the smallest T allowed, and every later score
// becomes 1.000 or 0.000. So T is only fitted when validation can support it, and only kept
// when it lowers log loss on examples it was not fitted on:
//   1. enough examples (MIN_EXAMPLES) and enough top-label errors (MIN_ERRORS) — T is learnt
//      from the errors, the only examples that say how far to trust a score;
//   2. K-fold cross-fitting: T_f is fitted on all folds but f and scored on fold f; the
//      held-out log loss at T_f is compared with that at T = 1;
//   3. T = the geometric mean of the fold temperatures (a scale parameter, so averaged in
//      log space), inside [TEMPERATURE_FLOOR, TEMPERATURE_CEILING];
//   otherwise T = 1, and the report says why.

import type { HeadKind } from "../../runtime/format/model-header.ts";
import { topLabel } from "../../runtime/model/rank-labels.ts";
import type { LabelledText, ScoredSet } from "../evaluate/evaluate.ts";
import { expectedCalibrationError, fitTemperature } from "../metrics/index.ts";

/** Fewest validation examples a temperature is fitted on (common practice, no source: well above the 15 ECE bins). */
export const CALIBRATION_MIN_EXAMPLES = 200;
/** Fewest top-label errors on validation a temperature is fitted from (common practice, no source). */
export const CALIBRATION_MIN_ERRORS = 10;
/** Folds of the cross-fitting. */
export const CALIBRATION_FOLDS = 5;
/**
 * Bounds of a kept temperature. Guo et al. report fitted temperatures between about 1 and 4
 * for the networks they studied (Table 1 of the paper, from memory); 1/4 allows a model that is
 * too timid to be sharpened as far as a fourfold, never to certainty.
 */
export const TEMPERATURE_FLOOR = 0.25;
export const TEMPERATURE_CEILING = 4;

export interface CalibrationReport {
  /** The temperature stored in the model (1 when calibration was skipped). */
  temperature: number;
  /** What calibration optimizes. */
  objective: "log loss";
  /** Why no temperature was kept; null when one was. */
  skipped: string | null;
  /** Validation examples and their top-label errors. */
  examples: number;
  errors: number;
  /** Folds T was cross-fitted over (0 when not fitted). */
  folds: number;
  /** Mean log loss on held-out folds at T = 1 and at the fold's T (NaN when not fitted). */
  nllBefore: number;
  nllAfter: number;
  /** ECE (15 bins) of the top label on validation at T = 1 and at the stored T. */
  eceBefore: number;
  eceAfter: number;
}

/**
 * Fits T on scored validation examples when they can support it; T = 1 otherwise, with the reason.
 * @example fitCalibration("softmax", scored, validation, labelIndex).skipped // "24 validation examples; …" or null
 */
export function fitCalibration(head: HeadKind, scored: ScoredSet, validation: readonly LabelledText[], labelIndex: Map<string, number>): CalibrationReport {
  const k = scored.labelCount;
  const n = scored.count;
  const logProbabilities = new Float64Array(n * k);
  for (let i = 0; i < n * k; i++) logProbabilities[i] = Math.log(Math.max(scored.scores[i], 1e-30));
  const gold = Int32Array.from(validation, (e) => labelIndex.get(e.labels[0]) ?? 0);
  const errors = countErrors(logProbabilities, gold, n, k);
  const eceBefore = topLabelEce(logProbabilities, gold, n, k, 1);
  const skip = (reason: string, folds = 0, nllBefore = NaN, nllAfter = NaN): CalibrationReport => ({ temperature: 1, objective: "log loss", skipped: reason, examples: n, errors, folds, nllBefore, nllAfter, eceBefore, eceAfter: eceBefore });
  if (head !== "softmax") return skip(`the ${head} head is not temperature-scaled`);
  const need = `temperature scaling needs at least ${CALIBRATION_MIN_EXAMPLES} validation examples with at least ${CALIBRATION_MIN_ERRORS} errors`;
  if (n < CALIBRATION_MIN_EXAMPLES || errors < CALIBRATION_MIN_ERRORS) return skip(`${n} validation examples with ${errors} errors; ${need}`);

  const fold = Int32Array.from({ length: n }, (_, i) => i % CALIBRATION_FOLDS);
  let logTemperatureSum = 0;
  let heldOutBefore = 0;
  let heldOutAfter = 0;
  for (let f = 0; f < CALIBRATION_FOLDS; f++) {
    const fitRows = rowsWhere(fold, (g) => g !== f);
    const testRows = rowsWhere(fold, (g) => g === f);
    const fitted = fitTemperature(pick(logProbabilities, fitRows, k), pick(gold, fitRows, 1), fitRows.length, k);
    const temperature = clamp(fitted.temperature);
    logTemperatureSum += Math.log(temperature);
    heldOutBefore += meanNll(logProbabilities, gold, testRows, k, 1) * testRows.length;
    heldOutAfter += meanNll(logProbabilities, gold, testRows, k, temperature) * testRows.length;
  }
  const nllBefore = heldOutBefore / n;
  const nllAfter = heldOutAfter / n;
  if (!(nllAfter < nllBefore)) return skip(`a temperature fitted on ${CALIBRATION_FOLDS - 1} of ${CALIBRATION_FOLDS} folds did not lower the log loss of the fold left out (${nllBefore.toFixed(4)} at T = 1, ${nllAfter.toFixed(4)} fitted)`, CALIBRATION_FOLDS, nllBefore, nllAfter);
  const temperature = clamp(Math.exp(logTemperatureSum / CALIBRATION_FOLDS));
  return { temperature, objective: "log loss", skipped: null, examples: n, errors, folds: CALIBRATION_FOLDS, nllBefore, nllAfter, eceBefore, eceAfter: topLabelEce(logProbabilities, gold, n, k, temperature) };
}

function clamp(temperature: number): number {
  return Math.min(TEMPERATURE_CEILING, Math.max(TEMPERATURE_FLOOR, temperature));
}

function rowsWhere(fold: Int32Array, keep: (group: number) => boolean): number[] {
  const rows: number[] = [];
  for (let i = 0; i < fold.length; i++) if (keep(fold[i])) rows.push(i);
  return rows;
}

function pick<T extends Float64Array | Int32Array>(values: T, rows: readonly number[], width: number): T {
  const out = new (values.constructor as { new (length: number): T })(rows.length * width);
  rows.forEach((row, i) => out.set(values.subarray(row * width, row * width + width), i * width));
  return out;
}

function countErrors(logits: Float64Array, gold: Int32Array, n: number, k: number): number {
  let errors = 0;
  for (let i = 0; i < n; i++) {
    if (topLabel(logits, i * k, k) !== gold[i]) errors++;
  }
  return errors;
}

/** Mean NLL of the gold labels over `rows` after dividing logits by T. */
function meanNll(logits: Float64Array, gold: Int32Array, rows: readonly number[], k: number, temperature: number): number {
  let total = 0;
  for (const i of rows) {
    let max = -Infinity;
    for (let j = 0; j < k; j++) max = Math.max(max, logits[i * k + j] / temperature);
    let sum = 0;
    for (let j = 0; j < k; j++) sum += Math.exp(logits[i * k + j] / temperature - max);
    total += max + Math.log(sum) - logits[i * k + gold[i]] / temperature;
  }
  return total / rows.length;
}

/** ECE (15 equal-width bins) of the top label after dividing logits by T. */
export function topLabelEce(logits: Float64Array, gold: Int32Array, n: number, k: number, temperature: number): number {
  const confidence = new Float64Array(n);
  const correct = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    // Dividing by T > 0 keeps the order, so the top logit is the top scaled logit.
    const best = topLabel(logits, i * k, k);
    const max = logits[i * k + best] / temperature;
    let sum = 0;
    for (let j = 0; j < k; j++) sum += Math.exp(logits[i * k + j] / temperature - max);
    confidence[i] = 1 / sum;
    correct[i] = best === gold[i] ? 1 : 0;
  }
  return expectedCalibrationError(confidence, correct, 15);
}
