// One candidate of the build's setting search (search-settings.ts): a float draft trained with
// early stopping on the validation split, scored after pruning to the size budget, and timed
// compiled as it would ship. The search decides which candidates to train; this file trains one.

import type { HeadKind } from "../../runtime/format/model-header.ts";
import type { LabelledText } from "../evaluate/evaluate.ts";
import { checkWeights, TrainingDivergedError } from "../train/divergence.ts";
import { createDraft } from "../train/draft.ts";
import { buildVocabulary, inverseDocumentFrequency, mapToRows, type EncodedExamples, type Vocabulary } from "../train/encode.ts";
import { huffmanTree, treePaths } from "../train/huffman.ts";
import { createRandom } from "../train/random.ts";
import { scoreDraft, type DraftScores } from "../train/score-draft.ts";
import { trainDraft } from "../train/train-draft.ts";
import { rankRows, rowImportance, selectRows, subsetDraft } from "../compile/prune.ts";
import { rowBytes } from "./fit-rows-to-budget.ts";
import { candidateMicroseconds, servingWork } from "./candidate-latency.ts";
import type { BuildSettings } from "./build-settings.ts";

/** Longest schedule a candidate trains on when epochs are not given; early stopping ends most runs far sooner. */
export const SEARCH_MAX_EPOCHS = 30;
/**
 * Epochs without improvement before a candidate stops. With adaptive rates most candidates
 * peak within a few epochs (suite corpora, scripts/bench/learner-lab.ts), so two are enough.
 */
export const PATIENCE = 2;
export interface SearchCandidate {
  /** What this candidate changed, e.g. "char n-grams 2-4". */
  name: string;
  settings: Pick<BuildSettings, "charSpan" | "weighting" | "learningRate" | "dims" | "loss" | "linear"> & { head: HeadKind };
  accuracy: number;
  macroF1: number;
  loss: number;
  /** Epoch with the best validation macro-F1 (the epochs the build then trains). */
  epochs: number;
  /** Epochs actually run before early stopping. */
  epochsRun: number;
  /** CPU µs per classify call of the 300-token validation text, compiled as shipped (candidate-latency.ts; NaN for a probe). */
  microseconds: number;
  /**
   * Serving work per validation text, counted rather than timed so the speed rule gives the same
   * choice on a busy machine (servingWork in candidate-latency.ts).
   */
  workPerText: number;
  seconds: number;
  verdict: string;
  /** Set when this candidate's training diverged. */
  diverged: TrainingDivergedError | null;
  /** The search's deadline ended this candidate's training before its early stop. */
  stoppedByTime: boolean;
  /** Feature rows the draft trained, and how many of them the size budget keeps. */
  rows: number;
  rowsKept: number;
}

/** What a candidate reads of the search's job. */
export interface CandidateData {
  labels: string[];
  train: readonly LabelledText[];
  validation: readonly LabelledText[];
}

export function pickSettings(settings: BuildSettings, head: HeadKind): SearchCandidate["settings"] {
  return { charSpan: [...settings.charSpan] as [number, number], weighting: settings.weighting, learningRate: settings.learningRate, dims: settings.dims, loss: settings.loss, linear: settings.linear, head };
}

/** Trains one candidate with early stopping and scores it; a diverged run scores −∞. */
export function trainCandidate(name: string, settings: BuildSettings, head: HeadKind, encoded: { train: EncodedExamples; validation: EncodedExamples; vocabulary?: Vocabulary; labelCounts?: Float64Array }, job: CandidateData, fixedEpochs: boolean, deadline: number, probe?: { subset: Int32Array; epochs: number }): SearchCandidate {
  const started = performance.now();
  const vocabulary = encoded.vocabulary ?? buildVocabulary(encoded.train, settings.hashBits, settings.minDocs);
  const trainRows = mapToRows(encoded.train, vocabulary.slots, settings.hashBits);
  const validationRows = mapToRows(encoded.validation, vocabulary.slots, settings.hashBits);
  // A probe's subsample brings the vocabulary and label counts of all the training data.
  let labelCounts = encoded.labelCounts;
  if (labelCounts === undefined) {
    labelCounts = new Float64Array(job.labels.length);
    for (let i = 0; i < trainRows.labelList.length; i++) labelCounts[trainRows.labelList[i]]++;
  }
  const tree = head === "tree" ? huffmanTree(labelCounts) : null;
  const paths = tree ? treePaths(tree, job.labels.length) : null;
  const random = createRandom(settings.seed);
  const draft = createDraft({ head, labels: job.labels, dims: settings.dims, slots: vocabulary.slots, documentFrequency: vocabulary.documentFrequency, rowWeights: settings.weighting === "tfidf" ? inverseDocumentFrequency(vocabulary) : null, tree, random, adaptive: settings.adaptiveRates, loss: settings.loss, linear: settings.linear });
  let best: DraftScores & { epoch: number } = { accuracy: 0, macroF1: -1, loss: Infinity, epoch: 0 };
  let bestLoss = Infinity;
  let stale = 0;
  let epochsRun = 0;
  let verdict = "";
  let diverged: TrainingDivergedError | null = null;
  let stoppedByTime = false;
  const keep = rowsWithinBudget(settings, head, job.labels.length, job.train.length);
  try {
    const epochs = probe ? probe.epochs : fixedEpochs ? settings.epochs : SEARCH_MAX_EPOCHS;
    trainDraft(draft, trainRows, { epochs, learningRate: settings.learningRate, seed: settings.seed }, {
      paths,
      random,
      subset: probe?.subset,
      onEpoch: (epoch) => {
        epochsRun = epoch;
        checkWeights([draft.rows, draft.outputs, draft.bias], epoch, settings.learningRate);
        const scores = scoreDraft(draft, validationRows, paths);
        const better = scores.macroF1 > best.macroF1 || (scores.macroF1 === best.macroF1 && scores.loss < best.loss);
        if (better) best = { ...scores, epoch };
        if (better || scores.loss < bestLoss) stale = 0;
        else stale++;
        bestLoss = Math.min(bestLoss, scores.loss);
        if (fixedEpochs || probe) return false;
        if (stale >= PATIENCE) return true;
        stoppedByTime = performance.now() > deadline;
        return stoppedByTime;
      },
    });
    // What ships is pruned to the size budget: a candidate with many more rows (character
    // n-grams) loses more there. Score the trained draft pruned to the rows the budget keeps and
    // take the loss off its best epoch's scores (measured: unpruned drafts favoured character
    // n-grams on SpamAssassin that scored 3 points worse once compiled into 1 MiB).
    if (keep < draft.slots.length) {
      const full = scoreDraft(draft, validationRows, paths);
      const pruned = subsetDraft(draft, selectRows(rankRows(rowImportance(draft)), keep));
      const prunedScores = scoreDraft(pruned, mapToRows(encoded.validation, pruned.slots, settings.hashBits), paths);
      best = { ...best, accuracy: best.accuracy - Math.max(0, full.accuracy - prunedScores.accuracy), macroF1: best.macroF1 - Math.max(0, full.macroF1 - prunedScores.macroF1) };
    }
  } catch (error) {
    if (!(error instanceof TrainingDivergedError)) throw error;
    verdict = `rejected: ${error.message}`;
    diverged = error;
    best = { accuracy: NaN, macroF1: -Infinity, loss: Infinity, epoch: 0 };
  }
  return {
    name,
    settings: pickSettings(settings, head),
    accuracy: best.accuracy,
    macroF1: best.macroF1,
    loss: best.loss,
    epochs: fixedEpochs ? settings.epochs : best.epoch,
    epochsRun,
    // A probe's draft (a few epochs on a subsample) is not what would ship: it is not timed.
    microseconds: diverged === null && !probe ? candidateMicroseconds(draft, settings, head, keep, job.validation) : NaN,
    workPerText: servingWork(settings, head, job.labels.length, job.validation),
    seconds: (performance.now() - started) / 1000,
    verdict,
    diverged,
    stoppedByTime,
    rows: draft.slots.length,
    rowsKept: Math.min(keep, draft.slots.length),
  };
}

/** Values a compiled row stores: the logits when the output layer is folded into the rows (fewer outputs than dims), else dims. */
export function storedRowWidth(settings: BuildSettings, head: HeadKind, labelCount: number): number {
  const outputs = head === "tree" ? labelCount - 1 : labelCount;
  return settings.foldOutput && head !== "tree" && outputs < settings.dims ? outputs : settings.dims;
}

/** About how many rows the size budget keeps for these settings (the header and output layer take their share). */
export function rowsWithinBudget(settings: BuildSettings, head: HeadKind, labelCount: number, trainCount: number): number {
  if (settings.maxBytes <= 0) return Infinity;
  const outputs = head === "tree" ? labelCount - 1 : labelCount;
  const width = storedRowWidth(settings, head, labelCount);
  const fixedBytes = 4096 + 64 * labelCount + outputs * settings.dims * (settings.precision === "int8" ? 1 : 4) + (settings.fingerprint ? Math.ceil(trainCount * 1.25) : 0);
  return Math.max(0, Math.floor((settings.maxBytes - fixedBytes) / rowBytes(settings, width)));
}
