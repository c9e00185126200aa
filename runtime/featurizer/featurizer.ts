// The one featurizer: normalize → tokenize → n-grams → hash, shared by training and serving.
// Every feature is a MurmurHash3 x86_32 value masked into 2^hashBits slots. Hashes are
// computed over char codes as they are read: no n-gram substring is ever built unless
// the caller asks for names (explanations). The parts: normalize.ts, tokenizer.ts (chunks and
// tokens), char-grams.ts (character n-grams), this file (word n-grams and the whole pass).

import { charGramName, emitWordCharGrams } from "./char-grams.ts";
import {
  CHAR_GRAM_FEATURE,
  EXTRA_FEATURE,
  HIDDEN_CHARS_FEATURE,
  MIXED_SCRIPT_FEATURE,
  TOKEN_FEATURE,
  URL_SHAPE_FEATURE,
  WORD_NGRAM_FEATURE,
  pushOrigin,
  pushSlot,
  reserveSlots,
  writeOrigin,
  type FeatureBuffer,
} from "./feature-buffer.ts";
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
  /** Counts featurize calls; a buffer remembers the one that filled it (see nameOf). */
  private pass = 0;
  /** The last text featurized, and with origins under folding, where its normalized characters came from. */
  private lastText = "";
  private lastOrigins: Origins | null = null;
  private lastWordSources: (string | null)[] | null = null;

  constructor(settings: FeaturizerSettings) {
    this.settings = { ...settings };
    this.mask = settings.hashBits >= 32 ? 0xffffffff : (1 << settings.hashBits) - 1;
    const seeds = deriveFeatureSeeds(settings.hashSeed);
    this.charSeed = seeds.char;
    this.ngramSeed = seeds.ngram;
    this.anyUrlHash = murmur3String("[url]", seeds.shape);
    this.fold = settings.normalization >= 2;
    this.normalizer = new TextNormalizer(settings.normalization);
    this.tokens = new Tokenizer(seeds, settings.maxTokens, settings.unspacedScripts === true, settings.normalization);
    this.mixedScriptHash = murmur3String("[mixed-script]", seeds.shape);
    this.hiddenCharsHash = murmur3String("[hidden-chars]", seeds.shape);
  }

  /**
   * Writes the features of `text` into `out` (reset first). Allocation-free for ASCII text
   * once the buffers have grown to fit, unless `out.names` is set. With `out.origins` each
   * feature's origin is recorded, so nameOf and sourceOf can name it until the next call.
   * With `wordsApart` the features of each word token itself (its slot and its character
   * n-grams) are left out, for the caller to add word by word with wordFeatures (a model's
   * word cache does).
   */
  featurize(text: string, out: FeatureBuffer, wordsApart = false): void {
    out.count = 0;
    out.truncated = false;
    out.pass = ++this.pass;
    const withOrigins = out.origins !== null;
    const tokens = this.tokens;
    let normalized: string;
    this.lastText = text;
    this.lastOrigins = null;
    this.lastWordSources = null;
    if (withOrigins && this.fold) ({ text: normalized, origins: this.lastOrigins } = this.normalizer.normalizeWithOrigins(text));
    else normalized = this.normalizer.normalize(text);
    tokens.tokenize(normalized, withOrigins, withOrigins || this.settings.charMin > 0);
    out.tokenCount = tokens.tokenTotal;
    out.truncated = tokens.hasMoreText;
    this.emitFeatures(out, wordsApart);
    if (this.fold) this.emitFoldFeatures(out);
    if (out.names !== null) {
      const names = out.names;
      const sources = out.sources as (string | null)[];
      names.length = 0;
      sources.length = 0;
      for (let f = 0; f < out.count; f++) {
        names.push(this.nameOf(out, f));
        sources.push(this.sourceOf(out, f));
      }
    }
  }

  /**
   * How people read feature `f` of `out` ("refund", "refund my", "·re", "[url]"...). `out`
   * must keep origins and come from this featurizer's last call (else this throws, rather
   * than name the features of another text).
   */
  nameOf(out: FeatureBuffer, f: number): string {
    const origins = this.originsOf(out, f);
    const at = 3 * f;
    const kind = origins[at] & 0xff;
    const length = origins[at] >>> 8;
    const first = origins[at + 1];
    const tokens = this.tokens;
    switch (kind) {
      case TOKEN_FEATURE:
        return tokens.tokenNames[first];
      case URL_SHAPE_FEATURE:
        return "[url]";
      case WORD_NGRAM_FEATURE:
        return tokens.tokenNames.slice(first, first + length).join(" ");
      case CHAR_GRAM_FEATURE: {
        const charStart = tokens.tokenCharStart[first];
        return charGramName(tokens.wordChars, charStart, tokens.tokenCharEnd[first] - charStart, origins[at + 2], length);
      }
      case EXTRA_FEATURE:
        return tokens.extraNames[first];
      case MIXED_SCRIPT_FEATURE:
        return "[mixed-script]";
      default:
        return "[hidden-chars]";
    }
  }

  /**
   * The original text feature `f` of `out` was folded from (normalization 2: "frее" for the
   * word "free", "f r e e" too), or null when it reads as written. Same conditions as nameOf.
   */
  sourceOf(out: FeatureBuffer, f: number): string | null {
    const origins = this.originsOf(out, f);
    if (this.lastOrigins === null) return null; // no folding, or the text was not read with origins
    const at = 3 * f;
    const kind = origins[at] & 0xff;
    const first = origins[at + 1];
    switch (kind) {
      case TOKEN_FEATURE:
      case CHAR_GRAM_FEATURE:
        return this.wordSources()[first];
      case WORD_NGRAM_FEATURE:
        return pairSource(this.wordSources(), this.tokens.tokenNames, first, origins[at] >>> 8);
      case EXTRA_FEATURE: {
        const tokens = this.tokens;
        return spanSource(this.lastText, this.lastOrigins, tokens.extraTextStart[first], tokens.extraTextEnd[first], tokens.extraNames[first]);
      }
      case MIXED_SCRIPT_FEATURE:
        return this.normalizer.notes.mixedWord;
      case HIDDEN_CHARS_FEATURE:
        return this.normalizer.notes.hiddenWord || null;
      default:
        return null;
    }
  }

  private originsOf(out: FeatureBuffer, f: number): Int32Array {
    // Origins point into this featurizer's state of its last call: refuse any other buffer.
    if (out.origins === null || out.pass !== this.pass || !(f >= 0 && f < out.count)) throw new RangeError("not a feature of the last text featurized with origins");
    return out.origins;
  }

  /**
   * For each token of the last text, the span of the original text it was read from when
   * folding changed it (a word whose original, lower-cased, differs from the word: "frее",
   * "fr33", "f r e e"), else null. Computed once per call, when first asked.
   */
  private wordSources(): (string | null)[] {
    if (this.lastWordSources !== null) return this.lastWordSources;
    const tokens = this.tokens;
    const origins = this.lastOrigins as Origins;
    const sources: (string | null)[] = [];
    for (let t = 0; t < tokens.tokenTotal; t++) {
      sources.push(tokens.tokenKinds[t] === WORD ? spanSource(this.lastText, origins, tokens.tokenTextStart[t], tokens.tokenTextEnd[t], tokens.tokenNames[t]) : null);
    }
    this.lastWordSources = sources;
    return sources;
  }

  /** The features only the folding rules emit: bounded-run alternatives, [mixed-script], [hidden-chars]. */
  private emitFoldFeatures(out: FeatureBuffer): void {
    const tokens = this.tokens;
    const withOrigins = out.origins !== null;
    for (let e = 0; e < tokens.extraTotal; e++) {
      pushSlot(out, tokens.extraHashes[e] & this.mask);
      if (withOrigins) pushOrigin(out, EXTRA_FEATURE, 0, e, 0);
    }
    const notes = this.normalizer.notes;
    if (notes.mixedScript) {
      pushSlot(out, this.mixedScriptHash & this.mask);
      if (withOrigins) pushOrigin(out, MIXED_SCRIPT_FEATURE, 0, 0, 0);
    }
    if (notes.hiddenChars) {
      pushSlot(out, this.hiddenCharsHash & this.mask);
      if (withOrigins) pushOrigin(out, HIDDEN_CHARS_FEATURE, 0, 0, 0);
    }
  }

  /**
   * Appends the features of word token `t` of the last text (its slot, then its character
   * n-grams): what `featurize(text, out, true)` left out for it. Origins are not kept.
   */
  wordFeatures(t: number, out: FeatureBuffer): void {
    pushSlot(out, this.tokens.tokenHashes[t] & this.mask);
    if (this.settings.charMin > 0) this.charGrams(t, out);
  }

  /** Appends the character n-grams of word token `t`. */
  private charGrams(t: number, out: FeatureBuffer): void {
    const tokens = this.tokens;
    const first = tokens.tokenCharStart[t];
    emitWordCharGrams(tokens.wordChars, first, tokens.tokenCharEnd[t] - first, this.settings.charMin, this.settings.charMax, this.charSeed, this.mask, out, t);
  }

  private emitFeatures(out: FeatureBuffer, wordsApart: boolean): void {
    const mask = this.mask;
    const tokens = this.tokens;
    const count = tokens.tokenTotal;
    const hashes = tokens.tokenHashes;
    const kinds = tokens.tokenKinds;
    const wordSpan = this.settings.wordSpan;
    // At most two features a token (a URL and its shape), then the word n-grams: room for all
    // of them once, then written straight into the arrays (this loop runs for every token).
    reserveSlots(out, 2 * count + Math.max(0, wordSpan - 1) * count);
    const slots = out.slots;
    const withOrigins = out.origins !== null;
    let f = out.count;
    for (let t = 0; t < count; t++) {
      const kind = kinds[t];
      if (wordsApart && kind === WORD) continue;
      if (withOrigins) writeOrigin(out, f, TOKEN_FEATURE, 0, t, 0);
      slots[f++] = hashes[t] & mask;
      if (kind === URL) {
        if (withOrigins) writeOrigin(out, f, URL_SHAPE_FEATURE, 0, t, 0);
        slots[f++] = this.anyUrlHash & mask;
      }
    }
    for (let n = 2; n <= wordSpan; n++) {
      const seed = (this.ngramSeed + n) >>> 0;
      for (let t = 0; t + n <= count; t++) {
        if (withOrigins) writeOrigin(out, f, WORD_NGRAM_FEATURE, n, t, 0);
        slots[f++] = murmur3Words(hashes, t, n, seed) & mask;
      }
    }
    out.count = f;
    if (this.settings.charMin > 0 && !wordsApart) {
      for (let t = 0; t < count; t++) if (kinds[t] === WORD) this.charGrams(t, out);
    }
  }
}

/** The original text of a span of the normalized text, when it differs from `name` (lower-cased), else null. */
function spanSource(text: string, origins: Origins, start: number, end: number, name: string): string | null {
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
