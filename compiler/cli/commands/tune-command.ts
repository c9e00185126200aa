// `sluice tune <data> --time 10m [--max-bytes 256k] [--max-us 20] [--metric …] [--out sluice.config.json]`

import { defaultBuildSettings, parseSize } from "../../build/build-settings.ts";
import { parseMetric } from "../../tune/objective.ts";
import { searchedSettings } from "../../tune/search-space.ts";
import { tune, type TrialResult } from "../../tune/tune.ts";
import { fixed, formatTable } from "../format-table.ts";
import { parseArgs, UsageError, valueOf, type FlagSpec } from "../parse-args.ts";
import { DATA_FLAGS, readData } from "../read-data.ts";
import { writeFileAtomic } from "../write-file-atomic.ts";

export const TUNE_FLAGS: Record<string, FlagSpec> = {
  ...DATA_FLAGS,
  "--time": { takesValue: true, description: "time budget: 90s, 5m, 1h (default 5m)" },
  "--trials": { takesValue: true, description: "stop after N trials even with time left (reproducible runs)" },
  "--max-bytes": { takesValue: true, description: "size budget of the compiled model; every trial is compiled under it" },
  "--max-us": { takesValue: true, description: "latency budget: µs per classify call, measured in this process" },
  "--metric": { takesValue: true, description: "macro-f1 (default), accuracy, or recall-at-precision:<label>=<p>" },
  "--head": { takesValue: true, description: "auto (default), softmax, sigmoid or tree" },
  "--seed": { takesValue: true, description: "seed of the search and the builds (default 1)" },
  "--out": { takesValue: true, description: "config file for `sluice build --config` (default sluice.config.json)" },
  "--force": { takesValue: false, description: "replace the config file if it exists" },
  "--json": { takesValue: false, description: "print the result as one JSON object" },
  "--quiet": { takesValue: false, description: "no progress on stderr" },
};

/** Parses "90s", "5m", "1h" or plain seconds. */
export function parseDuration(text: string): number {
  const match = /^(\d+(?:\.\d+)?)\s*(s|m|h)?$/.exec(text.trim());
  if (!match) throw new UsageError(`--time: expected a duration like 90s, 5m or 1h, got "${text}"`);
  return Number(match[1]) * (match[2] === "h" ? 3600 : match[2] === "m" ? 60 : 1);
}

/** Runs the tune command; returns the exit code. */
export async function tuneCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, TUNE_FLAGS);
  if (args.positionals.length !== 1) throw new UsageError("tune needs one data file: sluice tune <data> --time 5m");
  const quiet = args.switches.get("--quiet") === true;
  const json = args.switches.get("--json") === true;
  const base = defaultBuildSettings();
  const maxBytesText = valueOf(args, "--max-bytes");
  if (maxBytesText !== undefined) {
    const size = parseSize(maxBytesText);
    if (size === null) throw new UsageError(`--max-bytes: expected a size like 256k, got "${maxBytesText}"`);
    base.maxBytes = size;
  }
  const head = valueOf(args, "--head");
  if (head !== undefined) {
    if (!["auto", "softmax", "sigmoid", "tree"].includes(head)) throw new UsageError(`--head: expected auto, softmax, sigmoid or tree, got "${head}"`);
    base.head = head as typeof base.head;
  }
  const seed = Number(valueOf(args, "--seed") ?? "1");
  if (!Number.isInteger(seed) || seed < 0) throw new UsageError("--seed: expected a non-negative integer");
  base.seed = seed;
  const trialsText = valueOf(args, "--trials");
  const maxTrials = trialsText === undefined ? undefined : Number(trialsText);
  if (maxTrials !== undefined && (!Number.isInteger(maxTrials) || maxTrials < 1)) throw new UsageError("--trials: expected a positive integer");
  const maxUsText = valueOf(args, "--max-us");
  const maxMicroseconds = maxUsText === undefined ? undefined : Number(maxUsText);
  if (maxMicroseconds !== undefined && !(maxMicroseconds > 0)) throw new UsageError("--max-us: expected a positive number");
  const metricText = valueOf(args, "--metric") ?? "macro-f1";
  const metric = parseMetric(metricText);
  const out = valueOf(args, "--out") ?? "sluice.config.json";
  const { examples } = await readData(args.positionals[0], args, { textFields: ["text"], labelField: "label" }, true, quiet);
  const result = await tune({
    examples,
    base,
    timeSeconds: parseDuration(valueOf(args, "--time") ?? "5m"),
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
    build: searchedSettings(result.best.settings),
    tune: {
      metric: metricText,
      score: result.best.score,
      bytes: result.best.bytes,
      microsecondsPerDoc: result.best.microsecondsPerDoc,
      baselineScore: result.baseline.score,
      trials: result.trials.length,
      folds: result.folds,
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
      `${result.trials.length} trials (${result.folds === 1 ? "20% stratified holdout" : `${result.folds}-fold cross-validation`}); scores are of compiled models`,
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
      `wrote ${out}; build with: sluice build ${args.positionals[0]} --config ${out}`,
    ].join("\n") + "\n",
  );
  return 0;
}

function describeTrial(t: TrialResult) {
  return { id: t.id, score: t.score, bytes: t.bytes, microsecondsPerDoc: t.microsecondsPerDoc, baseline: t.baseline, settings: searchedSettings(t.settings) };
}
