// Training data larger than memory: examples are featurized once and appended to shard
// files on disk; every epoch visits the shards in a fresh random order and shuffles inside
// each one, so memory holds one shard at a time (bounded) and a label-sorted input file
// still trains well. Shard record layout, u32 little-endian words:
//   labelCount | featureCount | tokenCount | labels (first-seen ids) … | slots …

import { closeSync, fstatSync, mkdtempSync, openSync, readSync, rmSync, writeSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Draft } from "./draft.ts";
import { keptSlots, type EncodedExamples, type Vocabulary } from "./encode.ts";
import { createRandom, shuffleInPlace } from "./random.ts";
import type { SourceTrainOptions, TrainingSource } from "./training-source.ts";
import { trainDraft, type TrainResult, type TrainSettings } from "./train-draft.ts";

// 256 KiB write buffer per shard, 16 MiB for 64 shards: 1 MiB each cost 64 MiB of a build whose
// memory is meant to be bounded (a 100 MB CSV peaked at 505 MB against a 500 MB ceiling).
const BUFFER_WORDS = 1 << 16;

/** Appends encoded examples to shards and counts document frequencies as it goes. */
export class ShardWriter {
  readonly directory: string;
  private readonly files: number[] = [];
  private buffers: Uint32Array[] = [];
  private readonly used: Int32Array;
  private readonly random;
  private readonly frequency: Uint32Array;
  private lastSeen: Int32Array;
  count = 0;
  tokenTotal = 0;
  /** Examples per first-seen label id. */
  labelCounts: number[] = [];

  constructor(shardCount: number, hashBits: number, seed: number, parent = tmpdir()) {
    this.directory = mkdtempSync(join(parent, "sluice-shards-"));
    for (let i = 0; i < shardCount; i++) {
      this.files.push(openSync(join(this.directory, `shard-${i}.bin`), "w"));
      this.buffers.push(new Uint32Array(BUFFER_WORDS));
    }
    this.used = new Int32Array(shardCount);
    this.random = createRandom(seed ^ 0x1f83d9ab);
    this.frequency = new Uint32Array(2 ** hashBits);
    this.lastSeen = new Int32Array(2 ** hashBits).fill(-1);
  }

  /** Adds one example (label ids in first-seen numbering, feature slots, token count). */
  add(labels: readonly number[], slots: Uint32Array, slotCount: number, tokens: number): void {
    const example = this.count++;
    this.tokenTotal += tokens;
    for (const label of labels) this.labelCounts[label] = (this.labelCounts[label] ?? 0) + 1;
    for (let f = 0; f < slotCount; f++) {
      const slot = slots[f];
      if (this.lastSeen[slot] !== example) {
        this.lastSeen[slot] = example;
        this.frequency[slot]++;
      }
    }
    const shard = Math.floor(this.random.next() * this.files.length);
    const words = 3 + labels.length + slotCount;
    if (this.used[shard] + words > BUFFER_WORDS) this.flush(shard);
    if (words > BUFFER_WORDS) {
      const big = new Uint32Array(words);
      this.fill(big, 0, labels, slots, slotCount, tokens);
      writeSync(this.files[shard], new Uint8Array(big.buffer));
      return;
    }
    this.fill(this.buffers[shard], this.used[shard], labels, slots, slotCount, tokens);
    this.used[shard] += words;
  }

  private fill(target: Uint32Array, at: number, labels: readonly number[], slots: Uint32Array, slotCount: number, tokens: number): void {
    target[at] = labels.length;
    target[at + 1] = slotCount;
    target[at + 2] = tokens;
    for (let l = 0; l < labels.length; l++) target[at + 3 + l] = labels[l];
    target.set(slots.subarray(0, slotCount), at + 3 + labels.length);
  }

  private flush(shard: number): void {
    if (this.used[shard] === 0) return;
    writeSync(this.files[shard], new Uint8Array(this.buffers[shard].buffer, 0, this.used[shard] * 4));
    this.used[shard] = 0;
  }

  /** Removes the shard directory (safe to call more than once). */
  dispose(): void {
    for (const fd of this.files.splice(0)) {
      try {
        closeSync(fd);
      } catch {
        // already closed by finish()
      }
    }
    rmSync(this.directory, { recursive: true, force: true });
  }

  /**
   * Closes the shards and returns a training source over them. `labelOrder[firstSeenId]` is
   * the label's id in the sorted label list.
   */
  finish(labelOrder: Int32Array): TrainingSource & { dispose(): void } {
    const paths = this.files.map((_, i) => join(this.directory, `shard-${i}.bin`));
    for (let shard = 0; shard < this.files.length; shard++) {
      this.flush(shard);
      closeSync(this.files[shard]);
    }
    this.files.length = 0;
    // Training needs neither the write buffers nor the per-slot scratch (20 MB at 2^20 slots).
    this.buffers = [];
    this.lastSeen = new Int32Array(0);
    const labelCounts = new Float64Array(labelOrder.length);
    this.labelCounts.forEach((n, firstSeen) => (labelCounts[labelOrder[firstSeen]] += n ?? 0));
    return diskSource(paths, this.directory, this.count, this.tokenTotal, labelCounts, this.frequency, labelOrder);
  }
}

function diskSource(paths: string[], directory: string, count: number, tokenTotal: number, labelCounts: Float64Array, frequency: Uint32Array, labelOrder: Int32Array): TrainingSource & { dispose(): void } {
  let rowOfSlot: Int32Array | null = null;
  let rowSlots: Uint32Array | null = null;
  const scratch = new ShardScratch();
  return {
    count,
    tokenTotal,
    labelCounts,
    vocabulary: (_hashBits: number, minDocs: number): Vocabulary => keptSlots(frequency, minDocs, count),
    async train(draft: Draft, settings: TrainSettings, options: SourceTrainOptions): Promise<TrainResult> {
      if (rowSlots !== draft.slots) {
        rowOfSlot = new Int32Array(frequency.length).fill(-1);
        for (let row = 0; row < draft.slots.length; row++) rowOfSlot[draft.slots[row]] = row;
        rowSlots = draft.slots;
      }
      const random = options.random ?? createRandom(settings.seed);
      const total = settings.epochs * count;
      const started = performance.now();
      let step = 0;
      let lastEpochLoss = 0;
      for (let epoch = 0; epoch < settings.epochs; epoch++) {
        const order = Int32Array.from(paths, (_, i) => i);
        shuffleInPlace(order, random);
        lastEpochLoss = 0;
        for (const shard of order) {
          const chunk = readShard(paths[shard], rowOfSlot as Int32Array, labelOrder, scratch);
          if (chunk.count === 0) continue;
          const before = step;
          const result = trainDraft(draft, chunk, { ...settings, epochs: 1 }, {
            paths: options.paths,
            trainRows: options.trainRows,
            random,
            schedule: { offset: step, total },
            onProgress: options.onProgress
              ? (p) => options.onProgress?.({ ...p, epoch: epoch + 1, epochs: settings.epochs, done: (before + p.done * chunk.count) / total, etaSeconds: 0 })
              : undefined,
          });
          step += chunk.count;
          lastEpochLoss += result.finalLoss * chunk.count;
        }
      }
      const seconds = (performance.now() - started) / 1000;
      return { seconds, tokensPerSecond: (settings.epochs * tokenTotal) / Math.max(seconds, 1e-9), finalLoss: count > 0 ? lastEpochLoss / count : 0 };
    },
    dispose() {
      rmSync(directory, { recursive: true, force: true });
    },
  };
}

/**
 * Arrays reused from shard to shard. Every epoch reads every shard, and fresh arrays for each
 * left garbage of twice the data's size per epoch, which the collector let pile up (peak RSS of
 * a 25 MB CSV on disk rose by some 50 MB during training).
 */
class ShardScratch {
  words = new Uint32Array(0);
  offsets = new Uint32Array(0);
  features = new Uint32Array(0);
  labelOffsets = new Uint32Array(0);
  labelList = new Int32Array(0);
}

/** `array` if it holds `length`, else a new one with room to spare (shards differ a little in size). */
function atLeast<T extends Uint32Array | Int32Array>(array: T, length: number, make: (length: number) => T): T {
  return array.length >= length ? array : make(Math.ceil(length * 1.25));
}

/** The shard file's words, read into the scratch buffer. */
function readWords(path: string, scratch: ShardScratch): Uint32Array {
  const fd = openSync(path, "r");
  try {
    const size = fstatSync(fd).size;
    scratch.words = atLeast(scratch.words, size >>> 2, (n) => new Uint32Array(n));
    const bytes = new Uint8Array(scratch.words.buffer, 0, size);
    let filled = 0;
    while (filled < size) {
      const read = readSync(fd, bytes, filled, size - filled, filled);
      if (read === 0) throw new Error(`${path}: shard ended after ${filled} of ${size} bytes`);
      filled += read;
    }
    return scratch.words.subarray(0, size >>> 2);
  } finally {
    closeSync(fd);
  }
}

/** Decodes one shard into memory (views of `scratch`, valid until the next shard), mapping slots to rows (dropping slots without one). */
function readShard(path: string, rowOfSlot: Int32Array, labelOrder: Int32Array, scratch: ShardScratch): EncodedExamples {
  const words = readWords(path, scratch);
  let examples = 0;
  let featureWords = 0;
  let labelWords = 0;
  for (let at = 0; at < words.length; at += 3 + words[at] + words[at + 1]) {
    examples++;
    labelWords += words[at];
    featureWords += words[at + 1];
  }
  scratch.offsets = atLeast(scratch.offsets, examples + 1, (n) => new Uint32Array(n));
  scratch.features = atLeast(scratch.features, featureWords, (n) => new Uint32Array(n));
  scratch.labelOffsets = atLeast(scratch.labelOffsets, examples + 1, (n) => new Uint32Array(n));
  scratch.labelList = atLeast(scratch.labelList, labelWords, (n) => new Int32Array(n));
  const offsets = scratch.offsets.subarray(0, examples + 1);
  const features = scratch.features;
  const labelOffsets = scratch.labelOffsets.subarray(0, examples + 1);
  const labelList = scratch.labelList.subarray(0, labelWords);
  offsets[0] = 0;
  labelOffsets[0] = 0;
  let featureCount = 0;
  let labelCount = 0;
  let tokenTotal = 0;
  let example = 0;
  for (let at = 0; at < words.length; ) {
    const labels = words[at];
    const slots = words[at + 1];
    tokenTotal += words[at + 2];
    for (let l = 0; l < labels; l++) labelList[labelCount++] = labelOrder[words[at + 3 + l]];
    const slotStart = at + 3 + labels;
    for (let f = 0; f < slots; f++) {
      const row = rowOfSlot[words[slotStart + f]];
      if (row >= 0) features[featureCount++] = row;
    }
    example++;
    offsets[example] = featureCount;
    labelOffsets[example] = labelCount;
    at = slotStart + slots;
  }
  return { count: examples, offsets, features: features.subarray(0, featureCount), labelOffsets, labelList, tokenTotal };
}
