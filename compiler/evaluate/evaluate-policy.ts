// How the model's compiled policy does on labelled data: per rule, the precision (with a 95%
// Wilson interval) and recall at the rule's threshold, and how much traffic goes to review.
//
// Two review measures, both shares of the evaluated examples:
// - per rule, `reviewShare`: examples this rule alone sends to review, i.e. the label's score
//   is in the review band [reviewFrom, threshold), plus, for a rule whose action is review,
//   the score reaches the threshold. The same definition as the build report's (compile/
//   choose-policy.ts), so eval numbers compare with the validation numbers of the build.
// - overall, `decisions`: each example's runtime decision (runtime/model/policy.ts decideFromScores,
//   severity block > review > route > allow, so every example counts once), with the review
//   decisions split by cause: `band` (a rule's review band), `rule` (a review-action rule
//   fired) and `floor` (no rule fired and the top score is below policy.reviewBelow).
//   The per-rule shares can overlap and can exceed what is reviewed when a block outranks them.

import type { Model } from "../../runtime/model/model.ts";
import { decideFromScores, type Action, type Decision, type Policy } from "../../runtime/model/policy.ts";
import { scoreTexts, type LabelledText, type ScoredSet } from "./evaluate.ts";
import { wilsonInterval } from "../metrics/index.ts";

/** One rule measured on the data. */
export interface PolicyRuleResult {
  action: Exclude<Action, "allow">;
  routeTo?: string;
  threshold: number;
  reviewFrom: number | null;
  /** Of the examples at or above the threshold, the share whose gold labels include the rule's label (0 when none). */
  precision: number;
  /** 95% Wilson score interval of `precision`. */
  precisionLow: number;
  precisionHigh: number;
  /** Of the examples labelled with the rule's label, the share at or above the threshold. */
  recall: number;
  /** Share of examples this rule sends to review (band, or fired review rule). */
  reviewShare: number;
  /** Examples at or above the threshold, and how many of them carry the label. */
  fired: number;
  truePositives: number;
  /** Examples whose gold labels include the rule's label. */
  positives: number;
}

/** Shares of the evaluated examples by runtime decision. */
export interface DecisionShares {
  examples: number;
  allow: number;
  review: number;
  block: number;
  route: number;
  /** Review decisions by cause; the three add up to `review`. */
  reviewByCause: { band: number; rule: number; floor: number };
}

export interface PolicyEvaluation {
  /** Keyed by the rule's label (a second rule for the same label gets "label#2"). */
  rules: Record<string, PolicyRuleResult>;
  decisions: DecisionShares;
}

/**
 * The policy of `model` measured on examples whose labels the model knows; null without a policy.
 * @example evaluatePolicy(model, examples)?.rules.spam.precision
 */
export function evaluatePolicy(model: Model, examples: readonly LabelledText[], scored?: ScoredSet): PolicyEvaluation | null {
  const policy = model.meta.policy;
  if (policy === null) return null;
  const set = scored ?? scoreTexts(model, examples.map((e) => e.text));
  const known = new Set(model.labels);
  const rows: number[] = [];
  examples.forEach((example, i) => {
    if (example.labels.every((label) => known.has(label))) rows.push(i);
  });
  return evaluatePolicyScores(policy, model.labels, set, examples.map((e) => e.labels), rows);
}

/**
 * The measurements of `evaluatePolicy` from scores: `goldLabels[i]` are the gold labels of
 * row i of `set`; only the `rows` listed are counted.
 * @example evaluatePolicyScores(policy, ["ok", "spam"], set, [["spam"], ["ok"]], [0, 1]).decisions.block
 */
export function evaluatePolicyScores(policy: Policy, labels: readonly string[], set: ScoredSet, goldLabels: readonly (readonly string[])[], rows: readonly number[]): PolicyEvaluation {
  const k = set.labelCount;
  const n = rows.length;
  const share = (count: number) => (n > 0 ? count / n : 0);
  const results: Record<string, PolicyRuleResult> = {};
  for (const rule of policy.rules) {
    const index = labels.indexOf(rule.label);
    if (index < 0) continue; // the runtime skips such a rule too
    let fired = 0;
    let truePositives = 0;
    let positives = 0;
    let review = 0;
    for (const i of rows) {
      const score = set.scores[i * k + index];
      const positive = goldLabels[i].includes(rule.label);
      if (positive) positives++;
      if (score >= rule.threshold) {
        fired++;
        if (positive) truePositives++;
        if (rule.action === "review") review++;
      } else if (rule.reviewFrom !== undefined && score >= rule.reviewFrom) review++;
    }
    const interval = wilsonInterval(truePositives, fired);
    const result: PolicyRuleResult = {
      action: rule.action,
      threshold: rule.threshold,
      reviewFrom: rule.reviewFrom ?? null,
      precision: fired > 0 ? truePositives / fired : 0,
      precisionLow: interval.low,
      precisionHigh: interval.high,
      recall: positives > 0 ? truePositives / positives : 0,
      reviewShare: share(review),
      fired,
      truePositives,
      positives,
    };
    if (rule.routeTo !== undefined) result.routeTo = rule.routeTo;
    let key = rule.label;
    for (let copy = 2; key in results; copy++) key = `${rule.label}#${copy}`;
    results[key] = result;
  }
  const counts = { allow: 0, review: 0, block: 0, route: 0 };
  const causes = { band: 0, rule: 0, floor: 0 };
  for (const i of rows) {
    const row = set.scores.subarray(i * k, (i + 1) * k);
    const decision = decideFromScores(policy, labels, row);
    counts[decision.action]++;
    if (decision.action === "review") causes[reviewCause(policy, labels, row, decision)]++;
  }
  return {
    rules: results,
    decisions: {
      examples: n,
      allow: share(counts.allow),
      review: share(counts.review),
      block: share(counts.block),
      route: share(counts.route),
      reviewByCause: { band: share(causes.band), rule: share(causes.rule), floor: share(causes.floor) },
    },
  };
}

// Why a review decision was made, mirroring decideFromScores: the first rule of the decided
// label that yields review, else the review floor.
function reviewCause(policy: Policy, labels: readonly string[], row: ArrayLike<number>, decision: Decision): "band" | "rule" | "floor" {
  for (const rule of policy.rules) {
    if (rule.label !== decision.label) continue;
    const score = row[labels.indexOf(rule.label)];
    if (score >= rule.threshold) {
      if (rule.action === "review") return "rule";
    } else if (rule.reviewFrom !== undefined && score >= rule.reviewFrom) return "band";
  }
  return "floor";
}
