// build(examples, settings) → model bytes: split → encode → train the draft → prune →
// quantize → fine-tune the output layer → calibrate → choose the policy → write → verify.
// Pure: no file I/O; the CLI reads the data and writes the file. The stages after encoding
// are in compile-from-source.ts (shared with build-from-file.ts).

import { createFeaturizer } from "../../runtime/featurizer/featurizer.ts";
import { leakWarning, TrainingTextCollector } from "../read/text-fingerprints.ts";
import { encodeTexts } from "../train/encode.ts";
import { memorySource } from "../train/training-source.ts";
import { featurizerSettingsOf } from "./base-header.ts";
import type { BuildInput } from "./build-input.ts";
import type { BuildReport } from "./build-report.ts";
import { chooseHead } from "./choose-head.ts";
import { compileFromSource } from "./compile-from-source.ts";
import { explicitSettings } from "./explicit-settings.ts";
import { describeChoice, searchSettings, type SearchReport } from "./search-settings.ts";
import { collectLabels, splitExamples } from "./split-examples.ts";

/**
 * Trains and compiles a model.
 * @example
 * const { bytes, report } = await build({ examples, settings: defaultBuildSettings(), buildTime: new Date().toISOString() });
 */
export async function build(input: BuildInput): Promise<{ bytes: Uint8Array; report: BuildReport }> {
  const started = performance.now();
  const warnings: string[] = [];
  const say = (message: string) => input.onMessage?.(message);
  const labels = collectLabels(input.examples);
  if (labels.length === 0) throw new Error("no labelled examples to train on");
  let { head, reason: headReason } = chooseHead(input.settings.head, input.examples.some((e) => e.labels.length > 1), labels.length);
  if (head !== "sigmoid" && labels.length < 2) throw new Error(`only one label ("${labels[0]}") in the data: a ${head} head needs at least two (use --head sigmoid for one yes/no label)`);
  say(`head: ${head} (${headReason})`);

  const labelIndex = new Map(labels.map((label, i) => [label, i]));
  const { train, validation, split } = splitExamples(input, labelIndex, warnings);
  // Leakage: a validation text that also appears in training makes validation optimistic.
  // One pass over the training texts serves both the exact check and the stored fingerprint.
  const trainTexts = new TrainingTextCollector();
  for (const example of train) trainTexts.add(example.text);
  const leaks = trainTexts.findLeaks(validation.map((e) => e.text));
  const leak = leakWarning(leaks, "validation");
  if (leak !== null) warnings.push(leak);
  if (validation.length === 0) warnings.push("no validation data (holdout 0 and no --validation): metrics below are not measured on held-out data");

  // Choose what the user left open on the validation split (epochs, learning rate, character
  // n-grams, weighting, dims), then build with it.
  let search: SearchReport | null = null;
  let settings = input.settings;
  const explicit = explicitSettings(input.settings, input.explicit);
  if (input.settings.searchTime !== 0 && validation.length > 0) {
    const searched = await searchSettings({ train, validation, labels, head, settings: input.settings, explicit, onMessage: input.onMessage, memoryRoomBytes: input.searchMemoryRoomBytes });
    search = searched.report;
    settings = searched.settings;
    if (search.chosen.head !== head) {
      head = search.chosen.head;
      headReason = `the build's search: higher validation macro-F1 than the ${head === "softmax" ? "tree" : "softmax"} head`;
    }
    say(`search: chose ${describeChoice(search)} in ${search.seconds.toFixed(1)} s`);
    if (search.stoppedByBudget) warnings.push(`the setting search stopped at its time budget (${search.budgetSeconds.toFixed(0)} s) before trying every candidate; raise --search-time to try them all (the choice then depends on this machine's speed)`);
  }
  const job = { ...input, settings };
  const featurizerSettings = featurizerSettingsOf(settings);
  const featurizer = createFeaturizer(featurizerSettings);
  const encoded = encodeTexts(featurizer, train.map((e) => e.text), train.map((e) => e.labels.map((l) => labelIndex.get(l) as number)));
  const source = memorySource(encoded, labels.length, settings.hashBits);
  const trainFingerprint = settings.fingerprint ? trainTexts.fingerprint() : undefined;
  return compileFromSource({ input: job, split, search, source, labels, head, headReason, validation, featurizerSettings, warnings, leaks, trainFingerprint, prepareSeconds: (performance.now() - started) / 1000 });
}
