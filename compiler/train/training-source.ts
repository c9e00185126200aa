// Where training examples come from: memory (small data, the default) or shards on disk
// (data larger than memory, see disk-source.ts). The build stages after encoding only see
// this interface, so both paths train, prune and fine-tune the same way.

import type { Draft } from "./draft.ts";
import { buildVocabulary, mapToRows, type EncodedExamples, type Vocabulary } from "./encode.ts";
import type { RandomSource } from "./random.ts";
import type { TreePaths } from "./steps.ts";
import { trainDraft, type TrainProgress, type TrainResult, type TrainSettings } from "./train-draft.ts";
import { trainParallel } from "./train-parallel.ts";

export interface SourceTrainOptions {
  paths: TreePaths | null;
  /** false: only the output layer learns (fine-tuning after pruning). */
  trainRows: boolean;
  threads: number;
  random?: RandomSource;
  onProgress?: (progress: TrainProgress) => void;
}

export interface TrainingSource {
  count: number;
  tokenTotal: number;
  /** Examples per label id. */
  labelCounts: Float64Array;
  /** Slots seen in at least `minDocs` training examples. */
  vocabulary(hashBits: number, minDocs: number): Vocabulary;
  /** Runs SGD on `draft` (whose `slots` say which feature has which row). */
  train(draft: Draft, settings: TrainSettings, options: SourceTrainOptions): Promise<TrainResult>;
}

/**
 * A source over examples already encoded in memory.
 * @example const source = memorySource(encodeTexts(featurizer, texts, labels), labelCount, 20)
 */
export function memorySource(encoded: EncodedExamples, labelCount: number, hashBits: number): TrainingSource {
  const labelCounts = new Float64Array(labelCount);
  for (let i = 0; i < encoded.labelList.length; i++) labelCounts[encoded.labelList[i]]++;
  let cachedSlots: Uint32Array | null = null;
  let cachedRows: EncodedExamples | null = null;
  return {
    count: encoded.count,
    tokenTotal: encoded.tokenTotal,
    labelCounts,
    vocabulary: (bits, minDocs) => buildVocabulary(encoded, bits, minDocs),
    async train(draft, settings, options) {
      if (cachedSlots !== draft.slots) {
        cachedRows = mapToRows(encoded, draft.slots, hashBits);
        cachedSlots = draft.slots;
      }
      const data = cachedRows as EncodedExamples;
      if (options.threads > 1 && options.trainRows) return trainParallel(draft, data, settings, options.threads, options.paths, options.onProgress ?? (() => {}));
      return trainDraft(draft, data, settings, { paths: options.paths, trainRows: options.trainRows, random: options.random, onProgress: options.onProgress });
    },
  };
}
