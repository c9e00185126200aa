// The shapes a loaded model takes and returns: its parts (views over the file), scores,
// explanations and metadata.

import type { ModelHeader } from "../format/model-header.ts";
import type { SlotIndex } from "../format/slot-index.ts";

/**
 * The numeric sections of a model, one shape for the writer (compiler/compile/write-model.ts,
 * ModelContents) and the loader (ModelParts, views over the file).
 */
export interface ModelArrays {
  rows: Int8Array | Float32Array;
  rowScales: Float32Array | null;
  rowWeights: Float32Array | null;
  /** Null when the rows hold logits (the output layer was multiplied into them). */
  outputWeights: Int8Array | Float32Array | null;
  outputScales: Float32Array | null;
  outputBias: Float32Array;
  tree: Int32Array | null;
}

/** The numeric parts of a model, as views over the file. */
export interface ModelParts extends ModelArrays {
  header: ModelHeader;
  index: SlotIndex;
  /** Content id: the file's CRC-32 as 8 hex digits. */
  contentId: string;
  byteLength: number;
}

export interface LabelScore {
  label: string;
  score: number;
}

export interface DecideOptions {
  /** The caller's review floor: an "allow" whose top score is below this becomes "review" (default 0, off). */
  reviewBelow?: number;
}

export interface ClassifyOptions {
  /** How many labels to return, best first (default: 1; for a sigmoid head, every label at or above its threshold). */
  top?: number;
  /** Leave out labels scoring below this (default 0). */
  minScore?: number;
}

/** Scores of one text plus what the featurizer saw. */
export interface ScoreResult {
  scores: Float32Array;
  tokenCount: number;
  truncated: boolean;
  /** Features that found a kept row (0 means the model knows nothing about this text). */
  knownFeatures: number;
}

export interface FeatureContribution {
  /** The word, word pair, character piece or shape token, as people read it. */
  feature: string;
  /** Its exact share of the (temperature-scaled) logit. */
  contribution: number;
  /**
   * Present when evasion folding (normalization 2) produced the feature: the original text it
   * was read from, e.g. ["frее"] (with a Cyrillic е) for the word "free", or ["f r e e"].
   */
  foldedFrom?: string[];
}

export interface LabelExplanation {
  label: string;
  score: number;
  /** Temperature-scaled logit = bias + Σ contributions (over all features, not only the ones listed). */
  logit: number;
  bias: number;
  features: FeatureContribution[];
}

export interface Explanation {
  labels: LabelExplanation[];
  tokenCount: number;
  truncated: boolean;
  /** Features of the text whose slot was pruned or never seen: they contribute nothing. */
  unknownFeatures: number;
}

/** Public description of a model (no training data). */
export interface ModelMeta {
  /**
   * Which file this is: its CRC-32 in 8 hex digits, equal for two files only when their bytes
   * are. Not a version: the format's version is `FORMAT_VERSION`, the tool's is in provenance.
   */
  contentId: string;
  bytes: number;
  labels: string[];
  head: ModelHeader["head"];
  dims: number;
  rowSpace: ModelHeader["rowSpace"];
  rowCount: number;
  precision: ModelHeader["precision"];
  weighting: ModelHeader["weighting"];
  featurizer: ModelHeader["featurizer"];
  calibration: ModelHeader["calibration"];
  thresholds: number[] | null;
  policy: ModelHeader["policy"];
  metrics: Record<string, unknown>;
  provenance: Record<string, unknown>;
}
