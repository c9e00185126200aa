// Reading a data file for a command: the shared data flags, the read report on stderr,
// and the SHA-256 of the file for provenance.

import { createHash } from "node:crypto";
import { createReadStream } from "node:fs";
import { createReadReport, readExamples, readExamplesFromText, type DataFormat, type Example, type ReadReport } from "../read/index.ts";
import { checkInputFile } from "./input-path.ts";
import { valueOf, type ParsedArgs } from "./parse-args.ts";

/** How to read a file when no flag says otherwise: the model's fields, or a config's. */
export interface FieldDefaults {
  textFields: string[];
  labelField: string;
  /** Separator of several labels in one cell, when the data has them. */
  labelSep?: string;
  format?: DataFormat;
}

/** The reading settings a config file records (`sluice tune` writes them, `build --config` reads them). */
export function readSettingsOf(options: ReturnType<typeof readOptionsFrom>): FieldDefaults {
  const settings: FieldDefaults = { textFields: options.textFields, labelField: options.labelField };
  if (options.labelSep !== undefined) settings.labelSep = options.labelSep;
  if (options.format !== undefined) settings.format = options.format;
  return settings;
}

/** Reader options from the data flags. */
export function readOptionsFrom(args: ParsedArgs, defaults: FieldDefaults, requireLabels: boolean) {
  const textFieldValue = valueOf(args, "--text-field");
  const format = valueOf(args, "--format");
  return {
    textFields: textFieldValue ? textFieldValue.split(",").map((f) => f.trim()).filter(Boolean) : defaults.textFields,
    labelField: valueOf(args, "--label-field") ?? defaults.labelField,
    labelSep: valueOf(args, "--label-sep") ?? defaults.labelSep,
    groupField: valueOf(args, "--group-field"),
    format: (format as DataFormat | undefined) ?? defaults.format,
    requireLabels,
    skipBad: args.switches.get("--skip-bad") === true,
  };
}

/** Reads every example of `path` ("-" = stdin); prints the read report to stderr. A missing
 * path or a folder is refused first (before the format is guessed from the name). */
export async function readData(path: string, args: ParsedArgs, defaults: FieldDefaults, requireLabels: boolean, quiet: boolean): Promise<{ examples: Example[]; report: ReadReport }> {
  checkInputFile(path, "data file");
  const options = readOptionsFrom(args, defaults, requireLabels);
  const report = createReadReport(path);
  const examples: Example[] = [];
  const source = path === "-" ? readExamplesFromText("stdin", await readStdin(), { ...options, format: options.format ?? "jsonl" }, report) : readExamples(path, options, report);
  for await (const example of source) examples.push(example);
  if (!quiet) describeReadReport(report);
  return { examples, report };
}

/** One line (plus samples) about what was read and what was left out, on stderr. */
export function describeReadReport(report: ReadReport): void {
  const parts = [`${report.examples} examples`];
  if (report.skipped > 0) {
    const lines = report.skippedLines > report.skipped ? `, ${report.skippedLines} lines of the file` : "";
    parts.push(`${report.skipped} bad ${report.skipped === 1 ? "row" : "rows"} skipped (${Object.entries(report.skippedByReason).map(([r, n]) => `${r}: ${n}`).join(", ")}${lines})`);
  }
  if (report.emptyText > 0) parts.push(`${report.emptyText} empty texts left out`);
  if (report.missingLabel > 0) parts.push(`${report.missingLabel} rows without a label left out`);
  process.stderr.write(`${report.file}: ${report.rows} rows → ${parts.join(", ")}\n`);
  for (const sample of report.samples) process.stderr.write(`  ${sample}\n`);
}

/** SHA-256 of a file, streamed. */
export async function sha256OfFile(path: string): Promise<string> {
  const hash = createHash("sha256");
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest("hex");
}

/** All of stdin as text. */
export async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString("utf8");
}
