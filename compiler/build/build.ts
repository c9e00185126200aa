// build(examples, settings) → model bytes: split → encode → train the draft → prune →
// quantize → fine-tune the output layer → calibrate → choose the policy → write → verify.
// Pure: no file I/O; the CLI reads the data and writes the file.

import { loadModel } from "../../runtime/format/load-model.ts";
import { createFeaturizer, type FeaturizerSettings } from "../../runtime/featurizer/featurizer.ts";
import type { HeadKind, ModelHeader } from "../../runtime/format/model-header.ts";
import { NORMALIZATION_VERSION } from "../../runtime/featurizer/normalize.ts";
import type { Policy } from "../../runtime/model/policy.ts";
import type { Model } from "../../runtime/model/model.ts";
import type { BuildSettings } from "./build-settings.ts";
import { choosePolicy, type PolicyReport } from "../compile/choose-policy.ts";
import { fitCalibration } from "../compile/calibrate.ts";
import { leakWarning, TrainingTextCollector, type LeakFindings } from "../read/text-fingerprints.ts";
import { chooseSigmoidThresholds } from "../compile/sigmoid-thresholds.ts";
import { huffmanTree, treePaths } from "../train/huffman.ts";
import { rankRows, rowImportance, selectRows, subsetDraft } from "../compile/prune.ts";
import { dequantizeRows, quantizeRows } from "../compile/quantize.ts";
import { foldOutputLayer, shouldFoldOutput } from "../compile/fold-output.ts";
import { sectionSizes, writeModel, type ModelContents } from "../compile/write-model.ts";
import { evaluateModel, scoreTexts, type LabelledText } from "../evaluate/evaluate.ts";
import { measureLatency, type LatencyReport } from "../evaluate/measure-latency.ts";
import { createDraft, type Draft } from "../train/draft.ts";
import { encodeTexts, inverseDocumentFrequency } from "../train/encode.ts";
import { memorySource, type TrainingSource } from "../train/training-source.ts";
import { createRandom } from "../train/random.ts";
import { stratifiedSplit } from "../train/split.ts";
import type { TrainProgress } from "../train/train-draft.ts";
import { TOOL_VERSION } from "../version.ts";

/** Above this many labels `--head auto` picks the tree head (measured: see README, "Scale"). */
export const TREE_HEAD_LABEL_THRESHOLD = 64;

export interface BuildInput {
  examples: readonly LabelledText[];
  /** Validation examples; when absent, `settings.holdout` of `examples` is held out. */
  validation?: readonly LabelledText[];
  settings: BuildSettings;
  /** ISO time recorded in provenance; fixed for reproducible builds. */
  buildTime: string;
  /** SHA-256 (hex) of the training data file, recorded in provenance. */
  dataSha256?: string;
  dataName?: string;
  onProgress?: (stage: string, progress: TrainProgress) => void;
  onMessage?: (message: string) => void;
  /** Which data fields held the text and the label (recorded so eval and classify can default to them). */
  fields?: { text: string[]; label: string };
  /**
   * Record the measured latency in the file's metrics (the CLI does, unless SOURCE_DATE_EPOCH
   * asks for a reproducible build: a timing differs run to run, so it would change the bytes).
   * The report carries it either way.
   */
  latencyInFile?: boolean;
}

export interface Quality {
  accuracy: number;
  macroF1: number;
}

export interface StageSeconds {
  /** Splitting, the leak check and fingerprint, featurizing the training texts (in-memory builds). */
  prepare: number;
  /** Training the float draft (the SGD epochs). */
  train: number;
  /** Measuring the draft, pruning, quantizing, fine-tuning the output layer, folding. */
  compile: number;
  /** Temperature scaling, sigmoid thresholds and the policy, on the validation split. */
  calibrate: number;
  /** Validation metrics of what ships, the final write and the round-trip check. */
  verify: number;
}

export interface BuildReport {
  bytes: number;
  head: HeadKind;
  headReason: string;
  labels: string[];
  trainExamples: number;
  validationExamples: number;
  trainSeconds: number;
  /** Wall-clock seconds of each stage: where a build's time goes. */
  stageSeconds: StageSeconds;
  tokensPerSecond: number;
  finalLoss: number;
  rows: { seen: number; kept: number };
  draft: Quality & { bytes: number };
  compiled: Quality;
  validation: Quality & { microF1: number; logLoss: number; ece: number };
  calibration: { temperature: number; eceBefore: number; eceAfter: number; nllBefore: number; nllAfter: number } | null;
  policy: PolicyReport | null;
  leaks: LeakFindings | null;
  sections: Record<string, number>;
  /** µs per classify call, in this process, for a 20- and a 300-token text from the validation data (null without texts). */
  latency: LatencyReport | null;
  warnings: string[];
}

/**
 * Trains and compiles a model.
 * @example
 * const { bytes, report } = await build({ examples, settings: defaultBuildSettings(), buildTime: new Date().toISOString() });
 */
export async function build(input: BuildInput): Promise<{ bytes: Uint8Array; report: BuildReport }> {
  const started = performance.now();
  const { settings } = input;
  const warnings: string[] = [];
  const say = (message: string) => input.onMessage?.(message);
  const labels = collectLabels(input.examples);
  if (labels.length === 0) throw new Error("no labelled examples to train on");
  const { head, reason: headReason } = chooseHead(settings.head, input.examples.some((e) => e.labels.length > 1), labels.length);
  if (head !== "sigmoid" && labels.length < 2) throw new Error(`only one label ("${labels[0]}") in the data: a ${head} head needs at least two (use --head sigmoid for one yes/no label)`);
  say(`head: ${head} (${headReason})`);

  const labelIndex = new Map(labels.map((label, i) => [label, i]));
  const { train, validation } = splitExamples(input, labelIndex, warnings);
  // Leakage: a validation text that also appears in training makes validation optimistic.
  // One pass over the training texts serves both the exact check and the stored fingerprint.
  const trainTexts = new TrainingTextCollector();
  for (const example of train) trainTexts.add(example.text);
  const leaks = trainTexts.findLeaks(validation.map((e) => e.text));
  const leak = leakWarning(leaks, "validation");
  if (leak !== null) warnings.push(leak);
  if (validation.length === 0) warnings.push("no validation data (holdout 0 and no --validation): metrics below are not measured on held-out data");

  const featurizerSettings = featurizerSettingsOf(settings);
  const featurizer = createFeaturizer(featurizerSettings);
  const encoded = encodeTexts(featurizer, train.map((e) => e.text), train.map((e) => e.labels.map((l) => labelIndex.get(l) as number)));
  const source = memorySource(encoded, labels.length, settings.hashBits);
  const trainFingerprint = settings.fingerprint ? trainTexts.fingerprint() : undefined;
  return compileFromSource({ input, source, labels, head, headReason, validation, featurizerSettings, warnings, leaks, trainFingerprint, prepareSeconds: (performance.now() - started) / 1000 });
}

/** What the stages after encoding need (shared by the in-memory and the on-disk paths). */
export interface SourceBuild {
  input: Omit<BuildInput, "examples"> & { examples?: readonly LabelledText[]; exampleCount?: number };
  source: TrainingSource;
  labels: string[];
  head: HeadKind;
  headReason: string;
  validation: LabelledText[];
  featurizerSettings: FeaturizerSettings;
  warnings: string[];
  /** Validation texts that also occur in training (exact, after normalization). */
  leaks?: LeakFindings;
  /** Bloom filter of the training texts, so `eval` can warn about overlap later. */
  trainFingerprint?: Uint8Array;
  /** Seconds spent before this call (reading, splitting, encoding), for the report. */
  prepareSeconds?: number;
}

/** Train the draft from a source, then compile, calibrate, choose the policy and write. */
export async function compileFromSource(job: SourceBuild): Promise<{ bytes: Uint8Array; report: BuildReport }> {
  const { input, source, labels, head, headReason, validation, featurizerSettings, warnings } = job;
  const { settings } = input;
  const clock = stageClock(job.prepareSeconds ?? 0);
  const say = (message: string) => input.onMessage?.(message);
  const labelIndex = new Map(labels.map((label, i) => [label, i]));
  const vocabulary = source.vocabulary(settings.hashBits, settings.minDocs);
  const rowWeights = settings.weighting === "tfidf" ? inverseDocumentFrequency(vocabulary) : null;
  const tree = head === "tree" ? huffmanTree(source.labelCounts) : null;
  const paths = tree ? treePaths(tree, labels.length) : null;
  const random = createRandom(settings.seed);
  const draft = createDraft({
    head,
    labels,
    dims: settings.dims,
    slots: vocabulary.slots,
    documentFrequency: vocabulary.documentFrequency,
    rowWeights,
    tree,
    random,
    shared: settings.threads > 1,
  });
  say(`training: ${source.count} examples, ${vocabulary.slots.length} feature rows, ${settings.epochs} epochs, ${settings.threads} thread(s)`);
  const trainSettings = { epochs: settings.epochs, learningRate: settings.learningRate, seed: settings.seed };
  clock.lap("prepare");
  const trained = await source.train(draft, trainSettings, { paths, trainRows: true, threads: settings.threads, random, onProgress: (p) => input.onProgress?.("train", p) });
  clock.lap("train");

  const header = baseHeader(input, head, labels, featurizerSettings, source.count);
  if (job.trainFingerprint) header.provenance.trainFingerprint = job.trainFingerprint;
  const validationTexts = validation.map((e) => e.text);

  // The draft as shipped would be: float32, every row.
  const draftBytes = writeModel(contentsOf(draft, header, "float32", null, "hidden"));
  const draftModel = loadModel(draftBytes);
  const draftQuality = validation.length > 0 ? quality(evaluateModel(draftModel, validation)) : { accuracy: NaN, macroF1: NaN };

  // Compile: prune to the budget, quantize, retrain the output layer on what survives.
  const ranking = rankRows(rowImportance(draft));
  const rowSpace = shouldFoldOutput(settings.foldOutput, head, header.outputCount, settings.dims) ? "logits" : "hidden";
  const compile = (keep: number) => compileDraft(draft, ranking, keep, source, settings, header, paths, rowSpace);
  // Decide the row count first, then prune, quantize and fine-tune once.
  let keep = settings.keepFeatures > 0 ? Math.min(settings.keepFeatures, draft.slots.length) : draft.slots.length;
  if (settings.maxBytes > 0) {
    const fit = fitRowsToBudget(draft, ranking, settings, header, keep, rowSpace);
    if (fit === null) throw new Error(`no model fits in ${settings.maxBytes} bytes: even with zero feature rows the header and output layer take more; raise --max-bytes or lower --dims`);
    keep = fit;
  }
  let compiled = await compile(keep);
  clock.lap("compile");

  // Calibrate and choose the policy on the validation split, with the compiled model.
  let calibration: BuildReport["calibration"] = null;
  let policy: Policy | null = null;
  let policyReport: PolicyReport | null = null;
  let thresholds: number[] | null = null;
  if (validation.length > 0) {
    const uncalibrated = loadModel(writeModel(compiled.contents));
    const scored = scoreTexts(uncalibrated, validationTexts);
    if (settings.calibrate && head !== "tree") {
      calibration = fitCalibration(head, scored, validation, labelIndex);
      compiled.contents.header.calibration = { temperature: calibration.temperature };
    }
    const calibratedScores = settings.calibrate && head !== "tree" ? scoreTexts(loadModel(writeModel(compiled.contents)), validationTexts) : scored;
    if (head === "sigmoid") thresholds = chooseSigmoidThresholds(calibratedScores, validation, labels);
    const chosen = choosePolicy(calibratedScores, validation, labels, settings.targetPrecision, settings.targetRecall, warnings, settings.actions, settings.reviewBelow);
    policy = chosen.policy;
    policyReport = chosen.report;
    compiled.contents.header.policy = policy;
    compiled.contents.header.thresholds = thresholds;
  }
  clock.lap("calibrate");

  // Measure what ships, record it in the header, write the final bytes.
  const shipped = loadModel(writeModel(compiled.contents));
  const evaluation = validation.length > 0 ? evaluateModel(shipped, validation) : null;
  const compiledQuality = evaluation ? quality(evaluation) : { accuracy: NaN, macroF1: NaN };
  const latencyPool = validationTexts.length > 0 ? validationTexts : (input.examples ?? []).map((e) => e.text);
  const latency = latencyPool.length > 0 ? measureLatency(shipped, latencyPool) : null;
  compiled.contents.header.metrics = {
    validationExamples: validation.length,
    draft: roundQuality(draftQuality),
    draftBytes: draftBytes.length,
    draftRows: draft.slots.length,
    compiled: roundQuality(compiledQuality),
    ...(evaluation ? { logLoss: round(evaluation.logLoss), ece: round(evaluation.ece), microF1: round(evaluation.microF1) } : {}),
    labels: evaluation ? Object.fromEntries(Object.entries(evaluation.labels).map(([label, s]) => [label, { precision: round(s.precision), recall: round(s.recall), f1: round(s.f1), support: s.support }])) : {},
    ...(latency && input.latencyInFile ? { latency } : {}),
  };
  let bytes = writeModel(compiled.contents);
  if (settings.maxBytes > 0 && bytes.length > settings.maxBytes) {
    // The metrics made the header a little longer: drop rows until it fits, keeping the measured metrics honest.
    while (bytes.length > settings.maxBytes && keep > 0) {
      keep = Math.max(0, keep - Math.max(1, Math.ceil((bytes.length - settings.maxBytes) / rowBytes(settings, rowSpace === "logits" ? header.outputCount : settings.dims))));
      const smaller = await compile(keep);
      smaller.contents.header = { ...compiled.contents.header };
      compiled = smaller;
      const reloaded = loadModel(writeModel(compiled.contents));
      const again = validation.length > 0 ? evaluateModel(reloaded, validation) : null;
      if (again) (compiled.contents.header.metrics as Record<string, unknown>).compiled = roundQuality(quality(again));
      bytes = writeModel(compiled.contents);
    }
  }
  verifyRoundTrip(bytes, shipped, validationTexts.slice(0, 50), head);
  clock.lap("verify");
  const report: BuildReport = {
    bytes: bytes.length,
    head,
    headReason,
    labels,
    trainExamples: source.count,
    validationExamples: validation.length,
    trainSeconds: trained.seconds,
    stageSeconds: clock.seconds,
    tokensPerSecond: trained.tokensPerSecond,
    finalLoss: trained.finalLoss,
    rows: { seen: draft.slots.length, kept: compiled.contents.slots.length },
    draft: { ...draftQuality, bytes: draftBytes.length },
    compiled: compiledQuality,
    validation: evaluation
      ? { accuracy: evaluation.accuracy, macroF1: evaluation.macroF1, microF1: evaluation.microF1, logLoss: evaluation.logLoss, ece: evaluation.ece }
      : { accuracy: NaN, macroF1: NaN, microF1: NaN, logLoss: NaN, ece: NaN },
    calibration,
    policy: policyReport,
    leaks: job.leaks ?? null,
    sections: sectionSizes(bytes),
    latency,
    warnings,
  };
  return { bytes, report };
}

/** Adds the time since the previous lap to a stage (the first lap includes what came before). */
function stageClock(before: number) {
  const seconds: StageSeconds = { prepare: before, train: 0, compile: 0, calibrate: 0, verify: 0 };
  let last = performance.now();
  return {
    seconds,
    lap(stage: keyof StageSeconds) {
      const now = performance.now();
      seconds[stage] += (now - last) / 1000;
      last = now;
    },
  };
}

function collectLabels(examples: readonly LabelledText[]): string[] {
  const labels = new Set<string>();
  for (const example of examples) for (const label of example.labels) labels.add(label);
  return [...labels].sort();
}

/** The featurizer settings a build records in its model (this runtime's normalization rules). */
export function featurizerSettingsOf(settings: BuildSettings): FeaturizerSettings {
  return {
    normalization: NORMALIZATION_VERSION,
    wordSpan: settings.wordSpan,
    charMin: settings.charSpan[0],
    charMax: settings.charSpan[1],
    hashBits: settings.hashBits,
    hashSeed: settings.hashSeed,
    maxTokens: settings.maxTokens,
  };
}

/** The head for `--head auto`: sigmoid for several labels per example, tree for many labels. */
export function chooseHead(choice: BuildSettings["head"], severalLabels: boolean, labelCount: number): { head: HeadKind; reason: string } {
  if (choice !== "auto") return { head: choice, reason: "chosen by --head" };
  if (severalLabels) return { head: "sigmoid", reason: "some examples carry several labels" };
  if (labelCount > TREE_HEAD_LABEL_THRESHOLD) return { head: "tree", reason: `${labelCount} labels, more than ${TREE_HEAD_LABEL_THRESHOLD}` };
  return { head: "softmax", reason: `one label per example, ${labelCount} labels` };
}

function splitExamples(input: BuildInput, labelIndex: Map<string, number>, warnings: string[]): { train: LabelledText[]; validation: LabelledText[] } {
  if (input.validation) {
    const unknown = input.validation.filter((e) => !e.labels.every((l) => labelIndex.has(l)));
    if (unknown.length > 0) warnings.push(`${unknown.length} validation examples have labels absent from the training data; they are left out of validation`);
    return { train: [...input.examples], validation: input.validation.filter((e) => e.labels.every((l) => labelIndex.has(l))) };
  }
  if (input.settings.holdout <= 0) return { train: [...input.examples], validation: [] };
  const firstLabel = input.examples.map((e) => labelIndex.get(e.labels[0]) as number);
  const split = stratifiedSplit(firstLabel, input.settings.holdout, input.settings.seed);
  return { train: Array.from(split.train, (i) => input.examples[i]), validation: Array.from(split.validation, (i) => input.examples[i]) };
}

type HeaderBase = ModelContents["header"];

function baseHeader(input: SourceBuild["input"], head: HeadKind, labels: string[], featurizer: FeaturizerSettings, trainCount: number): HeaderBase {
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

/**
 * The draft as model contents: float32 as trained, or int8 (rows quantized unless `frozenRows`
 * holds the quantized rows it was fine-tuned on). With "logits" rows the output layer is
 * multiplied into the rows (from the dequantized rows, so int8 files quantize only once more).
 */
function contentsOf(draft: Draft, header: HeaderBase, precision: "int8" | "float32", frozenRows: { values: Int8Array; scales: Float32Array } | null, rowSpace: "hidden" | "logits"): ModelContents {
  const base = { ...header, precision, rowSpace, metrics: { ...header.metrics }, calibration: { ...header.calibration } };
  const bias = Float32Array.from(draft.bias);
  if (rowSpace === "logits") {
    const rows = frozenRows ? dequantizeRows(frozenRows.values, frozenRows.scales, draft.dims) : draft.rows;
    const folded = foldOutputLayer(rows, draft.outputs, draft.dims, draft.outputCount);
    const stored = precision === "int8" ? quantizeRows(folded, draft.outputCount) : { values: folded, scales: null };
    return { header: base, slots: draft.slots, rows: stored.values, rowScales: stored.scales, rowWeights: draft.rowWeights, outputWeights: null, outputScales: null, outputBias: bias, tree: null };
  }
  if (precision === "float32") {
    return {
      header: base,
      slots: draft.slots,
      rows: draft.rows,
      rowScales: null,
      rowWeights: draft.rowWeights,
      outputWeights: Float32Array.from(draft.outputs),
      outputScales: null,
      outputBias: bias,
      tree: draft.tree,
    };
  }
  const rows = frozenRows ?? quantizeRows(draft.rows, draft.dims);
  const outputs = quantizeRows(draft.outputs, draft.dims);
  return {
    header: base,
    slots: draft.slots,
    rows: rows.values,
    rowScales: rows.scales,
    rowWeights: draft.rowWeights,
    outputWeights: outputs.values,
    outputScales: outputs.scales,
    outputBias: bias,
    tree: draft.tree,
  };
}

/** Prune to `keep` rows, quantize them, retrain the output layer on exactly those rows. */
async function compileDraft(draft: Draft, ranking: Int32Array, keep: number, source: TrainingSource, settings: BuildSettings, header: HeaderBase, paths: ReturnType<typeof treePaths> | null, rowSpace: "hidden" | "logits") {
  const pruned = subsetDraft(draft, selectRows(ranking, keep));
  let frozen: { values: Int8Array; scales: Float32Array } | null = null;
  if (settings.precision === "int8") {
    frozen = quantizeRows(pruned.rows, pruned.dims);
    pruned.rows = dequantizeRows(frozen.values, frozen.scales, pruned.dims);
  }
  if (settings.fineTuneEpochs > 0) {
    await source.train(pruned, { epochs: settings.fineTuneEpochs, learningRate: settings.learningRate * 0.2, seed: settings.seed + 1 }, { paths, trainRows: false, threads: 1 });
  }
  return { contents: contentsOf(pruned, header, settings.precision, frozen, rowSpace) };
}

/** Approximate bytes per kept row of `width` values (for stepping toward a byte budget). */
function rowBytes(settings: BuildSettings, width: number): number {
  // int8: the values, a one-byte scale code, a u16 weight under TF-IDF; float32: four bytes each.
  const int8 = settings.precision === "int8";
  return (int8 ? width + 1 : width * 4) + (settings.weighting === "tfidf" ? (int8 ? 2 : 4) : 0) + 3;
}

/** The largest row count (≤ upper) whose compiled file fits the byte budget, by bisection on real writes. */
function fitRowsToBudget(draft: Draft, ranking: Int32Array, settings: BuildSettings, header: HeaderBase, upper: number, rowSpace: "hidden" | "logits"): number | null {
  // Reserve room for the metrics and policy written into the header later.
  const budget = settings.maxBytes - 2048 - 64 * draft.labels.length;
  // A file's size depends on its row count and layout, not on its values: measure writes of
  // zero-filled contents instead of pruning, folding and quantizing at every probe.
  const int8 = settings.precision === "int8";
  const width = rowSpace === "logits" ? draft.outputCount : draft.dims;
  const sizeWith = (keep: number) => {
    const kept = selectRows(ranking, keep);
    const slots = Uint32Array.from(kept, (row) => draft.slots[row]);
    const hidden = rowSpace === "hidden";
    return writeModel({
      header: { ...header, precision: settings.precision, rowSpace },
      slots,
      rows: int8 ? new Int8Array(kept.length * width) : new Float32Array(kept.length * width),
      rowScales: int8 ? new Float32Array(kept.length) : null,
      rowWeights: draft.rowWeights ? new Float32Array(kept.length) : null,
      outputWeights: hidden ? (int8 ? new Int8Array(draft.outputs.length) : new Float32Array(draft.outputs.length)) : null,
      outputScales: hidden && int8 ? new Float32Array(draft.outputCount) : null,
      outputBias: new Float32Array(draft.outputCount),
      tree: draft.tree,
    }).length;
  };
  let lowSize = sizeWith(0);
  if (lowSize > budget) return null;
  let highSize = sizeWith(upper);
  if (highSize <= budget) return upper;
  // Size grows almost linearly with the row count, so guess by interpolation (a few probes
  // instead of ten), falling back to the midpoint whenever a guess would not narrow the range.
  let low = 0;
  let high = upper;
  while (high - low > Math.max(1, upper >> 10)) {
    let guess = low + Math.floor(((budget - lowSize) / (highSize - lowSize)) * (high - low));
    if (guess <= low || guess >= high) guess = (low + high) >>> 1;
    const size = sizeWith(guess);
    if (size <= budget) {
      low = guess;
      lowSize = size;
      // The next probe just above the guess usually settles it.
      const step = Math.max(1, upper >> 10);
      if (guess + step < high) {
        const above = sizeWith(guess + step);
        if (above > budget) return guess;
        low = guess + step;
        lowSize = above;
      }
    } else {
      high = guess;
      highSize = size;
    }
  }
  return low;
}

/** The written bytes load and score exactly like the model that was measured. */
function verifyRoundTrip(bytes: Uint8Array, measured: Model, texts: string[], head: HeadKind): void {
  const reloaded = loadModel(bytes);
  for (const text of texts) {
    const a = measured.score(text).scores;
    const b = reloaded.score(text).scores;
    for (let k = 0; k < a.length; k++) {
      if (Math.abs(a[k] - b[k]) > 1e-6) throw new Error(`verification failed: the written ${head} model scores differently from the measured one`);
    }
  }
}

function quality(report: { accuracy: number; macroF1: number }): Quality {
  return { accuracy: report.accuracy, macroF1: report.macroF1 };
}

function round(value: number): number {
  return Math.round(value * 1e6) / 1e6;
}

function roundQuality(q: Quality): Quality {
  return { accuracy: round(q.accuracy), macroF1: round(q.macroF1) };
}
