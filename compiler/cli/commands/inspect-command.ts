// `sluice inspect <model>`: header, labels, bytes per section, metrics, policy, provenance and
// settings, as tables and phrases people read; `--json` gives the same as one object.

import { readFileSync } from "node:fs";
import { summarizeTrainingFingerprint } from "../../read/text-fingerprints.ts";
import { sectionSizes } from "../../compile/write-model.ts";
import { describeRule } from "../../report/label-table.ts";
import { provenanceFacts, settingFacts } from "../../report/provenance-facts.ts";
import { fixed, formatTable } from "../format-table.ts";
import { loadModelFile } from "../load-model-file.ts";
import { optionsOf } from "../command-table.ts";
import { parseArgs, UsageError } from "../parse-args.ts";

const INSPECT_OPTIONS = optionsOf("inspect");

/** Runs the inspect command; returns the exit code. */
export async function inspectCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, INSPECT_OPTIONS);
  if (args.positionals.length !== 1) throw new UsageError("inspect needs one model file: sluice inspect <model>");
  const path = args.positionals[0];
  const model = loadModelFile(path);
  const sections = sectionSizes(readFileSync(path));
  // The training fingerprint is a Bloom filter: show what it is, not its bits.
  const meta = { ...model.meta, provenance: { ...model.meta.provenance, trainFingerprint: summarizeTrainingFingerprint(model.meta.provenance.trainFingerprint) ?? undefined } as Record<string, unknown> };
  if (args.switches.get("--json") === true) {
    process.stdout.write(`${JSON.stringify({ file: path, ...meta, sections })}\n`);
    return 0;
  }
  const f = meta.featurizer;
  const metrics = meta.metrics as { draft?: { accuracy?: number; macroF1?: number }; compiled?: { accuracy?: number; macroF1?: number }; validationExamples?: number };
  const lines = [
    `${path}: Sluice model ${meta.contentId}, ${meta.bytes} bytes`,
    `head ${meta.head}, ${meta.labels.length} labels, dims ${meta.dims}, ${meta.rowCount} feature rows (${meta.rowSpace === "logits" ? "logit rows, output layer multiplied in" : "hidden rows + output layer"}), ${meta.precision}, weighting ${meta.weighting}, temperature ${meta.calibration.temperature.toFixed(3)}`,
    `featurizer: normalization v${f.normalization}, word span ${f.wordSpan}, char span ${f.charMin === 0 ? "off" : `${f.charMin}-${f.charMax}`}, ${f.hashBits} hash bits, seed ${f.hashSeed}, max ${f.maxTokens} tokens`,
    `labels: ${meta.labels.join(", ")}`,
    "",
    formatTable(["section", "bytes", "share"], Object.entries(sections).map(([name, bytes]) => [name, bytes, `${((bytes / meta.bytes) * 100).toFixed(1)}%`])),
    "",
    `validation (${metrics.validationExamples ?? "n/a"} examples):`,
    formatTable(
      ["model", "accuracy", "macro-F1"],
      [
        ["draft (float32, all rows)", fixed(metrics.draft?.accuracy ?? NaN), fixed(metrics.draft?.macroF1 ?? NaN)],
        ["compiled (this file)", fixed(metrics.compiled?.accuracy ?? NaN), fixed(metrics.compiled?.macroF1 ?? NaN)],
      ],
    ),
    describeRecordedLatency(meta.metrics.latency),
    "",
    "policy:",
    ...(meta.policy ? meta.policy.rules.map((rule) => `  ${rule.label}: ${describeRule(rule)}`) : ["  none: every text is allowed with its top label (the review floor of HTTP and classify still applies)"]),
    ...(meta.policy?.reviewBelow !== undefined ? [`  any label: review when the top score is below ${meta.policy.reviewBelow.toFixed(3)}`] : []),
    "",
    "provenance:",
    ...aligned(provenanceFacts(model.meta.provenance)),
    "",
    "build settings:",
    ...aligned(settingFacts((model.meta.provenance.settings ?? {}) as Record<string, unknown>)),
  ];
  process.stdout.write(`${lines.join("\n")}\n`);
  return 0;
}

/** "  name   value" lines with the values in one column. */
function aligned(facts: readonly [string, string][]): string[] {
  const width = Math.max(0, ...facts.map(([name]) => name.length));
  return facts.map(([name, value]) => `  ${name.padEnd(width)}  ${value}`);
}

/** The latency the build measured, when it recorded one (reproducible builds leave it out). */
function describeRecordedLatency(latency: unknown): string {
  const entries = latency !== null && typeof latency === "object" ? Object.values(latency as Record<string, { tokens?: unknown; microseconds?: unknown }>) : [];
  const parts = entries.filter((l) => typeof l?.microseconds === "number" && typeof l.tokens === "number").map((l) => `${(l.microseconds as number).toFixed(1)} µs for ${l.tokens as number} tokens`);
  return parts.length > 0 ? `latency at build (CPU time per classify call, the build machine): ${parts.join(", ")}` : "latency at build: not recorded (a reproducible build leaves timings out)";
}
