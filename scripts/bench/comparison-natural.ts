// The rows of the general-purpose JS NLP library natural (naive Bayes and logistic
// regression), each trained and measured in a child process killed at its cap.

import { join } from "node:path";
import { emptyRow, scorePredictions, writeJsonl, type ComparisonRow, type Dataset, type Plan, type SystemRole } from "./comparison-rows.ts";
import { runNaturalJob, type NaturalJob, type NaturalOutcome } from "./natural-runner.ts";

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

export async function naturalRows(dataset: Dataset, plan: Plan, directory: string, log: (line: string) => void): Promise<ComparisonRow[]> {
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
