// renderReport: a model plus labelled data in, one self-contained HTML page out. Pure: no
// file or network access and no clock (the caller passes a time if it wants one shown).

import { RAMP_RULE } from "./colour-ramp.ts";
import type { Model } from "../../runtime/model/model.ts";
import type { EvaluationReport } from "../evaluate/evaluate.ts";
import { TOOL_VERSION } from "../version.ts";
import { compileStages, renderCompileCost } from "./compile-cost-chart.ts";
import { renderConfidentMistakes } from "./confident-mistakes.ts";
import { renderConfusionMatrix } from "./confusion-matrix-chart.ts";
import { escapeHtml } from "./escape-html.ts";
import { renderLabelTable } from "./label-table.ts";
import { renderPrecisionRecallCharts } from "./precision-recall-chart.ts";
import { renderProvenance } from "./provenance-section.ts";
import { renderReliabilityDiagram } from "./reliability-chart.ts";
import { collectReportData, type ReportExample } from "./report-data.ts";
import { formatBytes, formatCount, formatRate } from "./report-format.ts";
import { renderCaveats, renderResponsibleUseNote } from "./report-notes.ts";
import { renderPage } from "./report-page.ts";

/** What the caller knows about the data beyond the examples themselves. */
export interface ReportOptions {
  /** Data file name shown in the report. */
  dataName?: string;
  /** SHA-256 (hex) of the data file; when it equals the model's training data, the report warns. */
  dataSha256?: string;
  /** When the report was made (ISO time); omitted from the page when absent. */
  generatedAt?: string;
}

/**
 * The HTML report of `model` on labelled `examples`: confusion heat map, precision–recall
 * curves with the policy's operating points, reliability diagram, compile cost, per-label
 * table with Wilson intervals, provenance and a note on automatic blocking. A given
 * `evaluation` (of the same model on the same examples) is reused.
 * @example
 * const html = renderReport(loadModel(bytes), [{ text: "refund please", labels: ["billing"] }]);
 */
export function renderReport(model: Model, examples: readonly ReportExample[], evaluation?: EvaluationReport, options: ReportOptions = {}): string {
  const data = collectReportData(model, examples, evaluation);
  const report = data.evaluation;
  const meta = model.meta;
  const dataName = options.dataName ?? "the given data";
  const trainingSha = meta.provenance.dataSha256;
  const budget = (meta.provenance.settings as Record<string, unknown> | undefined)?.maxBytes;

  const summary = [
    ["accuracy", formatRate(report.accuracy)],
    ["macro-F1", formatRate(report.macroF1)],
    ["calibration error (ECE)", formatRate(data.ece)],
    ["examples scored", formatCount(data.scoredExamples)],
    ["model size", formatBytes(meta.bytes).replace(/ \(.*\)$/, "")],
    ["labels", formatCount(meta.labels.length)],
  ];
  const introduction =
    `<dl class="summary">${summary.map(([term, value]) => `<div><dt>${escapeHtml(term)}</dt><dd>${escapeHtml(value)}</dd></div>`).join("")}</dl>` +
    renderCaveats({
      sameAsTrainingData: typeof trainingSha === "string" && options.dataSha256 !== undefined && trainingSha.toLowerCase() === options.dataSha256.toLowerCase(),
      unknownLabelExamples: report.unknownLabelExamples,
      unknownLabels: report.unknownLabels,
      scoredExamples: data.scoredExamples,
      labelsWithoutExamples: data.labels.filter((label) => label.positives === 0).map((label) => label.label),
    });

  const sections = [
    { id: "confusion", heading: "Confusion matrix", body: `<p>Where the model's answer lands for each label in the data. A pale cell off the diagonal is a rare confusion; a dark one is a habit.</p>${renderConfusionMatrix(report)}` },
    { id: "labels", heading: "Results by label", body: renderLabelTable(report, meta.policy?.rules ?? []) },
    {
      id: "precision-recall",
      heading: "Precision and recall by label",
      body: `<p>Each curve traces precision against recall as the label's score threshold falls. Circles mark the model's policy thresholds, diamonds the start of a review band, squares the plain top-label decision for labels without a rule. The dashed line is the share of texts that carry the label.</p>${renderPrecisionRecallCharts(data.labels)}`,
    },
    { id: "calibration", heading: "Calibration", body: `<p>Does a score of 0.9 mean right nine times in ten? Bars below the diagonal mean the model is more confident than it is right.</p>${renderReliabilityDiagram(data.bins, data.ece)}` },
    { id: "compile-cost", heading: "What compiling cost", body: renderCompileCost(compileStages(model, report, dataName), typeof budget === "number" && budget > 0 ? budget : null) },
    { id: "mistakes", heading: "Most confident mistakes", body: renderConfidentMistakes(data.mistakes) },
    { id: "use", heading: "Before anything is blocked automatically", body: `<div class="use-note">${renderResponsibleUseNote()}</div>` },
    {
      id: "provenance",
      heading: "Provenance",
      body: renderProvenance(model, { name: options.dataName, dataSha256: options.dataSha256, examples: examples.length, scored: data.scoredExamples, unknownLabels: report.unknownLabels, generatedAt: options.generatedAt }),
    },
  ];

  return renderPage({
    title: `Sluice model report: ${meta.contentId}`,
    lede: `${meta.head} model over ${meta.labels.length} labels (${meta.labels.slice(0, 6).join(", ")}${meta.labels.length > 6 ? ", …" : ""}), measured on ${dataName}.`,
    introduction,
    sections,
    footer: `Made by sluice ${TOOL_VERSION}. This page loads nothing from the network and runs no script. Colours: the heat map's ramp is ${RAMP_RULE}; lines use Okabe & Ito (2008), "Color Universal Design".`,
  });
}
