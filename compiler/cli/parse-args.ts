// A small argument parser: positionals plus long flags (`--name value`, `--name=value`,
// boolean `--name` / `--no-name`). Each command declares its flags; anything else is an
// error that names the flag and lists the ones the command knows.

import type { OptionSpec } from "./command-table.ts";

export interface ParsedArgs {
  positionals: string[];
  values: Map<string, string[]>;
  switches: Map<string, boolean>;
}

/** Thrown for a malformed command line; the CLI prints it with the command's usage. */
export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "UsageError";
  }
}

/**
 * Parses argv against the flags a command knows.
 * @example parseArgs(["data.csv", "--dims", "16"], { "--dims": { value: "N", description: "width" } })
 */
export function parseArgs(argv: readonly string[], flags: Record<string, OptionSpec>): ParsedArgs {
  const result: ParsedArgs = { positionals: [], values: new Map(), switches: new Map() };
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--") {
      result.positionals.push(...argv.slice(i + 1));
      break;
    }
    if (!arg.startsWith("--") || arg === "-") {
      result.positionals.push(arg);
      continue;
    }
    const equals = arg.indexOf("=");
    const name = equals >= 0 ? arg.slice(0, equals) : arg;
    let inline: string | undefined = equals >= 0 ? arg.slice(equals + 1) : undefined;
    const spec = flags[name];
    if (!spec && name.startsWith("--no-") && flags[`--${name.slice(5)}`] && flags[`--${name.slice(5)}`].value === undefined) {
      result.switches.set(`--${name.slice(5)}`, false);
      continue;
    }
    if (!spec) {
      const known = Object.keys(flags).sort().join(", ");
      throw new UsageError(`unknown option ${name}; this command knows: ${known}`);
    }
    if (spec.value === undefined) {
      if (inline !== undefined) throw new UsageError(`${name} is a switch and takes no value`);
      result.switches.set(name, true);
      continue;
    }
    if (inline === undefined) {
      if (i + 1 >= argv.length) throw new UsageError(`${name} needs a value`);
      inline = argv[++i];
    }
    if (spec.values && !spec.values.includes(inline)) throw new UsageError(`${name}: expected ${listOfChoices(spec.values)}, got ${JSON.stringify(inline)}`);
    const list = result.values.get(name) ?? [];
    if (list.length > 0 && !spec.repeatable) throw new UsageError(`${name} was given twice`);
    list.push(inline);
    result.values.set(name, list);
  }
  return result;
}

/** The single value of a flag, or undefined. */
export function valueOf(args: ParsedArgs, flag: string): string | undefined {
  return args.values.get(flag)?.[0];
}

/** ["a", "b", "c"] → "a, b or c". */
export function listOfChoices(values: readonly string[]): string {
  return values.length <= 1 ? values.join("") : `${values.slice(0, -1).join(", ")} or ${values[values.length - 1]}`;
}
