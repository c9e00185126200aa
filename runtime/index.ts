// Public surface of sluice/runtime: load a model file, classify, decide, explain.
// Web-standard only (no node:* imports), so it runs in Workers, Node, Deno, Bun and browsers.

export { loadModel } from "./format/load-model.ts";
export { Model } from "./model/model.ts";
export type {
  ClassifyOptions,
  DecideOptions,
  Explanation,
  FeatureContribution,
  LabelExplanation,
  LabelScore,
  ModelMeta,
  ScoreResult,
} from "./model/model.ts";
export { ModelFormatError, InputError, MODEL_FORMAT_ERROR_CODES, INPUT_ERROR_CODES } from "./errors.ts";
export type { ModelFormatErrorCode, InputErrorCode } from "./errors.ts";
export { codedErrorClass } from "./coded-error.ts";
export type { CodedError, CodedErrorClass } from "./coded-error.ts";
export { decideFromScores, failClosed, DECISION_FAULT_CODES } from "./model/policy.ts";
export type { Action, Decision, DecisionFault, DecisionFaultCode, Policy, PolicyRule } from "./model/policy.ts";
export { createFeaturizer, createFeatureBuffer, Featurizer } from "./featurizer/featurizer.ts";
export type { FeatureBuffer, FeaturizerSettings } from "./featurizer/featurizer.ts";
export { normalizeText, NORMALIZATION_VERSION } from "./featurizer/normalize.ts";
export { murmur3String } from "./featurizer/murmur3.ts";
export { crc32 } from "./format/crc32.ts";
export { FORMAT_VERSION } from "./format/format.ts";
export type { ModelHeader, HeadKind, Weighting, Precision } from "./format/model-header.ts";
export { SURFACE_DEFAULTS } from "./surface-defaults.ts";
