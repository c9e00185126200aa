// `sluice build <data> --out model.sluice`: read → train → prune → quantize → verify → write.

import { readFileSync } from "node:fs";
import { basename } from "node:path";
import { build } from "../../build/build.ts";
import type { BuildReport } from "../../build/build-report.ts";
import type { CalibrationReport } from "../../compile/calibrate.ts";
import { BUILD_SETTINGS, parseSetting, parseSize, resolveBuildSettings, SettingError, type BuildSettings } from "../../build/build-settings.ts";
import { chooseBuildPath } from "../choose-build-path.ts";
import { createBuildProgress } from "../progress-bar.ts";
import { fixed, formatTable } from "../format-table.ts";
import { optionsOf } from "../command-table.ts";
import { parseArgs, UsageError, valueOf, type ParsedArgs } from "../parse-args.ts";
import type { Example } from "../../read/index.ts";
import { describeReadReport, readData, readOptionsFrom, readSettingsOf, sha256OfFile, type FieldDefaults } from "../read-data.ts";
import { buildFromFile } from "../../build/build-from-file.ts";
import { describeChoice } from "../../build/search-settings.ts";
import { createReadReport } from "../../read/index.ts";
import { checkInputFile } from "../input-path.ts";
import { checkOutputPath } from "../output-path.ts";
import { writeFileAtomic } from "../write-file-atomic.ts";

const BUILD_OPTIONS = optionsOf("build");


/** Runs the build command; returns the exit code. */
export async function buildCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, BUILD_OPTIONS);
  if (args.positionals.length !== 1) throw new UsageError("build needs exactly one data file: sluice build <data> [--out model.sluice]");
  const dataPath = args.positionals[0];
  const quiet = args.switches.get("--quiet") === true;
  const json = args.switches.get("--json") === true;
  const progress = createBuildProgress(!quiet && !json);
  const say = (message: string) => {
    progress.clear();
    if (!quiet) process.stderr.write(`${message}\n`);
  };
  const out = valueOf(args, "--out") ?? "model.sluice";
  const force = args.switches.get("--force") === true;
  const validationPath = valueOf(args, "--validation");
  // Before any reading or training: a bad path must not cost a whole training run.
  const alsoPaths = args.values.get("--also") ?? [];
  checkInputFile(dataPath, "data file");
  checkInputFile(validationPath, "validation file");
  for (const path of alsoPaths) checkInputFile(path, "--also file");
  checkInputFile(valueOf(args, "--config"), "config file");
  checkOutputPath(out, { inputs: [dataPath, validationPath, valueOf(args, "--config"), ...alsoPaths], force });
  const { settings, read, explicit } = settingsFromArgs(args);
  // Flags win over the config's reading settings, which win over the built-in defaults.
  const fields = readSettingsOf(readOptionsFrom(args, read, true));
  const validation = validationPath ? await readWithProgress(validationPath, args, fields, quiet, progress) : undefined;
  const alsoTrain = await readAlsoTrain(args, quiet);
  const common = {
    validation,
    ...(alsoTrain !== undefined ? { alsoTrain } : {}),
    settings,
    explicit,
    buildTime: buildTime(),
    latencyInFile: process.env.SOURCE_DATE_EPOCH === undefined,
    dataSha256: await sha256OfFile(dataPath),
    dataName: basename(dataPath),
    onProgress: progress.onTrain,
    onStage: progress.onStage,
    onMessage: say,
    fields: { text: fields.textFields, label: fields.labelField, ...(fields.labelSep !== undefined ? { labelSep: fields.labelSep } : {}) },
  };
  const choice = chooseBuildPath(dataPath, settings, { forceOnDisk: args.switches.get("--on-disk") === true, maxMemoryBytes: maxMemoryOf(args) });
  say(choice.reason);
  const onDisk = choice.onDisk;
  let result: Awaited<ReturnType<typeof build>>;
  if (onDisk) {
    if (alsoTrain !== undefined) throw new UsageError("--also needs an in-memory build; it cannot be combined with --on-disk (nor with data the build chose to stream from disk)");
    if (settings.threads > 1) say("note: building on disk trains with one thread");
    const readReport = createReadReport(dataPath);
    progress.stage(`reading and preparing ${dataPath} on disk`);
    result = await buildFromFile({ ...common, path: dataPath, readOptions: readOptionsFrom(args, fields, true), readReport, validation });
    progress.clear();
    if (!quiet) describeReadReport(readReport);
  } else {
    const examples = await readWithProgress(dataPath, args, fields, quiet, progress);
    progress.stage("preparing: featurizing, leak check, fingerprint");
    // The projection is of a words-only build: what the budget leaves over it bounds what the
    // search may add for a character n-gram encoding of all the data.
    result = await build({ ...common, examples, searchMemoryRoomBytes: choice.budgetBytes - choice.projectedBytes });
  }
  const { bytes, report } = result;
  progress.done();
  for (const warning of report.warnings) process.stderr.write(`warning: ${warning}\n`);
  writeFileAtomic(out, bytes, { force });
  // getrusage's maximum resident set size (kilobytes on Linux, process.resourceUsage docs).
  const peakMemoryBytes = process.resourceUsage().maxRSS * 1024;
  const memory = { onDisk, buildPath: choice.reason, peakMemoryBytes, projectedMemoryBytes: Math.round(choice.projectedBytes), memoryBudgetBytes: choice.budgetBytes };
  if (json) process.stdout.write(`${JSON.stringify({ out, ...report, ...memory })}\n`);
  else process.stdout.write(`${describeBuild(out, report)}\npeak memory ${Math.round(peakMemoryBytes / 1024 ** 2)} MB (RSS), built ${choice.reason}\n`);
  return 0;
}

/**
 * The --also files (read in the review export's layout: `text` and `label`, whatever the base
 * data's fields) and --also-weight, the number of times each of their examples is trained on.
 */
async function readAlsoTrain(args: ParsedArgs, quiet: boolean): Promise<{ examples: Example[]; repeat: number } | undefined> {
  const paths = args.values.get("--also") ?? [];
  const rawWeight = valueOf(args, "--also-weight");
  const repeat = rawWeight === undefined ? 1 : Number(rawWeight);
  if (!Number.isInteger(repeat) || repeat < 1 || repeat > 20) throw new UsageError(`--also-weight: expected an integer from 1 to 20, got "${rawWeight}"`);
  if (paths.length === 0) {
    if (rawWeight !== undefined) throw new UsageError("--also-weight needs --also <file>");
    return undefined;
  }
  const examples: Example[] = [];
  for (const path of paths) examples.push(...(await readData(path, parseArgs([], {}), READ_DEFAULTS, true, quiet)).examples);
  return { examples, repeat };
}

/** --max-memory SIZE in bytes, or undefined for the default budget. */
function maxMemoryOf(args: ReturnType<typeof parseArgs>): number | undefined {
  const text = valueOf(args, "--max-memory");
  if (text === undefined) return undefined;
  const bytes = parseSize(text);
  if (bytes === null || bytes <= 0) throw new UsageError(`--max-memory: expected a size like 512m or 2g, got "${text}"`);
  return bytes;
}

/** Reads a data file with a status line, then prints what was read. */
async function readWithProgress(path: string, args: ReturnType<typeof parseArgs>, fields: FieldDefaults, quiet: boolean, progress: ReturnType<typeof createBuildProgress>) {
  progress.stage(`reading ${path}`);
  const { examples, report } = await readData(path, args, fields, true, true);
  progress.clear();
  if (!quiet) describeReadReport(report);
  return examples;
}

/** The reading settings used when neither flags nor a config name them. */
const READ_DEFAULTS: FieldDefaults = { textFields: ["text"], labelField: "label" };

/** Build settings and reading settings from --config, then flags on top of the build settings. */
function settingsFromArgs(args: ReturnType<typeof parseArgs>): { settings: BuildSettings; read: FieldDefaults; explicit: (keyof BuildSettings)[] } {
  const configPath = valueOf(args, "--config");
  const config = configPath ? readConfig(configPath) : { build: {}, read: READ_DEFAULTS };
  const settings = resolveBuildSettings(config.build, configPath ?? "settings") as unknown as Record<string, unknown>;
  const explicit = new Set(Object.keys(config.build) as (keyof BuildSettings)[]);
  for (const [key, spec] of Object.entries(BUILD_SETTINGS)) {
    if (spec.kind === "boolean") {
      const value = args.switches.get(spec.flag);
      if (value !== undefined) {
        settings[key] = value;
        explicit.add(key as keyof BuildSettings);
      }
      continue;
    }
    const values = args.values.get(spec.flag);
    if (!values) continue;
    explicit.add(key as keyof BuildSettings);
    if (spec.kind === "map" || spec.kind === "actions") {
      const merged: Record<string, unknown> = {};
      for (const value of values) Object.assign(merged, parseSetting(key as "targetPrecision", value, spec.flag));
      settings[key] = merged;
    } else settings[key] = parseSetting(key as keyof BuildSettings, values[values.length - 1], spec.flag);
  }
  return { settings: settings as unknown as BuildSettings, read: config.read, explicit: [...explicit] };
}

/**
 * A config file: `{ "build": {...settings}, "read": { textFields, labelField, labelSep, format } }`
 * as `sluice tune` writes it, or a bare object of build settings.
 */
function readConfig(path: string): { build: Record<string, unknown>; read: FieldDefaults } {
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch (error) {
    throw new Error(`cannot read config ${path}: ${(error as Error).message}`);
  }
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch (error) {
    throw new SettingError(`${path}: not valid JSON (${(error as Error).message})`);
  }
  if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed)) throw new SettingError(`${path}: expected a JSON object of settings`);
  const object = parsed as Record<string, unknown>;
  if (!("build" in object) && !("read" in object)) return { build: object, read: READ_DEFAULTS };
  return { build: checkObject(object.build ?? {}, path, "build"), read: readSettingsFromConfig(object.read, path) };
}

function checkObject(value: unknown, path: string, key: string): Record<string, unknown> {
  if (typeof value !== "object" || value === null || Array.isArray(value)) throw new SettingError(`${path}: "${key}" must be an object`);
  return value as Record<string, unknown>;
}

function readSettingsFromConfig(value: unknown, path: string): FieldDefaults {
  if (value === undefined) return READ_DEFAULTS;
  const read = checkObject(value, path, "read");
  const fail = (key: string, expected: string): never => {
    throw new SettingError(`${path}, read setting "${key}": expected ${expected}, got ${JSON.stringify(read[key])}`);
  };
  for (const key of Object.keys(read)) if (!["textFields", "labelField", "labelSep", "format"].includes(key)) throw new SettingError(`${path}: unknown read setting "${key}" (known: textFields, labelField, labelSep, format)`);
  const textFields = read.textFields ?? READ_DEFAULTS.textFields;
  if (!Array.isArray(textFields) || textFields.length === 0 || !textFields.every((f) => typeof f === "string" && f.length > 0)) fail("textFields", "a non-empty array of field names");
  const labelField = read.labelField ?? READ_DEFAULTS.labelField;
  if (typeof labelField !== "string" || labelField === "") fail("labelField", "a field name");
  const settings: FieldDefaults = { textFields: textFields as string[], labelField: labelField as string };
  if (read.labelSep !== undefined) {
    if (typeof read.labelSep !== "string" || read.labelSep === "") fail("labelSep", "a non-empty string");
    settings.labelSep = read.labelSep as string;
  }
  if (read.format !== undefined) {
    if (!["csv", "tsv", "jsonl"].includes(read.format as string)) fail("format", "csv, tsv or jsonl");
    settings.format = read.format as FieldDefaults["format"];
  }
  return settings;
}

/** Build time for provenance: SOURCE_DATE_EPOCH (reproducible-builds.org) when set, else now. */
function buildTime(): string {
  const epoch = process.env.SOURCE_DATE_EPOCH;
  if (epoch !== undefined && /^\d+$/.test(epoch)) return new Date(Number(epoch) * 1000).toISOString();
  return new Date().toISOString();
}

/** The validation interval, how the split was made, and what the search compared. */
function describeValidation(report: BuildReport): string[] {
  const lines: string[] = [];
  if (report.validationInterval) {
    lines.push("", `validation accuracy ${fixed(report.validation.accuracy)} (95% interval ${fixed(report.validationInterval.low)}–${fixed(report.validationInterval.high)}, ${report.validationExamples} texts), macro-F1 ${fixed(report.validation.macroF1)}`);
  }
  const split = report.split;
  if (split && split.kind === "holdout" && split.clusteredRows > 0) {
    lines.push(`split: ${split.clusteredRows} rows in ${split.grouped ? `groups (${split.groups} groups)` : "clusters"}${split.nearDuplicateJoins > 0 ? `, ${split.nearDuplicateJoins} near-identical texts joined` : ""} kept on one side`);
  }
  const search = report.search;
  if (search) {
    lines.push("", `settings search (${search.seconds.toFixed(1)} s of ${search.budgetSeconds.toFixed(0)} s${search.explicit.length > 0 ? `; fixed by you: ${search.explicit.join(", ")}` : ""}):`);
    lines.push(
      formatTable(
        ["candidate", "accuracy", "macro-F1", "epochs", "work/text", "µs/300 tokens", "verdict"],
        search.candidates.map((c) => [c.name, fixed(c.accuracy), fixed(c.macroF1), c.epochs, Number.isFinite(c.workPerText) ? Math.round(c.workPerText) : "–", Number.isFinite(c.microseconds) ? c.microseconds.toFixed(1) : "–", c.verdict]),
      ),
    );
    lines.push(`chosen: ${describeChoice(search)}`);
  }
  return lines;
}

/** One line: µs per classify call for the two validation texts, measured in this process. */
export function describeLatency(latency: BuildReport["latency"]): string {
  if (latency === null) return "latency: not measured (no texts)";
  const part = (l: NonNullable<BuildReport["latency"]>["tokens20"]) => `${l.microseconds.toFixed(1)} µs for ${l.tokens} tokens`;
  return `latency (CPU time per classify call, this machine, now): ${part(latency.tokens20)}, ${part(latency.tokens300)}`;
}

function describeBuild(out: string, report: BuildReport): string {
  const lines = [
    `wrote ${out}: ${report.bytes} bytes, ${report.head} head over ${report.labels.length} labels (${report.headReason})`,
    `trained on ${report.trainExamples} examples in ${report.trainSeconds.toFixed(2)} s (${(report.tokensPerSecond / 1e6).toFixed(2)}M tokens/s); validated on ${report.validationExamples}`,
    `feature rows: ${report.rows.kept} kept of ${report.rows.seen}`,
    `time: ${Object.entries(report.stageSeconds).map(([stage, seconds]) => `${stage} ${seconds.toFixed(2)} s`).join(", ")}`,
    describeLatency(report.latency),
    "",
    formatTable(
      ["model", "accuracy", "macro-F1", "bytes"],
      [
        ["draft (float32, all rows)", fixed(report.draft.accuracy), fixed(report.draft.macroF1), report.draft.bytes],
        ["compiled (shipped)", fixed(report.compiled.accuracy), fixed(report.compiled.macroF1), report.bytes],
      ],
    ),
    ...describeValidation(report),
    "",
    `sections: ${Object.entries(report.sections).map(([name, bytes]) => `${name} ${bytes}`).join(", ")}`,
  ];
  if (report.calibration) lines.push(describeCalibration(report.calibration));
  if (report.policy) {
    for (const [label, rule] of Object.entries(report.policy)) {
      lines.push(`policy ${label}: ${rule.action} at ≥ ${rule.threshold.toFixed(3)}${rule.reviewFrom !== null ? `, review from ${rule.reviewFrom.toFixed(3)}` : ""} (validation precision ${fixed(rule.precision)}, recall ${fixed(rule.recall)}, review share ${fixed(rule.reviewShare)})`);
    }
  }
  return lines.join("\n");
}

/** What calibration did, in the terms it works in: it minimizes log loss; ECE is shown beside it. */
export function describeCalibration(c: CalibrationReport): string {
  if (c.skipped !== null) return `calibration: skipped, scores left as trained (temperature 1): ${c.skipped}`;
  return `calibration: temperature ${c.temperature.toFixed(3)}, minimizing log loss, cross-fitted over ${c.folds} folds of ${c.examples} validation examples (${c.errors} errors): held-out log loss ${fixed(c.nllBefore, 4)} → ${fixed(c.nllAfter, 4)}; ECE ${fixed(c.eceBefore)} → ${fixed(c.eceAfter)} (ECE is not what is optimized and may rise)`;
}
