// Featurize examples once into a compact CSR layout (offsets + feature ids), count the
// documents each slot occurs in, and map the kept slots (seen in ≥ minDocs examples)
// to dense row ids. Training then touches only typed arrays.

import { createFeatureBuffer, type Featurizer } from "../../runtime/featurizer/featurizer.ts";

/** Examples as feature lists: features of example i are `features[offsets[i] .. offsets[i+1])`. */
export interface EncodedExamples {
  count: number;
  offsets: Uint32Array;
  /** Slots (after `encodeTexts`) or row ids (after `mapToRows`). */
  features: Uint32Array;
  /** Labels of example i are `labelList[labelOffsets[i] .. labelOffsets[i+1])`. */
  labelOffsets: Uint32Array;
  labelList: Int32Array;
  /** Tokens the featurizer read, summed over all examples (for throughput). */
  tokenTotal: number;
}

/** Kept slots in ascending order with their document frequency. */
export interface Vocabulary {
  slots: Uint32Array;
  documentFrequency: Uint32Array;
  /** Examples counted. */
  documentCount: number;
}

/**
 * Featurizes texts with their label ids.
 * @example encodeTexts(featurizer, ["hi there"], [[0]])
 */
export function encodeTexts(featurizer: Featurizer, texts: readonly string[], labels: readonly (readonly number[])[]): EncodedExamples {
  const buffer = createFeatureBuffer(4096);
  const offsets = new Uint32Array(texts.length + 1);
  let features = new Uint32Array(Math.max(1024, texts.length * 64));
  let used = 0;
  let tokenTotal = 0;
  let labelCount = 0;
  for (const set of labels) labelCount += set.length;
  const labelOffsets = new Uint32Array(texts.length + 1);
  const labelList = new Int32Array(labelCount);
  let labelUsed = 0;
  for (let i = 0; i < texts.length; i++) {
    featurizer.featurize(texts[i], buffer);
    tokenTotal += buffer.tokenCount;
    if (used + buffer.count > features.length) {
      const grown = new Uint32Array(Math.max(features.length * 2, used + buffer.count));
      grown.set(features.subarray(0, used));
      features = grown;
    }
    features.set(buffer.slots.subarray(0, buffer.count), used);
    used += buffer.count;
    offsets[i + 1] = used;
    for (const label of labels[i]) labelList[labelUsed++] = label;
    labelOffsets[i + 1] = labelUsed;
  }
  return { count: texts.length, offsets, features: features.slice(0, used), labelOffsets, labelList, tokenTotal };
}

/** What an encoding would hold, counted without keeping its features (see `surveyTexts`). */
export interface TextSurvey {
  count: number;
  /** Examples each slot occurs in (2^hashBits entries). */
  frequency: Uint32Array;
  /** Features summed over all texts: `encodeTexts(...).features.length`. */
  featureTotal: number;
  tokenTotal: number;
}

/**
 * Featurizes texts one at a time and counts document frequencies and features, keeping no
 * feature lists: the vocabulary and size of an encoding without its memory (character
 * n-grams of a large training set take about 14 features a word, 56 bytes each word).
 * `keptSlots(survey.frequency, minDocs, survey.count)` equals `buildVocabulary(encodeTexts(...), hashBits, minDocs)`.
 * @example const survey = surveyTexts(featurizer, texts, 20)
 */
export function surveyTexts(featurizer: Featurizer, texts: readonly string[], hashBits: number): TextSurvey {
  const buffer = createFeatureBuffer(4096);
  const size = 2 ** hashBits;
  const frequency = new Uint32Array(size);
  const lastSeen = new Int32Array(size).fill(-1);
  let featureTotal = 0;
  let tokenTotal = 0;
  for (let i = 0; i < texts.length; i++) {
    featurizer.featurize(texts[i], buffer);
    tokenTotal += buffer.tokenCount;
    featureTotal += buffer.count;
    const slots = buffer.slots;
    for (let f = 0; f < buffer.count; f++) {
      const slot = slots[f];
      if (lastSeen[slot] !== i) {
        lastSeen[slot] = i;
        frequency[slot]++;
      }
    }
  }
  return { count: texts.length, frequency, featureTotal, tokenTotal };
}

/**
 * Slots seen in at least `minDocs` examples, ascending.
 * @example buildVocabulary(encoded, 18, 2).slots.length
 */
export function buildVocabulary(encoded: EncodedExamples, hashBits: number, minDocs: number): Vocabulary {
  const size = 2 ** hashBits;
  const frequency = new Uint32Array(size);
  const lastSeen = new Int32Array(size).fill(-1);
  for (let i = 0; i < encoded.count; i++) {
    for (let f = encoded.offsets[i]; f < encoded.offsets[i + 1]; f++) {
      const slot = encoded.features[f];
      if (lastSeen[slot] !== i) {
        lastSeen[slot] = i;
        frequency[slot]++;
      }
    }
  }
  return keptSlots(frequency, minDocs, encoded.count);
}

/**
 * The slots whose document frequency reaches `minDocs` (and is not zero), ascending, with
 * their frequencies: the vocabulary, from counts gathered in memory or while streaming.
 */
export function keptSlots(frequency: Uint32Array, minDocs: number, documentCount: number): Vocabulary {
  const threshold = Math.max(1, minDocs);
  let kept = 0;
  for (let slot = 0; slot < frequency.length; slot++) if (frequency[slot] >= threshold) kept++;
  const slots = new Uint32Array(kept);
  const documentFrequency = new Uint32Array(kept);
  let row = 0;
  for (let slot = 0; slot < frequency.length; slot++) {
    if (frequency[slot] >= threshold) {
      slots[row] = slot;
      documentFrequency[row++] = frequency[slot];
    }
  }
  return { slots, documentFrequency, documentCount };
}

/**
 * Rewrites slots as row ids of `keptSlots` (sorted), dropping features without a row.
 * Returns a new EncodedExamples; the input is left intact.
 */
export function mapToRows(encoded: EncodedExamples, keptSlots: Uint32Array, hashBits: number): EncodedExamples {
  const rowOfSlot = new Int32Array(2 ** hashBits).fill(-1);
  for (let row = 0; row < keptSlots.length; row++) rowOfSlot[keptSlots[row]] = row;
  const offsets = new Uint32Array(encoded.count + 1);
  // Count first, so the mapped lists are allocated once at their size (no second copy to trim).
  let kept = 0;
  const length = encoded.offsets[encoded.count];
  for (let f = 0; f < length; f++) if (rowOfSlot[encoded.features[f]] >= 0) kept++;
  const features = new Uint32Array(kept);
  let used = 0;
  for (let i = 0; i < encoded.count; i++) {
    for (let f = encoded.offsets[i]; f < encoded.offsets[i + 1]; f++) {
      const row = rowOfSlot[encoded.features[f]];
      if (row >= 0) features[used++] = row;
    }
    offsets[i + 1] = used;
  }
  return { ...encoded, offsets, features };
}

/** Smoothed inverse document frequency, ln((1 + n) / (1 + df)) + 1 (scikit-learn's TfidfTransformer with smooth_idf=True). */
export function inverseDocumentFrequency(vocabulary: Vocabulary): Float32Array {
  const idf = new Float32Array(vocabulary.slots.length);
  const n = vocabulary.documentCount;
  for (let row = 0; row < idf.length; row++) idf[row] = Math.log((1 + n) / (1 + vocabulary.documentFrequency[row])) + 1;
  return idf;
}
