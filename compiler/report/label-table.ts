// The per-label table: precision, recall and F1 of the top label on the given data, with
// Wilson 95% intervals so a precision measured on twelve texts is not read like one measured
// on twelve hundred.

import type { PolicyRule } from "../../runtime/model/policy.ts";
import type { EvaluationReport } from "../evaluate/evaluate.ts";
import { wilsonInterval, type Interval } from "../metrics/index.ts";
import { htmlTable } from "./html-table.ts";
import { formatCount, formatRate } from "./report-format.ts";

/** One row of the per-label table, from the confusion matrix. */
export interface LabelRow {
  label: string;
  support: number;
  predicted: number;
  truePositives: number;
  precision: number;
  precisionInterval: Interval;
  recall: number;
  recallInterval: Interval;
  f1: number;
}

/**
 * Per-label counts and rates from `confusion[gold][predicted]` (0/0 = 0, as compiler/metrics).
 * @example labelRows(evaluation)[0].precisionInterval // { low: 0.57, high: 0.93 } for 13 right of 16
 */
export function labelRows(evaluation: EvaluationReport): LabelRow[] {
  const confusion = evaluation.confusion;
  return evaluation.confusionLabels.map((label, k) => {
    const truePositives = confusion[k][k];
    const support = confusion[k].reduce((sum, count) => sum + count, 0);
    const predicted = confusion.reduce((sum, row) => sum + row[k], 0);
    return {
      label,
      support,
      predicted,
      truePositives,
      precision: predicted > 0 ? truePositives / predicted : 0,
      precisionInterval: wilsonInterval(truePositives, predicted),
      recall: support > 0 ? truePositives / support : 0,
      recallInterval: wilsonInterval(truePositives, support),
      f1: predicted + support > 0 ? (2 * truePositives) / (predicted + support) : 0,
    };
  });
}

/**
 * The per-label table as HTML, with each label's policy rule (if any).
 * @example renderLabelTable(evaluation, model.meta.policy?.rules ?? [])
 */
export function renderLabelTable(evaluation: EvaluationReport, rules: readonly PolicyRule[]): string {
  const rows = labelRows(evaluation).map((row) => [
    row.label,
    formatCount(row.support),
    formatCount(row.predicted),
    formatRate(row.precision),
    row.predicted > 0 ? formatInterval(row.precisionInterval) : "no predictions",
    formatRate(row.recall),
    row.support > 0 ? formatInterval(row.recallInterval) : "no examples",
    formatRate(row.f1),
    describeRule(rules.find((rule) => rule.label === row.label)),
  ]);
  return htmlTable({
    caption: "Per-label results of the top label on the given data (95% intervals: Wilson score)",
    headings: ["label", "support", "predicted", "precision", "precision 95% CI", "recall", "recall 95% CI", "F1", "policy rule"],
    rows,
    numericColumns: [1, 2, 3, 4, 5, 6, 7],
    className: "label-table",
  });
}

function formatInterval(interval: Interval): string {
  return `${formatRate(interval.low)}–${formatRate(interval.high)}`;
}

/** A rule in words, e.g. "block at ≥ 0.850 (target precision 0.95)". */
export function describeRule(rule: PolicyRule | undefined): string {
  if (!rule) return "—";
  const verb = rule.action === "route" && rule.routeTo ? `route to ${rule.routeTo}` : rule.action;
  const band = rule.reviewFrom !== undefined ? `, review from ${rule.reviewFrom.toFixed(3)}` : "";
  const target = rule.target ? ` (target ${Object.entries(rule.target).map(([name, value]) => `${name} ${value}`).join(", ")})` : "";
  return `${verb} at ≥ ${rule.threshold.toFixed(3)}${band}${target}`;
}
