// Public surface of sluice/compiler: the programmatic API the CLI is a thin shell over.
// Everything here is pure (no file I/O) except buildFromFile, which streams a data file.

export { build } from "./build/build.ts";
export { compileFromSource } from "./build/compile-from-source.ts";
export { chooseHead, TREE_HEAD_LABEL_THRESHOLD } from "./build/choose-head.ts";
export type { BuildInput } from "./build/build-input.ts";
export type { BuildReport, Quality } from "./build/build-report.ts";
export { buildFromFile } from "./build/build-from-file.ts";
export type { FileBuildInput } from "./build/build-from-file.ts";
export { BUILD_SETTINGS, defaultBuildSettings, parseSetting, parseSize, resolveBuildSettings, SettingError } from "./build/build-settings.ts";
export type { BuildSettings, HeadChoice } from "./build/build-settings.ts";
export { evaluateModel, scoreTexts } from "./evaluate/evaluate.ts";
export type { EvaluationReport, LabelledText, ScoredSet } from "./evaluate/evaluate.ts";
export { evaluateAll } from "./evaluate/evaluate-all.ts";
export { evaluateMultilabel } from "./evaluate/evaluate-multilabel.ts";
export { evaluatePolicy } from "./evaluate/evaluate-policy.ts";
export { compareModels } from "./evaluate/compare.ts";
export { measureLatency, measureClassifyMicroseconds, textOfTokens, LATENCY_TOKENS } from "./evaluate/measure-latency.ts";
export type { LatencyReport, TextLatency, LatencyOptions } from "./evaluate/measure-latency.ts";
export { renderReport } from "./report/render-report.ts";
export { tune } from "./tune/tune.ts";
export type { TuneOptions, TuneResult, TrialResult } from "./tune/tune.ts";
export { writeModel, sectionSizes } from "./compile/write-model.ts";
export type { ModelContents } from "./compile/write-model.ts";
export { readExamples, readExamplesFromText, createReadReport, DataError } from "./read/index.ts";
export type { DataFormat, Example, ReadOptions, ReadReport } from "./read/index.ts";
export { main } from "./cli/main.ts";
