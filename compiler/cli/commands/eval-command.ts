// `sluice eval <model> <data>`: metrics on labelled data, as a table or one JSON object.
// Single-label metrics for softmax and tree heads, multi-label metrics for a sigmoid head;
// plus the policy on this data, calibration before/after temperature scaling, and a warning
// when examples of the data were trained on.

import type { Model } from "../../../runtime/model/model.ts";
import { evaluateAll, evaluationJson, type ModelEvaluation, type SingleLabelReport } from "../../evaluate/evaluate-all.ts";
import { leakageMessage } from "../../evaluate/evaluate-leakage.ts";
import type { MultilabelEvaluationReport } from "../../evaluate/evaluate-multilabel.ts";
import type { PolicyEvaluation } from "../../evaluate/evaluate-policy.ts";
import { fixed, formatTable } from "../format-table.ts";
import { checkInputFiles } from "../input-path.ts";
import { fieldsOf, loadModelFile } from "../load-model-file.ts";
import { optionsOf } from "../command-table.ts";
import { parseArgs, UsageError } from "../parse-args.ts";
import { readData } from "../read-data.ts";

const EVAL_OPTIONS = optionsOf("eval");

/** Runs the eval command; returns the exit code. */
export async function evalCommand(argv: string[]): Promise<number> {
  const args = parseArgs(argv, EVAL_OPTIONS);
  if (args.positionals.length !== 2) throw new UsageError("eval needs a model and a data file: sluice eval <model> <data>");
  const [modelPath, dataPath] = args.positionals;
  checkInputFiles([[modelPath, "model file"], [dataPath, "data file"]]);
  const quiet = args.switches.get("--quiet") === true;
  const model = loadModelFile(modelPath);
  const { examples } = await readData(dataPath, args, fieldsOf(model), true, quiet);
  const evaluation = evaluateAll(model, examples);
  const report = evaluation.report;
  if (report.unknownLabelExamples > 0) {
    process.stderr.write(`warning: ${report.unknownLabelExamples} examples have labels the model does not know (${report.unknownLabels.slice(0, 5).join(", ")}); they are left out\n`);
  }
  const leaks = leakageMessage(evaluation.leakage);
  if (leaks !== null) process.stderr.write(`warning: ${leaks}\n`);
  if (args.switches.get("--json") === true) {
    process.stdout.write(`${JSON.stringify(evaluationJson(evaluation))}\n`);
    return 0;
  }
  process.stdout.write(`${describeEvaluation(dataPath, model, evaluation).join("\n")}\n`);
  return 0;
}

function describeEvaluation(dataPath: string, model: Model, evaluation: ModelEvaluation): string[] {
  const lines = [`${dataPath}: ${evaluation.report.examples} examples, model ${model.meta.contentId} (${model.meta.head} head)`];
  if (evaluation.kind === "multilabel") lines.push(...describeMultilabel(evaluation.report));
  else lines.push(...describeSingleLabel(evaluation.report));
  if (evaluation.policy) lines.push("", ...describePolicy(evaluation.policy));
  if (!evaluation.leakage.checked && evaluation.leakage.reason) lines.push("", `leakage: not checked (${evaluation.leakage.reason})`);
  else if (evaluation.leakage.checked && evaluation.leakage.count === 0) lines.push("", `leakage: no example matches the training fingerprint (${evaluation.leakage.trainingTexts} training texts)`);
  return lines;
}

function describeSingleLabel(report: SingleLabelReport): string[] {
  const rows = Object.entries(report.labels).map(([label, s]) => [label, fixed(s.precision), fixed(s.recall), fixed(s.f1), s.support]);
  const calibration =
    report.temperature === 1
      ? `calibration: ECE ${fixed(report.ece)} (15 bins; no temperature scaling)`
      : `calibration: ECE ${fixed(report.ece)} as shipped (temperature ${report.temperature.toFixed(3)}), ${fixed(report.eceUncalibrated)} before temperature scaling (15 bins)`;
  return [
    `accuracy ${fixed(report.accuracy)}  macro-F1 ${fixed(report.macroF1)}  micro-F1 ${fixed(report.microF1)}  log-loss ${fixed(report.logLoss)}  ECE ${fixed(report.ece)}  ${report.usPerDoc.toFixed(1)} µs/doc`,
    calibration,
    "",
    formatTable(["label", "precision", "recall", "f1", "support"], rows),
    "",
    "confusion (rows: gold, columns: predicted)",
    formatTable(["gold \\ predicted", ...report.confusionLabels], report.confusion.map((row, i) => [report.confusionLabels[i], ...row])),
  ];
}

function describeMultilabel(report: MultilabelEvaluationReport): string[] {
  const rows = Object.entries(report.labels).map(([label, s]) => [label, fixed(s.threshold), fixed(s.precision), fixed(s.recall), fixed(s.f1), s.support]);
  return [
    `subset accuracy ${fixed(report.subsetAccuracy)}  Hamming loss ${fixed(report.hammingLoss)}  ${report.usPerDoc.toFixed(1)} µs/doc`,
    `micro precision ${fixed(report.microPrecision)}  recall ${fixed(report.microRecall)}  F1 ${fixed(report.microF1)}   macro precision ${fixed(report.macroPrecision)}  recall ${fixed(report.macroRecall)}  F1 ${fixed(report.macroF1)}`,
    `precision@1 ${fixed(report.precisionAt1)}  precision@3 ${fixed(report.precisionAt3)}  recall@1 ${fixed(report.recallAt1)}  recall@3 ${fixed(report.recallAt3)}`,
    "",
    formatTable(["label", "threshold", "precision", "recall", "f1", "support"], rows),
  ];
}

function describePolicy(policy: PolicyEvaluation): string[] {
  const rows = Object.entries(policy.rules).map(([label, r]) => [
    label,
    r.action === "route" && r.routeTo !== undefined ? `route:${r.routeTo}` : r.action,
    fixed(r.threshold),
    r.reviewFrom === null ? "-" : fixed(r.reviewFrom),
    fixed(r.precision),
    `${fixed(r.precisionLow)}-${fixed(r.precisionHigh)}`,
    fixed(r.recall),
    percent(r.reviewShare),
  ]);
  const d = policy.decisions;
  return [
    "policy on this data (precision and recall at each rule's threshold; review share: this rule's band, or all it fires on for a review rule)",
    formatTable(["label", "action", "threshold", "review from", "precision", "95% interval", "recall", "review share"], rows),
    `decisions: allow ${percent(d.allow)}, review ${percent(d.review)} (review bands ${percent(d.reviewByCause.band)}, review rules ${percent(d.reviewByCause.rule)}, review floor ${percent(d.reviewByCause.floor)}), block ${percent(d.block)}, route ${percent(d.route)}`,
  ];
}

function percent(share: number): string {
  return `${(share * 100).toFixed(1)}%`;
}
