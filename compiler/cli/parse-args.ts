// A small argument parser: positionals plus long flags (`--name value`, `--name=value`,
// boolean `--name` / `--no-name`). Each command declares its flags; anything else is an
// error that names the flag and lists the ones the command knows.

export interface FlagSpec {
  /** Takes a value (string) or is a switch. */
  takesValue: boolean;
  /** May be given several times (values are collected). */
  repeatable?: boolean;
  description: string;
}

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
 * @example parseArgs(["data.csv", "--dims", "16"], { "--dims": { takesValue: true, description: "" } })
 */
export function parseArgs(argv: readonly string[], flags: Record<string, FlagSpec>): ParsedArgs {
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
    let name = equals >= 0 ? arg.slice(0, equals) : arg;
    let inline: string | undefined = equals >= 0 ? arg.slice(equals + 1) : undefined;
    let spec = flags[name];
    if (!spec && name.startsWith("--no-") && flags[`--${name.slice(5)}`] && !flags[`--${name.slice(5)}`].takesValue) {
      result.switches.set(`--${name.slice(5)}`, false);
      continue;
    }
    if (!spec) {
      const known = Object.keys(flags).sort().join(", ");
      throw new UsageError(`unknown option ${name}; this command knows: ${known}`);
    }
    if (!spec.takesValue) {
      if (inline !== undefined) throw new UsageError(`${name} is a switch and takes no value`);
      result.switches.set(name, true);
      continue;
    }
    if (inline === undefined) {
      if (i + 1 >= argv.length) throw new UsageError(`${name} needs a value`);
      inline = argv[++i];
    }
    const list = result.values.get(name) ?? [];
    if (list.length > 0 && !spec.repeatable) throw new UsageError(`${name} was given twice`);
    list.push(inline);
    result.values.set(name, list);
    name = "";
    spec = undefined as unknown as FlagSpec;
  }
  return result;
}

/** The single value of a flag, or undefined. */
export function valueOf(args: ParsedArgs, flag: string): string | undefined {
  return args.values.get(flag)?.[0];
}
