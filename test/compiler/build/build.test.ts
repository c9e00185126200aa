// The pure build API, build({ examples, settings, buildTime }), on the demo support topics
// (an invented scenario, demo-data/README.md). Reproducibility is checked byte for byte;
// budgets are checked as deterministic ceilings on a fixed split; the runtime loads and
// uses what the build wrote.

import { beforeAll, describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { defaultBuildSettings, type BuildSettings } from "../../../compiler/build/build-settings.ts";
import type { LabelledText } from "../../../compiler/evaluate/evaluate.ts";
import { readExamples, type Example } from "../../../compiler/read/index.ts";
import { collectLabels, splitExamples } from "../../../compiler/build/split-examples.ts";
import { evaluateModel } from "../../../compiler/evaluate/evaluate.ts";
import { loadModel } from "../../../runtime/format/load-model.ts";
import { syntheticLabelData } from "../../fixtures/synthetic-labels.ts";

const SUPPORT_TOPICS = new URL("../../../demo-data/support-topics.csv", import.meta.url).pathname;
const BUILD_TIME = "2024-05-01T12:00:00.000Z";

let all: Example[] = [];
let subset: Example[] = [];

/** Settings made smaller where it does not change what a test checks (speed only). */
function quickSettings(overrides: Partial<BuildSettings> = {}): BuildSettings {
  return { ...defaultBuildSettings(), epochs: 2, hashBits: 16, searchTime: 0, ...overrides };
}

beforeAll(async () => {
  for await (const example of readExamples(SUPPORT_TOPICS, { textFields: ["subject", "body"], labelField: "topic" })) all.push(example);
  subset = all.slice(0, 2000);
});

describe("build", () => {
  it("writes byte-identical models for the same data, seed and build time", async () => {
    // Reproducible builds: same inputs, same bytes (reproducible-builds.org definition).
    const first = await build({ examples: subset, settings: quickSettings(), buildTime: BUILD_TIME });
    const second = await build({ examples: subset, settings: quickSettings(), buildTime: BUILD_TIME });
    expect(Buffer.compare(Buffer.from(first.bytes), Buffer.from(second.bytes))).toBe(0);
  });

  it("reports a positive latency for a 20-token and a 300-token validation text, and leaves it out of the file unless asked", async () => {
    // A measurement, not a speed assertion: only that it is there and makes sense.
    const { bytes, report } = await build({ examples: subset, settings: quickSettings(), buildTime: BUILD_TIME });
    expect(report.latency).not.toBeNull();
    expect(report.latency?.tokens20.tokens).toBe(20);
    expect(report.latency?.tokens300.tokens).toBe(300);
    expect(report.latency?.tokens20.microseconds).toBeGreaterThan(0);
    expect(report.latency?.tokens300.microseconds).toBeGreaterThan(0);
    expect(loadModel(bytes).meta.metrics.latency).toBeUndefined();
    const recorded = await build({ examples: subset, settings: quickSettings(), buildTime: BUILD_TIME, latencyInFile: true });
    expect((recorded.report.latency?.tokens300.microseconds ?? 0) > 0).toBe(true);
    expect(loadModel(recorded.bytes).meta.metrics.latency).toEqual(recorded.report.latency);
  });

  it("trains different weights for a different seed, not only a different recorded setting", async () => {
    // The seed is also recorded in provenance, so different bytes alone would prove nothing:
    // the scores of the two models must differ.
    const first = loadModel((await build({ examples: subset, settings: quickSettings({ seed: 1 }), buildTime: BUILD_TIME })).bytes);
    const other = loadModel((await build({ examples: subset, settings: quickSettings({ seed: 2 }), buildTime: BUILD_TIME })).bytes);
    const texts = subset.slice(0, 50).map((e) => e.text);
    const differing = texts.filter((text) => first.score(text).scores.some((score, k) => score !== other.score(text).scores[k]));
    expect(differing.length).toBeGreaterThan(0);
  });

  it("reports the size of the bytes it returns and the accuracy those bytes score on its validation split", async () => {
    const settings = quickSettings();
    const { bytes, report } = await build({ examples: subset, settings, buildTime: BUILD_TIME });
    expect(report.bytes).toBe(bytes.length);
    // The same stratified split the build made (same seed and holdout), scored through the runtime.
    const labels = collectLabels(subset);
    const { validation } = splitExamples({ examples: subset, settings, buildTime: BUILD_TIME }, new Map(labels.map((label, i) => [label, i])), []);
    expect(report.validationExamples).toBe(validation.length);
    expect(report.validation.accuracy).toBe(evaluateModel(loadModel(bytes), validation).accuracy);
    // The demo data repeats some short texts on purpose; overlap is the only warning allowed here.
    expect(report.warnings.filter((w) => !/also appear in the training data/.test(w))).toEqual([]);
  });

  it("fits a tight byte budget even when the measured metrics outgrow the header's reserve, and the metrics describe the written bytes", async () => {
    // 60 labels with long names: the per-label metrics take more header bytes than the budget
    // reserved, so rows are dropped after measuring. The written file must fit, load, and carry
    // the metrics of itself, not of the larger model measured first.
    const examples = syntheticLabelData(60, 3000, 7).map((e) => ({ text: e.text, labels: e.labels.map((label) => `a-rather-long-label-name-for-the-header-metrics-${label}`) }));
    const settings = quickSettings({ maxBytes: 60_000, head: "softmax" });
    const { bytes, report } = await build({ examples, settings, buildTime: BUILD_TIME });
    expect(bytes.length).toBeLessThanOrEqual(60_000);
    const model = loadModel(bytes);
    expect(model.meta.rowCount).toBe(report.rows.kept);
    const labels = collectLabels(examples);
    const { validation } = splitExamples({ examples, settings, buildTime: BUILD_TIME }, new Map(labels.map((label, i) => [label, i])), []);
    const measured = evaluateModel(model, validation);
    expect(report.validation.accuracy).toBe(measured.accuracy);
    expect((model.meta.metrics.compiled as { accuracy: number }).accuracy).toBe(Math.round(measured.accuracy * 1e6) / 1e6);
  });

  it("warns that metrics are not held out when the holdout is 0", async () => {
    const { report } = await build({ examples: subset, settings: quickSettings({ holdout: 0 }), buildTime: BUILD_TIME });
    expect(report.validationExamples).toBe(0);
    expect(report.warnings.some((warning) => /no validation data/.test(warning))).toBe(true);
  });

  it("refuses data with a single label, naming the label and the way out", async () => {
    const oneLabel: LabelledText[] = subset.slice(0, 50).map((example) => ({ text: example.text, labels: ["billing"] }));
    await expect(build({ examples: oneLabel, settings: quickSettings(), buildTime: BUILD_TIME })).rejects.toThrow(
      /only one label \("billing"\).*softmax head needs at least two.*--head sigmoid/,
    );
  });

  it("writes a model the runtime loads and classifies with", async () => {
    const { bytes, report } = await build({ examples: subset, settings: quickSettings(), buildTime: BUILD_TIME });
    const model = loadModel(bytes);
    expect(model.labels).toEqual(report.labels);
    const best = model.classify("Where is my parcel? The tracking hasn't moved in 6 days.");
    expect(best).toHaveLength(1);
    // demo-data/samples.txt line 2 is a shipping question in the invented scenario.
    expect(best[0].label).toBe("shipping");
    // A softmax head gives a probability distribution: scores sum to 1 (common practice, no source).
    const every = model.classify("Where is my parcel?", { top: report.labels.length });
    expect(every.map((s) => s.label).sort()).toEqual([...report.labels].sort());
    expect(every.reduce((sum, s) => sum + s.score, 0)).toBeCloseTo(1, 5);
  });

  it("fits a 16 KiB size budget by pruning rows", async () => {
    const maxBytes = 16 * 1024;
    const { bytes, report } = await build({ examples: subset, settings: quickSettings({ maxBytes }), buildTime: BUILD_TIME });
    expect(bytes.length).toBeLessThanOrEqual(maxBytes);
    expect(report.rows.kept).toBeLessThan(report.rows.seen);
    expect(loadModel(bytes).meta.rowCount).toBe(report.rows.kept);
  });

  it("reports where its time goes: five stages that add up to the whole build", async () => {
    const started = performance.now();
    const { report } = await build({ examples: subset, settings: quickSettings({}), buildTime: BUILD_TIME });
    const wall = (performance.now() - started) / 1000;
    const stages = report.stageSeconds;
    expect(Object.keys(stages)).toEqual(["prepare", "train", "compile", "calibrate", "verify"]);
    for (const seconds of Object.values(stages)) expect(seconds).toBeGreaterThanOrEqual(0);
    const sum = Object.values(stages).reduce((a, b) => a + b, 0);
    expect(sum).toBeLessThanOrEqual(wall + 1e-3);
    expect(sum).toBeGreaterThan(wall * 0.9 - 0.01); // only the call itself lies outside the stages
    expect(stages.train).toBeCloseTo(report.trainSeconds, 1);
  });

  it("keeps at most 500 rows when asked to keep 500 features", async () => {
    const { bytes, report } = await build({ examples: subset, settings: quickSettings({ keepFeatures: 500 }), buildTime: BUILD_TIME });
    expect(report.rows.seen).toBeGreaterThan(500);
    expect(report.rows.kept).toBe(500);
    expect(loadModel(bytes).meta.rowCount).toBe(500);
  });

  it("loses at most 0.02 accuracy from draft to compiled model on the demo support topics", async () => {
    // A deterministic ceiling on a fixed split (default settings, seed 1, 10% stratified holdout).
    const { report } = await build({ examples: all, settings: defaultBuildSettings(), buildTime: BUILD_TIME });
    expect(report.validationExamples).toBe(600);
    expect(Math.abs(report.compiled.accuracy - report.draft.accuracy)).toBeLessThanOrEqual(0.02);
  });
});
