// Benchmark results on disk: test/bench/results/<name>.json (machine-readable) and .md
// (for people), both stamped with the machine, the Node version and the date, because a
// timing means nothing without the computer that produced it.

import { mkdirSync, writeFileSync } from "node:fs";
import { cpus, totalmem } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

/** Where results go: test/bench/results under the repository root. */
export const RESULTS_DIRECTORY = join(dirname(fileURLToPath(import.meta.url)), "..", "..", "test", "bench", "results");

/** The computer a measurement was taken on. */
export interface MachineInfo {
  cpu: string;
  cores: number;
  memoryBytes: number;
  node: string;
  platform: string;
}

/**
 * The current machine, as recorded beside every result.
 * @example machineInfo().cores // 2
 */
export function machineInfo(): MachineInfo {
  const processors = cpus();
  return {
    cpu: processors[0]?.model.trim() ?? "unknown",
    cores: processors.length,
    memoryBytes: totalmem(),
    node: process.version,
    platform: `${process.platform} ${process.arch}`,
  };
}

/**
 * One line naming the machine, for the top of a results page.
 * @example describeMachine(machineInfo()) // "Intel(R) Xeon(R) …, 2 cores, 23.5 GiB, Node v20.20.0, linux x64"
 */
export function describeMachine(machine: MachineInfo): string {
  const gib = (machine.memoryBytes / 1024 ** 3).toFixed(1);
  return `${machine.cpu}, ${machine.cores} cores, ${gib} GiB, Node ${machine.node}, ${machine.platform}`;
}

/**
 * Writes `<name>.json` ({ name, date, machine, data }) and `<name>.md` (a title, the machine
 * and date line, then `markdown`) into `directory`; returns both paths.
 * @example writeResults("comparison", rows, formatComparison(rows))
 */
export function writeResults(name: string, data: unknown, markdown: string, directory: string = RESULTS_DIRECTORY): { json: string; markdown: string } {
  if (!/^[a-z0-9][a-z0-9-]*$/.test(name)) throw new Error(`results name "${name}": expected kebab-case letters, digits and dashes`);
  const date = new Date().toISOString();
  const machine = machineInfo();
  mkdirSync(directory, { recursive: true });
  const jsonPath = join(directory, `${name}.json`);
  const markdownPath = join(directory, `${name}.md`);
  writeFileSync(jsonPath, `${JSON.stringify({ name, date, machine, data }, null, 2)}\n`);
  writeFileSync(markdownPath, `# ${name}\n\nMeasured ${date} on ${describeMachine(machine)}.\n\n${markdown.trimEnd()}\n`);
  return { json: jsonPath, markdown: markdownPath };
}

/** Column alignment in a markdown table. */
export type Alignment = "left" | "right";

/**
 * A GitHub-flavoured markdown table; `|` inside cells is escaped, columns are padded so
 * the raw text lines up in a terminal too.
 * @example markdownTable(["system", "accuracy"], [["Sluice", "0.981"]], ["left", "right"])
 */
export function markdownTable(headers: readonly string[], rows: readonly (readonly string[])[], alignments: readonly Alignment[] = []): string {
  const escape = (cell: string) => cell.replace(/\|/g, "\\|");
  const body = rows.map((row) => headers.map((_, i) => escape(row[i] ?? "")));
  const head = headers.map(escape);
  const widths = head.map((cell, i) => Math.max(3, cell.length, ...body.map((row) => row[i].length)));
  const pad = (cell: string, i: number) => (alignments[i] === "right" ? cell.padStart(widths[i]) : cell.padEnd(widths[i]));
  const line = (cells: string[]) => `| ${cells.map(pad).join(" | ")} |`;
  const rule = `| ${widths.map((width, i) => (alignments[i] === "right" ? `${"-".repeat(width - 1)}:` : "-".repeat(width))).join(" | ")} |`;
  return [line(head), rule, ...body.map(line)].join("\n");
}
