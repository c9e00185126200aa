// A buffer made with origins is named after the fact, from the featurizer's state of that
// same call: decisions and explanations name only the features they show, from the very
// features they were scored with.
import { describe, expect, it } from "vitest";
import { createFeatureBuffer, createFeaturizer } from "../../../runtime/index.ts";

const SETTINGS = { normalization: 2, wordSpan: 2, charMin: 3, charMax: 3, hashBits: 18, hashSeed: 0, maxTokens: 2000 } as const;

describe("feature origins", () => {
  it("names each feature as people read it: tokens, word pairs, framed character n-grams", () => {
    const featurizer = createFeaturizer(SETTINGS);
    const buffer = createFeatureBuffer(4, "origins"); // small, so the origins grow with the slots
    featurizer.featurize("Refund it", buffer);
    const names = Array.from({ length: buffer.count }, (_, f) => featurizer.nameOf(buffer, f));
    // Hand-written expectation: 2 tokens, 1 pair, then the 3-grams of "·refund·" and "·it·"
    // (the edge "·" frames each word; common practice, no source).
    expect(names).toEqual(["refund", "it", "refund it", "·re", "ref", "efu", "fun", "und", "nd·", "·it", "it·"]);
  });

  it("gives the same names and sources as a buffer that names every feature while featurizing", () => {
    const featurizer = createFeaturizer(SETTINGS);
    const text = "Get frее MONEY f r e e at https://example.test/x now!!!";
    const named = createFeatureBuffer(16, "names");
    featurizer.featurize(text, named);
    const origins = createFeatureBuffer(16, "origins");
    featurizer.featurize(text, origins);
    expect(Array.from(origins.slots.subarray(0, origins.count))).toEqual(Array.from(named.slots.subarray(0, named.count)));
    expect(Array.from({ length: origins.count }, (_, f) => featurizer.nameOf(origins, f))).toEqual(named.names);
    expect(Array.from({ length: origins.count }, (_, f) => featurizer.sourceOf(origins, f))).toEqual(named.sources);
    expect(featurizer.sourceOf(origins, (named.names as string[]).indexOf("free"))).toBe("frее"); // Cyrillic е folded
  });

  it("refuses to name a buffer filled before the featurizer's last call, or one without origins", () => {
    const featurizer = createFeaturizer(SETTINGS);
    const first = createFeatureBuffer(16, "origins");
    featurizer.featurize("refund my order", first);
    featurizer.featurize("where is my parcel", createFeatureBuffer(16));
    expect(() => featurizer.nameOf(first, 0)).toThrow(RangeError);
    const plain = createFeatureBuffer(16);
    featurizer.featurize("refund", plain);
    expect(() => featurizer.nameOf(plain, 0)).toThrow(RangeError);
    const again = createFeatureBuffer(16, "origins");
    featurizer.featurize("refund", again);
    expect(() => featurizer.nameOf(again, again.count)).toThrow(RangeError);
  });

  it("names a feature of a 1 MiB word without building a string per character n-gram", () => {
    const featurizer = createFeaturizer(SETTINGS);
    const buffer = createFeatureBuffer(1024, "origins");
    const word = "abcdéfghij".repeat(1 << 17).slice(0, 1 << 20); // no letter runs (folding would shorten them)
    featurizer.featurize(word, buffer);
    expect(buffer.count).toBe(1 + (1 << 20)); // the word, then one 3-gram per start of "·word·" that has 3 characters
    expect(featurizer.nameOf(buffer, 1)).toBe("·ab");
    expect(featurizer.nameOf(buffer, buffer.count - 1)).toBe(`${word.slice(-2)}·`);
  });
});
