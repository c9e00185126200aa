// `sluice classify <model> [file | -]`: labels, scores and the decision for texts. Input is a
// CSV/TSV/JSONL data file (text fields as the model was built with, or --text-field), or plain
// text with one text per line (.txt, or stdin with "-"). Output is a table with a header, or
// JSON Lines with --json. The decision is the one the HTTP API gives for the same text.

import { readFileSync } from "node:fs";
import { SURFACE_DEFAULTS } from "../../../runtime/surface-defaults.ts";
import { checkInputFiles } from "../input-path.ts";
import { fieldsOf, loadModelFile } from "../load-model-file.ts";
import { optionsOf } from "../command-table.ts";
import { parseArgs, UsageError, valueOf } from "../parse-args.ts";
import { readData, readStdin } from "../read-data.ts";

const CLASSIFY_OPTIONS = optionsOf("classify");

/** Runs the classify command; returns the exit code. */
export async function classifyCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, CLASSIFY_OPTIONS);
  if (args.positionals.length < 1 || args.positionals.length > 2) throw new UsageError("classify needs a model and optionally an input: sluice classify <model> [file | -]");
  const [modelPath, input = "-"] = args.positionals;
  checkInputFiles([[modelPath, "model file"], [input, "input file"]]);
  const topValue = valueOf(args, "--top");
  const top = topValue === undefined ? undefined : Number(topValue);
  if (top !== undefined && (!Number.isInteger(top) || top < 1)) throw new UsageError(`--top: expected a positive integer, got "${topValue}"`);
  const quiet = args.switches.get("--quiet") === true;
  const model = loadModelFile(modelPath);
  const texts = await readTexts(input, args, model, quiet);
  const json = args.switches.get("--json") === true;
  // Without --top, the model's own choice (as in the library and over HTTP): columns for the
  // best label, or for every label a sigmoid head could list.
  const shown = Math.min(top ?? (model.meta.head === "sigmoid" ? model.labels.length : 1), model.labels.length);
  const layout = json ? null : createLayout(model.labels, shown, texts.length);
  const lines: string[] = layout ? [layout.header] : [];
  texts.forEach((text, i) => {
    const ranked = model.classify(text, top === undefined ? {} : { top });
    // The same decision /v1/moderate gives: the model's policy, plus the shared review floor.
    const decision = model.decide(text, { reviewBelow: SURFACE_DEFAULTS.reviewBelow });
    if (layout) lines.push(layout.row(i + 1, decision.action, ranked, text));
    else {
      const labels = ranked.map((r) => ({ label: r.label, score: round(r.score) }));
      const best = labels[0] ?? { label: null, score: 0 };
      lines.push(JSON.stringify({ row: i + 1, label: best.label, score: best.score, labels, decision: { action: decision.action, label: decision.label, score: round(decision.score), reasons: decision.reasons } }));
    }
    if (lines.length >= 1000) {
      process.stdout.write(`${lines.join("\n")}\n`);
      lines.length = 0;
    }
  });
  if (lines.length > 0) process.stdout.write(`${lines.join("\n")}\n`);
  return 0;
}

/**
 * Aligned columns under a header, one row per text: row number, decision, then each listed
 * label with its score, then the text. Widths come from the model's labels, so rows can be
 * written as they are classified.
 */
function createLayout(labels: readonly string[], shown: number, count: number) {
  const rowWidth = Math.max(3, String(count).length);
  const labelWidth = Math.max(5, ...labels.map((l) => l.length));
  const decisionWidth = "decision".length;
  const labelHeads = Array.from({ length: shown }, (_, k) => (shown === 1 ? ["label", "score"] : [`label ${k + 1}`, `score ${k + 1}`]));
  const scoreWidth = Math.max(5, ...labelHeads.map(([, score]) => score.length));
  const cells = (row: string, decision: string, pairs: [string, string][], text: string) =>
    [row.padStart(rowWidth), decision.padEnd(decisionWidth), ...pairs.map(([l, s]) => `${l.padEnd(labelWidth)}  ${s.padStart(scoreWidth)}`), text].join("  ").trimEnd();
  return {
    header: cells("row", "decision", labelHeads.map(([l, s]) => [l, s]), "text"),
    row: (n: number, decision: string, ranked: readonly { label: string; score: number }[], text: string) =>
      cells(String(n), decision, Array.from({ length: shown }, (_, k) => (ranked[k] ? [ranked[k].label, ranked[k].score.toFixed(3)] : ["-", "-"])), preview(text)),
  };
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
