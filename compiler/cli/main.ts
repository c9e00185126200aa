// The sluice command line: parse the command, run it, turn errors into one clear line on
// stderr and a non-zero exit code. All real work lives in the programmatic API.

import { InputError, ModelFormatError } from "../../runtime/errors.ts";
import { SettingError } from "../build/build-settings.ts";
import { buildCommand } from "./commands/build-command.ts";
import { classifyCommand } from "./commands/classify-command.ts";
import { evalCommand } from "./commands/eval-command.ts";
import { explainCommand } from "./commands/explain-command.ts";
import { inspectCommand } from "./commands/inspect-command.ts";
import { UsageError, type FlagSpec } from "./parse-args.ts";
import { DataError } from "../read/index.ts";
import { TOOL_VERSION } from "../version.ts";

type Command = (argv: string[]) => Promise<number>;

const COMMANDS: Record<string, { run: () => Promise<Command>; summary: string }> = {
  build: { run: async () => buildCommand, summary: "build <data> --out model.sluice   read → train → prune → quantize → verify → write" },
  eval: { run: async () => evalCommand, summary: "eval <model> <data>               metrics on labelled data" },
  classify: { run: async () => classifyCommand, summary: "classify <model> [data | -]       labels and scores for texts" },
  explain: { run: async () => explainCommand, summary: 'explain <model> "text"            the features that pushed each top label' },
  inspect: { run: async () => inspectCommand, summary: "inspect <model>                   header, labels, sizes by section, provenance" },
  compare: { run: async () => (await import("./commands/compare-command.ts")).compareCommand, summary: "compare <live> <candidate> <data>  metric deltas, McNemar's test, flipped examples" },
  serve: { run: async () => (await import("./commands/serve-command.ts")).serveCommand, summary: "serve <model> [--port N]          local HTTP server, same API as the Worker" },
  report: { run: async () => (await import("./commands/report-command.ts")).reportCommand, summary: "report <model> <data> --out f     self-contained HTML report" },
  tune: { run: async () => (await import("./commands/tune-command.ts")).tuneCommand, summary: "tune <data> --time 5m             search settings under size and latency budgets" },
};

/** Commands that print their own --help text. */
const HELPS_ITSELF = new Set(["compare", "report", "serve"]);

const FLAG_TABLES: Record<string, () => Promise<Record<string, FlagSpec>>> = {
  build: async () => (await import("./commands/build-command.ts")).BUILD_FLAGS,
  eval: async () => (await import("./commands/eval-command.ts")).EVAL_FLAGS,
  classify: async () => (await import("./commands/classify-command.ts")).CLASSIFY_FLAGS,
  explain: async () => (await import("./commands/explain-command.ts")).EXPLAIN_FLAGS,
  inspect: async () => (await import("./commands/inspect-command.ts")).INSPECT_FLAGS,
  tune: async () => (await import("./commands/tune-command.ts")).TUNE_FLAGS,
};

/** A command's usage line and its options, from the same flag table its parser uses. */
async function commandHelp(name: string): Promise<string> {
  const flags = FLAG_TABLES[name] ? await FLAG_TABLES[name]() : {};
  const lines = Object.entries(flags)
    .sort(([a], [b]) => (a < b ? -1 : 1))
    .map(([flag, spec]) => `  ${`${flag}${spec.takesValue ? " <value>" : ""}`.padEnd(30)} ${spec.description}`);
  return [`usage: sluice ${COMMANDS[name].summary.replace(/\s{2,}/, "   ")}`, "", "options:", ...lines].join("\n");
}

function usage(): string {
  return [`sluice ${TOOL_VERSION}: text classifiers compiled for the edge`, "", "usage: sluice <command> [options]", "", ...Object.values(COMMANDS).map((c) => `  ${c.summary}`), "", "sluice <command> --help lists a command's options."].join("\n");
}

/**
 * Runs the CLI with the given arguments (without `node` and the script); returns the exit code.
 * @example await main(["inspect", "model.sluice"])
 */
export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === "--help" || name === "-h" || name === "help") {
    process.stdout.write(`${usage()}\n`);
    return name === undefined ? 1 : 0;
  }
  if (name === "--version") {
    process.stdout.write(`${TOOL_VERSION}\n`);
    return 0;
  }
  const command = COMMANDS[name];
  if (!command) {
    process.stderr.write(`sluice: unknown command "${name}"\n\n${usage()}\n`);
    return 2;
  }
  try {
    if (rest.includes("--help") && !HELPS_ITSELF.has(name)) {
      process.stdout.write(`${await commandHelp(name)}\n`);
      return 0;
    }
    const run = await command.run();
    return await run(rest);
  } catch (error) {
    return reportError(name, error);
  }
}

function reportError(command: string, error: unknown): number {
  if (error instanceof UsageError) {
    process.stderr.write(`sluice ${command}: ${error.message}\n`);
    return 2;
  }
  if (error instanceof DataError || error instanceof SettingError || error instanceof ModelFormatError || error instanceof InputError) {
    process.stderr.write(`sluice ${command}: ${error.message}\n`);
    return 1;
  }
  const message = error instanceof Error ? error.message : String(error);
  process.stderr.write(`sluice ${command}: ${message}\n`);
  if (process.env.SLUICE_DEBUG && error instanceof Error) process.stderr.write(`${error.stack}\n`);
  return 1;
}
