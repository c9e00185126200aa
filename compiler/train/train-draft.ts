// The SGD loop: epochs over a seeded shuffle, learning rate constant under adaptive rates or
// decaying linearly to zero over the whole run (plain SGD), progress reported every few thousand examples.

import type { Draft } from "./draft.ts";
import type { EncodedExamples } from "./encode.ts";
import { checkEpochLoss } from "./divergence.ts";
import { createRandom, shuffleInPlace, type RandomSource } from "./random.ts";
import { computeHidden, createStepScratch, sigmoidOutputStep, sigmoidStep, softmaxOutputStep, softmaxStep, treeOutputStep, treeStep, type TreePaths } from "./steps.ts";

export interface TrainSettings {
  epochs: number;
  learningRate: number;
  seed: number;
}

export interface TrainProgress {
  epoch: number;
  epochs: number;
  /** Fraction of the whole run done, 0..1. */
  done: number;
  /** Mean loss over the examples since the last report. */
  loss: number;
  tokensPerSecond: number;
  etaSeconds: number;
}

export interface TrainResult {
  seconds: number;
  tokensPerSecond: number;
  /** Mean loss of the last epoch. */
  finalLoss: number;
  /** Epochs actually run (fewer than asked when `onEpoch` stopped early). */
  epochs?: number;
}

export interface TrainOptions {
  paths?: TreePaths | null;
  /** false: feature rows stay fixed, only the output layer learns. */
  trainRows?: boolean;
  random?: RandomSource;
  onProgress?: (progress: TrainProgress) => void;
  /** The run covers examples [firstStep, firstStep + epochs·count) of a longer schedule (threads). */
  schedule?: { offset: number; total: number };
  /** Train on these example indexes only (default: all). */
  subset?: Int32Array;
  /** Called every 256 steps (threads merge their output layers here). */
  onSync?: () => void;
  /**
   * Called after each epoch with its number (1-based); return true to stop training early
   * (the build's early stopping measures the validation split here).
   */
  onEpoch?: (epoch: number, meanLoss: number) => boolean | void;
}

const REPORT_EVERY = 4096;

/**
 * Trains `draft` in place on `data` (features already mapped to row ids).
 * @example trainDraft(draft, encoded, { epochs: 5, learningRate: 0.5, seed: 1 })
 */
export function trainDraft(draft: Draft, data: EncodedExamples, settings: TrainSettings, options: TrainOptions = {}): TrainResult {
  const random = options.random ?? createRandom(settings.seed);
  const scratch = createStepScratch(draft.dims, draft.outputCount);
  const trainRows = options.trainRows ?? true;
  const order = options.subset ? Int32Array.from(options.subset) : Int32Array.from({ length: data.count }, (_, i) => i);
  const count = order.length;
  const tokensPerExample = data.count > 0 ? data.tokenTotal / data.count : 0;
  const totalSteps = options.schedule?.total ?? settings.epochs * count;
  const stepOffset = options.schedule?.offset ?? 0;
  const started = performance.now();
  let step = 0;
  let reportLoss = 0;
  let reportCount = 0;
  let epochLoss = 0;
  const { offsets, features, labelOffsets, labelList } = data;
  // With the rows frozen (fine-tuning the output layer) every example's hidden vector is the
  // same in every epoch: compute each once, then each step only does the output half. (One
  // epoch, as the on-disk path runs per shard, gains nothing from it.)
  const frozenHidden = trainRows || settings.epochs < 2 ? null : hiddenVectors(draft, data, order);
  const dims = draft.dims;
  let previousLoss = NaN;
  let epochsRun = 0;
  for (let epoch = 0; epoch < settings.epochs; epoch++) {
    shuffleInPlace(order, random);
    epochLoss = 0;
    for (let i = 0; i < count; i++) {
      const example = order[i];
      const progress = (stepOffset + step) / totalSteps;
      // Adaptive rates shrink on their own, so their base rate stays constant: then epoch k of
      // a longer run is the same model as a run of k epochs, and the epochs the search's early
      // stopping validated are exactly what the build trains. Plain SGD decays linearly to zero.
      const learningRate = draft.adaptive ? settings.learningRate : settings.learningRate * Math.max(0, 1 - progress);
      const start = offsets[example];
      const end = offsets[example + 1];
      const labelStart = labelOffsets[example];
      let loss: number;
      if (frozenHidden !== null) {
        scratch.hidden.set(frozenHidden.subarray(example * dims, (example + 1) * dims));
        if (draft.head === "softmax") loss = softmaxOutputStep(draft, labelList[labelStart], learningRate, scratch);
        else if (draft.head === "sigmoid") loss = sigmoidOutputStep(draft, labelList, labelStart, labelOffsets[example + 1], learningRate, scratch);
        else loss = treeOutputStep(draft, labelList[labelStart], options.paths as TreePaths, learningRate, scratch);
      } else if (draft.head === "softmax") {
        loss = softmaxStep(draft, features, start, end, labelList[labelStart], learningRate, scratch, trainRows);
      } else if (draft.head === "sigmoid") {
        loss = sigmoidStep(draft, features, start, end, labelList, labelStart, labelOffsets[example + 1], learningRate, scratch, trainRows);
      } else {
        loss = treeStep(draft, features, start, end, labelList[labelStart], options.paths as TreePaths, learningRate, scratch, trainRows);
      }
      epochLoss += loss;
      reportLoss += loss;
      reportCount++;
      step++;
      if (options.onSync && (step & 255) === 0) options.onSync();
      if (options.onProgress && reportCount === REPORT_EVERY) {
        const seconds = (performance.now() - started) / 1000;
        const done = step / (settings.epochs * count);
        options.onProgress({
          epoch: epoch + 1,
          epochs: settings.epochs,
          done,
          loss: reportLoss / reportCount,
          tokensPerSecond: (step * tokensPerExample) / Math.max(seconds, 1e-9),
          etaSeconds: done > 0 ? (seconds / done) * (1 - done) : 0,
        });
        reportLoss = 0;
        reportCount = 0;
      }
    }
    epochsRun = epoch + 1;
    // A loss that is not finite or grows means the rate is too large: stop before it spreads.
    const meanLoss = count > 0 ? epochLoss / count : 0;
    checkEpochLoss(epoch + 1, meanLoss, previousLoss, settings.learningRate);
    previousLoss = meanLoss;
    if (options.onEpoch?.(epoch + 1, meanLoss) === true) break;
  }
  options.onSync?.();
  const seconds = (performance.now() - started) / 1000;
  return {
    seconds,
    tokensPerSecond: (epochsRun * count * tokensPerExample) / Math.max(seconds, 1e-9),
    finalLoss: count > 0 ? epochLoss / count : 0,
    epochs: epochsRun,
  };
}

/** Hidden vectors (count × dims) of the examples in `order`, from the draft's current rows. */
function hiddenVectors(draft: Draft, data: EncodedExamples, order: Int32Array): Float64Array {
  const dims = draft.dims;
  const vectors = new Float64Array(data.count * dims);
  const hidden = new Float64Array(dims);
  for (const example of order) {
    computeHidden(draft, data.features, data.offsets[example], data.offsets[example + 1], hidden);
    vectors.set(hidden, example * dims);
  }
  return vectors;
}
