// What compression costs: the float draft (float32, every row) against compiled models
// under the size budgets, on held-out data, plus classify and load speed of each.
import { build } from "../../compiler/build/build.ts";
import { defaultBuildSettings, type BuildSettings } from "../../compiler/build/build-settings.ts";
import { evaluateModel, type LabelledText } from "../../compiler/evaluate/evaluate.ts";
import { loadModel } from "../../runtime/index.ts";
import { median, settleHeap, timeBatch } from "./timing.ts";

export interface CompressionRow {
  dataset: string;
  model: string;
  bytes: number;
  rows: number;
  accuracy: number;
  macroF1: number;
  usPerDoc: number;
  loadMsPerMB: number;
}

async function measure(dataset: string, name: string, train: LabelledText[], test: LabelledText[], overrides: Partial<BuildSettings>): Promise<CompressionRow> {
  const settings = { ...defaultBuildSettings(), ...overrides };
  const { bytes } = await build({ examples: train, settings, buildTime: "2026-01-01T00:00:00.000Z" });
  const model = loadModel(bytes);
  settleHeap();
  const report = evaluateModel(model, test);
  const texts = test.slice(0, 300).map((e) => e.text);
  const usPerDoc = timeBatch((i) => model.classify(texts[i % texts.length]), 6000, 600);
  const loadMs = median(Array.from({ length: 5 }, () => timeBatch(() => loadModel(bytes), 30, 5))) / 1000;
  return { dataset, model: name, bytes: bytes.length, rows: model.meta.rowCount, accuracy: report.accuracy, macroF1: report.macroF1, usPerDoc, loadMsPerMB: loadMs / (bytes.length / 1048576) };
}

/** Draft vs compiled on one dataset; `budget` is the size ceiling. */
export async function runCompression(dataset: string, train: LabelledText[], test: LabelledText[], budget: number): Promise<CompressionRow[]> {
  return [
    await measure(dataset, "float draft (float32, all rows)", train, test, { precision: "float32", fineTuneEpochs: 0, maxBytes: 0, foldOutput: false }),
    await measure(dataset, "compiled int8, all rows", train, test, { maxBytes: 0 }),
    await measure(dataset, `compiled int8, ≤ ${budget / 1024} KB`, train, test, { maxBytes: budget }),
  ];
}
