// A model with character n-grams spends most of its time on them (a 5-letter word has 18
// pieces of 2-5 characters besides its own slot), yet a word's features always add the same
// rows, however often it occurs. So such a model keeps a bounded cache per isolate: word →
// the weighted, scaled sum of its features' rows, how many of them have a row and their total
// weight. A word's hash picks a set of two entries, and the word is compared with theirs, hash
// and then character by character, so a hit is exactly that word (even if two words' hashes
// collided); a miss asks the featurizer for the word's features (the one implementation), sums
// their rows and overwrites the less recently used of the two. The sums are float64, so a cached score differs from the
// straightforward one only by the order of additions (test/runtime/model/word-feature-cache.test.ts).

import type { FeatureBuffer, Featurizer } from "../featurizer/featurizer.ts";
import { WORD } from "../featurizer/token-kinds.ts";

/** Sums the rows of `slots[0 .. count)` into `out` (all zero before); returns how many had a row and their weight. */
export interface RowSummer {
  sumRows(slots: Uint32Array, count: number, out: Float64Array): { known: number; weight: number };
}

/** Words longer than this are summed every time (they are rare, and would make every entry wide). */
export const LONGEST_CACHED_WORD = 24;
/** The memory bound: 4096 entries (about 450 KB for 6 logit rows), and never above 1 MiB. */
export const CACHE_BYTES = 1 << 20;
export const MOST_ENTRIES = 4096;

/** Adds the rows of the words just featurized, through the cache. */
export class WordFeatureCache {
  /** Entries the cache can hold; it never holds more. */
  readonly capacity: number;
  /** Words whose sums were computed rather than found (tests and benchmarks read it). */
  misses = 0;
  /** Of the last `addWords` call: features with a row, and their total weight. */
  known = 0;
  weight = 0;
  private readonly width: number;
  /** Per entry: the word's hash (the token's, which the featurizer computes from its characters). */
  private readonly wordHashes: Uint32Array;
  /** Per set of two entries: the one used last (the other is overwritten next). */
  private readonly lastUsed: Uint8Array;
  /** Per entry: the word's length (0: empty), then its characters. */
  private readonly words: Uint16Array;
  /** Per entry (and one spare for a long word): the row sum (width values), its total weight, its count of known features. */
  private readonly sums: Float64Array;
  private readonly wordSum: Float64Array;

  constructor(width: number) {
    const entryBytes = 8 * (width + 2) + 4 + 2 * (LONGEST_CACHED_WORD + 1);
    let sets = MOST_ENTRIES / 2;
    while (sets > 1 && 2 * sets * entryBytes > CACHE_BYTES) sets >>= 1;
    this.capacity = 2 * sets;
    this.width = width;
    this.wordHashes = new Uint32Array(this.capacity);
    this.lastUsed = new Uint8Array(sets);
    this.words = new Uint16Array(this.capacity * (LONGEST_CACHED_WORD + 1));
    this.sums = new Float64Array((this.capacity + 1) * (width + 2)); // and a spare entry for long words
    this.wordSum = new Float64Array(width);
  }

  /**
   * Adds to `out` the rows of every word token `featurizer` just read (it ran with wordsApart),
   * and sets `known` and `weight`. `scratch` holds a missed word's features (its contents are
   * overwritten).
   */
  addWords(featurizer: Featurizer, rows: RowSummer, out: Float64Array, scratch: FeatureBuffer): void {
    const tokens = featurizer.tokens;
    const { tokenKinds, tokenHashes, tokenCharStart, tokenCharEnd, wordChars } = tokens;
    const { width, sums, words, wordHashes, lastUsed } = this;
    const setMask = (this.capacity >> 1) - 1;
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
      if (entry < 0) {
        // A miss: sum the word's rows into a new entry (a long word into the spare last one).
        entry = length > LONGEST_CACHED_WORD ? this.capacity : 2 * set + (lastUsed[set] ^ 1);
        scratch.count = 0;
        featurizer.wordFeatures(t, scratch);
        const wordSum = this.wordSum;
        wordSum.fill(0);
        const summed = rows.sumRows(scratch.slots, scratch.count, wordSum);
        sums.set(wordSum, entry * stride);
        sums[entry * stride + width] = summed.weight;
        sums[entry * stride + width + 1] = summed.known;
        if (entry < this.capacity) {
          this.misses++;
          wordHashes[entry] = hash;
          words[entry * wordStride] = length;
          for (let c = 0; c < length; c++) words[entry * wordStride + 1 + c] = wordChars[first + c];
        }
      }
      const base = entry * stride;
      for (let k = 0; k < width; k++) out[k] += sums[base + k];
      weight += sums[base + width];
      known += sums[base + width + 1];
      if (entry < this.capacity) lastUsed[set] = entry & 1;
    }
    this.known = known;
    this.weight = weight;
  }
}
