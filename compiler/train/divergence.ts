// Training that ran away: the loss of an epoch became NaN or infinite, or grew instead of
// falling. SGD on a convex-per-example loss with a decaying rate should lower the training
// loss epoch after epoch; when it climbs, the learning rate is too large for this data and
// every later stage (pruning, quantization) would only turn the damage into confusing errors.

/** Thrown by training when the loss is not finite or grows; the build turns it into advice. */
export class TrainingDivergedError extends Error {
  readonly epoch: number;
  readonly learningRate: number;
  /** What went wrong ("loss rose from 0.0142 to 0.0291"), without the advice. */
  readonly detail: string;
  constructor(epoch: number, learningRate: number, detail: string) {
    super(`training diverged${epoch > 0 ? ` at epoch ${epoch}` : ""}: ${detail}; lower --learning-rate (now ${learningRate})`);
    this.name = "TrainingDivergedError";
    this.epoch = epoch;
    this.learningRate = learningRate;
    this.detail = detail;
  }
}

/**
 * A training loss that rose by more than this fraction over the previous epoch counts as
 * diverging. Shuffling noise moves an epoch's mean loss by a few percent at most once the
 * rate decays (common practice, no source); a rise of a quarter is no longer noise.
 */
export const LOSS_GROWTH_LIMIT = 0.25;
/**
 * ...and by more than this much in absolute terms: a fitted model's loss near zero wobbles by
 * large fractions of itself (measured: 0.0025 → 0.0034 on library passages with a constant
 * adaptive rate), which is not divergence.
 */
export const LOSS_GROWTH_FLOOR = 0.01;

/**
 * Checks one epoch's mean loss against the one before; throws TrainingDivergedError.
 * @example checkEpochLoss(3, 0.9, 0.4, 1) // throws: 0.9 is more than 0.4 × 1.25
 */
export function checkEpochLoss(epoch: number, loss: number, previous: number, learningRate: number): void {
  if (!Number.isFinite(loss)) throw new TrainingDivergedError(epoch, learningRate, `the mean loss became ${loss}`);
  if (Number.isFinite(previous) && loss > previous * (1 + LOSS_GROWTH_LIMIT) && loss - previous > LOSS_GROWTH_FLOOR) {
    throw new TrainingDivergedError(epoch, learningRate, `the mean loss grew from ${previous.toFixed(4)} to ${loss.toFixed(4)}`);
  }
}

/**
 * Largest |value| a trained weight may reach. Sensible models on mean-combined rows stay far
 * below 100 (inputs are averages, so a weight of 1000 already saturates every softmax); the int8
 * writer can store up to about 30,000. Anything above this limit is a run that diverged.
 */
export const WEIGHT_LIMIT = 1000;

/**
 * Throws TrainingDivergedError when some weight is not finite or beyond WEIGHT_LIMIT.
 * @example checkWeights([new Float32Array([0.1, NaN])], 5, 0.5) // throws
 */
export function checkWeights(arrays: readonly Float32Array[], epoch: number, learningRate: number): void {
  for (const array of arrays) {
    for (let i = 0; i < array.length; i++) {
      const value = array[i];
      if (!(Math.abs(value) <= WEIGHT_LIMIT)) {
        throw new TrainingDivergedError(epoch, learningRate, Number.isFinite(value) ? `a weight reached ${value.toPrecision(4)}` : `a weight became ${value}`);
      }
    }
  }
}
