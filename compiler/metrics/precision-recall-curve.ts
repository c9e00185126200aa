// Precision-recall curve of a binary score and the operating-point pickers the policy
// compiler uses. One point per distinct score, sorted by descending threshold; at threshold t
// an example counts as predicted positive when its score ≥ t (scikit-learn's convention in
// precision_recall_curve). Unlike scikit-learn, no extra (precision 1, recall 0) end point
// is appended: every point here is a threshold that can actually be deployed.
// Recall is 0 when there are no positives (0/0 = 0, as everywhere in compiler/metrics).

import { checkInteger, checkSameLength, checkUnitInterval, type NumberList } from "./input-checks.ts";
import { metricsInputError } from "./metrics-input-error.ts";

/** One operating point: predict positive when score ≥ threshold. */
export interface CurvePoint {
  threshold: number;
  precision: number;
  recall: number;
  truePositives: number;
  falsePositives: number;
}

/**
 * Precision and recall at every distinct score used as a threshold (score ≥ threshold counts
 * as positive), sorted by descending threshold. Empty input gives an empty curve.
 * @example
 * precisionRecallCurve([0.1, 0.4, 0.35, 0.8], [false, false, true, true])[0]
 * // { threshold: 0.8, precision: 1, recall: 0.5, truePositives: 1, falsePositives: 0 }
 */
export function precisionRecallCurve(
  scores: Float32Array | Float64Array | NumberList,
  positives: Uint8Array | readonly boolean[] | NumberList,
): CurvePoint[] {
  const fn = "precisionRecallCurve";
  checkSameLength(fn, "scores", scores, "positives", positives);
  const count = scores.length;
  const isPositive = new Uint8Array(count);
  let totalPositives = 0;
  for (let i = 0; i < count; i++) {
    if (Number.isNaN(scores[i])) {
      throw metricsInputError("bad-number", fn, `scores[${i}] is NaN, expected a number`);
    }
    const label = positives[i];
    if (label !== true && label !== false && label !== 0 && label !== 1) {
      throw metricsInputError("bad-number", fn, `positives[${i}] = ${String(label)}, expected true, false, 0 or 1`);
    }
    if (label === true || label === 1) {
      isPositive[i] = 1;
      totalPositives++;
    }
  }

  const order = new Int32Array(count);
  for (let i = 0; i < count; i++) order[i] = i;
  order.sort((a, b) => scores[b] - scores[a] || a - b);

  const curve: CurvePoint[] = [];
  let truePositives = 0;
  let falsePositives = 0;
  for (let r = 0; r < count; r++) {
    const index = order[r];
    if (isPositive[index]) truePositives++;
    else falsePositives++;
    // Emit once all examples tied at this score are counted.
    const last = r === count - 1 || scores[order[r + 1]] !== scores[index];
    if (last) {
      curve.push({
        threshold: scores[index],
        precision: truePositives / (truePositives + falsePositives),
        recall: totalPositives === 0 ? 0 : truePositives / totalPositives,
        truePositives,
        falsePositives,
      });
    }
  }
  return curve;
}

/**
 * The point with the highest recall among those whose precision ≥ `target` and that predict at
 * least `minSupport` positives (so one lucky example cannot set a threshold); ties in recall go
 * to the higher threshold, which has the same true positives and fewer false positives.
 * Null when no point qualifies. Expects a curve from `precisionRecallCurve`.
 * @example
 * const curve = precisionRecallCurve([0.1, 0.4, 0.35, 0.8], [false, false, true, true]);
 * thresholdForTargetPrecision(curve, 0.6)?.threshold // 0.35
 */
export function thresholdForTargetPrecision(
  curve: readonly CurvePoint[],
  target: number,
  minSupport = 1,
): CurvePoint | null {
  checkUnitInterval("thresholdForTargetPrecision", "target", target);
  checkInteger("thresholdForTargetPrecision", "minSupport", minSupport, 1);
  let best: CurvePoint | null = null;
  for (const point of curve) {
    if (point.precision < target || point.truePositives + point.falsePositives < minSupport) continue;
    if (best === null || point.recall > best.recall) best = point;
  }
  return best;
}

/**
 * The point with the highest precision among those whose recall ≥ `target`; ties in precision
 * go to the higher threshold. Null when no point qualifies (e.g. no positives).
 * Expects a curve from `precisionRecallCurve`.
 * @example
 * const curve = precisionRecallCurve([0.1, 0.4, 0.35, 0.8], [false, false, true, true]);
 * thresholdForTargetRecall(curve, 1)?.threshold // 0.35
 */
export function thresholdForTargetRecall(curve: readonly CurvePoint[], target: number): CurvePoint | null {
  checkUnitInterval("thresholdForTargetRecall", "target", target);
  let best: CurvePoint | null = null;
  for (const point of curve) {
    if (point.recall < target) continue;
    if (best === null || point.precision > best.precision) best = point;
  }
  return best;
}
