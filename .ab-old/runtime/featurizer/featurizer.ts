// The one featurizer: normalize → tokenize → n-grams → hash, shared by training and serving.
// Every feature is a MurmurHash3 x86_32 value masked into 2^hashBits slots. Hashes are
// computed over char codes as they are read: no n-gram substring is ever built unless
// the caller asks for names (explanations). The parts: normalize.ts, tokenizer.ts (chunks and
// tokens), char-grams.ts (character n-grams), this file (word n-grams and the whole pass).

import { emitCharGrams } from "./char-grams.ts";
import { pushSlot, type FeatureBuffer } from "./feature-buffer.ts";
import { deriveFeatureSeeds } from "./feature-seeds.ts";
import type { FeaturizerSettings } from "./featurizer-settings.ts";
import { murmur3String, murmur3Words } from "./murmur3.ts";
import { normalizeText } from "./normalize.ts";
import { URL } from "./token-kinds.ts";
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
  private readonly tokens: Tokenizer;

  constructor(settings: FeaturizerSettings) {
    this.settings = { ...settings };
    this.mask = settings.hashBits >= 32 ? 0xffffffff : (1 << settings.hashBits) - 1;
    const seeds = deriveFeatureSeeds(settings.hashSeed);
    this.charSeed = seeds.char;
    this.ngramSeed = seeds.ngram;
    this.anyUrlHash = murmur3String("[url]", seeds.shape);
    this.tokens = new Tokenizer(seeds, settings.maxTokens, settings.unspacedScripts === true);
  }

  /** Off only in tests, to check that the fast path reads exactly what the general reader reads. */
  get plainChunks(): boolean {
    return this.tokens.plainChunks;
  }

  set plainChunks(on: boolean) {
    this.tokens.plainChunks = on;
  }

  /**
   * Writes the features of `text` into `out` (reset first). Allocation-free for ASCII text
   * once the buffers have grown to fit, unless `out.names` is set.
   */
  featurize(text: string, out: FeatureBuffer): void {
    out.count = 0;
    out.truncated = false;
    const withNames = out.names !== null;
    if (out.names) out.names.length = 0;
    const tokens = this.tokens;
    tokens.tokenize(normalizeText(text), withNames, withNames || this.settings.charMin > 0);
    out.tokenCount = tokens.tokenTotal;
    out.truncated = tokens.hasMoreText;
    this.emitFeatures(out);
  }

  private emitFeatures(out: FeatureBuffer): void {
    const mask = this.mask;
    const tokens = this.tokens;
    const count = tokens.tokenTotal;
    const hashes = tokens.tokenHashes;
    const kinds = tokens.tokenKinds;
    const names = out.names;
    for (let t = 0; t < count; t++) {
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
    const { charMin, charMax } = this.settings;
    if (charMin > 0) emitCharGrams(tokens, charMin, charMax, this.charSeed, mask, out);
  }
}
