import { beforeAll, describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { defaultBuildSettings, type BuildSettings } from "../../../compiler/build/build-settings.ts";
import { evaluateAll } from "../../../compiler/evaluate/evaluate-all.ts";
import { calibrationSummary, undoTemperature } from "../../../compiler/evaluate/evaluate-calibration.ts";
import { scoreTexts } from "../../../compiler/evaluate/evaluate.ts";
import { readExamples, type Example } from "../../../compiler/read/index.ts";
import { loadModel } from "../../../runtime/format/load-model.ts";
import { handMadeModel } from "./evaluate-hand-made-model.ts";

// Seven labels whose logits for the text "zelvant" are (1, 2, 3, 4, 1, 2, 3) before the
// temperature: hidden = 1 and the output weights are those numbers.
const SEVEN = ["a", "b", "c", "d", "e", "f", "g"];
const SEVEN_LOGITS = [1, 2, 3, 4, 1, 2, 3];

describe("undoTemperature", () => {
  it("recovers the softmax of the raw logits from a temperature-scaled model's scores", () => {
    // Wikipedia, "Softmax function", example: softmax(1, 2, 3, 4, 1, 2, 3)
    // ≈ (0.024, 0.064, 0.175, 0.475, 0.024, 0.064, 0.175) (values from memory).
    const model = handMadeModel({ labels: SEVEN, words: { zelvant: 1 }, outputWeights: SEVEN_LOGITS, temperature: 2 });
    const shipped = model.score("zelvant").scores;
    expect(shipped[3]).not.toBeCloseTo(0.475, 2); // the temperature really changed the scores
    const raw = undoTemperature(shipped, 7, 2, "softmax") as Float64Array;
    const expected = [0.024, 0.064, 0.175, 0.475, 0.024, 0.064, 0.175];
    expected.forEach((value, j) => expect(raw[j]).toBeCloseTo(value, 3));
  });

  it("recovers the sigmoid of the raw logit for a sigmoid head", () => {
    // Logistic function values σ(1) ≈ 0.731059 and σ(2) ≈ 0.880797 (from memory).
    const model = handMadeModel({ labels: ["urgent"], head: "sigmoid", words: { zelvant: 1 }, outputWeights: [2], temperature: 2 });
    const shipped = model.score("zelvant").scores;
    expect(shipped[0]).toBeCloseTo(0.731059, 6);
    expect((undoTemperature(shipped, 1, 2, "sigmoid") as Float64Array)[0]).toBeCloseTo(0.880797, 6);
  });

  it("returns the scores unchanged at temperature 1, for a tree head too", () => {
    expect(Array.from(undoTemperature(Float32Array.from([0.25, 0.75]), 2, 1, "tree") as Float64Array)).toEqual([0.25, 0.75]);
  });

  it("gives no answer for a tree head with a temperature other than 1", () => {
    // Tree scores are products of inner-node sigmoids (evaluate-calibration.ts explains why).
    expect(undoTemperature(Float32Array.from([0.25, 0.75]), 2, 1.5, "tree")).toBeNull();
  });
});

describe("calibrationSummary", () => {
  it("computes the ECE of the shipped and of the raw top-label confidence", () => {
    // Four texts, all predicted "d"; two are "d". One populated bin, so by the definition of ECE
    // (Guo, Pleiss, Sun & Weinberger, ICML 2017, §2) it is |accuracy − confidence| = |0.5 − p_d|.
    const model = handMadeModel({ labels: SEVEN, words: { zelvant: 1 }, outputWeights: SEVEN_LOGITS, temperature: 2 });
    const set = scoreTexts(model, ["zelvant", "zelvant", "zelvant", "zelvant"]);
    const gold = Int32Array.from([3, 3, 0, 0]);
    const softmaxAt = (temperature: number) => Math.exp(4 / temperature) / SEVEN_LOGITS.reduce((sum, z) => sum + Math.exp(z / temperature), 0);
    const summary = calibrationSummary(set, gold, [0, 1, 2, 3], 2, "softmax");
    expect(summary.ece).toBeCloseTo(Math.abs(0.5 - softmaxAt(2)), 6);
    expect(summary.eceUncalibrated).toBeCloseTo(Math.abs(0.5 - softmaxAt(1)), 6);
  });
});

describe("evaluateAll on a built model", () => {
  // The support topics (600 validation examples, a few dozen errors): enough for calibration to
  // be fitted (compile/calibrate.ts skips smaller or error-free splits).
  const SUPPORT_TOPICS = new URL("../../../demo-data/support-topics.csv", import.meta.url).pathname;
  let examples: Example[] = [];
  const settings = (calibrate: boolean): BuildSettings => ({ ...defaultBuildSettings(), calibrate });

  beforeAll(async () => {
    for await (const example of readExamples(SUPPORT_TOPICS, { textFields: ["subject", "body"], labelField: "topic" })) examples.push(example);
  });

  it("reports as eceUncalibrated the ECE the same build has without temperature scaling", async () => {
    // Calibration only sets the header's temperature (compile/calibrate.ts), so the build with
    // --no-calibrate is the same model at T = 1, scored by the runtime: an independent path.
    const calibrated = loadModel((await build({ examples, settings: settings(true), buildTime: "2024-01-01T00:00:00.000Z" })).bytes);
    const plain = loadModel((await build({ examples, settings: settings(false), buildTime: "2024-01-01T00:00:00.000Z" })).bytes);
    expect(calibrated.meta.calibration.temperature).not.toBe(1);
    expect(plain.meta.calibration.temperature).toBe(1);
    const withScaling = evaluateAll(calibrated, examples);
    const without = evaluateAll(plain, examples);
    if (withScaling.kind !== "single-label" || without.kind !== "single-label") throw new Error("expected single-label reports");
    expect(withScaling.report.eceUncalibrated).toBeCloseTo(without.report.ece, 5);
    expect(withScaling.report.ece).not.toBeCloseTo(without.report.ece, 5);
  });
});
