// Large label sets and several threads: the tree head learns 1,000 labels, and Hogwild
// training on two threads reaches the accuracy of one.
import { describe, expect, it } from "vitest";
import { build } from "../../compiler/build/build.ts";
import { defaultBuildSettings } from "../../compiler/build/build-settings.ts";
import { evaluateModel } from "../../compiler/evaluate/evaluate.ts";
import { loadModel } from "../../runtime/index.ts";
import { syntheticLabelData } from "../fixtures/synthetic-labels.ts";
import { readExamples } from "../../compiler/read/index.ts";

describe("the tree head", () => {
  it("should learn 1,000 synthetic labels far above chance", async () => {
    const examples = syntheticLabelData(1000, 30000, 11);
    const settings = { ...defaultBuildSettings(), head: "tree" as const, dims: 16, charSpan: [0, 0] as [number, number], epochs: 5, hashBits: 18, calibrate: false, fineTuneEpochs: 1, searchTime: 0 };
    const { bytes, report } = await build({ examples, settings, buildTime: "2026-01-01T00:00:00.000Z" });
    console.log(`tree head, 1000 labels: validation accuracy ${report.compiled.accuracy.toFixed(3)}, ${report.trainSeconds.toFixed(2)} s training`);
    // Chance is 1/1000 (or ~0.13 by always guessing the most frequent Zipf label); every
    // label has signature words, so a working tree head must do far better than both.
    expect(report.head).toBe("tree");
    expect(report.compiled.accuracy).toBeGreaterThan(0.4);
    const model = loadModel(bytes);
    const top = model.classify(examples[0].text, { top: 3 });
    expect(top).toHaveLength(3);
    expect(top[0].score).toBeGreaterThanOrEqual(top[1].score);
    expect(model.meta.head).toBe("tree");
  }, 180_000);

  it("should be chosen by --head auto above the label threshold", async () => {
    const examples = syntheticLabelData(100, 3000, 3);
    const settings = { ...defaultBuildSettings(), dims: 8, charSpan: [0, 0] as [number, number], epochs: 2, hashBits: 16, searchTime: 0 };
    const { report } = await build({ examples, settings, buildTime: "2026-01-01T00:00:00.000Z" });
    expect(report.head).toBe("tree");
    expect(report.headReason).toMatch(/100 labels/);
  }, 60_000);
});

describe("training on several threads", () => {
  it("should reach the single-thread accuracy within two points on the demo topics", async () => {
    const examples = [];
    for await (const e of readExamples("demo-data/support-topics.csv", { textFields: ["subject", "body"], labelField: "topic" })) examples.push(e);
    const base = { ...defaultBuildSettings(), charSpan: [0, 0] as [number, number], dims: 16, epochs: 5, searchTime: 0 };
    const one = await build({ examples, settings: { ...base, threads: 1 }, buildTime: "2026-01-01T00:00:00.000Z" });
    const two = await build({ examples, settings: { ...base, threads: 2 }, buildTime: "2026-01-01T00:00:00.000Z" });
    console.log(`accuracy: 1 thread ${one.report.compiled.accuracy.toFixed(3)}, 2 threads ${two.report.compiled.accuracy.toFixed(3)}`);
    expect(Math.abs(one.report.compiled.accuracy - two.report.compiled.accuracy)).toBeLessThan(0.02);
    // The model trained on threads is a normal model.
    const model = loadModel(two.bytes);
    expect(evaluateModel(model, examples.slice(0, 200)).accuracy).toBeGreaterThan(0.9);
  }, 120_000);
});
