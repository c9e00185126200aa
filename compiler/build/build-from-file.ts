// Building from a data file larger than memory: one streaming pass featurizes every example
// into shards on disk (train/disk-source.ts) and picks the validation split by a seeded
// hash of each example's position — no need to hold the data or know its size first. The
// validation part is capped by reservoir sampling (Vitter 1985, Algorithm R); examples the
// reservoir evicts go to training, so none is lost. Then the usual stages run.

import { createFeatureBuffer, createFeaturizer } from "../../runtime/featurizer/featurizer.ts";
import { murmur3Words } from "../../runtime/featurizer/murmur3.ts";
import { featurizerSettingsOf } from "./base-header.ts";
import type { BuildInput } from "./build-input.ts";
import type { BuildReport } from "./build-report.ts";
import { chooseHead } from "./choose-head.ts";
import { compileFromSource } from "./compile-from-source.ts";
import type { LabelledText } from "../evaluate/evaluate.ts";
import { readExamples, type ReadOptions, type ReadReport } from "../read/index.ts";
import { leakWarning, TrainingTextCollector } from "../read/text-fingerprints.ts";
import { ShardWriter } from "../train/disk-source.ts";
import { createRandom } from "../train/random.ts";

/** Most validation examples kept in memory. */
export const MAX_VALIDATION_EXAMPLES = 20_000;
const SHARD_COUNT = 64;

export interface FileBuildInput extends Omit<BuildInput, "examples" | "validation"> {
  path: string;
  readOptions: ReadOptions;
  readReport?: ReadReport;
  /** Validation examples from a separate file (then no holdout is taken). */
  validation?: readonly LabelledText[];
  /** Where the shards go (default: the system temp directory); removed afterwards. */
  tempDirectory?: string;
}

/**
 * Builds a model from a file of any size with bounded memory.
 * @example await buildFromFile({ path: "big.jsonl", readOptions: {}, settings, buildTime })
 */
export async function buildFromFile(input: FileBuildInput): Promise<{ bytes: Uint8Array; report: BuildReport }> {
  const started = performance.now();
  const { settings } = input;
  const featurizerSettings = featurizerSettingsOf(settings);
  const featurizer = createFeaturizer(featurizerSettings);
  const buffer = createFeatureBuffer(4096);
  const writer = new ShardWriter(SHARD_COUNT, settings.hashBits, settings.seed, input.tempDirectory);
  const labelIds = new Map<string, number>();
  let severalLabels = false;
  const holdout = input.validation ? 0 : settings.holdout;
  const threshold = holdout * 2 ** 32;
  const reservoir: LabelledText[] = [];
  const reservoirRandom = createRandom(settings.seed ^ 0x2c1b3c6d);
  let validationSeen = 0;
  const position = new Uint32Array(1);
  let ordinal = 0;
  let lastNotice = Date.now();

  const collector = new TrainingTextCollector();
  const addToTraining = (example: LabelledText) => {
    collector.add(example.text);
    featurizer.featurize(example.text, buffer);
    const ids = example.labels.map((label) => {
      let id = labelIds.get(label);
      if (id === undefined) {
        id = labelIds.size;
        labelIds.set(label, id);
      }
      return id;
    });
    writer.add(ids, buffer.slots, buffer.count, buffer.tokenCount);
  };

  try {
    for await (const example of readExamples(input.path, input.readOptions, input.readReport)) {
      if (example.labels.length > 1) severalLabels = true;
      position[0] = ordinal++;
      const isValidation = holdout > 0 && murmur3Words(position, 0, 1, settings.seed) < threshold;
      if (!isValidation) addToTraining(example);
      else if (reservoir.length < MAX_VALIDATION_EXAMPLES) reservoir.push({ text: example.text, labels: example.labels });
      else {
        // Algorithm R: keep each later candidate with probability cap / seen, evicting one at random.
        const slot = Math.floor(reservoirRandom.next() * (validationSeen + 1));
        if (slot < MAX_VALIDATION_EXAMPLES) {
          addToTraining(reservoir[slot]);
          reservoir[slot] = { text: example.text, labels: example.labels };
        } else addToTraining(example);
      }
      if (isValidation) validationSeen++;
      if (input.onMessage && Date.now() - lastNotice > 5000) {
        lastNotice = Date.now();
        input.onMessage(`read ${ordinal} examples (${writer.count} for training)…`);
      }
    }
    const labels = [...labelIds.keys()].sort();
    if (labels.length === 0) throw new Error(`${input.path}: no labelled examples to train on`);
    const labelOrder = new Int32Array(labelIds.size);
    for (const [label, id] of labelIds) labelOrder[id] = labels.indexOf(label);
    const { head, reason } = chooseHead(settings.head, severalLabels, labels.length);
    if (head !== "sigmoid" && labels.length < 2) throw new Error(`only one label ("${labels[0]}") in the data: a ${head} head needs at least two`);
    input.onMessage?.(`head: ${head} (${reason}); ${writer.count} training examples in ${SHARD_COUNT} shards on disk`);
    const known = new Set(labels);
    const warnings: string[] = [];
    const validationSource = input.validation ?? reservoir;
    const validation = validationSource.filter((e) => e.labels.every((l) => known.has(l)));
    if (validation.length < validationSource.length) warnings.push(`${validationSource.length - validation.length} validation examples have labels absent from the training data; they are left out of validation`);
    if (validation.length === 0) warnings.push("no validation data: metrics are not measured on held-out data");
    if (validationSeen > MAX_VALIDATION_EXAMPLES) warnings.push(`validation capped at a uniform sample of ${MAX_VALIDATION_EXAMPLES} of ${validationSeen} held-out examples (the rest trained)`);
    const leaks = collector.findLeaks(validation.map((e) => e.text));
    const leak = leakWarning(leaks, "validation");
    if (leak !== null) warnings.push(leak);
    const source = writer.finish(labelOrder);
    try {
      return await compileFromSource({
        input: { ...input, exampleCount: ordinal },
        source,
        labels,
        head,
        headReason: reason,
        validation,
        featurizerSettings,
        warnings,
        leaks,
        trainFingerprint: settings.fingerprint ? collector.fingerprint() : undefined,
        prepareSeconds: (performance.now() - started) / 1000,
      });
    } finally {
      source.dispose();
    }
  } finally {
    writer.dispose();
  }
}
