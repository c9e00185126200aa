// Where the model came from and what this report measured: the header's provenance and
// settings, the model's shape and policy, and the data file given to the report.

import type { Model } from "../../runtime/model/model.ts";
import { escapeHtml } from "./escape-html.ts";
import { htmlTable } from "./html-table.ts";
import { describeRule } from "./label-table.ts";
import { provenanceFacts, settingFacts } from "./provenance-facts.ts";
import { formatBytes, formatCount } from "./report-format.ts";

/** What the report knows about the data it was given (all optional: the pure API may not have a file). */
export interface ReportDataSource {
  /** File name shown in the report. */
  name?: string;
  dataSha256?: string;
  /** Examples read from the file (before leaving out unknown labels). */
  examples: number;
  /** Examples whose label the model knows, which the numbers are computed from. */
  scored: number;
  unknownLabels: string[];
  /** When the report was made (ISO); left out when absent, so the output can be reproducible. */
  generatedAt?: string;
}

/**
 * The provenance section body: model, build, settings, policy and this report's data.
 * @example renderProvenance(model, { name: "test.csv", examples: 10, scored: 10, unknownLabels: [] })
 */
export function renderProvenance(model: Model, source: ReportDataSource): string {
  const meta = model.meta;
  const provenance = meta.provenance;
  const featurizer = meta.featurizer;
  const modelItems: [string, string][] = [
    ["content id (CRC-32)", meta.contentId],
    ["file size", formatBytes(meta.bytes)],
    ["head", `${meta.head} over ${meta.labels.length} labels`],
    ["feature rows", `${formatCount(meta.rowCount)} × ${meta.rowSpace === "logits" ? `${meta.labels.length} logits (trained at ${meta.dims} dims, output layer multiplied in)` : `${meta.dims} dims`}, stored as ${meta.precision}, weighting ${meta.weighting}`],
    ["calibration", `temperature ${meta.calibration.temperature.toFixed(3)}`],
    ["featurizer", `normalization v${featurizer.normalization}, word span ${featurizer.wordSpan}, char span ${featurizer.charMin === 0 ? "off" : `${featurizer.charMin}–${featurizer.charMax}`}, ${featurizer.hashBits} hash bits, seed ${featurizer.hashSeed}, at most ${formatCount(featurizer.maxTokens)} tokens`],
    ["labels", meta.labels.join(", ")],
  ];
  const buildItems = provenanceFacts(provenance);
  const validationExamples = meta.metrics.validationExamples;
  if (typeof validationExamples === "number") buildItems.push(["validation examples", formatCount(validationExamples)]);
  const reportItems: [string, string][] = [
    ["data", source.name ?? "(given in memory)"],
    ["data SHA-256", source.dataSha256 ?? "not computed"],
    ["examples", `${formatCount(source.examples)} read, ${formatCount(source.scored)} scored`],
  ];
  if (source.unknownLabels.length > 0) reportItems.push(["labels the model does not know (left out)", source.unknownLabels.join(", ")]);
  if (source.generatedAt) reportItems.push(["generated at", source.generatedAt]);

  const settings = provenance.settings;
  const settingsTable =
    typeof settings === "object" && settings !== null
      ? htmlTable({ caption: "Build settings", headings: ["setting", "value"], rows: settingFacts(settings as Record<string, unknown>), numericColumns: [], className: "settings-table" })
      : "<p>No build settings are recorded in the model file.</p>";
  const policy = meta.policy;
  const policyItems = policy ? policy.rules.map((rule) => [rule.label, describeRule(rule)] as [string, string]) : [];
  if (policy?.reviewBelow !== undefined) policyItems.push(["any label", `review when the top score is below ${policy.reviewBelow.toFixed(3)}`]);

  return [
    `<div class="two-columns"><div><h3>Model</h3>${definitionList(modelItems)}</div><div><h3>Build</h3>${definitionList(buildItems)}</div></div>`,
    `<h3>Policy</h3>${policy ? definitionList(policyItems) : "<p>The model has no policy: every text is allowed and labelled with its top label.</p>"}`,
    `<h3>This report</h3>${definitionList(reportItems)}`,
    `<details class="data-table"><summary>All build settings</summary>${settingsTable}</details>`,
  ].join("");
}

function definitionList(items: readonly [string, string][]): string {
  return `<dl class="facts">${items.map(([term, value]) => `<dt>${escapeHtml(term)}</dt><dd>${escapeHtml(value)}</dd>`).join("")}</dl>`;
}
