// What each compile step cost: the float draft (all rows) against the compiled model that
// ships (pruned, quantized), both measured on the validation split at build time and read from
// the model header, plus the shipped model measured now on the data given to the report.

import type { Model } from "../../runtime/model/model.ts";
import type { EvaluationReport } from "../evaluate/evaluate.ts";
import { escapeHtml } from "./escape-html.ts";
import { chartDataTable } from "./html-table.ts";
import { OKABE_ITO, textColourOn } from "./report-palettes.ts";
import { formatBytes, formatCount, formatRate } from "./report-format.ts";
import { ticks } from "./svg-axes.ts";
import { element, linearScale, svgChart, svgText } from "./svg-builder.ts";

/** One stage of the pipeline as the report shows it; null = not recorded. */
export interface CompileStage {
  name: string;
  /** Which data the quality numbers come from. */
  measuredOn: string;
  examples: number | null;
  accuracy: number | null;
  macroF1: number | null;
  bytes: number | null;
  rows: number | null;
}

const WIDTH = 780;
const LEFT = 214;
const ROW_HEIGHT = 62;
const TOP = 48;
const SIZE_PANEL = { left: LEFT, width: 250 };
const QUALITY_PANEL = { left: LEFT + 300, width: 220 };
const ACCURACY = OKABE_ITO.blue;
const MACRO_F1 = OKABE_ITO.vermillion;
const BUDGET = OKABE_ITO.reddishPurple;

/**
 * The stages from the model header and the evaluation: draft, compiled (shipped), measured now.
 * Draft bytes and rows appear only when the header records them (`draftBytes`, `draftRows`, or `bytes`/`rows` inside `draft`).
 * @example compileStages(model, evaluation, "test.csv")[1].bytes === model.meta.bytes
 */
export function compileStages(model: Model, evaluation: EvaluationReport, dataName: string): CompileStage[] {
  const metrics = model.meta.metrics;
  const draft = recordAt(metrics, "draft");
  const compiled = recordAt(metrics, "compiled");
  const validationExamples = numberAt(metrics, "validationExamples");
  const validation = validationExamples === null ? "validation split" : `validation split, ${formatCount(validationExamples)} examples`;
  return [
    { name: "draft (float32, all rows)", measuredOn: validation, examples: validationExamples, accuracy: numberAt(draft, "accuracy"), macroF1: numberAt(draft, "macroF1"), bytes: numberAt(metrics, "draftBytes") ?? numberAt(draft, "bytes"), rows: numberAt(metrics, "draftRows") ?? numberAt(draft, "rows") },
    { name: "compiled (shipped)", measuredOn: validation, examples: validationExamples, accuracy: numberAt(compiled, "accuracy"), macroF1: numberAt(compiled, "macroF1"), bytes: model.meta.bytes, rows: model.meta.rowCount },
    { name: "shipped, measured now", measuredOn: `${dataName}, ${formatCount(evaluation.examples)} examples`, examples: evaluation.examples, accuracy: evaluation.accuracy, macroF1: evaluation.macroF1, bytes: model.meta.bytes, rows: model.meta.rowCount },
  ];
}

/**
 * The compile-cost figure: size bars (with the size budget, if any) beside accuracy and macro-F1 dots.
 * @example renderCompileCost(compileStages(model, evaluation, "test.csv"), 131072)
 */
export function renderCompileCost(stages: readonly CompileStage[], budgetBytes: number | null): string {
  const height = TOP + stages.length * ROW_HEIGHT + 48;
  const largestBytes = Math.max(1, budgetBytes ?? 0, ...stages.map((s) => s.bytes ?? 0));
  const size = linearScale([0, largestBytes * 1.04], [SIZE_PANEL.left, SIZE_PANEL.left + SIZE_PANEL.width]);
  const values = stages.flatMap((s) => [s.accuracy, s.macroF1]).filter((v): v is number => v !== null);
  // The quality axis starts just below the lowest value (in steps of 0.05) so small changes are
  // visible; the first tick prints where it starts, and the description says so too.
  const low = Math.max(0, Math.floor((Math.min(1, ...values) - 0.02) * 20) / 20);
  const quality = linearScale([low, 1], [QUALITY_PANEL.left, QUALITY_PANEL.left + QUALITY_PANEL.width]);
  const step = 1 - low > 0.5 ? 0.2 : 1 - low > 0.2 ? 0.1 : 0.05;
  const parts: string[] = [];

  parts.push(svgText(SIZE_PANEL.left, 18, "model size (bytes)", { class: "panel-title" }));
  parts.push(svgText(QUALITY_PANEL.left, 18, `quality (axis from ${low.toFixed(2)})`, { class: "panel-title" }));
  const bottom = TOP + stages.length * ROW_HEIGHT;
  for (const value of ticks(low, 1, step)) {
    const px = quality(value);
    parts.push(element("line", { x1: px, y1: TOP - 6, x2: px, y2: bottom, stroke: "#d9d9d9" }));
    parts.push(svgText(px, bottom + 16, value.toFixed(2), { "text-anchor": "middle", class: "tick" }));
  }
  parts.push(element("line", { x1: SIZE_PANEL.left, y1: TOP - 6, x2: SIZE_PANEL.left, y2: bottom, stroke: "#4d4d4d", "stroke-width": 1.5 }));
  parts.push(element("line", { x1: QUALITY_PANEL.left, y1: bottom, x2: QUALITY_PANEL.left + QUALITY_PANEL.width, y2: bottom, stroke: "#4d4d4d", "stroke-width": 1.5 }));
  if (budgetBytes !== null) {
    parts.push(element("line", { x1: size(budgetBytes), y1: TOP - 10, x2: size(budgetBytes), y2: bottom, stroke: BUDGET, "stroke-width": 2, "stroke-dasharray": "5 3" }));
    parts.push(svgText(size(budgetBytes), TOP - 14, `budget ${formatBytes(budgetBytes).replace(/^.*\(|\)$/g, "")}`, { "text-anchor": "middle", class: "annotation" }));
  }

  stages.forEach((stage, i) => {
    const middle = TOP + i * ROW_HEIGHT + ROW_HEIGHT / 2;
    if (i > 0) parts.push(element("line", { x1: 8, y1: middle - ROW_HEIGHT / 2, x2: WIDTH - 8, y2: middle - ROW_HEIGHT / 2, stroke: "#ececec" }));
    parts.push(svgText(LEFT - 14, middle - 3, stage.name, { "text-anchor": "end", class: "label" }));
    parts.push(svgText(LEFT - 14, middle + 13, stage.measuredOn, { "text-anchor": "end", class: "sublabel" }));
    if (stage.bytes === null) {
      parts.push(svgText(SIZE_PANEL.left + 8, middle + 4, "size not recorded in the model file", { class: "note-text" }));
    } else {
      const barEnd = size(stage.bytes);
      const barWidth = Math.max(1, barEnd - SIZE_PANEL.left);
      parts.push(element("rect", { x: SIZE_PANEL.left, y: middle - 13, width: barWidth, height: 26, fill: ACCURACY }));
      const text = `${formatCount(stage.bytes)} B`;
      if (barWidth > 100) parts.push(svgText(barEnd - 6, middle + 4, text, { "text-anchor": "end", class: "bar-value", fill: textColourOn(ACCURACY) }));
      else parts.push(svgText(barEnd + 6, middle + 4, text, { class: "bar-value" }));
    }
    dot(parts, quality, stage.accuracy, middle - 9, "accuracy", ACCURACY, "circle");
    dot(parts, quality, stage.macroF1, middle + 10, "macro-F1", MACRO_F1, "diamond");
  });

  const keyY = height - 8;
  parts.push(element("circle", { cx: QUALITY_PANEL.left + 6, cy: keyY - 4, r: 5.5, fill: ACCURACY, stroke: "#000000" }));
  parts.push(svgText(QUALITY_PANEL.left + 16, keyY, "accuracy", { class: "annotation" }));
  parts.push(diamond(QUALITY_PANEL.left + 92, keyY - 4, MACRO_F1));
  parts.push(svgText(QUALITY_PANEL.left + 102, keyY, "macro-F1", { class: "annotation" }));

  const description = describeStages(stages);
  const svg = svgChart({ id: "compile-cost", width: WIDTH, height, title: "Size and quality of each compile step", description }, parts.join(""));
  const table = chartDataTable({
    caption: "size and quality of each compile step",
    headings: ["stage", "measured on", "feature rows", "bytes", "accuracy", "macro-F1"],
    rows: stages.map((s) => [s.name, s.measuredOn, s.rows === null ? "not recorded" : formatCount(s.rows), s.bytes === null ? "not recorded" : formatBytes(s.bytes), formatRate(s.accuracy), formatRate(s.macroF1)]),
    numericColumns: [2, 3, 4, 5],
  });
  return `<figure class="chart-figure">${svg}<figcaption>${escapeHtml(description)}</figcaption>${table}</figure>`;
}

function dot(parts: string[], scale: (value: number) => number, value: number | null, cy: number, name: string, colour: string, shape: "circle" | "diamond"): void {
  if (value === null) {
    parts.push(svgText(QUALITY_PANEL.left + 6, cy + 4, `${name} not recorded`, { class: "note-text" }));
    return;
  }
  const cx = scale(value);
  parts.push(shape === "circle" ? element("circle", { cx, cy, r: 5.5, fill: colour, stroke: "#000000" }) : diamond(cx, cy, colour));
  // Values near 1 sit at the right edge of the panel, so their text goes to the left of the dot.
  const textOnLeft = cx > QUALITY_PANEL.left + QUALITY_PANEL.width - 50;
  parts.push(svgText(textOnLeft ? cx - 10 : cx + 10, cy + 4, formatRate(value), { "text-anchor": textOnLeft ? "end" : "start", class: "dot-value" }));
}

function diamond(cx: number, cy: number, colour: string): string {
  const r = 6.5;
  return element("polygon", { points: `${cx},${cy - r} ${cx + r},${cy} ${cx},${cy + r} ${cx - r},${cy}`, fill: colour, stroke: "#000000" });
}

function describeStages(stages: readonly CompileStage[]): string {
  const [draft, compiled, now] = stages;
  const sentences: string[] = [];
  if (draft.bytes !== null && compiled.bytes !== null) {
    sentences.push(`Compiling shrank the model from ${formatBytes(draft.bytes)} to ${formatBytes(compiled.bytes)} (${Math.round((100 * (compiled.bytes - draft.bytes)) / draft.bytes)}%).`);
  } else if (compiled.bytes !== null) {
    sentences.push(`The shipped model is ${formatBytes(compiled.bytes)}; the draft's size is not recorded in the model file.`);
  }
  if (draft.accuracy !== null && compiled.accuracy !== null) {
    const change = compiled.accuracy - draft.accuracy;
    sentences.push(`Validation accuracy went from ${formatRate(draft.accuracy)} (draft) to ${formatRate(compiled.accuracy)} (compiled), a change of ${change >= 0 ? "+" : "−"}${formatRate(Math.abs(change))}.`);
  }
  sentences.push(`On the given data (${now.measuredOn}) the shipped model has accuracy ${formatRate(now.accuracy)} and macro-F1 ${formatRate(now.macroF1)}.`);
  return sentences.join(" ");
}

function recordAt(record: Record<string, unknown> | null, key: string): Record<string, unknown> | null {
  const value = record?.[key];
  return typeof value === "object" && value !== null && !Array.isArray(value) ? (value as Record<string, unknown>) : null;
}

function numberAt(record: Record<string, unknown> | null, key: string): number | null {
  const value = record?.[key];
  return typeof value === "number" && Number.isFinite(value) ? value : null;
}
