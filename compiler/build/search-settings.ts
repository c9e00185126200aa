// The build's own setting search: what fixed defaults used to guess, chosen on the validation
// split. A probe first decides whether it starts from words or character n-grams (both trained
// briefly on a subsample). Each candidate then trains a float draft with early stopping (the
// validation split is scored after every epoch; training stops when neither macro-F1 nor the
// validation loss has improved for a few epochs), so the number of epochs comes with every
// candidate. Candidates are tried one change at a time from the best so far (coordinate
// ascent): the other character setting, the softmax head, linear rows with the margin loss, the margin loss, the other weighting, then a larger
// and a smaller learning rate. A candidate replaces the best only when its validation macro-F1
// is higher; one whose serving work (counted as the compiled runtime does it) is more than
// twice the word-only candidate's must gain at least one point of macro-F1 (a rule of this
// project: speed is what users came for), and one whose compiled model is slower than --max-us
// is never chosen (candidate-latency.ts). Explicit settings are never changed. The plan is fixed in advance, so a seed gives the same choice every time,
// unless the time budget runs out (the report then says so).

import { createFeaturizer } from "../../runtime/featurizer/featurizer.ts";
import type { HeadKind } from "../../runtime/format/model-header.ts";
import type { LabelledText } from "../evaluate/evaluate.ts";
import { encodeTexts, keptSlots, surveyTexts, type EncodedExamples, type TextSurvey } from "../train/encode.ts";
import { featurizerSettingsOf } from "./base-header.ts";
import { latencyProblem, SLOW_CANDIDATE_GAIN } from "./candidate-latency.ts";
import { pickSettings, storedRowWidth, trainCandidate, type SearchCandidate } from "./search-candidate.ts";
import type { BuildSettings } from "./build-settings.ts";
import { withLinearDims } from "./linear-dims.ts";

/** Character n-gram lengths the search tries (inside words, and over unspaced scripts). */
export const SEARCH_CHAR_SPAN: [number, number] = [1, 4];
/** The character n-gram probe: a subsample holding about this many word features (at least PROBE_MIN_EXAMPLES examples), PROBE_EPOCHS epochs. */
export const PROBE_FEATURES = 150_000;
export const PROBE_MIN_EXAMPLES = 500;
export const PROBE_EPOCHS = 2;
/** The auto budget is at least the time of this many more starting-point runs (at most AUTO_BUDGET_MAX_SECONDS). */
export const AUTO_BUDGET_STARTING_POINTS = 8;
export const AUTO_BUDGET_MAX_SECONDS = 600;
/** Narrowest rows the search tries when the size budget prunes (see "budget-aware dims" below). */
export const SEARCH_MIN_DIMS = 12;

export interface SearchReport {
  budgetSeconds: number;
  seconds: number;
  stoppedByBudget: boolean;
  candidates: Omit<SearchCandidate, "diverged" | "stoppedByTime">[];
  /** The settings the build then used, and which of them the user fixed. */
  chosen: Pick<BuildSettings, "charSpan" | "weighting" | "learningRate" | "dims" | "loss" | "linear" | "epochs"> & { head: HeadKind };
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
  /** Bytes a candidate's new encoding may add to memory (see BuildInput.searchMemoryRoomBytes); absent: no limit. */
  memoryRoomBytes?: number;
}

const megabytes = (bytes: number) => `${Math.round(bytes / 2 ** 20)} MB`;

/** Memory of an encoded feature while the search holds it (its row id, and its share of the training arrays; the build path's projection uses the same cost). */
export const SEARCH_BYTES_PER_FEATURE = 12;

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
 * The search budget when --search-time is auto: 15 s, plus 10 s per million training tokens,
 * at most 2 minutes (enough for the character n-gram candidate of a language-identification
 * corpus of 330k tokens on a shared 2-core machine, where 10 s + 8 s/M was not).
 * @example autoSearchSeconds(1_500_000) // 30
 */
export function autoSearchSeconds(trainTokens: number): number {
  return Math.min(120, 15 + (10 * trainTokens) / 1e6);
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
  // Features of the whole training set under settings not yet encoded, counted without keeping
  // them: a character n-gram encoding of all the data is some 14 times the words-only one
  // (4.7 GB of a 100 MB CSV), and the probe trains on a subsample of it.
  const surveys = new Map<string, TextSurvey>();
  const survey = (settings: BuildSettings) => {
    const key = JSON.stringify(featurizerSettingsOf(settings));
    let found = surveys.get(key);
    if (!found) {
      found = surveyTexts(createFeaturizer(featurizerSettingsOf(settings)), job.train.map((e) => e.text), settings.hashBits);
      surveys.set(key, found);
    }
    return found;
  };
  const featureTotal = (settings: BuildSettings) => encodings.get(JSON.stringify(featurizerSettingsOf(settings)))?.train.features.length ?? survey(settings).featureTotal;
  /** Memory that encoding all the training data under `settings` would add: 0 once it is encoded. */
  const encodingBytes = (settings: BuildSettings) => (encodings.has(JSON.stringify(featurizerSettingsOf(settings))) ? 0 : survey(settings).featureTotal * SEARCH_BYTES_PER_FEATURE);
  const fitsMemory = (bytes: number) => job.memoryRoomBytes === undefined || bytes <= job.memoryRoomBytes;
  // A probe's data: the subsample encoded alone (example i is subset[i], so training visits the
  // same examples in the same order), with the vocabulary of all the training data, as a
  // probe on the full encoding would have.
  const probeData = (settings: BuildSettings, subset: Int32Array) => {
    const key = JSON.stringify(featurizerSettingsOf(settings));
    const full = encodings.get(key);
    if (full) return { encoded: full, subset };
    const featurizer = createFeaturizer(featurizerSettingsOf(settings));
    const all = survey(settings);
    const train = encodeTexts(featurizer, Array.from(subset, (i) => job.train[i].text), Array.from(subset, (i) => trainLabels[i]));
    const validation = encodeTexts(featurizer, job.validation.map((e) => e.text), validationLabels);
    const vocabulary = keptSlots(all.frequency, settings.minDocs, all.count);
    const labelCounts = new Float64Array(labels.length);
    for (const ids of trainLabels) for (const id of ids) labelCounts[id]++;
    return { encoded: { train, validation, vocabulary, labelCounts }, subset: Int32Array.from({ length: subset.length }, (_, i) => i) };
  };
  let base: BuildSettings = { ...job.settings };
  if (!explicit.has("dims")) base.dims = dimsForLabels(labels.length);
  base = withLinearDims(base, job.head, labels.length);
  const trainTokens = encode(base).train.tokenTotal;
  let budgetSeconds = job.settings.searchTime === "auto" ? autoSearchSeconds(trainTokens) : job.settings.searchTime;
  const elapsed = () => (performance.now() - started) / 1000;
  const candidates: SearchCandidate[] = [];
  let stoppedByBudget = false;

  const headOf = (settings: BuildSettings): HeadKind => (settings.head === "auto" ? job.head : settings.head);
  let deadline = started + budgetSeconds * 1000;
  const run = (name: string, settings: BuildSettings, probe?: { subset: Int32Array; epochs: number }): SearchCandidate => {
    const data = probe ? probeData(settings, probe.subset) : { encoded: encode(settings), subset: undefined };
    const candidate = trainCandidate(name, settings, headOf(settings), data.encoded, job, explicit.has("epochs"), deadline, probe && { subset: data.subset as Int32Array, epochs: probe.epochs });
    if (candidate.stoppedByTime) stoppedByBudget = true;
    candidates.push(candidate);
    job.onMessage?.(`search: ${name}: validation accuracy ${candidate.accuracy.toFixed(4)}, macro-F1 ${candidate.macroF1.toFixed(4)} after ${candidate.epochs} epochs (${candidate.seconds.toFixed(1)} s)`);
    return candidate;
  };
  // Character n-grams change the most (language identification: 0.72 → 0.91 validation
  // accuracy) and cost the most to try on all the data, so a probe decides where the search
  // starts: both options for PROBE_EPOCHS epochs on a subsample. Characters must win it by
  // SLOW_CANDIDATE_GAIN, since they classify more slowly. The other option is still tried on all
  // the data later when the budget allows.
  let probeWords: SearchCandidate | null = null;
  if (!explicit.has("charSpan") && base.charSpan[0] === 0) {
    const subset = probeSubset(encode(base).train, PROBE_FEATURES, PROBE_MIN_EXAMPLES);
    probeWords = run(`probe: words only (${subset.length} examples, ${PROBE_EPOCHS} epochs)`, base, { subset, epochs: PROBE_EPOCHS });
    const probeChars = run(`probe: char n-grams ${SEARCH_CHAR_SPAN.join("-")} (${subset.length} examples, ${PROBE_EPOCHS} epochs)`, { ...base, charSpan: SEARCH_CHAR_SPAN }, { subset, epochs: PROBE_EPOCHS });
    const charsWin = probeChars.macroF1 > probeWords.macroF1 + SLOW_CANDIDATE_GAIN;
    probeWords.verdict = charsWin ? "probe: lost" : "probe: won, the search starts from words only";
    probeChars.verdict = charsWin ? "probe: won, the search starts from character n-grams" : `probe: lost (needs ${SLOW_CANDIDATE_GAIN * 100} point of macro-F1 over words only)`;
    // Starting from characters encodes all the data with them: only when the memory budget holds it.
    const charBytes = encodingBytes({ ...base, charSpan: SEARCH_CHAR_SPAN });
    const charsFit = fitsMemory(charBytes);
    if (charsWin && !charsFit) {
      probeChars.verdict = `probe: won, but encoding all the data with it would add about ${megabytes(charBytes)}, more than the memory budget leaves`;
      probeWords.verdict = "probe: lost, but the search starts from words only (the memory budget)";
    }
    if (charsWin && charsFit) base = { ...base, charSpan: SEARCH_CHAR_SPAN };
  }
  // Under the auto budget the starting point always trains to its early stop (up to
  // AUTO_BUDGET_MAX_SECONDS): the rest of the budget is measured by it.
  if (job.settings.searchTime === "auto") deadline = started + Math.max(budgetSeconds, AUTO_BUDGET_MAX_SECONDS) * 1000;
  let best = run("defaults", base);
  // A starting point that diverges: the user's rate is theirs to change (stop and say so);
  // a rate of Sluice's own is halved until training settles.
  for (let attempt = 0; best.diverged !== null; attempt++) {
    if (explicit.has("learningRate") || attempt >= 4) throw best.diverged;
    base = { ...base, learningRate: base.learningRate / 2 };
    best = run(`learning rate ${base.learningRate}`, base);
  }
  best.verdict = "starting point";
  // The auto budget also scales with what this data costs to train: the plan is about
  // AUTO_BUDGET_STARTING_POINTS more candidates like the starting point, and a corpus whose
  // starting point alone takes longer than the token rule's budget (language identification with
  // character n-grams and 106 labels: 54 s against 18 s on the shared machine) would otherwise
  // never try the candidates that help it most (there the softmax head took validation accuracy
  // from 0.794 to 0.881 and narrower rows to 0.903: `sluice build` of its train.jsonl with
  // `--group-field group --search-time 900`, the build's own validation split).
  if (job.settings.searchTime === "auto") {
    const tokenRule = budgetSeconds;
    budgetSeconds = Math.max(budgetSeconds, Math.min(AUTO_BUDGET_MAX_SECONDS, elapsed() + AUTO_BUDGET_STARTING_POINTS * best.seconds));
    deadline = started + budgetSeconds * 1000;
    if (budgetSeconds > tokenRule) job.onMessage?.(`search: budget ${budgetSeconds.toFixed(0)} s (the starting point took ${best.seconds.toFixed(1)} s; ${AUTO_BUDGET_STARTING_POINTS} more of it)`);
  }
  // Classify time of words only, the reference of the speed rule (the probe's when the search starts from characters).
  const wordOnly = best.settings.charSpan[0] === 0 ? best : probeWords;
  let bestSettings = base;
  /** Records a candidate that was not trained, and why. */
  const skip = (name: string, settings: BuildSettings, verdict: string) => {
    candidates.push({ ...best, name, settings: pickSettings(settings, headOf(settings)), accuracy: NaN, macroF1: NaN, loss: NaN, epochs: 0, epochsRun: 0, microseconds: NaN, workPerText: NaN, seconds: 0, verdict, diverged: null, stoppedByTime: false, rows: 0, rowsKept: 0 });
  };
  const consider = (name: string, change: Partial<BuildSettings>, costFactor: number) => {
    const settings = { ...bestSettings, ...change };
    // Skip what the remaining budget cannot pay for even two epochs of (estimated from the best
    // run's time per epoch); a candidate that starts trains until its early stop or the
    // deadline, and one cut short by the deadline is judged on the epochs it had, which can only
    // understate it.
    const epochSeconds = best.seconds / Math.max(1, best.epochsRun);
    if (elapsed() + 2 * epochSeconds * costFactor > budgetSeconds) {
      stoppedByBudget = true;
      skip(name, settings, "skipped: the search time budget would be exceeded");
      return;
    }
    // A candidate that featurizes differently encodes all the data anew (character n-grams:
    // some 14 times the words); the build's memory budget must hold it.
    const added = encodingBytes(settings);
    if (!fitsMemory(added)) {
      skip(name, settings, `skipped: its encoding would add about ${megabytes(added)}, more than the ${megabytes(Math.max(0, job.memoryRoomBytes as number))} the memory budget leaves`);
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
  if (!explicit.has("charSpan")) {
    // The option the probe did not start from, on all the data. Training time follows the
    // feature count: count it (from the encoding, or a survey when it is not encoded yet).
    const other: [number, number] = base.charSpan[0] === 0 ? SEARCH_CHAR_SPAN : [0, 0];
    const costFactor = featureTotal({ ...bestSettings, charSpan: other }) / Math.max(1, featureTotal(bestSettings));
    consider(other[0] === 0 ? "words only" : `char n-grams ${other.join("-")}`, { charSpan: other }, costFactor);
  }
  // The tree head is fast for many labels but less accurate than a full softmax on small label sets (measured on language identification, 106 labels).
  if (!explicit.has("head") && job.head === "tree") consider("softmax head", { head: "softmax" }, 3);
  // For the softmax head: rows of per-label logits (draft.ts, linear: a full-rank linear model
  // instead of narrow rows and an output layer) trained with the margin loss (SoftmaxLoss), then,
  // when they did not win, the margin loss alone. The pair helps most together (on the passages'
  // build split: 0.286 macro-F1 for either alone, 0.304 for both; learner-lab.ts); linear rows
  // with the log-likelihood converge slowly (21 epochs, 29 s of a 62 s budget on package
  // sections) and did not win alone there, on the passages nor on SpamAssassin, so they are tried
  // only when the user fixed the loss. With more labels than dims each linear row stores more
  // values and the size budget keeps fewer of them, which the candidate's pruned score accounts
  // for. An explicit --dims keeps hidden rows.
  const softmax = headOf(bestSettings) === "softmax";
  const linearOpen = softmax && !explicit.has("linear") && !explicit.has("dims") && !bestSettings.linear;
  const lossOpen = softmax && !explicit.has("loss");
  const linearCost = Math.max(1, labels.length / bestSettings.dims);
  if (linearOpen && lossOpen) consider(`linear rows (dims ${labels.length}) with the margin loss`, { linear: true, dims: labels.length, loss: "margin" }, linearCost);
  else if (linearOpen) consider(`linear rows (dims ${labels.length})`, { linear: true, dims: labels.length }, linearCost);
  if (lossOpen && bestSettings.loss !== "margin") consider("margin loss", { loss: "margin" }, 1);
  if (!explicit.has("weighting")) consider(`weighting ${bestSettings.weighting === "tfidf" ? "mean" : "tfidf"}`, { weighting: bestSettings.weighting === "tfidf" ? "mean" : "tfidf" }, 1.2);
  // Budget-aware dims: when the size budget keeps only part of the trained rows, narrower rows
  // buy more of them (a row of d int8 values costs about d + 6 bytes). Halve while that wins,
  // judged like every candidate on validation after pruning to the budget. Rows that store
  // logits (fewer labels than dims) are as wide as the label count whatever dims is.
  if (!explicit.has("dims") && !bestSettings.linear && storedRowWidth(bestSettings, headOf(bestSettings), labels.length) === bestSettings.dims) {
    for (let halving = 0; halving < 2 && best.rowsKept < best.rows && Math.round(bestSettings.dims / 2) >= SEARCH_MIN_DIMS; halving++) {
      const dims = Math.round(bestSettings.dims / 2);
      consider(`dims ${dims} (the size budget keeps ${best.rowsKept} of ${best.rows} rows)`, { dims }, 0.7);
      if (bestSettings.dims !== dims) break;
    }
  }
  if (!explicit.has("learningRate")) {
    const rate = bestSettings.learningRate;
    // Double while doubling helps (early stopping makes a faster rate cheap to try), else halve once.
    for (let step = 1; step <= 2 && bestSettings.learningRate === rate * 2 ** (step - 1); step++) consider(`learning rate ${rate * 2 ** step}`, { learningRate: rate * 2 ** step }, 1);
    if (bestSettings.learningRate === rate) consider(`learning rate ${rate / 2}`, { learningRate: rate / 2 }, 1.5);
  }
  if (best.verdict.startsWith("chosen") || best.verdict === "starting point") best.verdict = best.verdict === "starting point" ? "kept: no candidate did better" : best.verdict;
  for (const candidate of candidates) if (candidate.stoppedByTime) candidate.verdict += ` (cut short by the time budget after ${candidate.epochsRun} epochs)`;
  const chosen: BuildSettings = { ...bestSettings, epochs: explicit.has("epochs") ? job.settings.epochs : Math.max(1, best.epochs) };
  return {
    settings: chosen,
    report: {
      budgetSeconds,
      seconds: elapsed(),
      stoppedByBudget,
      candidates: candidates.map(({ diverged: _diverged, stoppedByTime: _stopped, ...candidate }) => candidate),
      chosen: { ...pickSettings(chosen, headOf(chosen)), epochs: chosen.epochs },
      explicit: [...explicit].filter((key) => ["charSpan", "weighting", "learningRate", "dims", "loss", "linear", "epochs"].includes(key)),
    },
  };
}

/**
 * Every k-th training example, k chosen so the subsample holds about `features` features but at
 * least `minExamples` examples (all of them for small data): spread over the whole file.
 * @example probeSubset(encoded, 150_000, 500).length
 */
export function probeSubset(encoded: EncodedExamples, features: number, minExamples: number): Int32Array {
  const total = encoded.features.length;
  const byFeatures = total > 0 ? Math.ceil((encoded.count * features) / total) : encoded.count;
  const size = Math.min(encoded.count, Math.max(minExamples, byFeatures));
  const stride = encoded.count / size;
  return Int32Array.from({ length: size }, (_, i) => Math.floor(i * stride));
}

/**
 * One line saying what the search settled on.
 * @example describeChoice(report) // "softmax head (logistic loss), epochs 12, learning rate 0.5, tfidf weighting, words only, dims 24"
 */
export function describeChoice(report: SearchReport): string {
  const c = report.chosen;
  return `${c.head} head${c.head === "softmax" ? ` (${c.loss} loss)` : ""}, epochs ${c.epochs}, learning rate ${c.learningRate}, ${c.weighting} weighting, ${c.charSpan[0] === 0 ? "words only" : `char n-grams ${c.charSpan.join("-")}`}, ${c.linear ? "linear rows, " : ""}dims ${c.dims}`;
}
