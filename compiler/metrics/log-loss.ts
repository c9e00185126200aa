// Mean negative log-likelihood of the gold labels, the number calibration and temperature
// scaling try to lower. Probabilities are clipped to [1e-15, 1 − 1e-15] before the log,
// as scikit-learn's log_loss does with its default eps=1e-15 (scikit-learn 1.0 API reference,
// sklearn.metrics.log_loss), so one confident mistake costs at most −ln(1e-15) ≈ 34.5
// instead of Infinity.

import { checkUnitInterval, type NumberList } from "./input-checks.ts";

/** Clipping bound for probabilities, scikit-learn's log_loss default eps. */
export const LOG_LOSS_CLIP = 1e-15;

/**
 * Mean of −ln p over examples, where p is the probability the model gave the gold label,
 * clipped to [1e-15, 1 − 1e-15]. Natural log. No examples gives 0.
 * @example logLoss([0.9, 0.9, 0.8, 0.65]) // ≈ 0.21616
 */
export function logLoss(probabilityOfGold: Float64Array | Float32Array | NumberList): number {
  const count = probabilityOfGold.length;
  let sum = 0;
  for (let i = 0; i < count; i++) {
    const p = probabilityOfGold[i];
    checkUnitInterval("logLoss", `probabilityOfGold[${i}]`, p);
    sum -= Math.log(Math.min(1 - LOG_LOSS_CLIP, Math.max(LOG_LOSS_CLIP, p)));
  }
  return count === 0 ? 0 : sum / count;
}
