// Help for the terminal and option tables for README, both generated from the command table,
// in one layout for every command.

import { COMMAND_TABLE, COMMON_EXIT_CODES, type CommandName, type CommandSpec, type OptionSpec } from "./command-table.ts";

/** `--dims N`, `--[no-]calibrate`, `--json`: how an option is written. */
export function optionSyntax(flag: string, spec: OptionSpec): string {
  if (spec.negatable) return `--[no-]${flag.slice(2)}`;
  return spec.value === undefined ? flag : `${flag} ${spec.value}`;
}

/** The description with its default, as one line. */
function describeOption(spec: OptionSpec): string {
  return spec.default === undefined ? spec.description : `${spec.description} (default ${spec.default})`;
}

function exitCodesOf(spec: CommandSpec): [string, string][] {
  return Object.entries({ ...COMMON_EXIT_CODES, ...(spec.exitCodes ?? {}) });
}

/**
 * A command's --help: usage, what it does, its options by group with defaults and allowed
 * values, exit codes, and the environment it reads.
 * @example commandHelp("eval").startsWith("usage: sluice eval <model> <data> [options]") // true
 */
export function commandHelp(name: CommandName): string {
  const spec = COMMAND_TABLE[name] as CommandSpec;
  const lines = [`usage: sluice ${name} ${spec.arguments} [options]`, "", spec.summary];
  if (spec.details) lines.push("", ...spec.details);
  const rows = spec.groups.flatMap((group) => Object.entries(group.options).map(([flag, option]) => optionSyntax(flag, option)));
  const width = Math.min(34, Math.max(...rows.map((row) => row.length)));
  for (const group of spec.groups) {
    lines.push("", `${group.title}:`);
    for (const [flag, option] of Object.entries(group.options)) {
      const syntax = optionSyntax(flag, option);
      const text = describeOption(option);
      lines.push(syntax.length > width ? `  ${syntax}\n  ${" ".repeat(width)}  ${text}` : `  ${syntax.padEnd(width)}  ${text}`);
    }
  }
  lines.push("", "exit codes:", ...exitCodesOf(spec).map(([code, meaning]) => `  ${code}  ${meaning}`));
  if (spec.environment) {
    const names = Object.keys(spec.environment);
    const nameWidth = Math.max(...names.map((n) => n.length));
    lines.push("", "environment (the Worker's [vars] and secret names):", ...Object.entries(spec.environment).map(([n, meaning]) => `  ${n.padEnd(nameWidth)}  ${meaning}`));
  }
  return lines.join("\n");
}

/** `sluice` and `sluice --help`: the commands, one line each. */
export function overviewHelp(version: string): string {
  const names = Object.keys(COMMAND_TABLE) as CommandName[];
  const heads = names.map((name) => `${name} ${COMMAND_TABLE[name].arguments}`);
  const width = Math.max(...heads.map((h) => h.length));
  return [
    `sluice ${version}: text classifiers compiled for the edge`,
    "",
    "usage: sluice <command> [options]",
    "",
    ...names.map((name, i) => `  ${heads[i].padEnd(width)}  ${COMMAND_TABLE[name].summary}`),
    "",
    "sluice <command> --help lists a command's options, defaults and exit codes.",
  ].join("\n");
}

function cell(text: string): string {
  return text.replace(/\|/g, "\\|");
}

/**
 * README's CLI reference: the commands, then each command's options, as Markdown tables.
 * README holds this text between markers; a test fails when it differs from the table.
 * @example readmeReference().includes("| `build <data>` |") // true
 */
export function readmeReference(): string {
  const names = Object.keys(COMMAND_TABLE) as CommandName[];
  const out = ["| command | does |", "| --- | --- |", ...names.map((name) => `| \`${cell(`${name} ${COMMAND_TABLE[name].arguments}`)}\` | ${cell(COMMAND_TABLE[name].summary)} |`)];
  const codes = Object.entries(COMMON_EXIT_CODES).map(([code, meaning]) => `${code} ${meaning}`);
  out.push("", `Exit codes: ${codes.join("; ")}. \`compare\` adds ${Object.entries((COMMAND_TABLE.compare as CommandSpec).exitCodes ?? {}).map(([code, meaning]) => `${code} (${meaning})`).join(" and ")}.`);
  // Groups shared by several commands (data options) are printed once, where first used.
  const printed = new Map<string, string>();
  for (const name of names) {
    const spec = COMMAND_TABLE[name] as CommandSpec;
    out.push("", `**\`sluice ${name}\`** — ${cell(spec.summary)}`, "");
    const references: string[] = [];
    const rows: string[] = [];
    for (const group of spec.groups) {
      const earlier = printed.get(group.title + JSON.stringify(group.options));
      if (earlier !== undefined) {
        references.push(`${group.title} as for \`${earlier}\``);
        continue;
      }
      printed.set(group.title + JSON.stringify(group.options), name);
      for (const [flag, option] of Object.entries(group.options)) rows.push(`| \`${cell(optionSyntax(flag, option))}\` | ${cell(option.default ?? "")} | ${cell(option.description)} |`);
    }
    if (references.length > 0) out.push(`Takes the ${references.join(", ")}.`, "");
    if (rows.length > 0) out.push("| option | default | meaning |", "| --- | --- | --- |", ...rows);
    if (spec.environment) out.push("", `Environment: ${Object.entries(spec.environment).map(([n, meaning]) => `\`${n}\` (${cell(meaning)})`).join(", ")}.`);
  }
  return out.join("\n");
}

export const README_BEGIN = "<!-- generated from compiler/cli/command-table.ts by `npm run readme:options`; do not edit by hand -->";
export const README_END = "<!-- end of generated CLI reference -->";

/**
 * README with its generated block replaced by the current reference.
 * @example spliceReadme(readme).includes(README_BEGIN) // true
 */
export function spliceReadme(readme: string): string {
  const start = readme.indexOf(README_BEGIN);
  const end = readme.indexOf(README_END);
  if (start < 0 || end < start) throw new Error(`README has no generated block (markers ${README_BEGIN} … ${README_END})`);
  return `${readme.slice(0, start + README_BEGIN.length)}\n${readmeReference()}\n${readme.slice(end)}`;
}
