// `sluice tune`: successive halving over compiled models under a size budget.
import { describe, expect, it } from "vitest";
import { defaultBuildSettings } from "../../compiler/build/build-settings.ts";
import { readExamples } from "../../compiler/read/index.ts";
import { parseObjective } from "../../compiler/tune/objective.ts";
import { defaultTuneSeconds } from "../../compiler/tune/tune-defaults.ts";
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
    const options = { examples, base, timeSeconds: 600, maxTrials: 8, metric: parseObjective("macro-f1"), seed: 5 };
    const first = await tune(options);
    expect(first.folds).toBe(3); // small data: cross-validation
    expect(first.trials).toHaveLength(8);
    expect(first.best.score).toBeGreaterThanOrEqual(first.baseline.score);
    for (const trial of first.trials) expect(trial.bytes).toBeLessThanOrEqual(48 * 1024);
    const second = await tune(options);
    expect(second.trials.map((t) => t.score)).toEqual(first.trials.map((t) => t.score));
    expect(second.best.settings).toEqual(first.best.settings);
  }, 180_000);

  it("should read --objective recall with --at-precision and refuse the pieces on their own", () => {
    expect(parseObjective("recall", "spam=0.99")).toEqual({ kind: "recall", label: "spam", precision: 0.99 });
    expect(() => parseObjective("recall")).toThrow(/needs --at-precision label=P/);
    expect(() => parseObjective("accuracy", "spam=0.99")).toThrow(/goes with --objective recall/);
    expect(() => parseObjective("recall", "spam=1.5")).toThrow(/expected label=P/);
    expect(() => parseObjective("f2")).toThrow(/expected macro-f1, accuracy, recall/);
  });

  it("should take its default budget from the data: 25 default builds, never under 20 s", () => {
    expect(defaultTuneSeconds(0.3)).toBe(20);
    expect(defaultTuneSeconds(4)).toBe(100);
  });

  it("should spend a budget derived from the default build's time when none is given", async () => {
    const examples = await contactForm(300);
    const result = await tune({ examples, base: defaultBuildSettings(), maxTrials: 2, metric: parseObjective("accuracy"), seed: 2 });
    expect(result.defaultBuildSeconds).toBeGreaterThan(0);
    expect(result.timeSeconds).toBe(defaultTuneSeconds(result.defaultBuildSeconds));
  }, 120_000);

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
