// Each feature kind hashes with a seed of its own, derived from the model's one hash seed, so
// a word, a character n-gram, a word pair and a URL host with the same bytes land apart.

/** The per-kind seeds derived from one hash seed. */
export interface FeatureSeeds {
  word: number;
  char: number;
  ngram: number;
  host: number;
  shape: number;
}

/** Derives the per-kind seeds (the constants are arbitrary odd 32-bit values, fixed forever). */
export function deriveFeatureSeeds(hashSeed: number): FeatureSeeds {
  const seed = hashSeed >>> 0;
  return {
    word: seed,
    char: (seed ^ 0x2545f491) >>> 0,
    ngram: (seed ^ 0x6c8e9cf5) >>> 0,
    host: (seed ^ 0x1b56c4e9) >>> 0,
    shape: (seed ^ 0x7f4a7c15) >>> 0,
  };
}
