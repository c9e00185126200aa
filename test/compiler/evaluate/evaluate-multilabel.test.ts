import { beforeAll, describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { defaultBuildSettings } from "../../../compiler/build/build-settings.ts";
import { evaluateMultilabel } from "../../../compiler/evaluate/evaluate-multilabel.ts";
import type { LabelledText } from "../../../compiler/evaluate/evaluate.ts";
import { computeMultilabelMetrics } from "../../../compiler/metrics/index.ts";
import { loadModel } from "../../../runtime/format/load-model.ts";
import type { Model } from "../../../runtime/model/model.ts";
import { handMadeModel } from "./evaluate-hand-made-model.ts";

// An invented support inbox where a message may be about billing, shipping, both, and urgent.
const PHRASES: Record<string, string[]> = {
  billing: ["I was charged twice for my order", "the invoice shows the wrong amount", "please refund the duplicate payment", "my card was billed after I cancelled"],
  shipping: ["the parcel has not arrived yet", "tracking says delivered but nothing came", "the courier left the box out in the rain", "can you change my delivery address"],
  urgent: ["please answer today", "this is urgent", "I need this fixed immediately", "reply asap please"],
};
const LABEL_SETS = [["billing"], ["shipping"], ["billing", "urgent"], ["shipping", "urgent"], ["billing", "shipping"]];

function inbox(): LabelledText[] {
  const examples: LabelledText[] = [];
  for (const labels of LABEL_SETS) {
    for (let i = 0; i < 4; i++) {
      for (let j = 0; j < 4; j++) {
        const parts = labels.map((label, n) => PHRASES[label][(i + n * j) % 4]);
        examples.push({ text: `Hello, ${parts.join(" and ")}. Thanks, customer ${i}${j}`, labels });
      }
    }
  }
  return examples;
}

let model: Model;
const examples = inbox();

beforeAll(async () => {
  const settings = { ...defaultBuildSettings(), head: "sigmoid" as const, dims: 8, epochs: 30, minDocs: 1, hashBits: 14, holdout: 0 };
  model = loadModel((await build({ examples, settings, buildTime: "2024-01-01T00:00:00.000Z" })).bytes);
});

describe("evaluateMultilabel", () => {
  it("scores the label sets that model.classify returns without top", () => {
    // The runtime's own predictions, fed to the metric functions (tested against scikit-learn).
    const index = new Map(model.labels.map((label, i) => [label, i]));
    const gold = examples.map((e) => e.labels.map((l) => index.get(l) as number));
    const predicted = examples.map((e) => model.classify(e.text).map((r) => index.get(r.label) as number));
    const expected = computeMultilabelMetrics(gold, predicted, model.labels.length, model.labels);
    const report = evaluateMultilabel(model, examples);
    expect(report.subsetAccuracy).toBe(expected.subsetAccuracy);
    expect(report.hammingLoss).toBe(expected.hammingLoss);
    expect(report.microF1).toBe(expected.microF1);
    expect(report.macroF1).toBe(expected.macroF1);
    expect(report.labels.urgent.support).toBe(32);
  });

  it("gives as precision@1 the share of texts whose best label is a gold label", () => {
    // precision@1 = |top-1 ∩ gold| / 1 per example (torchmetrics RetrievalPrecision, top_k = 1).
    const hits = examples.filter((e) => e.labels.includes(model.classify(e.text, { top: 1 })[0].label)).length;
    expect(evaluateMultilabel(model, examples).precisionAt1).toBeCloseTo(hits / examples.length, 12);
  });

  it("gives recall@3 of 1 and precision@3 of mean |gold| / 3 when there are only three labels", () => {
    // With 3 labels the top 3 hold every gold label; precision@k divides by k (torchmetrics convention).
    const report = evaluateMultilabel(model, examples);
    expect(report.recallAt3).toBe(1);
    const meanGold = examples.reduce((sum, e) => sum + e.labels.length, 0) / examples.length;
    expect(report.precisionAt3).toBeCloseTo(meanGold / 3, 12);
  });

  it("learns the tiny inbox well enough to tell the labels apart", () => {
    // A deterministic ceiling on a fixed build (seeded), not a speed check.
    expect(evaluateMultilabel(model, examples).microF1).toBeGreaterThan(0.8);
  });

  it("leaves out examples with a label the model does not know and names it", () => {
    const report = evaluateMultilabel(model, [...examples, { text: "Hello, newsletter please", labels: ["billing", "newsletter"] }]);
    expect(report.examples).toBe(examples.length);
    expect(report.unknownLabelExamples).toBe(1);
    expect(report.unknownLabels).toEqual(["newsletter"]);
  });

  it("predicts with each label's own threshold", () => {
    // Hand-made sigmoid model: "zelvant" scores σ(1) ≈ 0.731 for billing and σ(−1) ≈ 0.269 for urgent.
    // Thresholds 0.8 and 0.25 predict {urgent} for gold {billing, urgent}: subset accuracy 0,
    // Hamming loss 1 wrong cell of 2 = 0.5 (scikit-learn hamming_loss definition).
    const handMade = handMadeModel({ labels: ["billing", "urgent"], head: "sigmoid", words: { zelvant: 1 }, outputWeights: [1, -1], thresholds: [0.8, 0.25] });
    const report = evaluateMultilabel(handMade, [{ text: "zelvant", labels: ["billing", "urgent"] }]);
    expect(report.subsetAccuracy).toBe(0);
    expect(report.hammingLoss).toBe(0.5);
    expect(report.labels.billing).toEqual({ precision: 0, recall: 0, f1: 0, support: 1, threshold: 0.8 });
    expect(report.labels.urgent.precision).toBe(1);
    expect(report.labels.urgent.threshold).toBeCloseTo(0.25, 6);
  });
});
