// Learner experiments on the training part of a prepared corpus only: a grouped validation
// split is carved from corpora/<name>/train.jsonl (test.jsonl is never read, so nothing here can
// tune to a test part). Featurizes once, then trains the float draft with the settings given and
// prints validation accuracy / macro-F1 / loss after every epoch. Measurements, not tests.
//
//   node --import tsx scripts/bench/learner-lab.ts --corpus library-docs [--char 1-4] [--weighting tfidf]
//        [--dims 32] [--lr 0.5] [--epochs 20] [--head softmax] [--plain (no adaptive rates)] [--max-train N]

import { readFileSync } from "node:fs";
import { createFeaturizer } from "../../runtime/featurizer/featurizer.ts";
import { defaultBuildSettings, type BuildSettings } from "../../compiler/build/build-settings.ts";
import { featurizerSettingsOf } from "../../compiler/build/base-header.ts";
import { findClusters, groupedSplit } from "../../compiler/train/group-split.ts";
import { buildVocabulary, encodeTexts, inverseDocumentFrequency, mapToRows } from "../../compiler/train/encode.ts";
import { createDraft } from "../../compiler/train/draft.ts";
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
const split = groupedSplit(rows.map((r) => labelIndex.get(r.labels[0]) as number), clusters, 0.1, 1);
let trainPart = Array.from(split.train, (i) => rows[i]);
if (maxTrain > 0) trainPart = trainPart.slice(0, maxTrain);
const validationPart = Array.from(split.validation, (i) => rows[i]);

const settings: BuildSettings = defaultBuildSettings();
const span = option("--char", "0").split("-").map(Number);
settings.charSpan = [span[0], span[1] ?? span[0]] as [number, number];
settings.weighting = option("--weighting", "tfidf") as BuildSettings["weighting"];
settings.dims = Number(option("--dims", "32"));
settings.wordSpan = Number(option("--word-span", "2"));
settings.minDocs = Number(option("--min-docs", "2"));
const head = option("--head", labels.length > 200 ? "tree" : "softmax") as HeadKind;
const epochs = Number(option("--epochs", "20"));
const train: TrainSettings = { epochs, learningRate: Number(option("--lr", "0.5")), seed: 1 };

const started = performance.now();
const featurizer = createFeaturizer(featurizerSettingsOf(settings));
const ids = (part: typeof rows) => part.map((r) => r.labels.filter((l) => labelIndex.has(l)).map((l) => labelIndex.get(l) as number));
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
const draft = createDraft({ head, labels, dims: settings.dims, slots: vocabulary.slots, documentFrequency: vocabulary.documentFrequency, rowWeights: settings.weighting === "tfidf" ? inverseDocumentFrequency(vocabulary) : null, tree, random, adaptive: !args.includes("--plain") });
console.log(`${corpus}: ${trainPart.length} train / ${validationPart.length} validation rows, ${labels.length} labels, ${vocabulary.slots.length} rows, ${encodedTrain.tokenTotal} tokens; featurized in ${((performance.now() - started) / 1000).toFixed(1)} s`);
console.log(`settings: char ${settings.charSpan.join("-")}, ${settings.weighting}, dims ${settings.dims}, head ${head}, ${JSON.stringify(train)}`);
const trainStarted = performance.now();
trainDraft(draft, trainRows, train, {
  paths,
  random,
  onEpoch: (epoch, meanLoss) => {
    const s = scoreDraft(draft, validationRows, paths);
    console.log(`epoch ${String(epoch).padStart(2)}  train loss ${meanLoss.toFixed(4)}  validation accuracy ${s.accuracy.toFixed(4)}  macro-F1 ${s.macroF1.toFixed(4)}  loss ${s.loss.toFixed(4)}  (${((performance.now() - trainStarted) / 1000).toFixed(1)} s)`);
  },
});
