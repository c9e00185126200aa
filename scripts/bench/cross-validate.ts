// Cross-validation on training parts only: how the default build (with its setting search)
// compares with the fixed settings it replaced (5 epochs, learning rate 0.5, TF-IDF, words
// only, dims 24 — `--search-time 0`). Folds are group-aware (compiler/train/group-split.ts), so
// related rows never straddle a fold. Test parts are never read: this is where defaults may be
// chosen. Prints a table; nothing is asserted.
//
//   node --import tsx scripts/bench/cross-validate.ts [--folds 5] [--sets support-topics,contact-form,spam-assassin]
//        [--configs fixed,default,search] (search: the setting search without linear rows and the margin loss)
//   (a corpus prepared under /work/corpora-shared/<name>/ may be named too: its train.jsonl is used)

import { existsSync, readFileSync } from "node:fs";
import { build } from "../../compiler/build/build.ts";
import { defaultBuildSettings, type BuildSettings } from "../../compiler/build/build-settings.ts";
import { evaluateModel, type LabelledText } from "../../compiler/evaluate/evaluate.ts";
import { evaluateMultilabel } from "../../compiler/evaluate/evaluate-multilabel.ts";
import { readExamples } from "../../compiler/read/index.ts";
import { findClusters, groupedFolds } from "../../compiler/train/group-split.ts";
import { loadModel } from "../../runtime/format/load-model.ts";
import { loadSpamAssassin, splitSpamAssassin } from "../../test/fixtures/spam-assassin.ts";

const args = process.argv.slice(2);
const option = (name: string, fallback: string) => {
  const at = args.indexOf(name);
  return at >= 0 && at + 1 < args.length ? args[at + 1] : fallback;
};
const folds = Number(option("--folds", "5"));
const sets = option("--sets", "support-topics,contact-form,spam-assassin").split(",");
// --configs fixed,default,search: which of the settings below to run (each line starts with its name).
const configNames = option("--configs", "fixed,default").split(",");
const CORPORA = process.env.SLUICE_CORPORA ?? "/work/corpora-shared";

async function load(name: string): Promise<LabelledText[]> {
  const rows: LabelledText[] = [];
  if (name === "support-topics") {
    for await (const e of readExamples(new URL("../../demo-data/support-topics.csv", import.meta.url).pathname, { textFields: ["subject", "body"], labelField: "topic" })) rows.push(e);
  } else if (name === "contact-form") {
    for await (const e of readExamples(new URL("../../demo-data/contact-form.jsonl", import.meta.url).pathname, { textFields: ["message"] })) rows.push(e);
  } else if (name === "spam-assassin") {
    // The training part of the fixed split the tests use (test/fixtures/spam-assassin.ts).
    for (const e of splitSpamAssassin(loadSpamAssassin()).train) rows.push({ text: e.text, labels: e.labels });
  } else {
    const path = `${CORPORA}/${name}/train.jsonl`;
    if (!existsSync(path)) throw new Error(`no data set "${name}" (and no ${path})`);
    for (const line of readFileSync(path, "utf8").split("\n")) {
      if (line.trim() === "") continue;
      const record = JSON.parse(line) as { text: string; label: string | string[]; group?: string };
      rows.push({ text: record.text, labels: Array.isArray(record.label) ? record.label : [record.label], group: record.group });
    }
  }
  return rows;
}

interface Outcome {
  accuracy: number;
  macroF1: number;
  validationAccuracy: number;
  seconds: number;
}

async function foldOutcome(train: LabelledText[], test: LabelledText[], settings: BuildSettings, explicit: (keyof BuildSettings)[]): Promise<Outcome> {
  const started = performance.now();
  const { bytes, report } = await build({ examples: train, settings, explicit, buildTime: "2026-01-01T00:00:00.000Z" });
  const seconds = (performance.now() - started) / 1000;
  const model = loadModel(bytes);
  const multi = train.some((e) => e.labels.length > 1);
  // Several labels per row: subset accuracy (every label right) stands for accuracy.
  const scored = multi ? (({ subsetAccuracy, macroF1 }) => ({ accuracy: subsetAccuracy, macroF1 }))(evaluateMultilabel(model, test)) : evaluateModel(model, test);
  return { accuracy: scored.accuracy, macroF1: scored.macroF1, validationAccuracy: report.validation.accuracy, seconds };
}

const mean = (values: number[]) => values.reduce((a, b) => a + b, 0) / values.length;
console.log(`| data (training part) | settings | accuracy | macro-F1 | validation accuracy printed | build s |`);
console.log(`| --- | --- | ---: | ---: | ---: | ---: |`);
for (const name of sets) {
  const rows = await load(name);
  const labels = [...new Set(rows.flatMap((e) => e.labels))].sort();
  const index = new Map(labels.map((l, i) => [l, i]));
  const fold = groupedFolds(rows.map((e) => index.get(e.labels[0]) as number), findClusters(rows), folds, 1);
  const configs: [string, BuildSettings, (keyof BuildSettings)[]][] = [
    ["fixed (--search-time 0)", { ...defaultBuildSettings(), searchTime: 0 }, ["searchTime"]],
    ["default (search)", defaultBuildSettings(), []],
    // The search as it was before it tried linear rows and the margin loss.
    ["search, --no-linear --loss logistic", { ...defaultBuildSettings(), linear: false, loss: "logistic" }, ["linear", "loss"]],
  ];
  for (const [label, settings, explicit] of configs) {
    if (!configNames.some((name) => label.startsWith(name))) continue;
    const outcomes: Outcome[] = [];
    for (let f = 0; f < folds; f++) {
      outcomes.push(await foldOutcome(rows.filter((_, i) => fold[i] !== f), rows.filter((_, i) => fold[i] === f), settings, explicit));
    }
    console.log(`| ${name} | ${label} | ${mean(outcomes.map((o) => o.accuracy)).toFixed(4)} | ${mean(outcomes.map((o) => o.macroF1)).toFixed(4)} | ${mean(outcomes.map((o) => o.validationAccuracy)).toFixed(4)} | ${mean(outcomes.map((o) => o.seconds)).toFixed(1)} |`);
  }
}
