// The rows of the comparison, the datasets they are measured on and the run's plan;
// every system's predictions are scored here by the same code (compiler/metrics).

import { writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import type { LabelledText } from "../../compiler/evaluate/evaluate.ts";
import { computeClassificationMetrics } from "../../compiler/metrics/index.ts";
import { readExamples } from "../../compiler/read/index.ts";
import { murmur3String } from "../../runtime/featurizer/murmur3.ts";
import { loadSpamAssassin, splitSpamAssassin } from "../../test/fixtures/spam-assassin.ts";
import type { CallTimings, TimingOptions } from "./single-call-timing.ts";

const REPOSITORY = join(dirname(fileURLToPath(import.meta.url)), "..", "..");

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

export interface Dataset {
  name: string;
  train: LabelledText[];
  test: LabelledText[];
  /** The --max-bytes budget of the budget row. */
  budgetBytes: number;
  budgetText: string;
}

/** Everything a run needs to know, fixed by --quick or not. */
export interface Plan {
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

export function planFor(quick: boolean): Plan {
  return quick
    ? { quick, timing: { warmupCalls: 50, warmupMs: 1000, minCalls: 500, budgetMs: 20_000 }, loadRepeats: 10, bayesCapSeconds: 15, logisticCapSeconds: 15, measureCapSeconds: 60, bayesSubset: 300, sklearnSample: 100, threads: [1] }
    : { quick, timing: { warmupCalls: 200, warmupMs: 2000, minCalls: 2000, budgetMs: 60_000 }, loadRepeats: 50, bayesCapSeconds: 600, logisticCapSeconds: 120, measureCapSeconds: 180, bayesSubset: 1000, sklearnSample: 500, threads: [1, 2] };
}

export async function loadDatasets(): Promise<Dataset[]> {
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

export function emptyRow(dataset: Dataset, system: string, role: SystemRole, threads: number | null): ComparisonRow {
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
export function scorePredictions(dataset: Dataset, predicted: readonly string[]): { accuracy: number; macroF1: number } {
  const labels = [...new Set([...dataset.train, ...dataset.test].map((e) => e.labels[0]))].sort();
  const index = new Map(labels.map((label, i) => [label, i]));
  const gold = dataset.test.map((e) => index.get(e.labels[0]) as number);
  // A prediction outside the known labels (none expected) counts as wrong: map it to a label ≠ gold.
  const guesses = predicted.map((label, i) => index.get(label) ?? (gold[i] + 1) % labels.length);
  const metrics = computeClassificationMetrics(gold, guesses, labels.length, labels);
  return { accuracy: metrics.accuracy, macroF1: metrics.macroF1 };
}

export function writeJsonl(file: string, examples: readonly LabelledText[]): void {
  writeFileSync(file, examples.map((e) => JSON.stringify({ text: e.text, label: e.labels[0] })).join("\n") + "\n");
}
