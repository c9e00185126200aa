import { describe, expect, it } from "vitest";
import { evaluatePolicy, evaluatePolicyScores } from "../../../compiler/evaluate/evaluate-policy.ts";
import type { LabelledText } from "../../../compiler/evaluate/evaluate.ts";
import type { Policy } from "../../../runtime/model/policy.ts";
import { handMadeModel, logit } from "./evaluate-hand-made-model.ts";

// Four marker words with known spam scores (softmax over [0, v] gives σ(v) to spam):
// 16 texts at 0.95 (13 spam), 4 at 0.70 (3 spam), 5 at 0.45 (1 spam), 15 at 0.05 (1 spam).
// 40 examples, 18 of them spam.
const WORDS = { quandrel: logit(0.95), vossimer: logit(0.7), plinteth: logit(0.45), dorvane: logit(0.05) };

function repeat(text: string, spam: number, ok: number): LabelledText[] {
  return [...Array.from({ length: spam }, () => ({ text, labels: ["spam"] })), ...Array.from({ length: ok }, () => ({ text, labels: ["ok"] }))];
}

const EXAMPLES: LabelledText[] = [...repeat("quandrel", 13, 3), ...repeat("vossimer", 3, 1), ...repeat("plinteth", 1, 4), ...repeat("dorvane", 1, 14)];

function modelWith(policy: Policy) {
  return handMadeModel({ labels: ["ok", "spam"], words: WORDS, outputWeights: [0, 1], policy });
}

const BLOCK_WITH_BAND: Policy = { rules: [{ label: "spam", action: "block", threshold: 0.9, reviewFrom: 0.5 }], reviewBelow: 0.6 };

describe("evaluatePolicy", () => {
  it("gives the precision at the rule's threshold with its 95% Wilson interval", () => {
    // 16 texts reach 0.9, 13 of them spam. Wilson interval for 13 of 16: R package contingencytables,
    // tests/testthat/test-ch2.R (stored repository ocbe-uio/contingencytables):
    // Wilson_score_CI_1x2(X = 13, n = 16) → "estimate = 0.8125 (95% CI 0.5699 to 0.9341)".
    const rule = evaluatePolicy(modelWith(BLOCK_WITH_BAND), EXAMPLES)?.rules.spam;
    expect(rule?.fired).toBe(16);
    expect(rule?.precision).toBe(0.8125);
    expect(rule?.precisionLow).toBeCloseTo(0.5699, 4);
    expect(rule?.precisionHigh).toBeCloseTo(0.9341, 4);
  });

  it("gives the recall at the rule's threshold over every example labelled with the rule's label", () => {
    // Recall = TP / (TP + FN) (common practice, no source): 13 of the 18 spam examples reach 0.9.
    const rule = evaluatePolicy(modelWith(BLOCK_WITH_BAND), EXAMPLES)?.rules.spam;
    expect(rule?.positives).toBe(18);
    expect(rule?.recall).toBeCloseTo(13 / 18, 12);
  });

  it("counts the rule's review band as its review share", () => {
    // Scores in [0.5, 0.9): the 4 texts at 0.70, out of 40.
    expect(evaluatePolicy(modelWith(BLOCK_WITH_BAND), EXAMPLES)?.rules.spam.reviewShare).toBe(4 / 40);
  });

  it("counts everything a review-action rule fires on as review", () => {
    const policy: Policy = { rules: [{ label: "spam", action: "review", threshold: 0.9 }] };
    const evaluation = evaluatePolicy(modelWith(policy), EXAMPLES);
    expect(evaluation?.rules.spam.reviewShare).toBe(16 / 40);
    expect(evaluation?.decisions.reviewByCause).toEqual({ band: 0, rule: 16 / 40, floor: 0 });
  });

  it("splits review decisions into the rule's band and the review floor", () => {
    // Band: the 4 texts at 0.70. Floor: the 5 texts at 0.45, whose top score (ok, 0.55) is below 0.6.
    const decisions = evaluatePolicy(modelWith(BLOCK_WITH_BAND), EXAMPLES)?.decisions;
    expect(decisions).toEqual({ examples: 40, allow: 15 / 40, review: 9 / 40, block: 16 / 40, route: 0, reviewByCause: { band: 4 / 40, rule: 0, floor: 5 / 40 } });
  });

  it("reports the same decision shares as the runtime's model.decide on each text", () => {
    const model = modelWith(BLOCK_WITH_BAND);
    const counts: Record<string, number> = { allow: 0, review: 0, block: 0, route: 0 };
    for (const example of EXAMPLES) counts[model.decide(example.text).action]++;
    const decisions = evaluatePolicy(model, EXAMPLES)?.decisions;
    expect(decisions?.allow).toBe(counts.allow / 40);
    expect(decisions?.review).toBe(counts.review / 40);
    expect(decisions?.block).toBe(counts.block / 40);
  });

  it("leaves out examples with a label the model does not know", () => {
    const withStranger = [...EXAMPLES, { text: "quandrel", labels: ["newsletter"] }];
    expect(evaluatePolicy(modelWith(BLOCK_WITH_BAND), withStranger)?.decisions.examples).toBe(40);
  });

  it("returns null for a model without a policy", () => {
    const model = handMadeModel({ labels: ["ok", "spam"], words: WORDS, outputWeights: [0, 1] });
    expect(evaluatePolicy(model, EXAMPLES)).toBeNull();
  });
});

describe("evaluatePolicyScores", () => {
  const set = { scores: Float32Array.from([0.9, 0.1, 0.2, 0.8]), labelCount: 2, count: 2, usPerDoc: 0 };

  it("skips a rule whose label the model does not have, as the runtime does", () => {
    const policy: Policy = { rules: [{ label: "phishing", action: "block", threshold: 0.5 }] };
    const evaluation = evaluatePolicyScores(policy, ["ok", "spam"], set, [["ok"], ["spam"]], [0, 1]);
    expect(evaluation.rules).toEqual({});
    expect(evaluation.decisions.allow).toBe(1);
  });

  it("reports precision 0 and the whole [0, 1] interval when the rule never fires", () => {
    // Wilson interval with no trials: no information, [0, 1] (project convention in wilson-interval.ts);
    // precision 0/0 = 0 as scikit-learn's zero_division=0.
    const policy: Policy = { rules: [{ label: "spam", action: "block", threshold: 0.99 }] };
    const rule = evaluatePolicyScores(policy, ["ok", "spam"], set, [["ok"], ["spam"]], [0, 1]).rules.spam;
    expect([rule.precision, rule.precisionLow, rule.precisionHigh, rule.recall]).toEqual([0, 0, 1, 0]);
  });
});
