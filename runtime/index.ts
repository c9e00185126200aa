// Public surface of sluice/runtime: load a model file, classify, decide, explain.
// Web-standard only (no node:* imports), so it runs in Workers, Node, Deno, Bun and browsers.

export { loadModel } from "./load-model.ts";
export { Model } from "./model.ts";
export type {
  ClassifyOptions,
  Explanation,
  FeatureContribution,
  LabelExplanation,
  LabelScore,
  ModelMeta,
  ScoreResult,
} from "./model.ts";
export { ModelFormatError, InputError, MODEL_FORMAT_ERROR_CODES, INPUT_ERROR_CODES } from "./errors.ts";
export type { ModelFormatErrorCode, InputErrorCode } from "./errors.ts";
export { decideFromScores } from "./policy.ts";
export type { Action, Decision, Policy, PolicyRule } from "./policy.ts";
export { createFeaturizer, createFeatureBuffer, Featurizer } from "./featurizer.ts";
export type { FeatureBuffer, FeaturizerSettings } from "./featurizer.ts";
export { normalizeText, NORMALIZATION_VERSION } from "./normalize.ts";
export { murmur3String, murmur3Bytes } from "./murmur3.ts";
export { crc32 } from "./crc32.ts";
export { FORMAT_VERSION } from "./format.ts";
export type { ModelHeader, HeadKind, Weighting, Precision } from "./model-header.ts";
