// A word's slot is MurmurHash3 x86_32 of its UTF-8 bytes, seeded with the model's hash seed,
// masked to 2^hashBits slots: pinned here to the published hash values themselves, not to
// our own murmur3 function, so a change of hash, seed derivation, masking or token bytes fails.
//
// Vectors: Ian Boyd's table of MurmurHash3 x86_32 values with seed 0x9747b28c, translated
// from the SMHasher verification code, https://stackoverflow.com/a/31929528 (the same table
// murmur3.test.ts uses).

import { describe, expect, it } from "vitest";
import { createFeatureBuffer, createFeaturizer, type FeaturizerSettings } from "../../../runtime/featurizer/featurizer.ts";

const PUBLISHED_SEED = 0x9747b28c;
const PUBLISHED: [word: string, hash: number][] = [
  ["aaaa", 0x5a97808a],
  ["aaa", 0x283e0130],
  ["abcd", 0xf0478627],
  ["abc", 0xc84a62dd],
  ["ab", 0x74875592],
  ["ππππππππ", 0xd58063c1], // UTF-8, two bytes per character
];

/** Words only (no pairs, no character pieces), so each word yields exactly one slot. */
function slotsOf(text: string, hashBits: number): number[] {
  // Version 1 reads each word as written; version 2 would bound the letter runs of "aaaa" and "aaa".
  const settings: FeaturizerSettings = { normalization: 1, wordSpan: 1, charMin: 0, charMax: 0, hashBits, hashSeed: PUBLISHED_SEED, maxTokens: 100 };
  const buffer = createFeatureBuffer(16);
  createFeaturizer(settings).featurize(text, buffer);
  return Array.from(buffer.slots.subarray(0, buffer.count));
}

describe("a word's slot", () => {
  it("is the published MurmurHash3 x86_32 of the word, masked to the feature space", () => {
    const text = PUBLISHED.map(([word]) => word).join(" ");
    for (const hashBits of [18, 24]) {
      const mask = 2 ** hashBits - 1;
      expect(slotsOf(text, hashBits)).toEqual(PUBLISHED.map(([, hash]) => (hash & mask) >>> 0));
    }
  });

  it("is the published hash of the lower-cased word, since normalization lower-cases first", () => {
    expect(slotsOf("AAAA AbCd", 20)).toEqual([0x5a97808a & 0xfffff, 0xf0478627 & 0xfffff]);
  });
});
