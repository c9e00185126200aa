// Single words of 1 MiB in several scripts through every featurizer path: plain featurize,
// featurize with names (explanations), score, classify, decide and explain. The named path
// once spread a word's code units into one String.fromCharCode call, which overflows V8's
// stack somewhere above 100,000 arguments (from memory; the exact limit depends on the stack
// size), so one long word turned a block into a crash.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { createFeatureBuffer, createFeaturizer, loadModel } from "../../../runtime/index.ts";
import { charCodesToString } from "../../../runtime/featurizer/char-codes-to-string.ts";
import { ensureDemoModel } from "../../../scripts/demo-model.ts";

const MEBIBYTE = 1024 * 1024;
/** One word of `length` UTF-16 code units made of `unit` repeated. */
const longWord = (unit: string, length = MEBIBYTE) => unit.repeat(Math.ceil(length / unit.length)).slice(0, length);

// Letters of each script (Unicode charts: Basic Latin, Cyrillic, CJK Unified Ideographs,
// Arabic, Devanagari, Greek); the mixed one switches script inside the word.
const SCRIPTS: [string, string][] = [
  ["Latin", "a"],
  ["Cyrillic", "я"],
  ["CJK", "字"],
  ["Arabic", "ب"],
  ["Devanagari", "क"],
  ["Greek and Latin mixed", "αb"],
];

const golden = loadModel(new Uint8Array(readFileSync(new URL("../../fixtures/golden/tiny-v2.sluice", import.meta.url))));

describe("charCodesToString", () => {
  it("should build the same string as String.fromCharCode for short and very long runs", () => {
    const codes = Uint16Array.from(longWord("aя字"), (_, i) => "aя字".charCodeAt(i % 3));
    expect(charCodesToString(codes, 0, 5)).toBe(String.fromCharCode(...codes.subarray(0, 5)));
    expect(charCodesToString(codes, 7, codes.length)).toBe(longWord("aя字").slice(7));
  });
});

describe.each(SCRIPTS)("a 1 MiB %s word", (_script, unit) => {
  const word = longWord(unit);

  it("should featurize with and without names", () => {
    const featurizer = createFeaturizer(golden.meta.featurizer);
    const plain = createFeatureBuffer();
    const named = createFeatureBuffer(256, true);
    featurizer.featurize(`refund ${word}`, plain);
    featurizer.featurize(`refund ${word}`, named);
    expect(named.count).toBe(plain.count);
    expect(Array.from(named.slots.subarray(0, named.count))).toEqual(Array.from(plain.slots.subarray(0, plain.count)));
    // A word token is named by its normalized text: the whole word comes back (lower case is itself here).
    expect(named.names?.some((name) => name.length === word.length)).toBe(true);
  });

  it("should score, classify, decide and explain without throwing", () => {
    const text = `I want a refund ${word}`;
    for (const score of golden.score(text).scores) expect(Number.isFinite(score)).toBe(true);
    expect(golden.classify(text)[0].label).toMatch(/billing|shipping/);
    expect(golden.decide(text).fault).toBeUndefined();
    expect(golden.explain(text).labels[0].features.length).toBeGreaterThan(0);
  });
});

describe("a long word after spam, on the demo moderation model (character n-grams on)", () => {
  it("should still decide, not throw, for the 127k-character word the probe used", () => {
    const model = loadModel(new Uint8Array(readFileSync(ensureDemoModel())));
    const spam = "WIN A FREE PRIZE!!! Click www.example.net/win to claim your reward now";
    expect(model.decide(spam).action).not.toBe("allow");
    const decision = model.decide(`${spam} ${longWord("x", 127 * 1024)}`);
    expect(decision.fault).toBeUndefined();
    expect(decision.action).not.toBe("allow");
    expect(model.explain(`${spam} ${longWord("x", 127 * 1024)}`).labels.length).toBe(1);
  });
});
