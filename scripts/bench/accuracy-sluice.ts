// The Sluice side of `npm run bench:accuracy`: the default `sluice build` as a user runs it
// (the CLI in a child process, so "build seconds" is the whole command: reading, training,
// compiling, verifying, writing), then the test part scored through the shipped runtime
// (loadModel + scoreInto). Single-label: the top label. Multi-label: every label at or above
// the threshold the build compiled into the model (0.5 when it has none).
import { spawnSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { scoreTexts } from "../../compiler/evaluate/evaluate.ts";
import { loadModel } from "../../runtime/index.ts";
import { topLabel } from "../../runtime/model/rank-labels.ts";
import type { SuiteRow } from "./accuracy-data.ts";

const REPOSITORY = join(import.meta.dirname ?? new URL(".", import.meta.url).pathname, "..", "..");
const CLI = join(REPOSITORY, "bin", "sluice.js");
/** Fixed so that builds are reproducible (only recorded in provenance). */
const SOURCE_DATE_EPOCH = "946684800";

export interface SluiceRun {
  buildSeconds: number;
  modelBytes: number;
  /** What the build printed as the shipped model's validation accuracy (micro-F1 for multi-label). */
  printedValidation: number | null;
  validationExamples: number | null;
  flags: string[];
  predictions: (string | string[])[];
  warnings: string[];
}

/** True when this checkout's `sluice build` knows a flag (read from its help text). */
export function buildKnowsFlag(flag: string): boolean {
  const help = spawnSync(process.execPath, [CLI, "build", "--help"], { encoding: "utf8" });
  return `${help.stdout}${help.stderr}`.includes(flag);
}

/**
 * Builds on `trainFile` with default settings (plus `flags`), writes `modelFile`, predicts `test`.
 * @example runSluice("/tmp/train.jsonl", "/tmp/m.sluice", testRows, false, [])
 */
export function runSluice(trainFile: string, modelFile: string, test: readonly SuiteRow[], multiLabel: boolean, flags: string[]): SluiceRun {
  const args = [CLI, "build", trainFile, "--out", modelFile, "--json", "--quiet", "--force", ...flags];
  const started = performance.now();
  const child = spawnSync(process.execPath, args, { encoding: "utf8", maxBuffer: 1 << 28, env: { ...process.env, SOURCE_DATE_EPOCH } });
  const buildSeconds = (performance.now() - started) / 1000;
  if (child.status !== 0) throw new Error(`sluice build ${trainFile} failed (exit ${child.status}): ${child.stderr.trim().slice(0, 600)}`);
  const report = JSON.parse(child.stdout.trim().split("\n").pop() as string) as {
    validationExamples?: number;
    compiled?: { accuracy?: number };
    validation?: { accuracy?: number; microF1?: number };
    warnings?: string[];
  };
  const bytes = readFileSync(modelFile);
  const model = loadModel(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength));
  const scored = scoreTexts(model, test.map((r) => r.text));
  const k = model.labels.length;
  const thresholds = model.meta.thresholds ?? model.labels.map(() => 0.5);
  const predictions: (string | string[])[] = [];
  for (let i = 0; i < test.length; i++) {
    const row = scored.scores.subarray(i * k, (i + 1) * k);
    if (multiLabel) {
      predictions.push(model.labels.filter((_, j) => row[j] >= thresholds[j]));
    } else {
      predictions.push(model.labels[topLabel(row)]);
    }
  }
  const printed = multiLabel ? report.validation?.microF1 : (report.compiled?.accuracy ?? report.validation?.accuracy);
  return {
    buildSeconds,
    modelBytes: bytes.byteLength,
    printedValidation: typeof printed === "number" ? printed : null,
    validationExamples: report.validationExamples ?? null,
    flags,
    predictions,
    warnings: report.warnings ?? [],
  };
}
