// Every command and every option of the CLI in one typed table. The parser, each command's
// --help and README's option tables are all generated from it, so an option cannot exist
// without a description, and the help cannot disagree with what the parser accepts.
// Options shared by several commands are declared once, in groups.

import { BUILD_SETTINGS, type SettingSpec, type BuildSettings } from "../build/build-settings.ts";
import { SURFACE_DEFAULTS } from "../../runtime/surface-defaults.ts";
import { COMPARE_EXIT_CODES } from "../evaluate/compare-exit-codes.ts";
import { OBJECTIVES, TUNE_BUDGET_RULE } from "../tune/tune-defaults.ts";

export interface OptionSpec {
  /** Placeholder of the value (`N`, `file`); absent for a switch. */
  value?: string;
  /** The values the option accepts, when it is a choice. */
  values?: readonly string[];
  /** The default as a reader should see it; absent when there is none. */
  default?: string;
  /** May be given several times (values are collected). */
  repeatable?: boolean;
  /** A switch that is on by default and turned off with `--no-<name>`. */
  negatable?: boolean;
  description: string;
}

export type OptionTable = Record<string, OptionSpec>;

export interface OptionGroup {
  title: string;
  options: OptionTable;
}

export interface CommandSpec {
  /** Positionals after the command name, as shown in usage. */
  arguments: string;
  /** One line: what the command does. */
  summary: string;
  /** Extra lines for --help (what the output means). */
  details?: readonly string[];
  groups: readonly OptionGroup[];
  /** Exit codes beyond the common 0 / 1 / 2. */
  exitCodes?: Readonly<Record<number, string>>;
  /** Environment variables the command reads, name → meaning. */
  environment?: Readonly<Record<string, string>>;
}

/** Exit codes every command shares. */
export const COMMON_EXIT_CODES: Readonly<Record<number, string>> = {
  0: "success",
  1: "bad data, settings or model file (one line on stderr says what and where)",
  2: "bad usage: unknown command or option, missing argument",
};


const DATA: OptionGroup = {
  title: "data options (eval, classify, compare and report default to what the model was built with)",
  options: {
    "--text-field": { value: "a[,b]", default: "text, or the model's", description: "field(s) holding the text, comma-separated, joined in order" },
    "--label-field": { value: "f", default: "label, or the model's", description: "field holding the label(s)" },
    "--label-sep": { value: "s", default: "none, or the model's", description: "separator of several labels in one CSV/TSV cell (JSONL may use an array)" },
    "--group-field": { value: "f", default: "none", description: "field naming each row's origin (a document, a thread, a source): rows of one group stay on one side of build's validation split and of tune's folds" },
    "--format": { value: "csv|tsv|jsonl", values: ["csv", "tsv", "jsonl"], default: "from the extension", description: "how the data file is written" },
    "--skip-bad": { description: "skip bad rows, counting them and the lines they spanned, instead of stopping at the first" },
  },
};

// The output options several commands share, each spelled and described once: a command
// says only what differs (the file it writes by default, what its JSON holds).
const QUIET: OptionTable = { "--quiet": { description: "no progress and no messages on stderr" } };

/** `--json` with what it prints for this command. */
function json(prints: string): OptionTable {
  return { "--json": { description: `print ${prints} on stdout instead of text` } };
}

/** `--out` (the file written, its default) and `--force`, which always come together. */
function outputFile(defaultFile: string, description: string): OptionTable {
  return { "--out": { value: "file", default: defaultFile, description }, "--force": { description: "replace the output file if it exists" } };
}

/**
 * The flag spelling of a build setting, as shown in help (`--[no-]calibrate` for an on-by-default
 * switch, and for one the build's search may turn on, so that `--no-linear` can forbid it).
 */
function settingOption(spec: SettingSpec<keyof BuildSettings>): OptionSpec {
  const placeholder: Record<string, string> = { int: "N", float: "X", span: "A-B", size: "SIZE", map: "L=X", actions: "L=ACTION", seconds: "TIME" };
  if (spec.kind === "boolean") return { negatable: spec.default === true || spec.defaultText !== undefined, description: spec.description, default: spec.defaultText ?? (spec.default === true ? "on" : "off") };
  return {
    value: spec.kind === "enum" ? (spec.values ?? []).join("|") : (spec.placeholder ?? placeholder[spec.kind] ?? "X"),
    values: spec.kind === "enum" ? spec.values : undefined,
    repeatable: spec.kind === "map" || spec.kind === "actions",
    default: settingDefault(spec),
    description: spec.description,
  };
}

/** A build setting's default as text: `1m`, `0 (off)`, `on`; undefined when it has none. */
export function settingDefault(spec: SettingSpec<keyof BuildSettings>): string | undefined {
  if (spec.defaultText !== undefined) return spec.defaultText;
  const value = spec.default as unknown;
  if (spec.kind === "map" || spec.kind === "actions") return undefined;
  if (spec.kind === "span") {
    const [low, high] = value as [number, number];
    return low === 0 ? "0 (off)" : `${low}-${high}`;
  }
  if (spec.kind === "size") return formatSize(value as number);
  return String(value);
}

function formatSize(bytes: number): string {
  if (bytes === 0) return "0 (none)";
  if (bytes % (1024 * 1024) === 0) return `${bytes / (1024 * 1024)}m`;
  if (bytes % 1024 === 0) return `${bytes / 1024}k`;
  return String(bytes);
}

function buildSettingOptions(): OptionTable {
  const options: OptionTable = {};
  for (const spec of Object.values(BUILD_SETTINGS) as SettingSpec<keyof BuildSettings>[]) options[spec.flag] = settingOption(spec);
  return options;
}

/** The table of commands, in the order `sluice --help` lists them. */
export const COMMAND_TABLE = {
  build: {
    arguments: "<data>",
    summary: "read → train → prune → quantize → verify → write a model file",
    groups: [
      DATA,
      { title: "build settings (the same keys in camelCase in sluice.config.json)", options: buildSettingOptions() },
      {
        title: "input and output",
        options: {
          "--validation": { value: "file", description: "validation data file (instead of --holdout)" },
          "--also": { value: "file", repeatable: true, description: "more training examples, never held out: e.g. the review queue's export (`text` and `label` fields)" },
          "--also-weight": { value: "N", default: "1", description: "train on each --also example N times (1-20), so reviewed traffic counts more" },
          "--config": { value: "file", description: "settings file (sluice.config.json, as `sluice tune` writes it); flags override it" },
          "--on-disk": { default: "when an in-memory build would exceed --max-memory", description: "stream the data through shards on disk (bounded memory, one thread)" },
          "--max-memory": { value: "SIZE", default: "2 × the data file + 300 MB", description: "memory budget: data whose in-memory build is projected (examples × tokens, from a sample) to need more is built on disk" },
          ...outputFile("model.sluice", "output model file"),
          ...json("the build report as one JSON object"),
          ...QUIET,
        },
      },
    ],
  },
  eval: {
    arguments: "<model> <data>",
    summary: "metrics on labelled data",
    details: ["Accuracy, macro/micro-F1, per-label precision, recall and F1, confusion, log loss, ECE before and", "after calibration, the policy's precision with 95% Wilson intervals and review share, and a", "warning when evaluated texts also occur in the training data."],
    groups: [DATA, { title: "output", options: { ...json("one JSON object"), ...QUIET } }],
  },
  classify: {
    arguments: "<model> [data | -]",
    summary: "labels, scores and the decision for texts",
    details: ["Input is a CSV/TSV/JSONL data file, a .txt file of one text per line, or stdin (-).", "Text output is one row per text under a header: decision, labels with scores, the text."],
    groups: [
      DATA,
      {
        title: "output",
        options: {
          "--top": { value: "N", default: "the best label (sigmoid head: every label above its threshold)", description: "labels listed per text" },
          ...json("JSON Lines, one object per text ({ text, labels, decision })"),
          ...QUIET,
        },
      },
    ],
  },
  explain: {
    arguments: "<model> <text>",
    summary: "the features that pushed each top label, with exact logit contributions",
    groups: [
      {
        title: "output",
        options: {
          "--top": { value: "N", default: String(SURFACE_DEFAULTS.explainTop), description: "top labels explained" },
          "--features": { value: "N", default: String(SURFACE_DEFAULTS.explainFeatures), description: "features listed per label" },
          ...json("one JSON object"),
        },
      },
    ],
  },
  inspect: {
    arguments: "<model>",
    summary: "header, labels, sizes by section, metrics, policy, provenance",
    groups: [{ title: "output", options: json("one JSON object") }],
  },
  compare: {
    arguments: "<live> <candidate> <data>",
    summary: "metric deltas, McNemar's test and the examples whose label flips",
    details: [
      "Scores <data> with both models: accuracy, macro-F1 and per-label F1 with deltas (candidate − live),",
      "McNemar's test on paired correctness (b = live right & candidate wrong, c = live wrong & candidate right;",
      "exact binomial below 25 discordant pairs), and the examples whose predicted label flips.",
    ],
    groups: [
      DATA,
      {
        title: "gates",
        options: {
          "--require-better": { description: `exit ${COMPARE_EXIT_CODES.notBetter} unless the candidate is significantly better (McNemar p < 0.05 and c > b)` },
          "--max-regression": { value: "X", description: `exit ${COMPARE_EXIT_CODES.regression} when the candidate's --metric drops by more than X (absolute, e.g. 0.01)` },
          "--metric": { value: "accuracy|macro-f1", values: ["accuracy", "macro-f1"], default: "accuracy", description: "metric for --max-regression" },
        },
      },
      { title: "output", options: { ...json("one JSON object (all flip counts, the first 50 of each kind)"), ...QUIET } },
    ],
    exitCodes: {
      [COMPARE_EXIT_CODES.notBetter]: "--require-better: the candidate is not significantly better",
      [COMPARE_EXIT_CODES.regression]: `--max-regression: the candidate's metric dropped by more than X (outranks ${COMPARE_EXIT_CODES.notBetter})`,
    },
  },
  report: {
    arguments: "<model> <data>",
    summary: "one self-contained, accessible HTML report with charts and tables",
    details: ["With --evasion FILE (no model or data): the evasion suite's results (npm run bench:evasion) as a page instead."],
    groups: [
      DATA,
      {
        title: "output",
        options: {
          "--evasion": { value: "file", description: "draw the evasion suite's results (test/bench/results/evasion.json) instead of a model's report" },
          ...outputFile("report.html", "output HTML file"),
          ...QUIET,
        },
      },
    ],
  },
  "traffic-report": {
    arguments: "<model>",
    summary: "the Worker's traffic counts against validation (population stability) and the shadow candidate's flips, as HTML",
    details: ["Reads the JSON answers of GET /v1/stats and GET /v1/shadow (reviewer token) saved to files."],
    groups: [
      {
        title: "input and output",
        options: {
          "--stats": { value: "file", description: "the answer of GET /v1/stats?hours=N" },
          "--shadow": { value: "file", description: "the answer of GET /v1/shadow?hours=N" },
          ...outputFile("traffic.html", "output HTML file"),
          ...QUIET,
        },
      },
    ],
  },
  tune: {
    arguments: "<data>",
    summary: "search build settings for the best compiled model under time, size and latency budgets",
    details: ["Writes a config for `sluice build --config`, with the reading settings (fields, separator, format)", "as well as the searched build settings."],
    groups: [
      DATA,
      {
        title: "search",
        options: {
          "--time": { value: "DURATION", default: TUNE_BUDGET_RULE, description: "time budget: 90s, 5m, 1h" },
          "--trials": { value: "N", description: "stop after N trials even with time left (reproducible runs)" },
          "--objective": { value: OBJECTIVES.join("|"), values: OBJECTIVES, default: "macro-f1", description: "what the search maximizes on validation data (recall needs --at-precision)" },
          "--at-precision": { value: "L=P", description: "with --objective recall: the recall of label L at the threshold reaching precision P" },
          "--max-bytes": { value: "SIZE", default: settingDefault(BUILD_SETTINGS.maxBytes as SettingSpec<keyof BuildSettings>), description: "size budget of the compiled model; every trial is compiled under it" },
          "--max-us": { value: "X", description: "latency budget: µs per classify call, measured in this process" },
          "--head": settingOption(BUILD_SETTINGS.head as SettingSpec<keyof BuildSettings>),
          "--seed": { value: "N", default: String(BUILD_SETTINGS.seed.default), description: "seed of the search and the builds" },
        },
      },
      { title: "output", options: { ...outputFile("sluice.config.json", "config file for `sluice build --config`"), ...json("the result as one JSON object"), ...QUIET } },
    ],
  },
  serve: {
    arguments: "<model>",
    summary: "local HTTP server with the same API as the Worker",
    groups: [
      {
        title: "server",
        options: {
          "--port": { value: "N", default: "8787", description: "TCP port (0 picks a free one)" },
          "--host": { value: "address", default: "127.0.0.1 (loopback only)", description: "address to listen on" },
        },
      },
    ],
    environment: {
      API_TOKEN: "bearer token required on /v1/* (unset: open; set but blank or unusable: refuses to start)",
      CORS_ORIGINS: "comma-separated browser origins allowed to call /v1/*",
      MAX_BODY_BYTES: "largest request body (default 131072)",
      MAX_TEXTS: "most texts per /v1/classify call (default 100)",
      MODERATE_FIELDS: "body fields /v1/moderate reads (default text)",
      REVIEW_BELOW: `an allow below this top score becomes review (default ${SURFACE_DEFAULTS.reviewBelow}; 0 = off)`,
    },
  },
} satisfies Record<string, CommandSpec>;

export type CommandName = keyof typeof COMMAND_TABLE;

/** Every option a command accepts, flattened from its groups (plus --help). */
export function optionsOf(command: CommandName): OptionTable {
  const options: OptionTable = {};
  for (const group of (COMMAND_TABLE[command] as CommandSpec).groups) Object.assign(options, group.options);
  options["--help"] = { description: "show this help" };
  return options;
}
