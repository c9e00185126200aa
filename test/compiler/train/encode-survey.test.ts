// The setting search's character n-gram probe no longer encodes all the training data (14 times
// the words-only encoding, gigabytes on a 100 MB file) to train on a subsample of it: it counts the
// vocabulary with surveyTexts and encodes the subsample alone. These tests pin the two facts that
// keep its result the same: the survey gives exactly the vocabulary and size of a full encoding,
// and training on a compacted subsample visits the same examples in the same order as training
// on the full encoding with the subset. Data: the invented demo support topics (demo-data/README.md).

import { beforeAll, describe, expect, it } from "vitest";
import { createFeaturizer } from "../../../runtime/featurizer/featurizer.ts";
import { buildVocabulary, encodeTexts, keptSlots, mapToRows, surveyTexts } from "../../../compiler/train/encode.ts";
import { createDraft } from "../../../compiler/train/draft.ts";
import { createRandom } from "../../../compiler/train/random.ts";
import { trainDraft } from "../../../compiler/train/train-draft.ts";
import { readExamples, type Example } from "../../../compiler/read/index.ts";

const SUPPORT_TOPICS = new URL("../../../demo-data/support-topics.csv", import.meta.url).pathname;
const HASH_BITS = 16;
let examples: Example[] = [];
let labels: string[] = [];

beforeAll(async () => {
  for await (const example of readExamples(SUPPORT_TOPICS, { textFields: ["subject", "body"], labelField: "topic" })) examples.push(example);
  examples = examples.slice(0, 800);
  labels = [...new Set(examples.map((e) => e.labels[0]))].sort();
});

const featurizer = () => createFeaturizer({ normalization: 2, hashBits: HASH_BITS, hashSeed: 0, wordSpan: 2, charMin: 1, charMax: 4, maxTokens: 2000, unspacedScripts: true });
const labelIds = (rows: readonly Example[]) => rows.map((e) => [labels.indexOf(e.labels[0])]);

describe("surveyTexts", () => {
  it("counts the same vocabulary, features and tokens as a full encoding", () => {
    const texts = examples.map((e) => e.text);
    const encoded = encodeTexts(featurizer(), texts, labelIds(examples));
    const survey = surveyTexts(featurizer(), texts, HASH_BITS);
    expect(survey.featureTotal).toBe(encoded.features.length);
    expect(survey.tokenTotal).toBe(encoded.tokenTotal);
    for (const minDocs of [1, 2, 5]) {
      const full = buildVocabulary(encoded, HASH_BITS, minDocs);
      const counted = keptSlots(survey.frequency, minDocs, survey.count);
      expect(Array.from(counted.slots)).toEqual(Array.from(full.slots));
      expect(Array.from(counted.documentFrequency)).toEqual(Array.from(full.documentFrequency));
      expect(counted.documentCount).toBe(full.documentCount);
    }
  });
});

describe("training on a subsample", () => {
  it("gives the same draft from the subsample encoded alone as from the full encoding with the subset", () => {
    const texts = examples.map((e) => e.text);
    const encoded = encodeTexts(featurizer(), texts, labelIds(examples));
    const vocabulary = buildVocabulary(encoded, HASH_BITS, 2);
    const subset = Int32Array.from({ length: 100 }, (_, i) => i * 7 + 3);
    const alone = encodeTexts(featurizer(), Array.from(subset, (i) => texts[i]), Array.from(subset, (i) => labelIds(examples)[i]));
    const train = (data: typeof encoded, order: Int32Array) => {
      const random = createRandom(5);
      const draft = createDraft({ head: "softmax", labels, dims: 8, slots: vocabulary.slots, documentFrequency: vocabulary.documentFrequency, rowWeights: null, tree: null, random, adaptive: true });
      trainDraft(draft, mapToRows(data, vocabulary.slots, HASH_BITS), { epochs: 2, learningRate: 0.5, seed: 5 }, { random, subset: order });
      return draft;
    };
    const fromFull = train(encoded, subset);
    const fromAlone = train(alone, Int32Array.from({ length: subset.length }, (_, i) => i));
    expect(Buffer.from(fromAlone.rows.buffer).equals(Buffer.from(fromFull.rows.buffer))).toBe(true);
    expect(Buffer.from(fromAlone.outputs.buffer).equals(Buffer.from(fromFull.outputs.buffer))).toBe(true);
    // Not vacuous: training moved the rows away from their initial values.
    const untouched = createDraft({ head: "softmax", labels, dims: 8, slots: vocabulary.slots, documentFrequency: vocabulary.documentFrequency, rowWeights: null, tree: null, random: createRandom(5), adaptive: true });
    expect(Buffer.from(untouched.rows.buffer).equals(Buffer.from(fromFull.rows.buffer))).toBe(false);
  });
});
