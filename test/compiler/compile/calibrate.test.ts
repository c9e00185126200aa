// Temperature scaling is fitted only when validation can support it, bounded, cross-fitted
// over folds, and kept only when it lowers held-out log loss (compiler/compile/calibrate.ts).
// Scores are synthetic: two labels, a known generating process, so the right answer is known.
import { describe, expect, it } from "vitest";
import { CALIBRATION_MIN_ERRORS, CALIBRATION_MIN_EXAMPLES, fitCalibration, TEMPERATURE_CEILING, TEMPERATURE_FLOOR } from "../../../compiler/compile/calibrate.ts";
import type { ScoredSet } from "../../../compiler/evaluate/evaluate.ts";
import { createRandom } from "../../../compiler/train/random.ts";

const LABELS = new Map([["a", 0], ["b", 1]]);

/** n examples whose model says p(top) = confidence, right with probability `accuracy`. */
function scoredSet(n: number, confidence: number, accuracy: number, seed = 1) {
  const random = createRandom(seed);
  const scores = new Float32Array(n * 2);
  const validation = [];
  for (let i = 0; i < n; i++) {
    const predicted = i % 2;
    const right = random.next() < accuracy;
    scores[i * 2 + predicted] = confidence;
    scores[i * 2 + (1 - predicted)] = 1 - confidence;
    validation.push({ text: `t${i}`, labels: [right === (predicted === 0) ? "a" : "b"] });
  }
  const set: ScoredSet = { scores, labelCount: 2, count: n, usPerDoc: 0 };
  return { set, validation };
}

describe("fitCalibration", () => {
  it("should skip a small validation split and keep temperature 1, saying why", () => {
    // The case that once gave T = 0.05 and scores of 1.000: 24 examples, one error.
    const { set, validation } = scoredSet(24, 0.8, 23 / 24);
    const report = fitCalibration("softmax", set, validation, LABELS);
    expect(report.temperature).toBe(1);
    expect(report.skipped).toMatch(new RegExp(`24 validation examples with \\d+ errors; temperature scaling needs at least ${CALIBRATION_MIN_EXAMPLES} validation examples with at least ${CALIBRATION_MIN_ERRORS} errors`));
  });

  it("should skip a large split with too few errors to learn from", () => {
    const { set, validation } = scoredSet(1000, 0.8, 0.997);
    const report = fitCalibration("softmax", set, validation, LABELS);
    expect(report.errors).toBeLessThan(CALIBRATION_MIN_ERRORS);
    expect(report.temperature).toBe(1);
    expect(report.skipped).not.toBeNull();
  });

  it("should soften an overconfident model towards the confidence its accuracy supports", () => {
    // Says 0.95, right 80% of the time. The NLL optimum puts p(top) at the accuracy: with logit
    // gap g = ln(0.95/0.05), T* = g / ln(0.8/0.2) (definition of temperature scaling, Guo et al. 2017).
    const { set, validation } = scoredSet(2000, 0.95, 0.8);
    const report = fitCalibration("softmax", set, validation, LABELS);
    expect(report.skipped).toBeNull();
    expect(report.objective).toBe("log loss");
    expect(report.folds).toBe(5);
    const expected = Math.log(0.95 / 0.05) / Math.log(0.8 / 0.2);
    expect(Math.abs(report.temperature - expected) / expected).toBeLessThan(0.1);
    expect(report.nllAfter).toBeLessThan(report.nllBefore);
  });

  it("should keep a temperature inside its bounds even when the data asks for an extreme", () => {
    // Says 0.55 and is right 99%: the optimum T is far below the floor.
    const timid = scoredSet(4000, 0.55, 0.99);
    const sharpened = fitCalibration("softmax", timid.set, timid.validation, LABELS);
    expect(sharpened.skipped).toBeNull();
    expect(sharpened.temperature).toBe(TEMPERATURE_FLOOR);
    // Says 0.99 and is right 55%: the optimum T is far above the ceiling.
    const bold = scoredSet(4000, 0.99, 0.55);
    expect(fitCalibration("softmax", bold.set, bold.validation, LABELS).temperature).toBe(TEMPERATURE_CEILING);
  });

  it("should not keep a temperature that does not lower held-out log loss", () => {
    // Already calibrated: says 0.8 and is right 80%, so the held-out gain is noise at best.
    const { set, validation } = scoredSet(400, 0.8, 0.8, 7);
    const report = fitCalibration("softmax", set, validation, LABELS);
    if (report.skipped === null) expect(report.nllAfter).toBeLessThan(report.nllBefore);
    else {
      expect(report.temperature).toBe(1);
      expect(report.skipped).toMatch(/did not lower the log loss of the fold left out/);
    }
  });
});
