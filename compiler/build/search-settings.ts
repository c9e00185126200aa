// The build's own setting search: what fixed defaults used to guess, chosen on the validation
// split. Each candidate trains a float draft with early stopping (the validation split is
// scored after every epoch; training stops when neither macro-F1 nor the validation loss has
// improved for a few epochs), so the number of epochs comes with every candidate. Candidates
// are tried one change at a time from the best so far (coordinate ascent): character n-grams,
// then the other weighting, then a larger and a smaller learning rate. A candidate replaces the
// best only when its validation macro-F1 is higher; one whose compiled model classifies more
// than twice as slowly as the best word-only candidate's must gain at least one point of
// macro-F1, and one slower than --max-us is never chosen (candidate-latency.ts).
// Explicit settings are never changed. The plan is fixed in advance, so a seed gives the same
// choice every time, unless the time budget runs out (the report then says so).

import { createFeaturizer } from "../../runtime/featurizer/featurizer.ts";
import type { HeadKind } from "../../runtime/format/model-header.ts";
import type { LabelledText } from "../evaluate/evaluate.ts";
import { checkWeights, TrainingDivergedError } from "../train/divergence.ts";
import { createDraft } from "../train/draft.ts";
import { buildVocabulary, encodeTexts, inverseDocumentFrequency, mapToRows, type EncodedExamples } from "../train/encode.ts";
import { huffmanTree, treePaths } from "../train/huffman.ts";
import { createRandom } from "../train/random.ts";
import { scoreDraft, type DraftScores } from "../train/score-draft.ts";
import { trainDraft } from "../train/train-draft.ts";
import { featurizerSettingsOf } from "./base-header.ts";
import { rankRows, rowImportance, selectRows, subsetDraft } from "../compile/prune.ts";
import { rowBytes } from "./fit-rows-to-budget.ts";
import { candidateMicroseconds, latencyProblem } from "./candidate-latency.ts";
import type { BuildSettings } from "./build-settings.ts";

/** Longest schedule a candidate trains on when epochs are not given; early stopping ends most runs far sooner. */
export const SEARCH_MAX_EPOCHS = 40;
/** Epochs without improvement before a candidate stops. */
export const PATIENCE = 3;
/** Character n-gram lengths the search tries (inside words, and over unspaced scripts). */
export const SEARCH_CHAR_SPAN: [number, number] = [1, 4];

export interface SearchCandidate {
  /** What this candidate changed, e.g. "char n-grams 2-4". */
  name: string;
  settings: Pick<BuildSettings, "charSpan" | "weighting" | "learningRate" | "dims"> & { head: HeadKind };
  accuracy: number;
  macroF1: number;
  loss: number;
  /** Epoch with the best validation macro-F1 (the epochs the build then trains). */
  epochs: number;
  /** Epochs actually run before early stopping. */
  epochsRun: number;
  /** µs per classify call of the 300-token validation text, compiled as shipped (candidate-latency.ts). */
  microseconds: number;
  seconds: number;
  verdict: string;
  /** Set when this candidate's training diverged. */
  diverged: TrainingDivergedError | null;
}

export interface SearchReport {
  budgetSeconds: number;
  seconds: number;
  stoppedByBudget: boolean;
  candidates: Omit<SearchCandidate, "diverged">[];
  /** The settings the build then used, and which of them the user fixed. */
  chosen: Pick<BuildSettings, "charSpan" | "weighting" | "learningRate" | "dims" | "epochs"> & { head: HeadKind };
  explicit: string[];
}

export interface SearchJob {
  train: readonly LabelledText[];
  validation: readonly LabelledText[];
  labels: string[];
  head: HeadKind;
  settings: BuildSettings;
  explicit: ReadonlySet<keyof BuildSettings>;
  onMessage?: (message: string) => void;
}

/**
 * Embedding width for a label count: 24 serves up to 16 labels (measured on the demo sets and
 * SpamAssassin), larger label sets get more room to tell their labels apart.
 * @example dimsForLabels(456) // 48
 */
export function dimsForLabels(labelCount: number): number {
  if (labelCount <= 16) return 24;
  if (labelCount <= 64) return 32;
  return 48;
}

/**
 * The search budget when --search-time is auto: 10 s, plus 8 s per million training tokens,
 * at most 2 minutes.
 * @example autoSearchSeconds(1_500_000) // 22
 */
export function autoSearchSeconds(trainTokens: number): number {
  return Math.min(120, 10 + (8 * trainTokens) / 1e6);
}

/**
 * Chooses the settings the user left open; returns them with the report of what was compared.
 * @example const { settings, report } = await searchSettings({ train, validation, labels, head, settings, explicit: new Set() });
 */
export async function searchSettings(job: SearchJob): Promise<{ settings: BuildSettings; report: SearchReport }> {
  const started = performance.now();
  const { explicit, labels } = job;
  const labelIndex = new Map(labels.map((label, i) => [label, i]));
  const labelIds = (rows: readonly LabelledText[]) => rows.map((e) => e.labels.filter((l) => labelIndex.has(l)).map((l) => labelIndex.get(l) as number));
  const trainLabels = labelIds(job.train);
  const validationLabels = labelIds(job.validation);
  const encodings = new Map<string, { train: EncodedExamples; validation: EncodedExamples }>();
  const encode = (settings: BuildSettings) => {
    const key = JSON.stringify(featurizerSettingsOf(settings));
    let found = encodings.get(key);
    if (!found) {
      const featurizer = createFeaturizer(featurizerSettingsOf(settings));
      found = { train: encodeTexts(featurizer, job.train.map((e) => e.text), trainLabels), validation: encodeTexts(featurizer, job.validation.map((e) => e.text), validationLabels) };
      encodings.set(key, found);
    }
    return found;
  };
  let base: BuildSettings = { ...job.settings };
  if (!explicit.has("dims")) base.dims = dimsForLabels(labels.length);
  const trainTokens = encode(base).train.tokenTotal;
  const budgetSeconds = job.settings.searchTime === "auto" ? autoSearchSeconds(trainTokens) : job.settings.searchTime;
  const elapsed = () => (performance.now() - started) / 1000;
  const candidates: SearchCandidate[] = [];
  let stoppedByBudget = false;

  const headOf = (settings: BuildSettings): HeadKind => (settings.head === "auto" ? job.head : settings.head);
  const run = (name: string, settings: BuildSettings): SearchCandidate => {
    const candidate = trainCandidate(name, settings, headOf(settings), encode(settings), job, explicit.has("epochs"));
    candidates.push(candidate);
    job.onMessage?.(`search: ${name}: validation accuracy ${candidate.accuracy.toFixed(4)}, macro-F1 ${candidate.macroF1.toFixed(4)} after ${candidate.epochs} epochs (${candidate.seconds.toFixed(1)} s)`);
    return candidate;
  };
  let best = run("defaults", base);
  // A starting point that diverges: the user's rate is theirs to change (stop and say so);
  // a rate of Sluice's own is halved until training settles.
  for (let attempt = 0; best.diverged !== null; attempt++) {
    if (explicit.has("learningRate") || attempt >= 4) throw best.diverged;
    base = { ...base, learningRate: base.learningRate / 2 };
    best = run(`learning rate ${base.learningRate}`, base);
  }
  best.verdict = "starting point";
  const wordOnly = best.settings.charSpan[0] === 0 ? best : null;
  let bestSettings = base;
  const consider = (name: string, change: Partial<BuildSettings>, costFactor: number) => {
    const settings = { ...bestSettings, ...change };
    // Skip what the remaining budget cannot pay for (estimated from the best run's time).
    if (elapsed() + best.seconds * costFactor > budgetSeconds) {
      stoppedByBudget = true;
      candidates.push({ ...best, name, settings: pickSettings(settings, headOf(settings)), accuracy: NaN, macroF1: NaN, loss: NaN, epochs: 0, epochsRun: 0, microseconds: NaN, seconds: 0, verdict: "skipped: the search time budget would be exceeded", diverged: null });
      return;
    }
    const candidate = run(name, settings);
    const slowness = candidate.macroF1 > best.macroF1 ? latencyProblem(candidate, wordOnly ?? best, job.settings.maxUs) : null;
    if (slowness !== null) {
      candidate.verdict = `rejected: ${slowness}`;
    } else if (!(candidate.macroF1 > best.macroF1)) {
      candidate.verdict = `rejected: macro-F1 ${candidate.macroF1.toFixed(4)} is not above ${best.macroF1.toFixed(4)}`;
    } else {
      candidate.verdict = `chosen: macro-F1 ${candidate.macroF1.toFixed(4)} > ${best.macroF1.toFixed(4)}`;
      best.verdict = best.verdict === "starting point" || best.verdict.startsWith("chosen") ? `replaced by ${name}` : best.verdict;
      best = candidate;
      bestSettings = settings;
    }
  };
  if (!explicit.has("charSpan") && base.charSpan[0] === 0) consider(`char n-grams ${SEARCH_CHAR_SPAN.join("-")}`, { charSpan: SEARCH_CHAR_SPAN }, 4);
  // The tree head is fast for many labels but less accurate than a full softmax on small label sets (measured on language identification, 106 labels).
  if (!explicit.has("head") && job.head === "tree") consider("softmax head", { head: "softmax" }, 3);
  if (!explicit.has("weighting")) consider(`weighting ${bestSettings.weighting === "tfidf" ? "mean" : "tfidf"}`, { weighting: bestSettings.weighting === "tfidf" ? "mean" : "tfidf" }, 1.2);
  if (!explicit.has("learningRate")) {
    const rate = bestSettings.learningRate;
    // Double while doubling helps (early stopping makes a faster rate cheap to try), else halve once.
    for (let step = 1; step <= 2 && bestSettings.learningRate === rate * 2 ** (step - 1); step++) consider(`learning rate ${rate * 2 ** step}`, { learningRate: rate * 2 ** step }, 1);
    if (bestSettings.learningRate === rate) consider(`learning rate ${rate / 2}`, { learningRate: rate / 2 }, 1.5);
  }
  if (best.verdict.startsWith("chosen") || best.verdict === "starting point") best.verdict = best.verdict === "starting point" ? "kept: no candidate did better" : best.verdict;
  const chosen: BuildSettings = { ...bestSettings, epochs: explicit.has("epochs") ? job.settings.epochs : Math.max(1, best.epochs) };
  return {
    settings: chosen,
    report: {
      budgetSeconds,
      seconds: elapsed(),
      stoppedByBudget,
      candidates: candidates.map(({ diverged: _diverged, ...candidate }) => candidate),
      chosen: { ...pickSettings(chosen, headOf(chosen)), epochs: chosen.epochs },
      explicit: [...explicit].filter((key) => ["charSpan", "weighting", "learningRate", "dims", "epochs"].includes(key)),
    },
  };
}

function pickSettings(settings: BuildSettings, head: HeadKind): SearchCandidate["settings"] {
  return { charSpan: [...settings.charSpan] as [number, number], weighting: settings.weighting, learningRate: settings.learningRate, dims: settings.dims, head };
}

/** Trains one candidate with early stopping and scores it; a diverged run scores −∞. */
function trainCandidate(name: string, settings: BuildSettings, head: HeadKind, encoded: { train: EncodedExamples; validation: EncodedExamples }, job: SearchJob, fixedEpochs: boolean): SearchCandidate {
  const started = performance.now();
  const vocabulary = buildVocabulary(encoded.train, settings.hashBits, settings.minDocs);
  const trainRows = mapToRows(encoded.train, vocabulary.slots, settings.hashBits);
  const validationRows = mapToRows(encoded.validation, vocabulary.slots, settings.hashBits);
  const labelCounts = new Float64Array(job.labels.length);
  for (let i = 0; i < trainRows.labelList.length; i++) labelCounts[trainRows.labelList[i]]++;
  const tree = head === "tree" ? huffmanTree(labelCounts) : null;
  const paths = tree ? treePaths(tree, job.labels.length) : null;
  const random = createRandom(settings.seed);
  const draft = createDraft({ head, labels: job.labels, dims: settings.dims, slots: vocabulary.slots, documentFrequency: vocabulary.documentFrequency, rowWeights: settings.weighting === "tfidf" ? inverseDocumentFrequency(vocabulary) : null, tree, random });
  let best: DraftScores & { epoch: number } = { accuracy: 0, macroF1: -1, loss: Infinity, epoch: 0 };
  let bestLoss = Infinity;
  let stale = 0;
  let epochsRun = 0;
  let verdict = "";
  let diverged: TrainingDivergedError | null = null;
  const keep = rowsWithinBudget(settings, head, job.labels.length, job.train.length);
  try {
    trainDraft(draft, trainRows, { epochs: fixedEpochs ? settings.epochs : SEARCH_MAX_EPOCHS, learningRate: settings.learningRate, seed: settings.seed }, {
      paths,
      random,
      onEpoch: (epoch) => {
        epochsRun = epoch;
        checkWeights([draft.rows, draft.outputs, draft.bias], epoch, settings.learningRate);
        const scores = scoreDraft(draft, validationRows, paths);
        const better = scores.macroF1 > best.macroF1 || (scores.macroF1 === best.macroF1 && scores.loss < best.loss);
        if (better) best = { ...scores, epoch };
        if (better || scores.loss < bestLoss) stale = 0;
        else stale++;
        bestLoss = Math.min(bestLoss, scores.loss);
        return !fixedEpochs && stale >= PATIENCE;
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
    microseconds: diverged === null ? candidateMicroseconds(draft, settings, head, keep, job.validation) : NaN,
    seconds: (performance.now() - started) / 1000,
    verdict,
    diverged,
  };
}

/**
 * One line saying what the search settled on.
 * @example describeChoice(report) // "epochs 12, learning rate 0.5, tfidf weighting, words only, dims 24"
 */
export function describeChoice(report: SearchReport): string {
  const c = report.chosen;
  return `${c.head} head, epochs ${c.epochs}, learning rate ${c.learningRate}, ${c.weighting} weighting, ${c.charSpan[0] === 0 ? "words only" : `char n-grams ${c.charSpan.join("-")}`}, dims ${c.dims}`;
}

/** About how many rows the size budget keeps for these settings (the header and output layer take their share). */
function rowsWithinBudget(settings: BuildSettings, head: HeadKind, labelCount: number, trainCount: number): number {
  if (settings.maxBytes <= 0) return Infinity;
  const outputs = head === "tree" ? labelCount - 1 : labelCount;
  const width = settings.foldOutput && head !== "tree" && outputs < settings.dims ? outputs : settings.dims;
  const fixedBytes = 4096 + 64 * labelCount + outputs * settings.dims * (settings.precision === "int8" ? 1 : 4) + (settings.fingerprint ? Math.ceil(trainCount * 1.25) : 0);
  return Math.max(0, Math.floor((settings.maxBytes - fixedBytes) / rowBytes(settings, width)));
}
