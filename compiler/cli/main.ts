// The sluice command line: parse the command, run it, turn errors into one clear line on
// stderr and a non-zero exit code. All real work lives in the programmatic API.

import { InputError, ModelFormatError } from "../../runtime/errors.ts";
import { SettingError } from "../build/build-settings.ts";
import { DataError } from "../read/index.ts";
import { TOOL_VERSION } from "../version.ts";
import type { CommandName } from "./command-table.ts";
import { commandHelp, overviewHelp } from "./help-text.ts";
import { UsageError } from "./parse-args.ts";

type Command = (argv: string[]) => Promise<number>;

/** Each command's code, loaded only when it runs (start-up stays small). */
const RUNNERS: Record<CommandName, () => Promise<Command>> = {
  build: async () => (await import("./commands/build-command.ts")).buildCommand,
  eval: async () => (await import("./commands/eval-command.ts")).evalCommand,
  classify: async () => (await import("./commands/classify-command.ts")).classifyCommand,
  explain: async () => (await import("./commands/explain-command.ts")).explainCommand,
  inspect: async () => (await import("./commands/inspect-command.ts")).inspectCommand,
  compare: async () => (await import("./commands/compare-command.ts")).compareCommand,
  report: async () => (await import("./commands/report-command.ts")).reportCommand,
  "traffic-report": async () => (await import("./commands/traffic-report-command.ts")).trafficReportCommand,
  tune: async () => (await import("./commands/tune-command.ts")).tuneCommand,
  serve: async () => (await import("./commands/serve-command.ts")).serveCommand,
};

/**
 * Runs the CLI with the given arguments (without `node` and the script); returns the exit code.
 * @example await main(["inspect", "model.sluice"])
 */
export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined) {
    // No command is bad usage: the overview goes to stderr with exit 2, like any other.
    process.stderr.write(`${overviewHelp(TOOL_VERSION)}\n`);
    return 2;
  }
  if (name === "--help" || name === "-h" || name === "help") {
    process.stdout.write(`${overviewHelp(TOOL_VERSION)}\n`);
    return 0;
  }
  if (name === "--version") {
    process.stdout.write(`${TOOL_VERSION}\n`);
    return 0;
  }
  if (!Object.hasOwn(RUNNERS, name)) {
    process.stderr.write(`sluice: unknown command "${name}"\n\n${overviewHelp(TOOL_VERSION)}\n`);
    return 2;
  }
  const command = name as CommandName;
  try {
    if (rest.includes("--help")) {
      process.stdout.write(`${commandHelp(command)}\n`);
      return 0;
    }
    const run = await RUNNERS[command]();
    return await run(rest);
  } catch (error) {
    return reportError(name, error);
  }
}

function reportError(command: string, error: unknown): number {
  if (error instanceof UsageError) {
    process.stderr.write(`sluice ${command}: ${error.message} (sluice ${command} --help lists the options)\n`);
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
