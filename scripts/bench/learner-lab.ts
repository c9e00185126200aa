// Learner experiments on the training part of a prepared corpus only: a grouped validation
// split is carved from corpora/<name>/train.jsonl (test.jsonl is never read, so nothing here can
// tune to a test part). Featurizes, then trains the float draft with the settings given and
// prints validation accuracy / macro-F1 / loss after every epoch. Measurements, not tests.
//
//   node --import tsx scripts/bench/learner-lab.ts --corpus library-docs [--char 1-4] [--weighting tfidf]
//        [--dims 32] [--loss logistic|margin] [--lr 0.5] [--epochs 20] [--head softmax] [--plain (no adaptive rates)] [--max-train N]
//        [--splits N (N grouped validation splits, scores averaged per epoch)] [--reference-split]

import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { createFeaturizer } from "../../runtime/featurizer/featurizer.ts";
import { defaultBuildSettings, type BuildSettings } from "../../compiler/build/build-settings.ts";
import { featurizerSettingsOf } from "../../compiler/build/base-header.ts";
import { findClusters, groupedSplit } from "../../compiler/train/group-split.ts";
import { buildVocabulary, encodeTexts, inverseDocumentFrequency, mapToRows } from "../../compiler/train/encode.ts";
import { createDraft, type SoftmaxLoss } from "../../compiler/train/draft.ts";
import { createRandom } from "../../compiler/train/random.ts";
import { huffmanTree, treePaths } from "../../compiler/train/huffman.ts";
import { scoreDraft } from "../../compiler/train/score-draft.ts";
import { trainDraft, type TrainSettings } from "../../compiler/train/train-draft.ts";
import type { HeadKind } from "../../runtime/format/model-header.ts";

const args = process.argv.slice(2);
const option = (name: string, fallback: string) => {
  const at = args.indexOf(name);
  return at >= 0 && at + 1 < args.length ? args[at + 1] : fallback;
};
const corpus = option("--corpus", "library-docs");
const rows = readFileSync(`corpora/${corpus}/train.jsonl`, "utf8")
  .split("\n")
  .filter((line) => line.trim() !== "")
  .map((line) => JSON.parse(line) as { text: string; label: string | string[]; group?: string })
  .map((r) => ({ text: r.text, labels: Array.isArray(r.label) ? r.label : [r.label], group: r.group }));
const maxTrain = Number(option("--max-train", "0"));
const labels = [...new Set(rows.flatMap((r) => r.labels))].sort();
const labelIndex = new Map(labels.map((l, i) => [l, i]));
const clusters = findClusters(rows, { nearDuplicates: true });
// --reference-split: the validation split the scikit-learn references chose C / alpha on
// (sklearn_suite.py, in_validation: a group is in validation when the first four bytes of
// sha256("sluice-bench-validation-v1:" + group) are below 0.2 · 2^32), so the scores printed here
// compare with the "tried" validation scores in test/bench/results/accuracy-references.json.
const benchSplit = args.includes("--reference-split");
const splits = benchSplit ? 1 : Number(option("--splits", "1"));
function referenceSplit(): { train: Int32Array; validation: Int32Array } {
  const train: number[] = [];
  const validation: number[] = [];
  rows.forEach((r, i) => {
    const digest = createHash("sha256").update(`sluice-bench-validation-v1:${r.group ?? ""}`, "utf8").digest();
    (digest.readUInt32BE(0) < 0.2 * 2 ** 32 ? validation : train).push(i);
  });
  return { train: Int32Array.from(train), validation: Int32Array.from(validation) };
}

const settings: BuildSettings = defaultBuildSettings();
const span = option("--char", "0").split("-").map(Number);
settings.charSpan = [span[0], span[1] ?? span[0]] as [number, number];
settings.weighting = option("--weighting", "tfidf") as BuildSettings["weighting"];
settings.dims = Number(option("--dims", "32"));
settings.wordSpan = Number(option("--word-span", "2"));
settings.minDocs = Number(option("--min-docs", "2"));
const head = option("--head", labels.length > 200 ? "tree" : "softmax") as HeadKind;
const epochs = Number(option("--epochs", "20"));
const loss = option("--loss", "logistic") as SoftmaxLoss;
const linear = args.includes("--linear");
if (linear) settings.dims = labels.length;
const train: TrainSettings = { epochs, learningRate: Number(option("--lr", "0.5")), seed: 1 };
const featurizer = createFeaturizer(featurizerSettingsOf(settings));
const ids = (part: typeof rows) => part.map((r) => r.labels.filter((l) => labelIndex.has(l)).map((l) => labelIndex.get(l) as number));
console.log(`settings: char ${settings.charSpan.join("-")}, ${settings.weighting}, ${loss} loss, dims ${settings.dims}, head ${head}, ${JSON.stringify(train)}, ${splits} split(s)`);

// --splits N: N grouped validation splits (seeds 1..N), scores averaged per epoch, since one
// split of a few hundred rows from a few dozen groups moves by several points on its own.
const sums = Array.from({ length: epochs }, () => ({ accuracy: 0, macroF1: 0, loss: 0, trainLoss: 0, runs: 0 }));
const started = performance.now();
for (let seed = 1; seed <= splits; seed++) {
  const split = benchSplit ? referenceSplit() : groupedSplit(rows.map((r) => labelIndex.get(r.labels[0]) as number), clusters, 0.1, seed);
  let trainPart = Array.from(split.train, (i) => rows[i]);
  if (maxTrain > 0) trainPart = trainPart.slice(0, maxTrain);
  const validationPart = Array.from(split.validation, (i) => rows[i]);
  const encodedTrain = encodeTexts(featurizer, trainPart.map((r) => r.text), ids(trainPart));
  const encodedValidation = encodeTexts(featurizer, validationPart.map((r) => r.text), ids(validationPart));
  const vocabulary = buildVocabulary(encodedTrain, settings.hashBits, settings.minDocs);
  const trainRows = mapToRows(encodedTrain, vocabulary.slots, settings.hashBits);
  const validationRows = mapToRows(encodedValidation, vocabulary.slots, settings.hashBits);
  const counts = new Float64Array(labels.length);
  for (const l of trainRows.labelList) counts[l]++;
  const tree = head === "tree" ? huffmanTree(counts) : null;
  const paths = tree ? treePaths(tree, labels.length) : null;
  const random = createRandom(1);
  const draft = createDraft({ head, labels, dims: settings.dims, slots: vocabulary.slots, documentFrequency: vocabulary.documentFrequency, rowWeights: settings.weighting === "tfidf" ? inverseDocumentFrequency(vocabulary) : null, tree, random, adaptive: !args.includes("--plain"), loss, linear });
  console.log(`${corpus} split ${seed}: ${trainPart.length} train / ${validationPart.length} validation rows, ${labels.length} labels, ${vocabulary.slots.length} rows, ${encodedTrain.tokenTotal} tokens`);
  trainDraft(draft, trainRows, train, {
    paths,
    random,
    onEpoch: (epoch, meanLoss) => {
      const s = scoreDraft(draft, validationRows, paths);
      const sum = sums[epoch - 1];
      sum.accuracy += s.accuracy;
      sum.macroF1 += s.macroF1;
      sum.loss += s.loss;
      sum.trainLoss += meanLoss;
      sum.runs++;
    },
  });
}
for (let e = 0; e < epochs; e++) {
  const s = sums[e];
  if (s.runs === 0) break;
  console.log(`epoch ${String(e + 1).padStart(2)}  train loss ${(s.trainLoss / s.runs).toFixed(4)}  validation accuracy ${(s.accuracy / s.runs).toFixed(4)}  macro-F1 ${(s.macroF1 / s.runs).toFixed(4)}  loss ${(s.loss / s.runs).toFixed(4)}`);
}
console.log(`done in ${((performance.now() - started) / 1000).toFixed(1)} s`);
