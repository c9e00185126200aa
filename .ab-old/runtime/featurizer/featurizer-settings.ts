// The settings that define the feature space; every model file stores them.

/** Settings that define the feature space; stored in every model file. */
export interface FeaturizerSettings {
  /** Version of the normalization and tokenization rules (see normalize.ts). */
  normalization: number;
  /** Longest word n-gram: 1 = words only, 2 = words + pairs. */
  wordSpan: number;
  /** Shortest character n-gram inside a word; 0 turns character n-grams off. */
  charMin: number;
  /** Longest character n-gram inside a word. */
  charMax: number;
  /** The feature space has 2^hashBits slots. */
  hashBits: number;
  /** Seed of every hash (each feature kind derives its own from it). */
  hashSeed: number;
  /** Tokens beyond this count are ignored, and the caller is told. */
  maxTokens: number;
  /**
   * Each letter of a script written without spaces (Han, kana, Thai, Lao, Khmer, Myanmar) is a
   * token of its own (format version 3; absent in older files, where such runs stay one word).
   */
  unspacedScripts?: boolean;
}
