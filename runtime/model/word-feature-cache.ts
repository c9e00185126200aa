// A model with character n-grams spends most of its time on them (a 5-letter word has 18
// pieces of 2-5 characters besides its own slot), yet a word's features always add the same
// rows, however often it occurs. So such a model keeps a bounded cache per isolate: word →
// the weighted, scaled sum of its features' rows, how many of them have a row and their total
// weight. A word is found by its hash and then compared character by character, so a hit is
// exactly that word; a miss asks the featurizer for the word's features (the one
// implementation), sums their rows and overwrites the less recently used of two entries. The
// sums are float64, so a cached score differs from the straightforward one only by the order
// of additions (test/runtime/model/word-feature-cache.test.ts).

import { createFeatureBuffer, type Featurizer } from "../featurizer/featurizer.ts";
import { WORD } from "../featurizer/token-kinds.ts";

/** Sums the rows of `slots[0 .. count)` into `out` (all zero before); returns how many had a row and their weight. */
export interface RowSummer {
  sumRows(slots: Uint32Array, count: number, out: Float64Array): { known: number; weight: number };
}

/** Words longer than this are summed every time (they are rare, and would make every entry wide). */
export const LONGEST_CACHED_WORD = 24;
/** The memory bound: 4096 entries (about 450 KB for 6 logit rows), and never above 1 MiB. */
export const CACHE_BYTES = 1 << 20;

/** Adds the rows of the words just featurized, through the cache. */
export class WordFeatureCache {
  /** Entries the cache can hold; it never holds more. */
  readonly capacity: number;
  /** Words whose sums were computed rather than found (tests read it). */
  misses = 0;
  /** Of the last `addWords` call: features with a row, and their total weight. */
  known = 0;
  weight = 0;
  private readonly width: number;
  private readonly setMask: number;
  private readonly wordHashes: Uint32Array;
  /** Per entry: the word's length (0: empty), then its characters. */
  private readonly words: Uint16Array;
  /** Per entry: the row sum (width values), its total weight, its count of known features. */
  private readonly sums: Float64Array;
  /** Per set of two entries: the one used last (the other is overwritten next). */
  private readonly lastUsed: Uint8Array;
  private readonly features = createFeatureBuffer(256);
  private readonly wordSum: Float64Array;

  /** `mostEntries`, a power of two, is smaller only in tests (to watch evictions). */
  constructor(width: number, mostEntries = 4096) {
    const entryBytes = 8 * (width + 2) + 4 + 2 * (LONGEST_CACHED_WORD + 1);
    let sets = mostEntries / 2;
    while (sets > 1 && 2 * sets * entryBytes > CACHE_BYTES) sets >>= 1;
    this.capacity = 2 * sets;
    this.width = width;
    this.setMask = sets - 1;
    this.wordHashes = new Uint32Array(this.capacity);
    this.words = new Uint16Array(this.capacity * (LONGEST_CACHED_WORD + 1));
    this.sums = new Float64Array(this.capacity * (width + 2));
    this.lastUsed = new Uint8Array(sets);
    this.wordSum = new Float64Array(width);
  }

  /** Entries holding a word now (at most `capacity`). */
  get size(): number {
    let filled = 0;
    for (let e = 0; e < this.capacity; e++) if (this.words[e * (LONGEST_CACHED_WORD + 1)] > 0) filled++;
    return filled;
  }

  /**
   * Adds to `out` the rows of every word token `featurizer` just read (it ran with wordsApart),
   * and sets `known` and `weight`.
   */
  addWords(featurizer: Featurizer, rows: RowSummer, out: Float64Array): void {
    const tokens = featurizer.tokens;
    const { tokenKinds, tokenHashes, tokenCharStart, tokenCharEnd, wordChars } = tokens;
    const { width, sums, words, wordHashes, lastUsed, setMask } = this;
    const stride = width + 2;
    const wordStride = LONGEST_CACHED_WORD + 1;
    let known = 0;
    let weight = 0;
    for (let t = 0; t < tokens.tokenTotal; t++) {
      if (tokenKinds[t] !== WORD) continue;
      const first = tokenCharStart[t];
      const length = tokenCharEnd[t] - first;
      const hash = tokenHashes[t];
      const set = hash & setMask;
      let entry = -1;
      if (length <= LONGEST_CACHED_WORD) {
        for (let way = 2 * set; way < 2 * set + 2 && entry < 0; way++) {
          if (wordHashes[way] !== hash || words[way * wordStride] !== length) continue;
          let c = 0;
          while (c < length && words[way * wordStride + 1 + c] === wordChars[first + c]) c++;
          if (c === length) entry = way;
        }
      }
      let source: Float64Array = sums;
      let base = entry * stride;
      if (entry < 0) {
        const features = this.features;
        features.count = 0;
        featurizer.wordFeatures(t, features);
        source = this.wordSum;
        source.fill(0);
        const summed = rows.sumRows(features.slots, features.count, source);
        base = 0;
        known += summed.known;
        weight += summed.weight;
        if (length <= LONGEST_CACHED_WORD) {
          this.misses++;
          entry = 2 * set + (lastUsed[set] ^ 1);
          wordHashes[entry] = hash;
          words[entry * wordStride] = length;
          for (let c = 0; c < length; c++) words[entry * wordStride + 1 + c] = wordChars[first + c];
          sums.set(source, entry * stride);
          sums[entry * stride + width] = summed.weight;
          sums[entry * stride + width + 1] = summed.known;
        }
      } else {
        weight += sums[base + width];
        known += sums[base + width + 1];
      }
      for (let k = 0; k < width; k++) out[k] += source[base + k];
      if (entry >= 0) lastUsed[set] = entry & 1;
    }
    this.known = known;
    this.weight = weight;
  }
}
