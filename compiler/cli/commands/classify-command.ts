// `sluice classify <model> [file | -]`: labels and scores for texts. Input is a CSV/TSV/JSONL
// data file (text fields as the model was built with, or --text-field), or plain text with
// one text per line (.txt, or stdin with "-"). With --json, one JSON line per input.

import { readFileSync } from "node:fs";
import { fieldsOf, loadModelFile } from "../load-model-file.ts";
import { parseArgs, UsageError, valueOf, type FlagSpec } from "../parse-args.ts";
import { DATA_FLAGS, readData, readStdin } from "../read-data.ts";

export const CLASSIFY_FLAGS: Record<string, FlagSpec> = {
  ...DATA_FLAGS,
  "--top": { takesValue: true, description: "how many labels to list per text (default 1)" },
  "--json": { takesValue: false, description: "one JSON line per input: { label, score, top } (plus decision when the model has a policy)" },
  "--quiet": { takesValue: false, description: "no messages on stderr" },
};

/** Runs the classify command; returns the exit code. */
export async function classifyCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, CLASSIFY_FLAGS);
  if (args.positionals.length < 1 || args.positionals.length > 2) throw new UsageError("classify needs a model and optionally an input: sluice classify <model> [file | -]");
  const [modelPath, input = "-"] = args.positionals;
  const topValue = valueOf(args, "--top") ?? "1";
  const top = Number(topValue);
  if (!Number.isInteger(top) || top < 1) throw new UsageError(`--top: expected a positive integer, got "${topValue}"`);
  const quiet = args.switches.get("--quiet") === true;
  const model = loadModelFile(modelPath);
  const texts = await readTexts(input, args, model, quiet);
  const json = args.switches.get("--json") === true;
  const lines: string[] = [];
  // With a policy in the model, each line also says what the policy would do with the text.
  const hasPolicy = model.meta.policy !== null;
  for (const text of texts) {
    const ranked = model.classify(text, { top: Math.max(top, 1) });
    const best = ranked[0];
    const decision = hasPolicy ? model.decide(text) : null;
    if (json) {
      const line: Record<string, unknown> = { label: best.label, score: round(best.score), top: ranked.map((r) => ({ label: r.label, score: round(r.score) })) };
      if (decision) line.decision = { action: decision.action, label: decision.label, score: round(decision.score), reasons: decision.reasons };
      lines.push(JSON.stringify(line));
    } else {
      const action = decision ? `${decision.action.padEnd(6)} ` : "";
      lines.push(`${action}${ranked.map((r) => `${r.label} ${r.score.toFixed(3)}`).join("  ")}\t${preview(text)}`);
    }
    if (lines.length >= 1000) {
      process.stdout.write(`${lines.join("\n")}\n`);
      lines.length = 0;
    }
  }
  if (lines.length > 0) process.stdout.write(`${lines.join("\n")}\n`);
  return 0;
}

async function readTexts(input: string, args: ReturnType<typeof parseArgs>, model: ReturnType<typeof loadModelFile>, quiet: boolean): Promise<string[]> {
  const plain = input === "-" ? valueOf(args, "--format") === undefined : /\.(txt|text)$/i.test(input);
  if (plain) {
    const content = input === "-" ? await readStdin() : readFileSync(input, "utf8");
    return content.split(/\r?\n/).filter((line) => line.trim().length > 0);
  }
  const { examples } = await readData(input, args, fieldsOf(model), false, quiet);
  return examples.map((e) => e.text);
}

function round(score: number): number {
  return Math.round(score * 1e6) / 1e6;
}

function preview(text: string): string {
  const flat = text.replace(/\s+/g, " ").trim();
  return flat.length > 80 ? `${flat.slice(0, 77)}...` : flat;
}
