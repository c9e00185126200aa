// The stages after encoding: train the draft → measure it → prune and quantize to the budget →
// calibrate and choose the policy → measure what ships → write → verify.

import { validationTraffic } from "./validation-traffic.ts";
import { loadModel } from "../../runtime/format/load-model.ts";
import type { Model } from "../../runtime/model/model.ts";
import type { Policy } from "../../runtime/model/policy.ts";
import { choosePolicy, type PolicyReport } from "../compile/choose-policy.ts";
import { fitCalibration } from "../compile/calibrate.ts";
import { chooseSigmoidThresholds } from "../compile/sigmoid-thresholds.ts";
import { rankRows, rowImportance } from "../compile/prune.ts";
import { shouldFoldOutput } from "../compile/fold-output.ts";
import { sectionSizes, writeModel } from "../compile/write-model.ts";
import { evaluateModel, scoreTexts, type ScoredSet } from "../evaluate/evaluate.ts";
import { measureLatency } from "../evaluate/measure-latency.ts";
import { createDraft } from "../train/draft.ts";
import { inverseDocumentFrequency } from "../train/encode.ts";
import { huffmanTree, treePaths } from "../train/huffman.ts";
import { createRandom } from "../train/random.ts";
import { baseHeader } from "./base-header.ts";
import type { SourceBuild } from "./build-input.ts";
import { quality, round, roundQuality, stageClock, type BuildReport } from "./build-report.ts";
import { compileDraft } from "./compile-draft.ts";
import { contentsOf } from "./draft-contents.ts";
import { fitRowsToBudget, rowBytes } from "./fit-rows-to-budget.ts";
import { verifyRoundTrip } from "./verify-round-trip.ts";
import { explicitSettings } from "./explicit-settings.ts";
import { withLinearDims } from "./linear-dims.ts";
import { checkWeights, TrainingDivergedError } from "../train/divergence.ts";
import type { Draft } from "../train/draft.ts";
import type { TrainResult } from "../train/train-draft.ts";
import { wilsonInterval } from "../metrics/wilson-interval.ts";

/** Halvings of a learning rate Sluice chose before the build gives up on a diverging run. */
const MAX_RECOVERIES = 4;

/** The divergence behind `error` (also when it crossed a thread boundary as a plain Error), else null. */
function asDivergence(error: unknown, learningRate: number): TrainingDivergedError | null {
  if (error instanceof TrainingDivergedError) return error;
  const message = error instanceof Error ? error.message : String(error);
  const match = /training diverged at epoch (\d+): (.*?); lower --learning-rate/.exec(message);
  return match ? new TrainingDivergedError(Number(match[1]), learningRate, match[2]) : null;
}

/** Compiles; a weight too large for int8 storage is a training problem and is reported as one. */
async function compileOrExplain<T>(compile: () => Promise<T>, learningRate: number): Promise<T> {
  try {
    return await compile();
  } catch (error) {
    if (error instanceof Error && /beyond what an int8 row scale code can hold/.test(error.message)) {
      throw new TrainingDivergedError(0, learningRate, "the trained weights grew too large to store");
    }
    throw error;
  }
}

/** The draft written as float32 with every row: its size, and its scores on validation. */
function measureDraft(draft: Draft, header: ReturnType<typeof baseHeader>, validation: SourceBuild["validation"]) {
  const bytes = writeModel(contentsOf(draft, header, "float32", null, "hidden"));
  const draftQuality = validation.length > 0 ? quality(evaluateModel(loadModel(bytes), validation)) : { accuracy: NaN, macroF1: NaN };
  return { draftByteCount: bytes.length, draftQuality };
}

/** Train the draft from a source, then compile, calibrate, choose the policy and write. */
export async function compileFromSource(job: SourceBuild): Promise<{ bytes: Uint8Array; report: BuildReport }> {
  const { source, labels, head, headReason, validation, featurizerSettings, warnings } = job;
  let { input } = job;
  let settings = withLinearDims(input.settings, head, labels.length);
  if (settings !== input.settings) input = { ...input, settings };
  const clock = stageClock(job.prepareSeconds ?? 0);
  const say = (message: string) => input.onMessage?.(message);
  const labelIndex = new Map(labels.map((label, i) => [label, i]));
  const vocabulary = source.vocabulary(settings.hashBits, settings.minDocs);
  const rowWeights = settings.weighting === "tfidf" ? inverseDocumentFrequency(vocabulary) : null;
  const tree = head === "tree" ? huffmanTree(source.labelCounts) : null;
  const paths = tree ? treePaths(tree, labels.length) : null;
  say(`training: ${source.count} examples, ${vocabulary.slots.length} feature rows, ${settings.epochs} epochs, ${settings.threads} thread(s)`);
  clock.lap("prepare");
  // A run that diverges is retried at half the rate when the rate was Sluice's choice; a rate
  // the user gave is theirs to change, so the build stops with what to do.
  const rateIsExplicit = explicitSettings(input.settings, input.explicit).has("learningRate");
  let learningRate = settings.learningRate;
  let draft: Draft;
  let trained: TrainResult;
  for (let attempt = 0; ; attempt++) {
    const random = createRandom(settings.seed);
    draft = createDraft({ head, labels, dims: settings.dims, slots: vocabulary.slots, documentFrequency: vocabulary.documentFrequency, rowWeights, tree, random, shared: settings.threads > 1, adaptive: settings.adaptiveRates, loss: settings.loss, linear: settings.linear });
    try {
      trained = await source.train(draft, { epochs: settings.epochs, learningRate, seed: settings.seed }, { paths, trainRows: true, threads: settings.threads, random, onProgress: (p) => input.onProgress?.("train", p) });
      checkWeights([draft.rows, draft.outputs, draft.bias], settings.epochs, learningRate);
      break;
    } catch (error) {
      const diverged = asDivergence(error, learningRate);
      if (diverged === null) throw error;
      if (rateIsExplicit || attempt >= MAX_RECOVERIES) throw diverged;
      warnings.push(`${diverged.message.replace(/; lower --learning-rate.*$/, "")} at learning rate ${learningRate}; retrained at ${learningRate / 2}`);
      learningRate /= 2;
    }
  }
  if (learningRate !== settings.learningRate) {
    settings = { ...settings, learningRate };
    input = { ...input, settings };
  }
  clock.lap("train");
  input.onStage?.("compile");

  const header = baseHeader(input, head, labels, featurizerSettings, source.count);
  if (job.trainFingerprint) header.provenance.trainFingerprint = job.trainFingerprint;
  const validationTexts = validation.map((e) => e.text);

  // The draft as shipped would be: float32, every row. Only its size and scores are kept: the
  // file is as large as the draft itself (72 MB for 750k rows) and must not live on through compiling.
  const { draftByteCount, draftQuality } = measureDraft(draft, header, validation);

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
  let compiled = await compileOrExplain(() => compile(keep), learningRate);
  if (compiled.fineTuneNote !== null) warnings.push(compiled.fineTuneNote);
  clock.lap("compile");
  input.onStage?.("calibrate");

  // Calibrate and choose the policy on the validation split, with the compiled model.
  // Each model that scores differently is written and loaded once: the compiled one, and the
  // calibrated one when calibration changes the temperature. The policy, thresholds and
  // metrics are header fields no score reads, so the last of these models (`measured`) and
  // its validation scores serve the measurements below too, and the only later write is the
  // bytes that ship; verifyRoundTrip reloads those and checks they score like `measured`.
  let calibration: BuildReport["calibration"] = null;
  let policy: Policy | null = null;
  let policyReport: PolicyReport | null = null;
  let thresholds: number[] | null = null;
  let measured: Model | null = null;
  let measuredScores: ScoredSet | undefined;
  if (validation.length > 0) {
    const uncalibrated = loadModel(writeModel(compiled.contents));
    const scored = scoreTexts(uncalibrated, validationTexts);
    measured = uncalibrated;
    let calibratedScores = scored;
    if (settings.calibrate && head !== "tree") {
      calibration = fitCalibration(head, scored, validation, labelIndex);
      compiled.contents.header.calibration = { temperature: calibration.temperature };
      measured = loadModel(writeModel(compiled.contents));
      calibratedScores = scoreTexts(measured, validationTexts);
    }
    measuredScores = calibratedScores;
    if (head === "sigmoid") thresholds = chooseSigmoidThresholds(calibratedScores, validation, labels);
    const chosen = choosePolicy(calibratedScores, validation, labels, settings.targetPrecision, settings.targetRecall, warnings, settings.actions, settings.reviewBelow);
    policy = chosen.policy;
    policyReport = chosen.report;
    compiled.contents.header.policy = policy;
    compiled.contents.header.thresholds = thresholds;
  }
  clock.lap("calibrate");
  input.onStage?.("verify");

  // Measure what ships, record it in the header, write the final bytes.
  const latencyPool = validationTexts.length > 0 ? validationTexts : (input.examples ?? []).map((e) => e.text);
  const measure = (model: Model, contents: typeof compiled.contents, scored?: ScoredSet) => {
    const evaluation = validation.length > 0 ? evaluateModel(model, validation, scored) : null;
    const latency = latencyPool.length > 0 ? measureLatency(model, latencyPool) : null;
    contents.header.metrics = {
      validationExamples: validation.length,
      draft: roundQuality(draftQuality),
      draftBytes: draftByteCount,
      draftRows: draft.slots.length,
      compiled: roundQuality(evaluation ? quality(evaluation) : { accuracy: NaN, macroF1: NaN }),
      ...(evaluation ? { logLoss: round(evaluation.logLoss), ece: round(evaluation.ece), microF1: round(evaluation.microF1) } : {}),
      labels: evaluation ? Object.fromEntries(Object.entries(evaluation.labels).map(([label, s]) => [label, { precision: round(s.precision), recall: round(s.recall), f1: round(s.f1), support: s.support }])) : {},
      ...(latency && input.latencyInFile ? { latency } : {}),
      // What the Worker's traffic counts will be compared with (population stability in the report).
      ...(validation.length > 0 ? { traffic: validationTraffic(model, validationTexts) } : {}),
    };
    return { evaluation, latency, bytes: writeModel(contents) };
  };
  // Scores exactly as the shipped bytes will (only their header is still to change).
  let shipped = measured ?? loadModel(writeModel(compiled.contents));
  let { evaluation, latency, bytes } = measure(shipped, compiled.contents, measuredScores);
  // The metrics made the header a little longer than the budget reserved: drop rows until it
  // fits, measuring each smaller model again, so the metrics, the report and the round-trip
  // check below all describe the bytes that are written (the calibration, thresholds and
  // policy stay those chosen on the larger model).
  while (settings.maxBytes > 0 && bytes.length > settings.maxBytes && keep > 0) {
    keep = Math.max(0, keep - Math.max(1, Math.ceil((bytes.length - settings.maxBytes) / rowBytes(settings, rowSpace === "logits" ? header.outputCount : settings.dims))));
    const smaller = await compile(keep);
    smaller.contents.header = { ...compiled.contents.header };
    compiled = smaller;
    shipped = loadModel(writeModel(compiled.contents));
    ({ evaluation, latency, bytes } = measure(shipped, compiled.contents));
  }
  const compiledQuality = evaluation ? quality(evaluation) : { accuracy: NaN, macroF1: NaN };
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
    draft: { ...draftQuality, bytes: draftByteCount },
    compiled: compiledQuality,
    validation: evaluation
      ? { accuracy: evaluation.accuracy, macroF1: evaluation.macroF1, microF1: evaluation.microF1, logLoss: evaluation.logLoss, ece: evaluation.ece }
      : { accuracy: NaN, macroF1: NaN, microF1: NaN, logLoss: NaN, ece: NaN },
    validationInterval: evaluation ? wilsonInterval(Math.round(evaluation.accuracy * validation.length), validation.length) : null,
    split: job.split ?? null,
    search: job.search ?? null,
    calibration,
    policy: policyReport,
    leaks: job.leaks ?? null,
    sections: sectionSizes(bytes),
    latency,
    warnings,
  };
  return { bytes, report };
}
