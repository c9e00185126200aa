// The side-by-side part of `npm run bench`: Sluice against the general-purpose JS NLP
// library `natural` (its naive Bayes and logistic regression classifiers) and against
// scikit-learn's TF-IDF + logistic regression, the strong linear reference, on the same
// train/test splits of two datasets. Every system's accuracy and macro-F1 come from its own
// predictions on the test split, scored by the same code (compiler/metrics); every JS
// system's classify time is measured by the same single-call loop (timeSingleCalls).
//
//   node --import tsx scripts/bench/comparison.ts [--quick] [--write]
//
// prints the table and the ratios; --write also saves test/bench/results/comparison.{json,md}.
// Nothing heavy should run at the same time: the numbers are wall-clock timings.

import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { build } from "../../compiler/build/build.ts";
import { defaultBuildSettings, type BuildSettings } from "../../compiler/build/build-settings.ts";
import type { LabelledText } from "../../compiler/evaluate/evaluate.ts";
import { computeClassificationMetrics } from "../../compiler/metrics/index.ts";
import { readExamples } from "../../compiler/read/index.ts";
import { loadModel } from "../../runtime/index.ts";
import { murmur3String } from "../../runtime/featurizer/murmur3.ts";
import { loadSpamAssassin, splitSpamAssassin } from "../../test/fixtures/spam-assassin.ts";
import { runNaturalJob, type NaturalJob, type NaturalOutcome } from "./natural-runner.ts";
import { markdownTable, writeResults } from "./results-writer.ts";
import { settleHeap } from "./timing.ts";

const HERE = dirname(fileURLToPath(import.meta.url));
const REPOSITORY = join(HERE, "..", "..");
const SKLEARN_SCRIPT = join(HERE, "sklearn_reference.py");
/** Debian's interpreter, where python3-sklearn installs; not whatever python3 is first on PATH. */
const SYSTEM_PYTHON = "/usr/bin/python3";
/** Fixed so that builds are reproducible (it is only recorded in provenance). */
const BUILD_TIME = "2000-01-01T00:00:00.000Z";

// ---------------------------------------------------------------- measuring single calls

/** How single-text calls are timed. */
export interface TimingOptions {
  /** Untimed calls first, so the JIT has compiled the hot path: this many, or until warmupMs. */
  warmupCalls: number;
  warmupMs: number;
  /** Timed calls: every text once, then round again until this many (or budgetMs is spent). */
  minCalls: number;
  budgetMs: number;
}

/** Per-call latency, microseconds; percentiles by nearest rank over the sorted timings. */
export interface CallTimings {
  calls: number;
  p50: number;
  p99: number;
  mean: number;
  /** True when budgetMs ran out before minCalls. */
  stoppedEarly: boolean;
}

/**
 * Times `call` once per text with performance.now (after a warm-up), going round the texts
 * until `minCalls`; returns the timings and the results of the first pass (one per text).
 * @example const { timings, firstPass } = timeSingleCalls((t) => model.classify(t)[0].label, texts, TIMING);
 */
export function timeSingleCalls<T>(call: (text: string) => T, texts: readonly string[], options: TimingOptions): { timings: CallTimings; firstPass: T[] } {
  if (texts.length === 0) throw new Error("timeSingleCalls: no texts to time");
  const warmupStarted = performance.now();
  for (let i = 0; i < options.warmupCalls && performance.now() - warmupStarted < options.warmupMs; i++) call(texts[i % texts.length]);
  const firstPass: T[] = [];
  const micros: number[] = [];
  const started = performance.now();
  let stoppedEarly = false;
  for (let i = 0; ; i++) {
    if (i >= texts.length) {
      if (i >= options.minCalls) break;
      if (performance.now() - started > options.budgetMs) {
        stoppedEarly = true;
        break;
      }
    }
    const text = texts[i % texts.length];
    const before = performance.now();
    const result = call(text);
    micros.push((performance.now() - before) * 1000);
    if (i < texts.length) firstPass.push(result);
  }
  micros.sort((a, b) => a - b);
  const mean = micros.reduce((sum, x) => sum + x, 0) / micros.length;
  return { timings: { calls: micros.length, p50: nearestRank(micros, 0.5), p99: nearestRank(micros, 0.99), mean, stoppedEarly }, firstPass };
}

/** Nearest-rank percentile of ascending values (the same rule as sklearn_reference.py). */
function nearestRank(sorted: readonly number[], fraction: number): number {
  return sorted[Math.min(sorted.length, Math.max(1, Math.ceil(fraction * sorted.length))) - 1];
}

/**
 * Median wall time of `repeats` calls in milliseconds, stopping early once `budgetMs` is spent.
 * @example medianMilliseconds(() => loadModel(bytes), 50, 10_000).median
 */
export function medianMilliseconds(run: () => unknown, repeats: number, budgetMs: number): { median: number; repeats: number } {
  const times: number[] = [];
  const started = performance.now();
  while (times.length < repeats && (times.length === 0 || performance.now() - started < budgetMs)) {
    const before = performance.now();
    run();
    times.push(performance.now() - before);
  }
  times.sort((a, b) => a - b);
  const middle = times.length >> 1;
  return { median: times.length % 2 === 1 ? times[middle] : (times[middle - 1] + times[middle]) / 2, repeats: times.length };
}

// ---------------------------------------------------------------- rows

/** Which system a row measures (the ratios pick rows by this). */
export type SystemRole = "sluice-draft" | "sluice-compiled" | "sluice-budget" | "sluice-twentieth" | "natural-bayes" | "natural-bayes-subset" | "natural-logistic" | "sklearn";

/** One line of the comparison table; null where a value was not measured. */
export interface ComparisonRow {
  dataset: string;
  system: string;
  role: SystemRole;
  threads: number | null;
  status: "ok" | "too-slow" | "failed" | "skipped";
  /** Why a row has no numbers (too slow, failed, skipped). */
  statusText: string | null;
  trainExamples: number;
  testExamples: number;
  trainSeconds: number | null;
  accuracy: number | null;
  macroF1: number | null;
  /** Single-text classify calls, microseconds. */
  classify: CallTimings | null;
  /** sklearn only: predict on the whole test set at once, microseconds per text. */
  batchUsPerDoc: number | null;
  modelBytes: number | null;
  loadMs: number | null;
  details: Record<string, unknown>;
}

interface Dataset {
  name: string;
  train: LabelledText[];
  test: LabelledText[];
  /** The --max-bytes budget of the budget row. */
  budgetBytes: number;
  budgetText: string;
}

/** Everything a run needs to know, fixed by --quick or not. */
interface Plan {
  quick: boolean;
  timing: TimingOptions;
  loadRepeats: number;
  bayesCapSeconds: number;
  logisticCapSeconds: number;
  measureCapSeconds: number;
  /** Examples in the natural Bayes subset run, made only when the full run hits its cap. */
  bayesSubset: number;
  sklearnSample: number;
  threads: number[];
}

function planFor(quick: boolean): Plan {
  return quick
    ? { quick, timing: { warmupCalls: 50, warmupMs: 1000, minCalls: 500, budgetMs: 20_000 }, loadRepeats: 10, bayesCapSeconds: 15, logisticCapSeconds: 15, measureCapSeconds: 60, bayesSubset: 300, sklearnSample: 100, threads: [1] }
    : { quick, timing: { warmupCalls: 200, warmupMs: 2000, minCalls: 2000, budgetMs: 60_000 }, loadRepeats: 50, bayesCapSeconds: 600, logisticCapSeconds: 120, measureCapSeconds: 180, bayesSubset: 1000, sklearnSample: 500, threads: [1, 2] };
}

async function loadDatasets(): Promise<Dataset[]> {
  const spam = splitSpamAssassin(loadSpamAssassin());
  const topics: { train: LabelledText[]; test: LabelledText[] } = { train: [], test: [] };
  const file = join(REPOSITORY, "demo-data", "support-topics.csv");
  for await (const example of readExamples(file, { textFields: ["subject", "body"], labelField: "topic" })) {
    // Deterministic 80/20 split on the record's line number, independent of anything else.
    (murmur3String(String(example.line), 0) % 5 === 0 ? topics.test : topics.train).push({ text: example.text, labels: example.labels });
  }
  return [
    { name: "SpamAssassin", train: spam.train, test: spam.test, budgetBytes: 256 * 1024, budgetText: "256k" },
    { name: "support topics", train: topics.train, test: topics.test, budgetBytes: 128 * 1024, budgetText: "128k" },
  ];
}

function emptyRow(dataset: Dataset, system: string, role: SystemRole, threads: number | null): ComparisonRow {
  return {
    dataset: dataset.name,
    system,
    role,
    threads,
    status: "ok",
    statusText: null,
    trainExamples: dataset.train.length,
    testExamples: dataset.test.length,
    trainSeconds: null,
    accuracy: null,
    macroF1: null,
    classify: null,
    batchUsPerDoc: null,
    modelBytes: null,
    loadMs: null,
    details: {},
  };
}

/** Accuracy and macro-F1 of predicted label names against the test split, by compiler/metrics. */
function scorePredictions(dataset: Dataset, predicted: readonly string[]): { accuracy: number; macroF1: number } {
  const labels = [...new Set([...dataset.train, ...dataset.test].map((e) => e.labels[0]))].sort();
  const index = new Map(labels.map((label, i) => [label, i]));
  const gold = dataset.test.map((e) => index.get(e.labels[0]) as number);
  // A prediction outside the known labels (none expected) counts as wrong: map it to a label ≠ gold.
  const guesses = predicted.map((label, i) => index.get(label) ?? (gold[i] + 1) % labels.length);
  const metrics = computeClassificationMetrics(gold, guesses, labels.length, labels);
  return { accuracy: metrics.accuracy, macroF1: metrics.macroF1 };
}

// ---------------------------------------------------------------- Sluice

async function sluiceRow(dataset: Dataset, plan: Plan, system: string, role: SystemRole, settings: BuildSettings): Promise<ComparisonRow> {
  const row = emptyRow(dataset, system, role, settings.threads);
  const started = performance.now();
  const { bytes, report } = await build({ examples: dataset.train, settings, buildTime: BUILD_TIME });
  row.trainSeconds = (performance.now() - started) / 1000;
  const model = loadModel(bytes);
  settleHeap();
  const { timings, firstPass } = timeSingleCalls((text) => model.classify(text)[0]?.label ?? "", dataset.test.map((e) => e.text), plan.timing);
  Object.assign(row, scorePredictions(dataset, firstPass));
  row.classify = timings;
  row.modelBytes = bytes.length;
  loadModel(bytes); // warm-up
  const load = medianMilliseconds(() => loadModel(bytes), plan.loadRepeats, 30_000);
  row.loadMs = load.median;
  row.details = {
    settings: { dims: settings.dims, wordSpan: settings.wordSpan, charSpan: settings.charSpan, hashBits: settings.hashBits, weighting: settings.weighting, epochs: settings.epochs, precision: settings.precision, foldOutput: settings.foldOutput, fineTuneEpochs: settings.fineTuneEpochs, maxBytes: settings.maxBytes, holdout: settings.holdout },
    draftTrainSeconds: report.trainSeconds,
    stageSeconds: report.stageSeconds,
    tokensPerSecond: report.tokensPerSecond,
    trainedOn: report.trainExamples,
    rows: report.rows,
    reportDraft: report.draft,
    reportCompiledOnValidation: report.compiled,
    loadRepeats: load.repeats,
  };
  return row;
}

async function sluiceRows(dataset: Dataset, plan: Plan, log: (line: string) => void): Promise<ComparisonRow[]> {
  const rows: ComparisonRow[] = [];
  for (const threads of plan.threads) {
    const base = { ...defaultBuildSettings(), threads };
    const label = threads === 1 ? "1 thread" : `${threads} threads`;
    log(`  Sluice compiled, ${label}`);
    rows.push(await sluiceRow(dataset, plan, `Sluice compiled int8 (${label})`, "sluice-compiled", base));
    // The draft as a file: float32, every row, its own output layer (not folded), no fine-tune, no byte budget.
    log(`  Sluice draft, ${label}`);
    rows.push(await sluiceRow(dataset, plan, `Sluice draft float32 (${label})`, "sluice-draft", { ...base, precision: "float32", keepFeatures: 0, fineTuneEpochs: 0, maxBytes: 0, foldOutput: false }));
  }
  log(`  Sluice compiled, --max-bytes ${dataset.budgetText}`);
  rows.push(await sluiceRow(dataset, plan, `Sluice compiled int8, max-bytes ${dataset.budgetText} (1 thread)`, "sluice-budget", { ...defaultBuildSettings(), threads: 1, maxBytes: dataset.budgetBytes }));
  return rows;
}

// ---------------------------------------------------------------- natural

function writeJsonl(file: string, examples: readonly LabelledText[]): void {
  writeFileSync(file, examples.map((e) => JSON.stringify({ text: e.text, label: e.labels[0] })).join("\n") + "\n");
}

/** Every k-th example, so a subset keeps the label mix of a corpus stored group by group. */
function evenSubset<T>(items: readonly T[], count: number): T[] {
  if (items.length <= count) return [...items];
  const step = items.length / count;
  return Array.from({ length: count }, (_, i) => items[Math.floor(i * step)]);
}

function naturalRow(dataset: Dataset, system: string, role: SystemRole, outcome: NaturalOutcome, trainExamples: number, capSeconds: number): ComparisonRow {
  const row = emptyRow(dataset, system, role, 1);
  row.trainExamples = trainExamples;
  row.details = { capSeconds };
  if (outcome.status === "too-slow") {
    row.status = "too-slow";
    row.statusText = outcome.phase === "train" ? `too slow: training not done in ${outcome.capSeconds} s (killed)` : `too slow: trained in ${outcome.trainSeconds?.toFixed(1)} s, then measuring not done in ${outcome.capSeconds} s (killed)`;
    row.trainSeconds = outcome.phase === "measure" ? outcome.trainSeconds : null;
    return row;
  }
  if (outcome.status === "failed") {
    row.status = "failed";
    row.statusText = `failed after ${outcome.elapsedSeconds.toFixed(0)} s: ${outcome.reason}`;
    row.trainSeconds = outcome.trainSeconds;
    return row;
  }
  Object.assign(row, scorePredictions(dataset, outcome.predictions));
  row.trainSeconds = outcome.trainSeconds;
  row.classify = outcome.timings;
  row.modelBytes = outcome.modelBytes;
  row.loadMs = outcome.loadMs;
  row.details = { capSeconds, loadRepeats: outcome.loadRepeats };
  return row;
}

async function naturalRows(dataset: Dataset, plan: Plan, directory: string, log: (line: string) => void): Promise<ComparisonRow[]> {
  const trainFile = join(directory, "train.jsonl");
  const testFile = join(directory, "test.jsonl");
  const job = (kind: NaturalJob["kind"], file: string, cap: number): NaturalJob => ({
    kind,
    trainFile: file,
    testFile,
    trainCapSeconds: cap,
    measureCapSeconds: plan.measureCapSeconds,
    timing: plan.timing,
    loadRepeats: plan.loadRepeats,
    loadBudgetMs: 20_000,
  });
  const rows: ComparisonRow[] = [];
  log(`  natural BayesClassifier (cap ${plan.bayesCapSeconds} s)`);
  const bayes = await runNaturalJob(job("bayes", trainFile, plan.bayesCapSeconds));
  rows.push(naturalRow(dataset, "natural BayesClassifier", "natural-bayes", bayes, dataset.train.length, plan.bayesCapSeconds));
  if (bayes.status === "too-slow" && bayes.phase === "train") {
    // Still worth a number: the same classifier on an evenly spread subset of the training split.
    const subset = evenSubset(dataset.train, plan.bayesSubset);
    const subsetFile = join(directory, "train-subset.jsonl");
    writeJsonl(subsetFile, subset);
    log(`  natural BayesClassifier on ${subset.length} examples (cap ${plan.bayesCapSeconds} s)`);
    const small = await runNaturalJob(job("bayes", subsetFile, plan.bayesCapSeconds));
    rows.push(naturalRow(dataset, `natural BayesClassifier, ${subset.length}-example subset`, "natural-bayes-subset", small, subset.length, plan.bayesCapSeconds));
  }
  log(`  natural LogisticRegressionClassifier (cap ${plan.logisticCapSeconds} s)`);
  const logistic = await runNaturalJob(job("logistic", trainFile, plan.logisticCapSeconds));
  rows.push(naturalRow(dataset, "natural LogisticRegressionClassifier", "natural-logistic", logistic, dataset.train.length, plan.logisticCapSeconds));
  return rows;
}

// ---------------------------------------------------------------- scikit-learn

/** The JSON sklearn_reference.py prints. */
interface SklearnOutput {
  trainSeconds: number;
  predictions: string[];
  accuracy: number;
  macroF1: number;
  batchUsPerDoc: number;
  singleCalls: number;
  singleUsP50: number;
  singleUsP99: number;
  features: number;
  vocabularyBytes: number;
  coefficientBytes: number;
  modelBytes: number;
  idfBytes: number;
  pickleBytes: number;
  loadMs: number;
  C: number;
  iterations: number;
  sklearn: string;
  python: string;
}

const SKLEARN_C = 10;

/** True when Debian's python3-sklearn can be imported by /usr/bin/python3. */
function sklearnAvailable(): boolean {
  return spawnSync(SYSTEM_PYTHON, ["-c", "import sklearn"], { stdio: "ignore" }).status === 0;
}

function sklearnRow(dataset: Dataset, plan: Plan, directory: string, log: (line: string) => void): ComparisonRow {
  const row = emptyRow(dataset, `scikit-learn TF-IDF 1-2 grams + LogisticRegression (C=${SKLEARN_C})`, "sklearn", 1);
  if (!sklearnAvailable()) {
    row.status = "skipped";
    row.statusText = `skipped: ${SYSTEM_PYTHON} cannot import sklearn (run npm run bench:setup)`;
    return row;
  }
  log("  scikit-learn reference");
  const optionsFile = join(directory, "sklearn-options.json");
  writeFileSync(optionsFile, JSON.stringify({ C: SKLEARN_C, singleSample: plan.sklearnSample, warmup: 20, loadRepeats: plan.quick ? 5 : 20 }));
  const run = spawnSync(SYSTEM_PYTHON, [SKLEARN_SCRIPT, join(directory, "train.jsonl"), join(directory, "test.jsonl"), optionsFile], { encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  if (run.status !== 0) {
    row.status = "failed";
    row.statusText = `failed: sklearn_reference.py exited with ${run.status ?? run.signal}: ${run.stderr.trim().split("\n").slice(-2).join(" / ")}`;
    return row;
  }
  const output = JSON.parse(run.stdout) as SklearnOutput;
  const ours = scorePredictions(dataset, output.predictions);
  Object.assign(row, ours);
  row.trainSeconds = output.trainSeconds;
  row.classify = { calls: output.singleCalls, p50: output.singleUsP50, p99: output.singleUsP99, mean: NaN, stoppedEarly: false };
  row.batchUsPerDoc = output.batchUsPerDoc;
  row.modelBytes = output.modelBytes;
  row.loadMs = output.loadMs;
  const { predictions: _, ...rest } = output;
  row.details = { ...rest, metricsAgree: Math.abs(ours.accuracy - output.accuracy) < 1e-9 && Math.abs(ours.macroF1 - output.macroF1) < 1e-9 };
  return row;
}

// ---------------------------------------------------------------- the run

/**
 * Builds, trains and measures every system on both datasets, one after another.
 * `quick` shortens caps and call counts and skips the 2-thread builds (a smoke run).
 * @example const rows = await runComparison(); console.log(formatComparison(rows));
 */
export async function runComparison(options: { quick?: boolean; log?: (line: string) => void } = {}): Promise<ComparisonRow[]> {
  const plan = planFor(options.quick ?? false);
  const log = options.log ?? ((line: string) => process.stderr.write(`${line}\n`));
  const rows: ComparisonRow[] = [];
  for (const dataset of await loadDatasets()) {
    log(`${dataset.name}: ${dataset.train.length} train / ${dataset.test.length} test examples`);
    const directory = mkdtempSync(join(tmpdir(), "sluice-comparison-"));
    try {
      writeJsonl(join(directory, "train.jsonl"), dataset.train);
      writeJsonl(join(directory, "test.jsonl"), dataset.test);
      rows.push(...(await sluiceRows(dataset, plan, log)));
      const sklearn = sklearnRow(dataset, plan, directory, log);
      rows.push(sklearn);
      if (sklearn.status === "ok" && sklearn.modelBytes !== null) {
        // The size target: a compiled model at most 1/20 of the reference's bytes. Such a budget
        // is too small for the ~1 byte per training text of the leakage fingerprint, so it is left out.
        const maxBytes = Math.floor(sklearn.modelBytes / 20);
        log(`  Sluice compiled, --max-bytes ${maxBytes} (1/20 of scikit-learn's), --no-fingerprint`);
        rows.push(await sluiceRow(dataset, plan, `Sluice compiled int8, max-bytes ${maxBytes} = sklearn/20, no fingerprint (1 thread)`, "sluice-twentieth", { ...defaultBuildSettings(), threads: 1, maxBytes, fingerprint: false }));
      }
      rows.push(...(await naturalRows(dataset, plan, directory, log)));
    } finally {
      rmSync(directory, { recursive: true, force: true });
    }
  }
  return rows;
}

// ---------------------------------------------------------------- printing

const fixed = (value: number | null, digits: number) => (value === null || !Number.isFinite(value) ? "—" : value.toFixed(digits));
const grouped = (value: number | null) => (value === null ? "—" : Math.round(value).toLocaleString("en-US"));
const microseconds = (value: number | null) => (value === null ? "—" : value >= 1000 ? Math.round(value).toLocaleString("en-US") : value.toFixed(1));

/**
 * The table of rows as markdown (status text stands in for missing numbers).
 * @example console.log(comparisonTable(await runComparison()));
 */
export function comparisonTable(rows: readonly ComparisonRow[]): string {
  const headers = ["dataset", "system", "train s", "accuracy", "macro-F1", "µs/doc p50", "µs/doc p99", "model bytes", "load ms"];
  const body = rows.map((row) => {
    const train = row.trainSeconds === null && row.status !== "ok" ? row.statusText ?? row.status : fixed(row.trainSeconds, 2);
    return [row.dataset, row.system, train, fixed(row.accuracy, 4), fixed(row.macroF1, 4), microseconds(row.classify?.p50 ?? null), microseconds(row.classify?.p99 ?? null), grouped(row.modelBytes), fixed(row.loadMs, 2)];
  });
  return markdownTable(headers, body, ["left", "left", "right", "right", "right", "right", "right", "right", "right"]);
}

/**
 * Lines comparing Sluice (compiled, 1 thread, default settings) with natural's Bayes
 * classifier and with the sklearn reference, per dataset, from the same run.
 * @example comparisonRatios(rows).forEach((line) => console.log(line));
 */
export function comparisonRatios(rows: readonly ComparisonRow[]): string[] {
  const lines: string[] = [];
  const points = (a: number, b: number) => {
    const difference = (a - b) * 100;
    return Math.abs(difference) < 0.005 ? "±0.00 points" : `${difference > 0 ? "+" : "−"}${Math.abs(difference).toFixed(2)} points`;
  };
  const times = (x: number) => `${x >= 10 ? x.toFixed(0) : x.toFixed(1)}×`;
  // A ratio of "their time / our time": above 1 Sluice is faster, below 1 it is slower.
  const speed = (ratio: number, verb: string) => (ratio >= 1 ? `${verb} ${times(ratio)} faster` : `${verb} ${times(1 / ratio)} slower`);
  for (const dataset of [...new Set(rows.map((r) => r.dataset))]) {
    const pick = (role: SystemRole) => rows.find((r) => r.dataset === dataset && r.role === role && (r.threads === 1 || r.threads === null));
    const sluice = pick("sluice-compiled");
    if (!sluice || sluice.trainSeconds === null || sluice.accuracy === null || !sluice.classify) continue;
    lines.push(`${dataset} — Sluice compiled int8, 1 thread (${grouped(sluice.modelBytes)} bytes):`);
    const bayes = pick("natural-bayes");
    if (bayes?.status === "ok" && bayes.trainSeconds !== null && bayes.accuracy !== null && bayes.classify) {
      lines.push(`  vs natural Bayes: ${speed(bayes.trainSeconds / sluice.trainSeconds, "trains")}, ${speed(bayes.classify.p50 / sluice.classify.p50, "classifies")} (p50), accuracy ${points(sluice.accuracy, bayes.accuracy)}`);
    } else if (bayes?.status === "too-slow" && bayes.trainSeconds === null) {
      const capSeconds = bayes.details.capSeconds as number;
      const bound = capSeconds / sluice.trainSeconds;
      lines.push(
        bound >= 1
          ? `  vs natural Bayes: trains more than ${times(bound)} faster (natural did not finish training within its ${capSeconds} s cap; Sluice's build took ${fixed(sluice.trainSeconds, 1)} s)`
          : `  vs natural Bayes: no training ratio (natural did not finish within its ${capSeconds} s cap, shorter than Sluice's ${fixed(sluice.trainSeconds, 1)} s build)`,
      );
      const subset = pick("natural-bayes-subset");
      if (subset?.status === "ok" && subset.trainSeconds !== null && subset.accuracy !== null && subset.classify) {
        lines.push(`    vs natural Bayes trained on a ${subset.trainExamples}-example subset in ${fixed(subset.trainSeconds, 1)} s (a smaller vocabulary, so it classifies faster than the full model would): Sluice ${speed(subset.classify.p50 / sluice.classify.p50, "classifies")} (p50), accuracy ${points(sluice.accuracy, subset.accuracy)}`);
      }
    } else if (bayes) lines.push(`  vs natural Bayes: no ratio (${bayes.statusText})`);
    const sklearn = pick("sklearn");
    if (sklearn?.status === "ok" && sklearn.accuracy !== null && sklearn.modelBytes !== null && sluice.modelBytes !== null) {
      const budget = pick("sluice-budget");
      const budgetText = budget?.modelBytes && budget.accuracy !== null ? `; max-bytes row: sklearn bytes / its bytes = ${times(sklearn.modelBytes / budget.modelBytes)}, accuracy ${points(budget.accuracy, sklearn.accuracy)}` : "";
      const twentieth = pick("sluice-twentieth");
      const twentiethText = twentieth?.modelBytes && twentieth.accuracy !== null ? `; sklearn/20 row: ${times(sklearn.modelBytes / twentieth.modelBytes)} smaller, accuracy ${points(twentieth.accuracy, sklearn.accuracy)}` : "";
      lines.push(`  vs scikit-learn TF-IDF + LR: accuracy ${points(sluice.accuracy, sklearn.accuracy)}, macro-F1 ${points(sluice.macroF1 ?? NaN, sklearn.macroF1 ?? NaN)}; sklearn bytes / Sluice bytes = ${times(sklearn.modelBytes / sluice.modelBytes)}${budgetText}${twentiethText}`);
      if (sklearn.trainSeconds !== null && sklearn.classify) lines.push(`    (sklearn fit ${fixed(sklearn.trainSeconds, 2)} s vs Sluice build ${fixed(sluice.trainSeconds, 2)} s; sklearn predict([text]) p50 ${microseconds(sklearn.classify.p50)} µs, batch ${microseconds(sklearn.batchUsPerDoc)} µs/doc)`);
    } else if (sklearn) lines.push(`  vs scikit-learn: no ratio (${sklearn.statusText})`);
  }
  return lines;
}

/**
 * What each row measures, printed under the table so the numbers cannot be misread
 * (the caps and repeat counts are read from the rows, so a --quick run says its own).
 * @example comparisonNotes(rows).forEach((note) => console.log(`- ${note}`));
 */
export function comparisonNotes(rows: readonly ComparisonRow[]): string[] {
  const capOf = (role: SystemRole) => rows.find((r) => r.role === role)?.details.capSeconds ?? "?";
  const loadRepeats = rows.find((r) => r.role === "sluice-compiled")?.details.loadRepeats ?? "?";
  const calls = Math.min(...rows.filter((r) => r.role.startsWith("sluice")).map((r) => r.classify?.calls ?? Infinity));
  return [
    "All systems train on the same training split and are scored on the same test split (SpamAssassin: the fixture's murmur3 80/20 split; support topics: murmur3 of the CSV line number % 5 = 0 is test). Accuracy and macro-F1 come from each system's test predictions, scored by compiler/metrics.",
    "Sluice train s = the whole build() call (encode, train, prune, quantize, fine-tune the output layer, calibrate, write, verify) with default settings; it trains on 90% of the training split and keeps 10% for calibration and policy (default holdout). Draft-only training seconds are in the JSON (details.draftTrainSeconds).",
    "Sluice compiled = the default build (int8; logit rows, the output layer multiplied in; TF-IDF, 5 epochs; the default 1 MiB budget prunes rows when the data needs more). max-bytes = the same with a smaller size budget (rows pruned to fit). Sluice draft = a separate build with precision float32, fine-tune epochs 0, keep-features 0, no max-bytes, output layer kept (no folding): the draft itself as a float32 file (1 thread: the identical draft, same seed). 2 threads = settings.threads 2 (Hogwild, not deterministic).",
    `µs/doc = one classify call per text after a warm-up, performance.now around each call, percentiles by nearest rank over the sorted calls (Sluice: ${Number.isFinite(calls) ? `≥ ${calls}` : "?"} calls; natural: see details.classify.calls in the JSON). Sluice: model.classify(text); natural: classifier.classify(text); sklearn: pipeline.predict([text]) on an evenly spread sample in Python (batch predict per text is in the ratios).`,
    "Model bytes: Sluice = the model file; natural = UTF-8 bytes of JSON.stringify(classifier), what its save() writes (it includes the stemmed training documents); sklearn = vocabulary (UTF-8 term bytes + 4 per index) + float64 coefficients and intercepts (one coefficient row for two classes; idf_, 8 bytes per term, is not counted: see details.idfBytes).",
    `Load ms: Sluice = loadModel(bytes), median of ${loadRepeats}; natural = JSON.parse + restore, median of up to ${loadRepeats} within 20 s; sklearn = pickle.loads of the fitted pipeline, median.`,
    `natural (8.1.1) runs in a child process killed at its training cap (BayesClassifier ${capOf("natural-bayes")} s, LogisticRegressionClassifier ${capOf("natural-logistic")} s, so that the whole comparison ends in about half an hour on 2 cores), with its default Porter stemmer and stop words. When the Bayes classifier hits its cap it is run again on an evenly spread subset of the training split.`,
  ];
}

/**
 * The table, the notes and the ratios, as the markdown that is printed and saved.
 * @example console.log(formatComparison(await runComparison()));
 */
export function formatComparison(rows: readonly ComparisonRow[]): string {
  return [comparisonTable(rows), "", ...comparisonNotes(rows).map((note) => `- ${note}`), "", "Ratios (same run):", "", "```", ...comparisonRatios(rows), "```", ""].join("\n");
}

async function main(argv: readonly string[]): Promise<void> {
  const unknown = argv.filter((a) => a !== "--quick" && a !== "--write");
  if (unknown.length > 0) throw new Error(`comparison.ts: unknown argument ${unknown.join(" ")}; expected --quick and/or --write`);
  const rows = await runComparison({ quick: argv.includes("--quick") });
  const markdown = formatComparison(rows);
  process.stdout.write(markdown);
  if (argv.includes("--write")) {
    const written = writeResults("comparison", rows, markdown);
    process.stderr.write(`wrote ${written.json} and ${written.markdown}\n`);
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main(process.argv.slice(2)).catch((error: unknown) => {
    process.stderr.write(`${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
    process.exit(1);
  });
}
