// The reusable output of featurize: slots of one text, plus, when asked, where each feature
// came from (its origin), from which the featurizer names it after scoring.

/** Reusable output of `featurize`: the slots of one text, plus optional origins and names. */
export interface FeatureBuffer {
  slots: Uint32Array;
  count: number;
  tokenCount: number;
  truncated: boolean;
  /**
   * When not null, where each feature came from: three ints per feature (kind and length,
   * then two positions; see the *_FEATURE kinds). Recording them costs no strings, so a
   * decision can be scored from this buffer and its drivers named afterwards, for the few
   * features shown (featurizer.nameOf), without reading the text twice.
   */
  origins: Int32Array | null;
  /** Which featurize call filled the buffer (nameOf refuses a buffer filled before the featurizer's last call). */
  pass: number;
  /** When not null, `names[i]` describes `slots[i]` (filled from the origins; this allocates). */
  names: string[] | null;
  /**
   * With names: `sources[i]` is the original text a folded feature came from (normalization 2:
   * "frее" for the word "free"), or null when the feature reads as written.
   */
  sources: (string | null)[] | null;
}

// Origin kinds. For each: what the two positions hold.
/** A token (word, number, code, URL, mark...): token index. */
export const TOKEN_FEATURE = 0;
/** The "[url]" shape feature after a URL token: token index. */
export const URL_SHAPE_FEATURE = 1;
/** A word n-gram: its first token; the length field is n. */
export const WORD_NGRAM_FEATURE = 2;
/** A character n-gram: the word's token index, its start in the framed word; the length field is its length. */
export const CHAR_GRAM_FEATURE = 3;
/** A folding alternative (normalization 2): the tokenizer's extra index. */
export const EXTRA_FEATURE = 4;
/** "[mixed-script]" (normalization 2). */
export const MIXED_SCRIPT_FEATURE = 5;
/** "[hidden-chars]" (normalization 2). */
export const HIDDEN_CHARS_FEATURE = 6;

/**
 * A buffer for `featurize`. `detail`: "origins" to name features after scoring (decisions),
 * "names" to have every feature named (explanations, tests; allocates a string per feature).
 * A boolean `true` means "names" (older call sites).
 */
export function createFeatureBuffer(capacity = 1024, detail: boolean | "origins" | "names" = false): FeatureBuffer {
  const withNames = detail === true || detail === "names";
  const withOrigins = withNames || detail === "origins";
  return {
    slots: new Uint32Array(capacity),
    count: 0,
    tokenCount: 0,
    truncated: false,
    origins: withOrigins ? new Int32Array(3 * capacity) : null,
    pass: 0,
    names: withNames ? [] : null,
    sources: withNames ? [] : null,
  };
}

export function pushSlot(out: FeatureBuffer, slot: number): void {
  if (out.count === out.slots.length) reserveSlots(out, 1);
  out.slots[out.count++] = slot;
}

/**
 * Grows `out` so that `extra` more features fit (slots, and origins when kept), for loops that
 * write many features straight into the arrays (the featurizer's tokens and word n-grams:
 * one check per text instead of one per feature).
 */
export function reserveSlots(out: FeatureBuffer, extra: number): void {
  const needed = out.count + extra;
  if (needed > out.slots.length) {
    let size = out.slots.length * 2;
    while (size < needed) size *= 2;
    const grown = new Uint32Array(size);
    grown.set(out.slots.subarray(0, out.count));
    out.slots = grown;
  }
  if (out.origins !== null && 3 * needed > out.origins.length) {
    const grown = new Int32Array(3 * out.slots.length);
    grown.set(out.origins);
    out.origins = grown;
  }
}

/** Records the origin of the feature just pushed (call only when `out.origins` is not null). */
export function pushOrigin(out: FeatureBuffer, kind: number, length: number, first: number, second: number): void {
  writeOrigin(out, out.count - 1, kind, length, first, second);
}

/** Records the origin of feature `f` (call only when `out.origins` is not null). */
export function writeOrigin(out: FeatureBuffer, f: number, kind: number, length: number, first: number, second: number): void {
  let origins = out.origins as Int32Array;
  const at = 3 * f;
  if (at + 3 > origins.length) {
    const grown = new Int32Array(Math.max(3 * out.slots.length, at + 3));
    grown.set(origins);
    out.origins = origins = grown;
  }
  origins[at] = kind | (length << 8);
  origins[at + 1] = first;
  origins[at + 2] = second;
}
