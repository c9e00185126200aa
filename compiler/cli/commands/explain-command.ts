// `sluice explain <model> <text>`: the features that pushed each top label, with their exact
// contributions to the logit.

import { loadModelFile } from "../load-model-file.ts";
import { SURFACE_DEFAULTS } from "../../../runtime/surface-defaults.ts";
import { optionsOf } from "../command-table.ts";
import { parseArgs, UsageError, valueOf } from "../parse-args.ts";

const EXPLAIN_OPTIONS = optionsOf("explain");

/** Runs the explain command; returns the exit code. */
export async function explainCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, EXPLAIN_OPTIONS);
  if (args.positionals.length < 2) throw new UsageError('explain needs a model and a text: sluice explain <model> "text"');
  const [modelPath, ...words] = args.positionals;
  const text = words.join(" ");
  const top = positive(valueOf(args, "--top") ?? String(SURFACE_DEFAULTS.explainTop), "--top");
  const features = positive(valueOf(args, "--features") ?? String(SURFACE_DEFAULTS.explainFeatures), "--features");
  const model = loadModelFile(modelPath);
  const explanation = model.explain(text, { top, features });
  if (args.switches.get("--json") === true) {
    process.stdout.write(`${JSON.stringify(explanation)}\n`);
    return 0;
  }
  const lines: string[] = [];
  for (const label of explanation.labels) {
    lines.push(`${label.label}  score ${label.score.toFixed(3)}  logit ${label.logit.toFixed(3)} = bias ${label.bias.toFixed(3)} + features`);
    for (const f of label.features) {
      const from = f.foldedFrom ? `  (folded from ${f.foldedFrom.map((s) => JSON.stringify(s)).join(", ")})` : "";
      lines.push(`  ${f.contribution >= 0 ? "+" : "-"}${Math.abs(f.contribution).toFixed(3)}  ${f.feature}${from}`);
    }
  }
  lines.push(`${explanation.tokenCount} tokens${explanation.truncated ? " (cut at the token limit)" : ""}; ${explanation.unknownFeatures} features unknown to the model`);
  process.stdout.write(`${lines.join("\n")}\n`);
  return 0;
}

function positive(value: string, flag: string): number {
  const n = Number(value);
  if (!Number.isInteger(n) || n < 1) throw new UsageError(`${flag}: expected a positive integer, got "${value}"`);
  return n;
}
