// The header every model of a build starts from: labels, head, featurizer, provenance.

import type { FeaturizerSettings } from "../../runtime/featurizer/featurizer.ts";
import { NORMALIZATION_VERSION } from "../../runtime/featurizer/normalize.ts";
import type { HeadKind } from "../../runtime/format/model-header.ts";
import type { ModelContents } from "../compile/write-model.ts";
import { TOOL_VERSION } from "../version.ts";
import type { BuildSettings } from "./build-settings.ts";
import type { SourceBuild } from "./build-input.ts";

/** The featurizer settings a build records in its model (this runtime's normalization rules). */
export function featurizerSettingsOf(settings: BuildSettings): FeaturizerSettings {
  return {
    normalization: settings.foldEvasion ? NORMALIZATION_VERSION : 1,
    wordSpan: settings.wordSpan,
    charMin: settings.charSpan[0],
    charMax: settings.charSpan[1],
    hashBits: settings.hashBits,
    hashSeed: settings.hashSeed,
    maxTokens: settings.maxTokens,
    unspacedScripts: settings.unspacedScripts,
  };
}

export type HeaderBase = ModelContents["header"];

export function baseHeader(input: SourceBuild["input"], head: HeadKind, labels: string[], featurizer: FeaturizerSettings, trainCount: number): HeaderBase {
  const s = input.settings;
  return {
    labels,
    head,
    dims: s.dims,
    rowSpace: "hidden",
    outputCount: head === "tree" ? labels.length - 1 : labels.length,
    featurizer,
    weighting: s.weighting,
    precision: s.precision,
    calibration: { temperature: 1 },
    thresholds: null,
    policy: null,
    metrics: {},
    provenance: {
      tool: `sluice ${TOOL_VERSION}`,
      builtAt: input.buildTime,
      data: input.dataName ?? null,
      fields: input.fields ?? null,
      dataSha256: input.dataSha256 ?? null,
      examples: input.examples?.length ?? input.exampleCount ?? null,
      trainExamples: trainCount,
      settings: { ...s },
    },
  };
}
