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
import { TextNormalizer, type Origins } from "./normalize.ts";
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
  private readonly normalizer: TextNormalizer;
  /** Normalization 2: the evasion folding rules, and the [mixed-script] and [hidden-chars] features. */
  private readonly fold: boolean;
  private readonly mixedScriptHash: number;
  private readonly hiddenCharsHash: number;

  constructor(settings: FeaturizerSettings) {
    this.settings = { ...settings };
    this.mask = settings.hashBits >= 32 ? 0xffffffff : (1 << settings.hashBits) - 1;
    const seeds = deriveFeatureSeeds(settings.hashSeed);
    this.charSeed = seeds.char;
    this.ngramSeed = seeds.ngram;
    this.anyUrlHash = murmur3String("[url]", seeds.shape);
    this.fold = settings.normalization >= 2;
    this.normalizer = new TextNormalizer(settings.normalization);
    this.tokens = new Tokenizer(seeds, settings.maxTokens, settings.unspacedScripts === true, this.fold);
    this.mixedScriptHash = murmur3String("[mixed-script]", seeds.shape);
    this.hiddenCharsHash = murmur3String("[hidden-chars]", seeds.shape);
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
    if (out.sources) out.sources.length = 0;
    const tokens = this.tokens;
    let normalized: string;
    let origins: Origins | null = null;
    if (withNames && this.fold) ({ text: normalized, origins } = this.normalizer.normalizeWithOrigins(text));
    else normalized = this.normalizer.normalize(text);
    tokens.tokenize(normalized, withNames, withNames || this.settings.charMin > 0);
    out.tokenCount = tokens.tokenTotal;
    out.truncated = tokens.hasMoreText;
    const wordSources = origins && out.sources ? this.wordSources(text, origins) : null;
    this.emitFeatures(out, wordSources, wordsApart);
    if (this.fold) this.emitFoldFeatures(out, text, origins);
  }

  /**
   * For each token, the span of the original text it was read from when folding changed it
   * (a word whose original, lower-cased, differs from the word: "frее", "fr33", "f r e e"), else null.
   */
  private wordSources(text: string, origins: Origins): (string | null)[] {
    const tokens = this.tokens;
    const sources: (string | null)[] = [];
    for (let t = 0; t < tokens.tokenTotal; t++) {
      sources.push(tokens.tokenKinds[t] === WORD ? sourceOf(text, origins, tokens.tokenTextStart[t], tokens.tokenTextEnd[t], tokens.tokenNames[t]) : null);
    }
    return sources;
  }

  /** The features only the folding rules emit: bounded-run alternatives, [mixed-script], [hidden-chars]. */
  private emitFoldFeatures(out: FeatureBuffer, text: string, origins: Origins | null): void {
    const tokens = this.tokens;
    const names = out.names;
    for (let e = 0; e < tokens.extraTotal; e++) {
      pushSlot(out, tokens.extraHashes[e] & this.mask);
      if (names) names.push(tokens.extraNames[e]);
      if (out.sources) out.sources.push(origins ? sourceOf(text, origins, tokens.extraTextStart[e], tokens.extraTextEnd[e], tokens.extraNames[e]) : null);
    }
    const notes = this.normalizer.notes;
    if (notes.mixedScript) {
      pushSlot(out, this.mixedScriptHash & this.mask);
      if (names) names.push("[mixed-script]");
      if (out.sources) out.sources.push(notes.mixedWord);
    }
    if (notes.hiddenChars) {
      pushSlot(out, this.hiddenCharsHash & this.mask);
      if (names) names.push("[hidden-chars]");
      if (out.sources) out.sources.push(notes.hiddenWord || null);
    }
  }

  /**
   * Appends the features of word token `t` of the last text (its slot, then its character
   * n-grams): what `featurize(text, out, true)` left out for it. Names and sources are not kept.
   */
  wordFeatures(t: number, out: FeatureBuffer): void {
    pushSlot(out, this.tokens.tokenHashes[t] & this.mask);
    if (this.settings.charMin > 0) this.charGrams(t, out, null);
  }

  /** Appends the character n-grams of word token `t` (with `source` as their source when out keeps sources). */
  private charGrams(t: number, out: FeatureBuffer, source: string | null): void {
    const tokens = this.tokens;
    const first = tokens.tokenCharStart[t];
    emitWordCharGrams(tokens.wordChars, first, tokens.tokenCharEnd[t] - first, this.settings.charMin, this.settings.charMax, this.charSeed, this.mask, out, source);
  }

  private emitFeatures(out: FeatureBuffer, wordSources: (string | null)[] | null, wordsApart: boolean): void {
    const mask = this.mask;
    const tokens = this.tokens;
    const count = tokens.tokenTotal;
    const hashes = tokens.tokenHashes;
    const kinds = tokens.tokenKinds;
    const names = out.names;
    const sources = out.sources;
    for (let t = 0; t < count; t++) {
      if (wordsApart && kinds[t] === WORD) continue;
      pushSlot(out, hashes[t] & mask);
      if (names) names.push(tokens.tokenNames[t]);
      if (sources) sources.push(wordSources ? wordSources[t] : null);
      if (kinds[t] === URL) {
        pushSlot(out, this.anyUrlHash & mask);
        if (names) names.push("[url]");
        if (sources) sources.push(null);
      }
    }
    const wordSpan = this.settings.wordSpan;
    for (let n = 2; n <= wordSpan; n++) {
      const seed = (this.ngramSeed + n) >>> 0;
      for (let t = 0; t + n <= count; t++) {
        pushSlot(out, murmur3Words(hashes, t, n, seed) & mask);
        if (names) names.push(tokens.tokenNames.slice(t, t + n).join(" "));
        if (sources) sources.push(wordSources ? pairSource(wordSources, tokens.tokenNames, t, n) : null);
      }
    }
    if (this.settings.charMin > 0 && !wordsApart) {
      for (let t = 0; t < count; t++) if (kinds[t] === WORD) this.charGrams(t, out, wordSources ? wordSources[t] : null);
    }
  }
}

/** The original text of a span of the normalized text, when it differs from `name` (lower-cased), else null. */
function sourceOf(text: string, origins: Origins, start: number, end: number, name: string): string | null {
  if (start < 0 || end <= start || end > origins.start.length) return null;
  const original = text.slice(origins.start[start], origins.end[end - 1]);
  return original.toLowerCase() === name ? null : original;
}

/** A word n-gram's original text when any of its words was folded, else null. */
function pairSource(sources: (string | null)[], names: string[], first: number, n: number): string | null {
  let folded = false;
  for (let k = first; k < first + n; k++) if (sources[k] !== null) folded = true;
  if (!folded) return null;
  const parts: string[] = [];
  for (let k = first; k < first + n; k++) parts.push(sources[k] ?? names[k]);
  return parts.join(" ");
}
