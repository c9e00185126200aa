// `npm run bench:accuracy`: the corpus suite (prepared by `npm run corpora`) through the
// default `sluice build` and the tuned scikit-learn references (when Debian's
// python3-sklearn is installed: `npm run bench:setup`). For each corpus: accuracy,
// macro-F1 (multi-label: subset accuracy, micro- and macro-F1) on the test part, Sluice's
// model bytes, whole build seconds and the validation accuracy the build printed, and each
// reference's chosen C/alpha and fit seconds. Results: test/bench/results/accuracy.{json,md}.
//
//   node --import tsx scripts/bench/accuracy.ts [--corpora DIR] [--only a,b] [--max-train N] [--no-sklearn] [--no-sluice]
//        [--learners LinearSVC,MultinomialNB] (some references only, e.g. where LogisticRegression's grid does not finish)
//   (--no-sluice runs the references only, e.g. once while the Sluice side is iterated on)
//
// Measurements, not tests. The machine is shared, so seconds are noisy.
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { readSuiteCorpus, writeRows, type SuiteCorpus } from "./accuracy-data.ts";
import { scoreMultiLabel, scoreSingleLabel, type AccuracyScores } from "./accuracy-metrics.ts";
import { buildKnowsFlag, runSluice } from "./accuracy-sluice.ts";
import { describeMachine, machineInfo, markdownTable, RESULTS_DIRECTORY, writeResults } from "./results-writer.ts";

const SYSTEM_PYTHON = "/usr/bin/python3";
const SKLEARN_SCRIPT = join(import.meta.dirname ?? new URL(".", import.meta.url).pathname, "sklearn_suite.py");
/** Larger training parts are subsampled by group to about this many rows (see accuracy-data.ts). */
const DEFAULT_MAX_TRAIN = 20_000;
/** Corpora that get character n-grams in the references (language identification). */
const CHAR_GRAM_CORPORA = new Set(["catalog-languages"]);

function option(name: string): string | undefined {
  const index = process.argv.indexOf(name);
  return index === -1 ? undefined : process.argv[index + 1];
}

interface SystemResult extends AccuracyScores {
  system: string;
  setting: string;
  seconds: number;
  searchSeconds: number | null;
  modelBytes: number | null;
  printedValidation: number | null;
  /** The references' grid (value, validation score, seconds, iterations) and final fit details. */
  detail?: unknown;
}

interface CorpusResult {
  corpus: string;
  shape: string;
  trainRows: number;
  fullTrainRows: number;
  testRows: number;
  labels: number;
  systems: SystemResult[];
  notes: string[];
  /** 1-minute load average when the corpus started and ended (the machine is shared). */
  load: [number, number];
  /** When and by which command this corpus was measured (a run with --only keeps the other corpora's earlier results). */
  measuredAt: string;
  command: string;
  referenceVersions: string | null;
}

function score(corpus: SuiteCorpus, predictions: (string | string[])[]): AccuracyScores {
  const trainLabels = [...new Set(corpus.train.flatMap((r) => (Array.isArray(r.label) ? r.label : [r.label])))];
  if (corpus.multiLabel) return scoreMultiLabel(corpus.test.map((r) => r.label as string[]), predictions as string[][], trainLabels);
  return scoreSingleLabel(corpus.test.map((r) => r.label as string), predictions as string[], trainLabels);
}

function sklearnAvailable(): string | null {
  if (process.argv.includes("--no-sklearn")) return null;
  const probe = spawnSync(SYSTEM_PYTHON, ["-c", "import sklearn; print(sklearn.__version__)"], { encoding: "utf8" });
  return probe.status === 0 ? probe.stdout.trim() : null;
}

const root = resolve(option("--corpora") ?? "corpora");
const only = option("--only")?.split(",");
const learners = option("--learners")?.split(",");
const maxTrain = Number(option("--max-train") ?? DEFAULT_MAX_TRAIN);
const manifestFile = join(root, "manifest.json");
if (!existsSync(manifestFile)) throw new Error(`${manifestFile} is missing: run \`npm run corpora\` first`);
const manifest = JSON.parse(readFileSync(manifestFile, "utf8")) as { corpora: { name: string; shape: string; multiLabel: boolean; labels: number }[] };
const sklearnVersion = sklearnAvailable();
const groupFlag = buildKnowsFlag("--group-field") ? ["--group-field", "group"] : [];
const machine = machineInfo();
const started = performance.now();
console.log(`Accuracy suite, ${new Date().toISOString()}\n${describeMachine(machine)}; scikit-learn ${sklearnVersion ?? "not installed (npm run bench:setup)"}`);
console.log(`sluice build flags: ${groupFlag.length > 0 ? groupFlag.join(" ") : "none (defaults)"}\n`);

let referenceVersions: string | null = null;
const command = `npm run bench:accuracy${process.argv.length > 2 ? ` -- ${process.argv.slice(2).join(" ")}` : ""}`;
const resultsName = process.argv.includes("--no-sluice") ? "accuracy-references" : "accuracy";
// With --only, the other corpora keep their earlier results (each says when it was measured).
const earlier: CorpusResult[] = (() => {
  const file = join(RESULTS_DIRECTORY, `${resultsName}.json`);
  if (!only || !existsSync(file)) return [];
  const previous = JSON.parse(readFileSync(file, "utf8")) as { data?: { results?: CorpusResult[] } };
  return (previous.data?.results ?? []).filter((r) => !only.includes(r.corpus) && r.measuredAt !== undefined);
})();
const work = mkdtempSync(join(tmpdir(), "sluice-accuracy-"));
const results: CorpusResult[] = [];
try {
  for (const entry of manifest.corpora) {
    if (only && !only.includes(entry.name)) continue;
    const corpus = readSuiteCorpus(root, entry, maxTrain);
    const trainFile = join(work, `${entry.name}-train.jsonl`);
    const testFile = join(work, `${entry.name}-test.jsonl`);
    writeRows(trainFile, corpus.train);
    writeRows(testFile, corpus.test);
    const notes: string[] = [];
    if (corpus.train.length < corpus.fullTrainRows) notes.push(`training part subsampled by group: ${corpus.train.length} of ${corpus.fullTrainRows} rows`);
    console.log(`${entry.name}: ${corpus.train.length} train / ${corpus.test.length} test rows, ${entry.labels} labels`);

    const loadAtStart = loadavg()[0];
    const systems: SystemResult[] = [];
    if (!process.argv.includes("--no-sluice")) {
      const sluice = runSluice(trainFile, join(work, `${entry.name}.sluice`), corpus.test, corpus.multiLabel, groupFlag);
      for (const warning of sluice.warnings) notes.push(`build warning: ${warning}`);
      systems.push({
        system: "Sluice (default build)",
        setting: sluice.flags.join(" ") || "defaults",
        ...score(corpus, sluice.predictions),
        seconds: sluice.buildSeconds,
        searchSeconds: null,
        modelBytes: sluice.modelBytes,
        printedValidation: sluice.printedValidation,
      });
      console.log(`  Sluice built in ${sluice.buildSeconds.toFixed(1)} s`);
    }
    if (sklearnVersion) {
      const optionsFile = join(work, `${entry.name}-options.json`);
      writeFileSync(optionsFile, JSON.stringify({ multiLabel: corpus.multiLabel, charGrams: CHAR_GRAM_CORPORA.has(entry.name), only: learners ?? null }));
      if (learners) notes.push(`references: ${learners.join(", ")} only (--learners)`);
      const child = spawnSync(SYSTEM_PYTHON, [SKLEARN_SCRIPT, trainFile, testFile, optionsFile], { encoding: "utf8", maxBuffer: 1 << 30, stdio: ["ignore", "pipe", "inherit"] });
      if (child.status !== 0) throw new Error(`sklearn_suite.py on ${entry.name} failed (exit ${child.status})`);
      const output = JSON.parse(child.stdout) as { sklearn: string; numpy: string; scipy: string; python: string; models: { name: string; parameter: string; value: number; fitSeconds: number; searchSeconds: number; predictions: (string | string[])[] }[] };
      referenceVersions = `scikit-learn ${output.sklearn}, numpy ${output.numpy}, scipy ${output.scipy}, Python ${output.python}`;
      for (const { predictions, ...model } of output.models) {
        systems.push({
          system: `TF-IDF + ${model.name}`,
          setting: `${model.parameter}=${model.value}${CHAR_GRAM_CORPORA.has(entry.name) ? ", words 1-2 + char_wb 1-4" : ", words 1-2"}`,
          ...score(corpus, predictions),
          seconds: model.fitSeconds,
          searchSeconds: model.searchSeconds,
          modelBytes: null,
          printedValidation: null,
          detail: model,
        });
      }
    }
    const load: [number, number] = [loadAtStart, loadavg()[0]];
    notes.push(`load average (1 min) ${load[0].toFixed(1)} at the start, ${load[1].toFixed(1)} at the end`);
    results.push({ corpus: entry.name, shape: entry.shape, trainRows: corpus.train.length, fullTrainRows: corpus.fullTrainRows, testRows: corpus.test.length, labels: entry.labels, systems, notes, load, measuredAt: new Date().toISOString(), command, referenceVersions });
    // Written after every corpus, so a run stopped part-way keeps what it measured.
    writeAll();
  }
} finally {
  rmSync(work, { recursive: true, force: true });
}

/** Writes every corpus measured so far (and the earlier ones kept with --only); returns what it wrote. */
function writeAll(): { table: string; notes: string[]; written: { json: string; markdown: string } } {
  const order = manifest.corpora.map((c) => c.name);
  const all = [...earlier, ...results].sort((a, b) => order.indexOf(a.corpus) - order.indexOf(b.corpus));
  const f = (value: number | null, digits = 3) => (value === null || !Number.isFinite(value) ? "" : value.toFixed(digits));
  const table = markdownTable(
    ["corpus", "system", "setting", "accuracy", "macro-F1", "micro-F1", "model bytes", "build/fit s", "search s", "printed validation"],
    all.flatMap((r) =>
      r.systems.map((s) => [r.corpus, s.system, s.setting, f(s.accuracy), f(s.macroF1), f(s.microF1), s.modelBytes === null ? "" : String(s.modelBytes), f(s.seconds, 1), f(s.searchSeconds, 1), f(s.printedValidation)]),
    ),
    ["left", "left", "left", "right", "right", "right", "right", "right", "right", "right"],
  );
  const totalSeconds = (performance.now() - started) / 1000;
  const notes = [
    "Test parts are split by group (`npm run corpora`); every row counts, a label the training part lacks is an error for every system.",
    "Multi-label (package-tags): accuracy is subset accuracy (the exact label set); Sluice predicts labels at the thresholds compiled into the model.",
    "Sluice: build seconds are the whole `sluice build` command; printed validation is the compiled model's accuracy on the build's own validation split (micro-F1 for multi-label).",
    "References (scripts/bench/sklearn_suite.py, learners in sklearn_learners.py: LogisticRegression with saga, tol 1e-3; LinearSVC; MultinomialNB): C/alpha chosen from a small grid (extended by ×10 up to twice while the best lies on its edge; LogisticRegression C at most 1000, 100 multi-label) on a grouped validation split carved from train, then refit on all of train; fit s is that final fit (vectorizer + learner), search s the grid before it (vectorized once, every value on the same matrices; the JSON holds every value's score, seconds and iterations).",
    ...all.flatMap((r) => [...r.notes, `measured ${r.measuredAt} by \`${r.command}\`${r.referenceVersions ? `; ${r.referenceVersions}` : ""}`].map((n) => `${r.corpus}: ${n}`)),
    `This run: ${totalSeconds.toFixed(0)} s so far. The machine is shared by other work, so seconds are noisy.`,
  ];
  const written = writeResults(resultsName, { sklearn: sklearnVersion, referenceVersions, flags: groupFlag, maxTrainRows: maxTrain, totalSeconds, command, results: all }, `${table}\n\n${notes.map((n) => `- ${n}`).join("\n")}\n\nCommand: \`${command}\`; ${referenceVersions ?? `scikit-learn ${sklearnVersion ?? "not installed"}`}.`);
  return { table, notes, written };
}

const { table, notes, written } = writeAll();
console.log(`\n${table}\n\n${notes.map((n) => `- ${n}`).join("\n")}\n\nwritten: ${written.markdown}`);
