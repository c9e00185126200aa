// `sluice tune`: successive halving over compiled models under a size budget.
import { describe, expect, it } from "vitest";
import { defaultBuildSettings } from "../../compiler/build/build-settings.ts";
import { readExamples } from "../../compiler/read/index.ts";
import { parseMetric } from "../../compiler/tune/objective.ts";
import { sizeFloor } from "../../compiler/tune/search-space.ts";
import { paretoFront, tune, type TrialResult } from "../../compiler/tune/tune.ts";

async function contactForm(limit: number) {
  const examples = [];
  for await (const e of readExamples("demo-data/contact-form.jsonl", { textFields: ["message"] })) examples.push(e);
  return examples.slice(0, limit);
}

describe("tune", () => {
  it("should never choose worse than the defaults, keep every model in budget, and repeat itself for a seed", async () => {
    const examples = await contactForm(900);
    const base = { ...defaultBuildSettings(), maxBytes: 48 * 1024 };
    const options = { examples, base, timeSeconds: 600, maxTrials: 8, metric: parseMetric("macro-f1"), seed: 5 };
    const first = await tune(options);
    expect(first.folds).toBe(3); // small data: cross-validation
    expect(first.trials).toHaveLength(8);
    expect(first.best.score).toBeGreaterThanOrEqual(first.baseline.score);
    for (const trial of first.trials) expect(trial.bytes).toBeLessThanOrEqual(48 * 1024);
    const second = await tune(options);
    expect(second.trials.map((t) => t.score)).toEqual(first.trials.map((t) => t.score));
    expect(second.best.settings).toEqual(first.best.settings);
  }, 180_000);

  it("should parse the recall-at-precision metric and refuse a malformed one", () => {
    expect(parseMetric("recall-at-precision:spam=0.99")).toEqual({ kind: "recall-at-precision", label: "spam", precision: 0.99 });
    expect(() => parseMetric("f2")).toThrow(/expected macro-f1, accuracy or recall-at-precision/);
  });

  it("should count a model's fixed parts so that impossible budgets are skipped", () => {
    const settings = { ...defaultBuildSettings(), dims: 48 };
    expect(sizeFloor(settings, 1000)).toBeGreaterThan(48 * 1000);
  });

  it("should keep only non-dominated trials on the Pareto front", () => {
    const trial = (id: number, score: number, bytes: number, micros: number) =>
      ({ id, score, bytes, microsecondsPerDoc: micros, withinBudget: true, resource: 1 }) as TrialResult;
    const front = paretoFront([trial(1, 0.9, 100, 5), trial(2, 0.95, 200, 5), trial(3, 0.89, 150, 6), trial(4, 0.9, 100, 4)]);
    // 3 is beaten by 1 on every axis; 1 by 4 (same score and size, faster).
    expect(front.map((t) => t.id)).toEqual([2, 4]);
  });
});
