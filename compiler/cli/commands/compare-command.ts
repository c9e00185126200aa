// `sluice compare <live> <candidate> <data>`: metric deltas, McNemar's test and the examples
// whose label flips; with --require-better / --max-regression the exit code gates a CI step.

import { checkGates, compareModels, COMPARE_EXIT_CODES, formatP, signed, type FlipGroup, type ModelComparison } from "../../evaluate/compare.ts";
import { fixed, formatTable } from "../format-table.ts";
import { checkInputFiles } from "../input-path.ts";
import { fieldsOf, loadModelFile } from "../load-model-file.ts";
import { optionsOf } from "../command-table.ts";
import { parseArgs, UsageError, valueOf } from "../parse-args.ts";
import { readData } from "../read-data.ts";

const COMPARE_OPTIONS = optionsOf("compare");

const SHOWN_PER_GROUP = 10;

/** Runs the compare command; returns the exit code. */
export async function compareCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, COMPARE_OPTIONS);
  if (args.positionals.length !== 3) throw new UsageError("compare needs two models and a data file: sluice compare <live> <candidate> <data>");
  const [livePath, candidatePath, dataPath] = args.positionals;
  checkInputFiles([[livePath, "live model file"], [candidatePath, "candidate model file"], [dataPath, "data file"]]);
  const gates = gatesFromArgs(args);
  const quiet = args.switches.get("--quiet") === true;
  const live = loadModelFile(livePath);
  const candidate = loadModelFile(candidatePath);
  const { examples } = await readData(dataPath, args, fieldsOf(live), true, quiet);
  const comparison = compareModels(live, candidate, examples);
  if (comparison.unknownLabelExamples > 0 && !quiet) {
    process.stderr.write(`warning: ${comparison.unknownLabelExamples} examples have labels the models do not know (${comparison.unknownLabels.slice(0, 5).join(", ")}); they are left out\n`);
  }
  const verdict = checkGates(comparison, gates);
  if (args.switches.get("--json") === true) {
    process.stdout.write(`${JSON.stringify({ ...comparison, gates: { ...gates, exitCode: verdict.exitCode, lines: verdict.lines } })}\n`);
  } else {
    process.stdout.write(`${describeComparison(dataPath, livePath, candidatePath, comparison, verdict.lines).join("\n")}\n`);
  }
  return verdict.exitCode;
}

function gatesFromArgs(args: ReturnType<typeof parseArgs>): Parameters<typeof checkGates>[1] {
  const metric = valueOf(args, "--metric") ?? "accuracy";
  if (metric !== "accuracy" && metric !== "macro-f1") throw new UsageError(`--metric: expected accuracy or macro-f1, got "${metric}"`);
  const limit = valueOf(args, "--max-regression");
  let maxRegression: number | null = null;
  if (limit !== undefined) {
    maxRegression = Number(limit);
    if (limit.trim() === "" || !Number.isFinite(maxRegression) || maxRegression < 0 || maxRegression > 1) {
      throw new UsageError(`--max-regression: expected a number from 0 to 1 (an absolute drop, e.g. 0.01), got "${limit}"`);
    }
  }
  return { requireBetter: args.switches.get("--require-better") === true, maxRegression, metric };
}

function describeComparison(dataPath: string, livePath: string, candidatePath: string, c: ModelComparison, gateLines: string[]): string[] {
  const m = c.mcnemar;
  const lines = [
    `${dataPath}: ${c.examples} examples; live ${livePath} (${c.contentIds.live}), candidate ${candidatePath} (${c.contentIds.candidate})`,
    "",
    formatTable(
      ["metric", "live", "candidate", "delta"],
      [
        ["accuracy", fixed(c.live.accuracy), fixed(c.candidate.accuracy), signed(c.delta.accuracy)],
        ["macro-F1", fixed(c.live.macroF1), fixed(c.candidate.macroF1), signed(c.delta.macroF1)],
        ...c.labels.map((label) => [`F1 ${label}`, fixed(c.live.labels[label]), fixed(c.candidate.labels[label]), signed(c.delta.labels[label])]),
      ],
    ),
    "",
    `McNemar's test: b = ${m.b} (live right, candidate wrong), c = ${m.c} (live wrong, candidate right), ${m.method === "exact" ? "exact binomial" : `chi-square ${m.statistic.toFixed(3)} with continuity correction`}, p = ${formatP(m.pValue)}`,
    ...describeFlips("fixed (live wrong → candidate right)", c.flips.fixed),
    ...describeFlips("broken (live right → candidate wrong)", c.flips.broken),
    ...describeFlips("changed (both wrong, different labels)", c.flips.changed),
  ];
  if (gateLines.length > 0) lines.push("", ...gateLines);
  return lines;
}

function describeFlips(title: string, group: FlipGroup): string[] {
  if (group.count === 0) return ["", `${title}: none`];
  const shown = group.examples.slice(0, SHOWN_PER_GROUP);
  return [
    "",
    `${title}: ${group.count}${group.count > shown.length ? `, first ${shown.length}` : ""}`,
    ...shown.map((e) => `  line ${e.line}: gold ${e.gold}; live ${e.live.label} ${e.live.score.toFixed(3)} → candidate ${e.candidate.label} ${e.candidate.score.toFixed(3)}  ${JSON.stringify(preview(e.text))}`),
  ];
}

function preview(text: string): string {
  const flat = text.replace(/\s+/g, " ").trim();
  return flat.length > 70 ? `${flat.slice(0, 67)}...` : flat;
}
