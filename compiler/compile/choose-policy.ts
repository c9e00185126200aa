// Per-label thresholds chosen on validation data to reach a target precision (the label's
// action fires: block, or route for routing labels) or a target recall (the start of the
// human-review band when the label also has a precision target, else a review rule).
// Only what the operator asked for becomes policy; with no targets there is none.

import type { Policy, PolicyRule } from "../../runtime/model/policy.ts";
import type { LabelledText, ScoredSet } from "../evaluate/evaluate.ts";
import { precisionRecallCurve, thresholdForTargetPrecision, thresholdForTargetRecall } from "../metrics/index.ts";

export interface PolicyReport {
  [label: string]: { action: string; routeTo?: string; threshold: number; reviewFrom: number | null; precision: number; recall: number; reviewShare: number };
}

/** Builds the policy from the targets; unreachable targets become warnings, not rules. */
export function choosePolicy(
  scored: ScoredSet,
  validation: readonly LabelledText[],
  labels: readonly string[],
  targetPrecision: Record<string, number>,
  targetRecall: Record<string, number>,
  warnings: string[],
  actions: Record<string, string> = {},
  reviewBelow = 0,
): { policy: Policy | null; report: PolicyReport | null } {
  const wanted = new Set([...Object.keys(targetPrecision), ...Object.keys(targetRecall)]);
  for (const label of Object.keys(actions)) if (!wanted.has(label)) warnings.push(`policy: --action ${label}=${actions[label]} has no --target-precision or --target-recall for "${label}", so no rule uses it`);
  if (wanted.size === 0 && reviewBelow <= 0) return { policy: null, report: null };
  const rules: PolicyRule[] = [];
  const report: PolicyReport = {};
  const k = scored.labelCount;
  for (const label of [...wanted].sort()) {
    const index = labels.indexOf(label);
    if (index < 0) {
      warnings.push(`policy: label "${label}" is not in the training data (known: ${labels.join(", ")})`);
      continue;
    }
    const scores = Float64Array.from({ length: scored.count }, (_, i) => scored.scores[i * k + index]);
    const positives = Uint8Array.from(validation, (e) => (e.labels.includes(label) ? 1 : 0));
    const curve = precisionRecallCurve(scores, positives);
    let threshold: number | null = null;
    let reviewFrom: number | null = null;
    if (targetPrecision[label] !== undefined) {
      const point = thresholdForTargetPrecision(curve, targetPrecision[label], 5);
      if (point === null) warnings.push(`policy: no threshold reaches precision ${targetPrecision[label]} for "${label}" on validation data; no ${label} rule was made`);
      else threshold = point.threshold;
    }
    if (targetRecall[label] !== undefined) {
      const point = thresholdForTargetRecall(curve, targetRecall[label]);
      if (point === null) warnings.push(`policy: no threshold reaches recall ${targetRecall[label]} for "${label}"`);
      else if (threshold === null && targetPrecision[label] === undefined) threshold = point.threshold;
      else if (threshold !== null && point.threshold < threshold) reviewFrom = point.threshold;
    }
    if (threshold === null) continue;
    const requested = actions[label] ?? (targetPrecision[label] !== undefined ? "block" : "review");
    const action = requested.startsWith("route:") ? "route" : (requested as "block" | "review");
    const rule: PolicyRule = { label, action, threshold, target: {} };
    if (action === "route") rule.routeTo = requested.slice("route:".length);
    if (reviewFrom !== null) rule.reviewFrom = reviewFrom;
    if (targetPrecision[label] !== undefined) (rule.target as Record<string, number>).precision = targetPrecision[label];
    if (targetRecall[label] !== undefined) (rule.target as Record<string, number>).recall = targetRecall[label];
    rules.push(rule);
    let truePositives = 0;
    let fired = 0;
    let review = 0;
    for (let i = 0; i < scores.length; i++) {
      if (scores[i] >= threshold) {
        fired++;
        if (positives[i]) truePositives++;
        if (action === "review") review++;
      } else if (reviewFrom !== null && scores[i] >= reviewFrom) review++;
    }
    const positiveCount = positives.reduce((a, b) => a + b, 0);
    report[label] = {
      action: requested,
      threshold,
      reviewFrom,
      precision: fired > 0 ? truePositives / fired : 0,
      recall: positiveCount > 0 ? truePositives / positiveCount : 0,
      reviewShare: scores.length > 0 ? review / scores.length : 0,
    };
  }
  if (rules.length === 0 && reviewBelow <= 0) return { policy: null, report: null };
  const policy: Policy = { rules };
  if (reviewBelow > 0) policy.reviewBelow = reviewBelow;
  return { policy, report };
}
