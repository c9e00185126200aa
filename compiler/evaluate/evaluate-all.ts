// Everything `sluice eval` reports, computed from one scoring pass: the metrics for the
// model's head (single-label, or multi-label for a sigmoid head), calibration before and
// after temperature scaling, the policy on this data, and the leakage check.

import type { Model } from "../../runtime/model/model.ts";
import { calibrationSummary } from "./evaluate-calibration.ts";
import { checkLeakage, type LeakageReport } from "./evaluate-leakage.ts";
import { evaluateMultilabel, type MultilabelEvaluationReport } from "./evaluate-multilabel.ts";
import { evaluatePolicy, type DecisionShares, type PolicyEvaluation, type PolicyRuleResult } from "./evaluate-policy.ts";
import { evaluateModel, goldIndexes, scoreTexts, type EvaluationReport, type LabelledText } from "./evaluate.ts";

/** Single-label metrics plus calibration before temperature scaling. */
export interface SingleLabelReport extends EvaluationReport {
  /** The model's temperature (1 = not scaled). */
  temperature: number;
  /** ECE (15 bins) of the top label with the temperature undone; NaN for a tree head with T ≠ 1. */
  eceUncalibrated: number;
}

export type ModelEvaluation =
  | { kind: "single-label"; report: SingleLabelReport; policy: PolicyEvaluation | null; leakage: LeakageReport }
  | { kind: "multilabel"; report: MultilabelEvaluationReport; policy: PolicyEvaluation | null; leakage: LeakageReport };

/**
 * Scores the examples once and computes every part of the eval report.
 * @example const evaluation = evaluateAll(model, examples); evaluation.kind // "single-label"
 */
export function evaluateAll(model: Model, examples: readonly (LabelledText & { line?: number })[]): ModelEvaluation {
  const scored = scoreTexts(model, examples.map((e) => e.text));
  const policy = evaluatePolicy(model, examples, scored);
  const leakage = checkLeakage(model, examples);
  if (model.meta.head === "sigmoid") return { kind: "multilabel", report: evaluateMultilabel(model, examples, scored), policy, leakage };
  const report = evaluateModel(model, examples, scored);
  const { gold } = goldIndexes(model, examples);
  const known: number[] = [];
  for (let i = 0; i < gold.length; i++) if (gold[i] >= 0) known.push(i);
  const calibration = calibrationSummary(scored, gold, known, model.meta.calibration.temperature, model.meta.head);
  return { kind: "single-label", report: { ...report, temperature: calibration.temperature, eceUncalibrated: calibration.eceUncalibrated }, policy, leakage };
}

/**
 * The --json object of `sluice eval`: `kind`, the report's fields, then `policy` (label → rule
 * results, or null), `decisions` (or null) and `leakage`.
 * @example JSON.stringify(evaluationJson(evaluateAll(model, examples)))
 */
export function evaluationJson(evaluation: ModelEvaluation): Record<string, unknown> {
  const policy: Record<string, PolicyRuleResult> | null = evaluation.policy?.rules ?? null;
  const decisions: DecisionShares | null = evaluation.policy?.decisions ?? null;
  return { kind: evaluation.kind, ...evaluation.report, policy, decisions, leakage: evaluation.leakage };
}
