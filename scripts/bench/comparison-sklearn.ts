// The scikit-learn reference row: TF-IDF + logistic regression run by sklearn_reference.py
// under Debian's python3 (python3-sklearn, `npm run bench:setup`); skipped when absent.

import { spawnSync } from "node:child_process";
import { writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { emptyRow, scorePredictions, type ComparisonRow, type Dataset, type Plan } from "./comparison-rows.ts";

const SKLEARN_SCRIPT = join(dirname(fileURLToPath(import.meta.url)), "sklearn_reference.py");
/** Debian's interpreter, where python3-sklearn installs; not whatever python3 is first on PATH. */
const SYSTEM_PYTHON = "/usr/bin/python3";

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

export function sklearnRow(dataset: Dataset, plan: Plan, directory: string, log: (line: string) => void): ComparisonRow {
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
