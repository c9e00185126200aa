// `sluice tune <data> [--time 2m] [--max-bytes 256k] [--max-us 20] [--objective recall --at-precision spam=0.99] [--out sluice.config.json]`
// The config it writes holds the reading settings (fields, label separator, format) beside the
// build settings, so the `sluice build <data> --config …` it prints reads the data the same way.

import { defaultBuildSettings, parseSetting } from "../../build/build-settings.ts";
import { describeObjective, parseObjective } from "../../tune/objective.ts";
import { searchedSettings } from "../../tune/search-space.ts";
import { tune, type TrialResult } from "../../tune/tune.ts";
import { TUNE_BUDGET_RULE } from "../../tune/tune-defaults.ts";
import { optionsOf } from "../command-table.ts";
import { fixed, formatTable } from "../format-table.ts";
import { parseArgs, UsageError, valueOf } from "../parse-args.ts";
import { readData, readOptionsFrom, readSettingsOf } from "../read-data.ts";
import { checkInputFile } from "../input-path.ts";
import { checkOutputPath } from "../output-path.ts";
import { writeFileAtomic } from "../write-file-atomic.ts";

const TUNE_OPTIONS = optionsOf("tune");

/** Parses "90s", "5m", "1h" or plain seconds. */
export function parseDuration(text: string): number {
  const match = /^(\d+(?:\.\d+)?)\s*(s|m|h)?$/.exec(text.trim());
  if (!match) throw new UsageError(`--time: expected a duration like 90s, 5m or 1h, got "${text}"`);
  return Number(match[1]) * (match[2] === "h" ? 3600 : match[2] === "m" ? 60 : 1);
}

/** Runs the tune command; returns the exit code. */
export async function tuneCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, TUNE_OPTIONS);
  if (args.positionals.length !== 1) throw new UsageError("tune needs one data file: sluice tune <data> [--time 2m]");
  const quiet = args.switches.get("--quiet") === true;
  const json = args.switches.get("--json") === true;
  const base = defaultBuildSettings();
  const maxBytesText = valueOf(args, "--max-bytes");
  if (maxBytesText !== undefined) base.maxBytes = parseSetting("maxBytes", maxBytesText, "--max-bytes");
  const head = valueOf(args, "--head");
  if (head !== undefined) base.head = parseSetting("head", head, "--head");
  const seedText = valueOf(args, "--seed");
  if (seedText !== undefined) base.seed = parseSetting("seed", seedText, "--seed");
  const seed = base.seed;
  const trialsText = valueOf(args, "--trials");
  const maxTrials = trialsText === undefined ? undefined : Number(trialsText);
  if (maxTrials !== undefined && (!Number.isInteger(maxTrials) || maxTrials < 1)) throw new UsageError("--trials: expected a positive integer");
  const maxUsText = valueOf(args, "--max-us");
  const maxMicroseconds = maxUsText === undefined ? undefined : Number(maxUsText);
  if (maxMicroseconds !== undefined && !(maxMicroseconds > 0)) throw new UsageError("--max-us: expected a positive number");
  const objectiveText = valueOf(args, "--objective") ?? "macro-f1";
  const atPrecision = valueOf(args, "--at-precision");
  let metric: ReturnType<typeof parseObjective>;
  try {
    metric = parseObjective(objectiveText, atPrecision);
  } catch (error) {
    throw new UsageError((error as Error).message);
  }
  const metricText = describeObjective(metric);
  const out = valueOf(args, "--out") ?? "sluice.config.json";
  checkInputFile(args.positionals[0], "data file");
  checkOutputPath(out, { inputs: [args.positionals[0]], force: args.switches.get("--force") === true });
  const readDefaults = { textFields: ["text"], labelField: "label" };
  const read = readSettingsOf(readOptionsFrom(args, readDefaults, true));
  const { examples } = await readData(args.positionals[0], args, readDefaults, true, quiet);
  const timeText = valueOf(args, "--time");
  const result = await tune({
    examples,
    base,
    timeSeconds: timeText === undefined ? undefined : parseDuration(timeText),
    maxTrials,
    maxMicroseconds,
    metric,
    seed,
    onTrial: quiet
      ? undefined
      : (trial, state) =>
          process.stderr.write(
            `trial ${trial.id}${trial.baseline ? " (defaults)" : ""}: ${Math.round(trial.resource * 100)}% data, ${metricText} ${fixed(trial.score)}, ${trial.bytes} B, ${trial.microsecondsPerDoc.toFixed(1)} µs/doc${trial.withinBudget ? "" : " (over --max-us)"}, ${trial.seconds.toFixed(1)} s · best ${state.best ? fixed(state.best.score) : "n/a"} · ${Math.round(state.secondsLeft)} s left\n`,
          ),
  });
  const config = {
    read,
    build: searchedSettings(result.best.settings),
    tune: {
      objective: objectiveText,
      ...(metric.kind === "recall" ? { atPrecision: { [metric.label]: metric.precision } } : {}),
      score: result.best.score,
      bytes: result.best.bytes,
      microsecondsPerDoc: result.best.microsecondsPerDoc,
      baselineScore: result.baseline.score,
      trials: result.trials.length,
      folds: result.folds,
      timeSeconds: round(result.timeSeconds),
      defaultBuildSeconds: round(result.defaultBuildSeconds),
      seed,
    },
  };
  writeFileAtomic(out, `${JSON.stringify(config, null, 2)}\n`, { force: args.switches.get("--force") === true });
  if (json) {
    process.stdout.write(`${JSON.stringify({ out, ...config, pareto: result.pareto.map(describeTrial) })}\n`);
    return 0;
  }
  process.stdout.write(
    [
      `${result.trials.length} trials in a budget of ${Math.round(result.timeSeconds)} s${timeText === undefined ? ` (${TUNE_BUDGET_RULE}: one took ${result.defaultBuildSeconds.toFixed(2)} s)` : ""}; maximizing ${metricText}`,
      `validation: ${result.folds === 1 ? "20% stratified holdout" : `${result.folds}-fold cross-validation`}; scores are of compiled models`,
      "",
      "Pareto front (full-size trials no other beats on score, bytes and µs/doc at once):",
      formatTable(
        ["trial", metricText, "bytes", "µs/doc", "dims", "words", "chars", "hash bits", "min docs", "weighting", "epochs", "rate"],
        result.pareto.map((t) => [
          `${t.id}${t.baseline ? " (defaults)" : ""}${t === result.best ? " *" : ""}`,
          fixed(t.score),
          t.bytes,
          t.microsecondsPerDoc.toFixed(1),
          t.settings.dims,
          t.settings.wordSpan,
          t.settings.charSpan[0] === 0 ? "off" : t.settings.charSpan.join("-"),
          t.settings.hashBits,
          t.settings.minDocs,
          t.settings.weighting,
          t.settings.epochs,
          t.settings.learningRate,
        ]),
      ),
      "",
      `best: trial ${result.best.id}, ${metricText} ${fixed(result.best.score)} (defaults: ${fixed(result.baseline.score)}), ${result.best.bytes} bytes, ${result.best.microsecondsPerDoc.toFixed(1)} µs/doc`,
      `wrote ${out} (build and reading settings); build with: sluice build ${shellWord(args.positionals[0])} --config ${shellWord(out)}`,
    ].join("\n") + "\n",
  );
  return 0;
}

function round(seconds: number): number {
  return Math.round(seconds * 100) / 100;
}

/** A path as one shell word (quoted when it holds anything a shell would split or expand). */
function shellWord(text: string): string {
  return /^[\w./@%+=:,-]+$/.test(text) ? text : `'${text.replace(/'/g, "'\\''")}'`;
}

function describeTrial(t: TrialResult) {
  return { id: t.id, score: t.score, bytes: t.bytes, microsecondsPerDoc: t.microsecondsPerDoc, baseline: t.baseline, settings: searchedSettings(t.settings) };
}
