// One `natural` classifier (the general-purpose JS NLP library, npm natural@8.1.1) trained
// and measured in a child process, so the parent can kill it at the training cap: its
// classifiers turn every text into a dense 0/1 vector over the whole vocabulary, which
// grows with vocabulary × examples and can run for a very long time.
//
// Started by natural-runner.ts with fork(); talks over the IPC channel only:
//   → { type: "training" }                  data read, training starts now
//   → { type: "trained", seconds }          addDocument for every example + train()
//   → { type: "result", ... }               size, restore time, per-call timings
// argv[2] is the job as JSON (NaturalJob in natural-runner.ts).

import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { medianMilliseconds, timeSingleCalls } from "./single-call-timing.ts";
import type { NaturalChildMessage, NaturalJob } from "./natural-runner.ts";

/** The part of natural's classifier API used here (see its lib/natural/classifiers/index.d.ts). */
interface NaturalClassifier {
  addDocument(text: string, label: string): void;
  train(): void;
  classify(text: string): string;
}
interface NaturalClassifierClass {
  new (): NaturalClassifier;
  restore(parsed: Record<string, unknown>): NaturalClassifier;
}

const require = createRequire(import.meta.url);
// The classifiers entry, not the package root: the root also loads natural's database
// storage back-ends, which read a .env file at load time.
const classifiers = require("natural/lib/natural/classifiers/index.js") as { BayesClassifier: NaturalClassifierClass; LogisticRegressionClassifier: NaturalClassifierClass };

function send(message: NaturalChildMessage): void {
  process.send?.(message);
}

function readJsonl(file: string): { text: string; label: string }[] {
  return readFileSync(file, "utf8")
    .split("\n")
    .filter((line) => line.trim() !== "")
    .map((line) => JSON.parse(line) as { text: string; label: string });
}

function main(): void {
  if (!process.send) throw new Error("natural-child.ts is started by natural-runner.ts with fork(); it reports over IPC");
  const job = JSON.parse(process.argv[2] ?? "") as NaturalJob;
  const Classifier = job.kind === "bayes" ? classifiers.BayesClassifier : classifiers.LogisticRegressionClassifier;
  const train = readJsonl(job.trainFile);
  const test = readJsonl(job.testFile);

  send({ type: "training" });
  const started = performance.now();
  const classifier = new Classifier();
  for (const example of train) classifier.addDocument(example.text, example.label);
  classifier.train();
  send({ type: "trained", seconds: (performance.now() - started) / 1000 });

  // The model as natural saves it (its save() writes exactly this string).
  const json = JSON.stringify(classifier);
  const load = medianMilliseconds(() => Classifier.restore(JSON.parse(json) as Record<string, unknown>), job.loadRepeats, job.loadBudgetMs);
  const { timings, firstPass } = timeSingleCalls((text) => classifier.classify(text), test.map((e) => e.text), job.timing);
  send({ type: "result", modelBytes: Buffer.byteLength(json, "utf8"), loadMs: load.median, loadRepeats: load.repeats, timings, predictions: firstPass });
  process.disconnect();
}

main();
