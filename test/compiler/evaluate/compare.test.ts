import { describe, expect, it } from "vitest";
import { checkGates, compareModels, comparePredictions, COMPARE_EXIT_CODES, LabelSetMismatchError } from "../../../compiler/evaluate/compare.ts";
import { computeClassificationMetrics, mcnemarTest } from "../../../compiler/metrics/index.ts";
import { handMadeModel, logit } from "./evaluate-hand-made-model.ts";

const LABELS = ["billing", "shipping", "returns"];

/** Paired predictions with `counts` examples of each (live right?, candidate right?) cell; gold is 0. */
function pairedTable(bothRight: number, liveOnly: number, candidateOnly: number, bothWrong: number) {
  const gold: number[] = [];
  const live: number[] = [];
  const candidate: number[] = [];
  const add = (count: number, liveLabel: number, candidateLabel: number) => {
    for (let i = 0; i < count; i++) {
      gold.push(0);
      live.push(liveLabel);
      candidate.push(candidateLabel);
    }
  };
  add(bothRight, 0, 0);
  add(liveOnly, 0, 1);
  add(candidateOnly, 1, 0);
  add(bothWrong, 1, 1);
  return { gold, live, candidate };
}

describe("comparePredictions", () => {
  it("counts b as live right & candidate wrong and c as live wrong & candidate right", () => {
    // McNemar (1947): only the discordant pairs count. By hand: example 1 is b; examples 2 and 3 are c.
    const result = comparePredictions([0, 1, 2, 0, 1], [0, 1, 0, 1, 1], [0, 0, 2, 0, 1], LABELS);
    expect([result.mcnemar.b, result.mcnemar.c]).toEqual([1, 2]);
    expect(result.flips).toEqual({ fixed: [2, 3], broken: [1], changed: [] });
  });

  it("lists a label change between two wrong predictions as changed, not as b or c", () => {
    const result = comparePredictions([0, 0], [1, 0], [2, 0], LABELS);
    expect(result.flips).toEqual({ fixed: [], broken: [], changed: [0] });
    expect([result.mcnemar.b, result.mcnemar.c]).toEqual([0, 0]);
  });

  it("gives the published exact McNemar p-value for Cavo et al.'s paired table", () => {
    // R package contingencytables (stored repository ocbe-uio/contingencytables), chapter 8:
    // rbind(c(59, 6), c(16, 80)) → "The McNemar exact conditional test: P = 0.052479".
    const { gold, live, candidate } = pairedTable(59, 6, 16, 80);
    const result = comparePredictions(gold, live, candidate, LABELS);
    expect(result.mcnemar.method).toBe("exact");
    expect(result.mcnemar.pValue).toBeCloseTo(0.052479, 6);
  });

  it("reports deltas as candidate minus live, per label from the classification metrics", () => {
    // Accuracy by hand: live 65/161, candidate 75/161. Per-label F1 from computeClassificationMetrics
    // (checked against scikit-learn in test/compiler/metrics).
    const { gold, live, candidate } = pairedTable(59, 6, 16, 80);
    const result = comparePredictions(gold, live, candidate, LABELS);
    expect(result.delta.accuracy).toBeCloseTo(75 / 161 - 65 / 161, 12);
    const liveF1 = computeClassificationMetrics(gold, live, 3, LABELS).labels.billing.f1;
    const candidateF1 = computeClassificationMetrics(gold, candidate, 3, LABELS).labels.billing.f1;
    expect(result.delta.labels.billing).toBeCloseTo(candidateF1 - liveF1, 12);
  });

  it("refuses prediction lists of different lengths", () => {
    expect(() => comparePredictions([0, 1], [0], [0, 1], LABELS)).toThrow(/gold has 2 entries, live 1, candidate 2/);
  });
});

describe("compareModels", () => {
  // Hand-made models (exact scores): "quandrel" scores spam 0.9 in both; "vossimer" scores spam
  // 0.7 in the live model and 0.3 in the candidate.
  const live = handMadeModel({ labels: ["ok", "spam"], words: { quandrel: logit(0.9), vossimer: logit(0.7) }, outputWeights: [0, 1] });
  const candidate = handMadeModel({ labels: ["ok", "spam"], words: { quandrel: logit(0.9), vossimer: logit(0.3) }, outputWeights: [0, 1] });
  const examples = [
    { text: "quandrel", labels: ["spam"], line: 2 },
    { text: "vossimer", labels: ["ok"], line: 3 },
    { text: "vossimer", labels: ["spam"], line: 4 },
    { text: "vossimer", labels: ["newsletter"], line: 5 },
  ];

  it("lists the flipped examples both ways with their lines, gold labels and scores", () => {
    const result = compareModels(live, candidate, examples);
    expect(result.flips.fixed.count).toBe(1);
    expect(result.flips.fixed.examples[0]).toMatchObject({ line: 3, gold: "ok", live: { label: "spam" }, candidate: { label: "ok" } });
    expect(result.flips.fixed.examples[0].live.score).toBeCloseTo(0.7, 6);
    expect(result.flips.broken.examples.map((e) => e.line)).toEqual([4]);
    expect(result.mcnemar).toEqual(mcnemarTest(1, 1));
  });

  it("leaves out examples whose gold label the models do not know", () => {
    const result = compareModels(live, candidate, examples);
    expect(result.examples).toBe(3);
    expect(result.unknownLabels).toEqual(["newsletter"]);
  });

  it("matches labels by name when the two models order them differently", () => {
    const reordered = handMadeModel({ labels: ["spam", "ok"], words: { quandrel: logit(0.9), vossimer: logit(0.7) }, outputWeights: [1, 0] });
    const result = compareModels(live, reordered, examples);
    expect(result.flips.fixed.count + result.flips.broken.count + result.flips.changed.count).toBe(0);
    expect(result.delta.accuracy).toBe(0);
  });

  it("refuses models with different label sets and names the difference", () => {
    const other = handMadeModel({ labels: ["ok", "phishing"], words: { quandrel: 1 }, outputWeights: [0, 1] });
    expect(() => compareModels(live, other, examples)).toThrow(LabelSetMismatchError);
    expect(() => compareModels(live, other, examples)).toThrow('only the live model has "spam"; only the candidate has "phishing"');
  });
});

describe("checkGates", () => {
  const gates = { requireBetter: false, maxRegression: null, metric: "accuracy" as const };
  const delta = (accuracy: number, macroF1 = 0) => ({ accuracy, macroF1, labels: {} });

  it("passes with exit 0 when no gate is asked for", () => {
    expect(checkGates({ delta: delta(-0.5), mcnemar: mcnemarTest(30, 0) }, gates)).toEqual({ exitCode: 0, lines: [] });
  });

  it("fails --require-better with exit 3 at p = 0.0525, just above 0.05", () => {
    // Cavo et al.'s table again: c = 16 > b = 6 but P = 0.052479 (contingencytables), not significant.
    expect(checkGates({ delta: delta(0.06), mcnemar: mcnemarTest(6, 16) }, { ...gates, requireBetter: true }).exitCode).toBe(COMPARE_EXIT_CODES.notBetter);
  });

  it("passes --require-better when the candidate wins significantly", () => {
    // Exact two-sided binomial: 2·Σ_{i≤2} C(22, i) / 2^22 ≈ 1.2e-4 < 0.05 (by hand).
    expect(checkGates({ delta: delta(0.1), mcnemar: mcnemarTest(2, 20) }, { ...gates, requireBetter: true }).exitCode).toBe(COMPARE_EXIT_CODES.pass);
  });

  it("fails --require-better when the difference is significant in the live model's favour", () => {
    expect(checkGates({ delta: delta(-0.1), mcnemar: mcnemarTest(20, 2) }, { ...gates, requireBetter: true }).exitCode).toBe(COMPARE_EXIT_CODES.notBetter);
  });

  it("fails --max-regression with exit 4 when the metric drops by more than allowed", () => {
    expect(checkGates({ delta: delta(-0.02), mcnemar: mcnemarTest(5, 3) }, { ...gates, maxRegression: 0.01 }).exitCode).toBe(COMPARE_EXIT_CODES.regression);
  });

  it("lets a drop of exactly the allowed amount pass despite floating-point rounding", () => {
    // 96/100 − 97/100 is −0.010000000000000009 in IEEE 754 doubles (common practice, no source).
    expect(checkGates({ delta: delta(96 / 100 - 97 / 100), mcnemar: mcnemarTest(1, 0) }, { ...gates, maxRegression: 0.01 }).exitCode).toBe(COMPARE_EXIT_CODES.pass);
  });

  it("applies --max-regression to macro-F1 when asked", () => {
    expect(checkGates({ delta: delta(0.01, -0.05), mcnemar: mcnemarTest(0, 1) }, { ...gates, maxRegression: 0.01, metric: "macro-f1" }).exitCode).toBe(COMPARE_EXIT_CODES.regression);
  });

  it("gives the regression code when both gates fail", () => {
    expect(checkGates({ delta: delta(-0.2), mcnemar: mcnemarTest(30, 1) }, { requireBetter: true, maxRegression: 0.01, metric: "accuracy" }).exitCode).toBe(COMPARE_EXIT_CODES.regression);
  });
});
