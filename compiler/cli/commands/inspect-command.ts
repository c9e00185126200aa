// `sluice inspect <model>`: header, labels, provenance and bytes per section.

import { readFileSync } from "node:fs";
import { summarizeTrainingFingerprint } from "../../read/text-fingerprints.ts";
import { sectionSizes } from "../../compile/write-model.ts";
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
  const lines = [
    `${path}: Sluice model ${meta.contentId}, ${meta.bytes} bytes`,
    `head ${meta.head}, ${meta.labels.length} labels, dims ${meta.dims}, ${meta.rowCount} feature rows (${meta.rowSpace === "logits" ? "logit rows, output layer multiplied in" : "hidden rows + output layer"}), ${meta.precision}, weighting ${meta.weighting}, temperature ${meta.calibration.temperature.toFixed(3)}`,
    `featurizer: normalization v${f.normalization}, word span ${f.wordSpan}, char span ${f.charMin === 0 ? "off" : `${f.charMin}-${f.charMax}`}, ${f.hashBits} hash bits, seed ${f.hashSeed}, max ${f.maxTokens} tokens`,
    `labels: ${meta.labels.join(", ")}`,
    `sections: ${Object.entries(sections).map(([name, bytes]) => `${name} ${bytes}`).join(", ")}`,
    `metrics: ${JSON.stringify({ draft: meta.metrics.draft, compiled: meta.metrics.compiled, validationExamples: meta.metrics.validationExamples })}`,
    `policy: ${meta.policy ? JSON.stringify(meta.policy.rules) : "none"}`,
    `provenance: ${JSON.stringify({ ...meta.provenance, settings: undefined })}`,
    `settings: ${JSON.stringify(meta.provenance.settings ?? {})}`,
  ];
  process.stdout.write(`${lines.join("\n")}\n`);
  return 0;
}
