// The one featurizer: normalize → tokenize → n-grams → hash, shared by training and serving.
// Every feature is a MurmurHash3 x86_32 value masked into 2^hashBits slots. Hashes are
// computed over char codes as they are read: no n-gram substring is ever built unless
// the caller asks for names (explanations). The parts: normalize.ts, tokenizer.ts (chunks and
// tokens), char-grams.ts (character n-grams), this file (word n-grams and the whole pass).

import { emitWordCharGrams } from "./char-grams.ts";
import { pushSlot, type FeatureBuffer } from "./feature-buffer.ts";
import { deriveFeatureSeeds } from "./feature-seeds.ts";
import type { FeaturizerSettings } from "./featurizer-settings.ts";
import { murmur3String, murmur3Words } from "./murmur3.ts";
import { normalizeText } from "./normalize.ts";
import { URL, WORD } from "./token-kinds.ts";
import { Tokenizer } from "./tokenizer.ts";

export { createFeatureBuffer, type FeatureBuffer } from "./feature-buffer.ts";
export type { FeaturizerSettings } from "./featurizer-settings.ts";

/**
 * Builds a featurizer for fixed settings (precomputes seeds and shape hashes).
 * @example
 * const featurizer = createFeaturizer({ normalization: 1, wordSpan: 2, charMin: 3, charMax: 4, hashBits: 18, hashSeed: 0, maxTokens: 2000 });
 * const buffer = createFeatureBuffer();
 * featurizer.featurize("Where is my parcel?", buffer); // buffer.count features in buffer.slots
 */
export function createFeaturizer(settings: FeaturizerSettings): Featurizer {
  return new Featurizer(settings);
}

export class Featurizer {
  readonly settings: FeaturizerSettings;
  private readonly mask: number;
  private readonly charSeed: number;
  private readonly ngramSeed: number;
  private readonly anyUrlHash: number;
  /**
   * The tokens of the last text featurized (a model's word cache reads its words here; tests
   * turn the tokenizer's fast path off with `tokens.plainChunks = false`).
   */
  readonly tokens: Tokenizer;

  constructor(settings: FeaturizerSettings) {
    this.settings = { ...settings };
    this.mask = (2 ** settings.hashBits - 1) | 0; // all ones at 32 bits: `& -1` keeps every bit
    const seeds = deriveFeatureSeeds(settings.hashSeed);
    this.charSeed = seeds.char;
    this.ngramSeed = seeds.ngram;
    this.anyUrlHash = murmur3String("[url]", seeds.shape);
    this.tokens = new Tokenizer(seeds, settings.maxTokens, settings.unspacedScripts === true);
  }

  /**
   * Writes the features of `text` into `out` (reset first). Allocation-free for ASCII text
   * once the buffers have grown to fit, unless `out.names` is set. With `wordsApart` the
   * features of each word token itself (its slot and its character n-grams) are left out, for
   * the caller to add word by word with wordFeatures (a model's word cache does).
   */
  featurize(text: string, out: FeatureBuffer, wordsApart = false): void {
    out.count = 0;
    out.truncated = false;
    const withNames = out.names !== null;
    if (out.names) out.names.length = 0;
    const tokens = this.tokens;
    tokens.tokenize(normalizeText(text), withNames, withNames || this.settings.charMin > 0);
    out.tokenCount = tokens.tokenTotal;
    out.truncated = tokens.hasMoreText;
    this.emitFeatures(out, wordsApart);
  }

  /**
   * Appends the features of word token `t` of the last text (its slot, then its character
   * n-grams): what `featurize(text, out, true)` left out for it.
   */
  wordFeatures(t: number, out: FeatureBuffer): void {
    pushSlot(out, this.tokens.tokenHashes[t] & this.mask);
    if (this.settings.charMin > 0) this.charGrams(t, out);
  }

  /** Appends the character n-grams of word token `t`. */
  private charGrams(t: number, out: FeatureBuffer): void {
    const tokens = this.tokens;
    const first = tokens.tokenCharStart[t];
    emitWordCharGrams(tokens.wordChars, first, tokens.tokenCharEnd[t] - first, this.settings.charMin, this.settings.charMax, this.charSeed, this.mask, out);
  }

  private emitFeatures(out: FeatureBuffer, wordsApart: boolean): void {
    const mask = this.mask;
    const tokens = this.tokens;
    const count = tokens.tokenTotal;
    const hashes = tokens.tokenHashes;
    const kinds = tokens.tokenKinds;
    const names = out.names;
    for (let t = 0; t < count; t++) {
      if (wordsApart && kinds[t] === WORD) continue;
      pushSlot(out, hashes[t] & mask);
      if (names) names.push(tokens.tokenNames[t]);
      if (kinds[t] === URL) {
        pushSlot(out, this.anyUrlHash & mask);
        if (names) names.push("[url]");
      }
    }
    const wordSpan = this.settings.wordSpan;
    for (let n = 2; n <= wordSpan; n++) {
      const seed = (this.ngramSeed + n) >>> 0;
      for (let t = 0; t + n <= count; t++) {
        pushSlot(out, murmur3Words(hashes, t, n, seed) & mask);
        if (names) names.push(tokens.tokenNames.slice(t, t + n).join(" "));
      }
    }
    if (this.settings.charMin > 0 && !wordsApart) for (let t = 0; t < count; t++) if (kinds[t] === WORD) this.charGrams(t, out);
  }
}
