// Operating policy compiled into a model: per-label thresholds and what to do at them.
// Severity decides between rules that fire together: block > review > route > allow.
// Uncertain cases go to human review; a policy never blocks below its block threshold.

import { topLabel } from "./rank-labels.ts";

/** What the operator wants done with a text. */
export type Action = "allow" | "review" | "block" | "route";

/** One label's rule. */
export interface PolicyRule {
  label: string;
  /** What to do when the label's score reaches `threshold`. */
  action: Exclude<Action, "allow">;
  threshold: number;
  /** Scores in [reviewFrom, threshold) go to review instead (the human-review band). */
  reviewFrom?: number;
  /** Destination for `route` (an address or queue name). */
  routeTo?: string;
  /** How the threshold was chosen, e.g. { precision: 0.99 } on validation data. */
  target?: Record<string, number>;
}

export interface Policy {
  rules: PolicyRule[];
  /**
   * The review floor compiled into the model (`--review-below`): an "allow" whose top score is
   * below this becomes "review"; it never blocks. Stored in the file as `uncertainBelow`.
   */
  reviewBelow?: number;
}

/** What the runtime returns for a text under a policy. */
export interface Decision {
  action: Action;
  /** The label the decision is about (the rule's label, or the top label). */
  label: string;
  score: number;
  /** Route target when action is `route`. */
  routeTo?: string;
  /** Plain-language reasons: which rule fired and, from `model.decide`, the features that drove it. */
  reasons: string[];
  /** Set when the decision failed closed: something was broken, so a person must look (action "review"). */
  fault?: DecisionFault;
}

/** Why a decision failed closed. */
export const DECISION_FAULT_CODES = {
  "non-finite-score": "a label score was NaN or infinite, so no threshold comparison can be trusted",
  "decision-error": "an error was thrown while scoring, applying the policy or explaining",
} as const;

export type DecisionFaultCode = keyof typeof DECISION_FAULT_CODES;

export interface DecisionFault {
  code: DecisionFaultCode;
  message: string;
}

/**
 * The decision when deciding went wrong: always "review", never "allow" (NaN fails every
 * threshold comparison, so a broken score would otherwise let everything through).
 * @example failClosed("decision-error", "RangeError: …") // { action: "review", label: "", score: 0, fault: { code: "decision-error", … } }
 */
export function failClosed(code: DecisionFaultCode, message: string, label = "", score = 0): Decision {
  return { action: "review", label, score, reasons: [`failed closed (${code}): ${message}; a person must decide`], fault: { code, message } };
}

const SEVERITY: Record<Action, number> = { allow: 0, route: 1, review: 2, block: 3 };

/**
 * Applies a policy to label scores (pure; no features), then the review floor: the higher of
 * the policy's own `reviewBelow` and the caller's (a server's REVIEW_BELOW), which applies
 * with or without a policy.
 * @example decideFromScores({ rules: [{ label: "spam", action: "block", threshold: 0.98, reviewFrom: 0.6 }] }, ["ok", "spam"], [0.3, 0.7])
 * // → { action: "review", label: "spam", score: 0.7, reasons: ["spam 0.700 is in the review band [0.600, 0.980)"] }
 */
export function decideFromScores(policy: Policy | null, labels: readonly string[], scores: ArrayLike<number>, reviewBelow = 0): Decision {
  for (let k = 0; k < labels.length; k++) {
    if (!Number.isFinite(scores[k])) return failClosed("non-finite-score", `the score of ${labels[k]} is ${scores[k]}`, labels[k]);
  }
  const top = topLabel(scores, 0, labels.length);
  let decision: Decision = { action: "allow", label: labels[top], score: scores[top], reasons: [] };
  const reasons: string[] = [];
  for (const rule of policy?.rules ?? []) {
    const k = labels.indexOf(rule.label);
    if (k < 0) continue;
    const score = scores[k];
    let action: Action | null = null;
    if (score >= rule.threshold) {
      action = rule.action;
      reasons.push(`${rule.label} ${score.toFixed(3)} ≥ ${rule.action} threshold ${rule.threshold.toFixed(3)}`);
    } else if (rule.reviewFrom !== undefined && score >= rule.reviewFrom) {
      action = "review";
      reasons.push(`${rule.label} ${score.toFixed(3)} is in the review band [${rule.reviewFrom.toFixed(3)}, ${rule.threshold.toFixed(3)})`);
    }
    if (action !== null && SEVERITY[action] > SEVERITY[decision.action]) {
      decision = { action, label: rule.label, score, reasons: [] };
      if (action === "route" && rule.routeTo !== undefined) decision.routeTo = rule.routeTo;
    }
  }
  const floor = Math.max(policy?.reviewBelow ?? 0, reviewBelow);
  if (decision.action === "allow" && scores[top] < floor) {
    decision = { action: "review", label: labels[top], score: scores[top], reasons: [] };
    reasons.push(`top label ${labels[top]} ${scores[top].toFixed(3)} is below the review floor ${floor.toFixed(3)}`);
  }
  if (reasons.length === 0) reasons.push(`${policy ? "no rule fired;" : "no policy:"} top label ${labels[top]} ${scores[top].toFixed(3)}`);
  decision.reasons = reasons;
  return decision;
}
