// Divergence (compiler/train/divergence.ts): a learning rate far too large for the data makes
// the training loss grow or overflow; the build must say so in words the user can act on,
// retry at a lower rate when the rate was its own choice, and never write a model.

import { beforeAll, describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { defaultBuildSettings, type BuildSettings } from "../../../compiler/build/build-settings.ts";
import { checkEpochLoss, checkWeights, TrainingDivergedError } from "../../../compiler/train/divergence.ts";
import { readExamples, type Example } from "../../../compiler/read/index.ts";

const CONTACT_FORM = new URL("../../../demo-data/contact-form.jsonl", import.meta.url).pathname;
let examples: Example[] = [];

beforeAll(async () => {
  for await (const example of readExamples(CONTACT_FORM, { textFields: ["message"] })) examples.push(example);
  examples = examples.slice(0, 800);
});

/**
 * Plain SGD (adaptive rates bound every step, so they did not blow up even at 10), mean
 * weighting with character n-grams and a rate of 10: measured to blow up at epoch 2 on these rows
 * (with normalization 1, no evasion folding: the features it was measured with).
 */
const absurd = (): BuildSettings => ({ ...defaultBuildSettings(), learningRate: 10, adaptiveRates: false, weighting: "mean", charSpan: [1, 4], searchTime: 0, hashBits: 16, foldEvasion: false });

describe("checkEpochLoss", () => {
  it("accepts a falling loss and refuses a growing or non-finite one", () => {
    expect(() => checkEpochLoss(2, 0.5, 0.7, 0.5)).not.toThrow();
    expect(() => checkEpochLoss(3, 0.9, 0.4, 1)).toThrowError(/training diverged at epoch 3: the mean loss grew from 0.4000 to 0.9000; lower --learning-rate \(now 1\)/);
    // A fitted model's loss near zero wobbles by large fractions of itself: not divergence.
    expect(() => checkEpochLoss(5, 0.0034, 0.0025, 0.5)).not.toThrow();
    expect(() => checkEpochLoss(1, NaN, NaN, 2)).toThrowError(TrainingDivergedError);
    expect(() => checkEpochLoss(1, Infinity, NaN, 2)).toThrowError(/the mean loss became Infinity/);
  });

  it("refuses weights that are not finite or beyond what a sane model holds", () => {
    expect(() => checkWeights([new Float32Array([0.1, -3])], 4, 0.5)).not.toThrow();
    expect(() => checkWeights([new Float32Array([0.1, NaN])], 4, 0.5)).toThrowError(/a weight became NaN/);
    expect(() => checkWeights([new Float32Array([5e4])], 4, 0.5)).toThrowError(/a weight reached 5\.000e\+4/);
  });
});

describe("a build whose training diverges", () => {
  it("stops with the epoch and the rate to lower when the user chose the rate", async () => {
    await expect(build({ examples, settings: absurd(), explicit: ["learningRate", "adaptiveRates", "weighting", "charSpan"], buildTime: "2024-01-01T00:00:00.000Z" })).rejects.toThrowError(
      /^training diverged at epoch \d+: .+; lower --learning-rate \(now 10\)$/,
    );
  });

  it("recovers at a lower rate, and says so, when the rate was the build's own choice", async () => {
    const { report } = await build({ examples, settings: absurd(), explicit: ["adaptiveRates", "weighting", "charSpan"], buildTime: "2024-01-01T00:00:00.000Z" });
    expect(report.warnings.some((w) => /training diverged at epoch \d+.* at learning rate 10; retrained at 5/.test(w))).toBe(true);
    expect(report.validation.accuracy).toBeGreaterThan(0.8);
  });
});
