// One small precision–recall chart per label (small multiples share axes, so panels compare
// at a glance), with the model's operating points marked: the policy rule's threshold (and
// review band) where the label has a rule, else the default decision (argmax, or the sigmoid
// head's label threshold). All values are measured on the data given to the report.

import { thresholdForTargetRecall } from "../metrics/index.ts";
import { escapeHtml, safeId } from "./escape-html.ts";
import { chartDataTable } from "./html-table.ts";
import { countOf, formatCount, formatRate } from "./report-format.ts";
import { lineStyle, type LineStyle } from "./report-palettes.ts";
import type { LabelReport, OperatingPoint } from "./report-data.ts";
import { ticks, xyAxes, type PlotArea } from "./svg-axes.ts";
import { element, linearScale, svgChart, svgPolyline, svgText } from "./svg-builder.ts";

/** Beyond this many labels, panels are drawn for labels with a rule and then the most frequent. */
export const PANEL_LIMIT = 24;
const WIDTH = 320;
const AREA: PlotArea = { left: 54, top: 12, width: 254, height: 200 };
const HEIGHT = AREA.top + AREA.height + 46;
const BASE_RATE_COLOUR = "#6b6b6b";

/**
 * The section body with one precision–recall panel per label.
 * @example renderPrecisionRecallCharts(data.labels)
 */
export function renderPrecisionRecallCharts(labels: readonly LabelReport[]): string {
  let shown = [...labels];
  if (shown.length > PANEL_LIMIT) {
    shown = shown.sort((a, b) => Number(b.rule !== null) - Number(a.rule !== null) || b.positives - a.positives || a.index - b.index).slice(0, PANEL_LIMIT).sort((a, b) => a.index - b.index);
  }
  const note = shown.length < labels.length ? `<p class="note">Panels for ${shown.length} of ${labels.length} labels: those with a policy rule, then the most frequent.</p>` : "";
  return `${note}<div class="panel-grid">${shown.map((label) => panel(label, lineStyle(label.index))).join("")}</div>`;
}

function panel(report: LabelReport, style: LineStyle): string {
  const id = safeId("pr", report.label, report.index);
  const x = linearScale([0, 1], [AREA.left, AREA.left + AREA.width]);
  const y = linearScale([0, 1], [AREA.top + AREA.height, AREA.top]);
  const parts: string[] = [xyAxes(AREA, x, y, ticks(0, 1, 0.2), ticks(0, 1, 0.2), "recall", "precision")];

  if (report.positives === 0) {
    parts.push(svgText(AREA.left + AREA.width / 2, AREA.top + AREA.height / 2, "no examples of this label in the data", { "text-anchor": "middle", class: "note-text" }));
  } else {
    const baseY = y(report.prevalence);
    parts.push(element("line", { x1: AREA.left, y1: baseY, x2: AREA.left + AREA.width, y2: baseY, stroke: BASE_RATE_COLOUR, "stroke-width": 1.25, "stroke-dasharray": "3 3" }));
    parts.push(svgPolyline(report.curve.map((point) => [x(point.recall), y(point.precision)] as const), { stroke: style.colour, "stroke-width": 2.5, "stroke-dasharray": style.dash, "stroke-linejoin": "round" }));
    for (const point of report.points) {
      // Dotted guides from the point to both axes make its precision and recall readable off the scales.
      const px = x(point.recall);
      const py = y(point.precision);
      parts.push(element("polyline", { points: `${AREA.left},${py} ${px},${py} ${px},${AREA.top + AREA.height}`, fill: "none", stroke: "#4d4d4d", "stroke-width": 1, "stroke-dasharray": "1 3" }));
    }
    for (const point of report.points) parts.push(marker(point, x(point.recall), y(point.precision), style.colour));
    parts.push(annotations(report, style.colour));
  }

  const description = describePanel(report);
  const svg = svgChart({ id, width: WIDTH, height: HEIGHT, title: `Precision–recall curve of ${report.label}`, description }, parts.join(""));
  const pointList = report.points.map((point) => `<li>${escapeHtml(pointSentence(point))}</li>`).join("");
  return (
    `<section class="panel" aria-labelledby="${id}-heading"><h3 id="${id}-heading">${escapeHtml(report.label)}</h3>` +
    `<figure>${svg}<figcaption><ul class="points">${pointList}<li>base rate (precision of labelling every text ${escapeHtml(report.label)}): ${formatRate(report.prevalence)}</li></ul></figcaption>` +
    `${dataTable(report)}</figure></section>`
  );
}

/** Marker shapes differ by kind, so the points stay apart without colour. */
function marker(point: OperatingPoint, cx: number, cy: number, colour: string): string {
  if (point.kind === "review") {
    const r = 6.5;
    return element("polygon", { points: `${cx},${cy - r} ${cx + r},${cy} ${cx},${cy + r} ${cx - r},${cy}`, fill: "#ffffff", stroke: colour, "stroke-width": 2.5 });
  }
  if (point.kind === "rule") return element("circle", { cx, cy, r: 6, fill: colour, stroke: "#000000", "stroke-width": 1.5 });
  return element("rect", { x: cx - 5.5, y: cy - 5.5, width: 11, height: 11, fill: colour, stroke: "#000000", "stroke-width": 1.5 });
}

/** A key in the empty lower-left corner of the plot: each marker with its threshold, precision and recall. */
function annotations(report: LabelReport, colour: string): string {
  const lineHeight = 15;
  const lines = report.points.length + 1;
  const boxTop = AREA.top + AREA.height - 6 - lines * lineHeight;
  const left = AREA.left + 6;
  const parts: string[] = [element("rect", { x: left - 2, y: boxTop - 4, width: AREA.width - 10, height: lines * lineHeight + 6, fill: "#ffffff", "fill-opacity": 0.88, stroke: "#bdbdbd", rx: 3 })];
  report.points.forEach((point, i) => {
    const cy = boxTop + i * lineHeight + 7;
    parts.push(marker(point, left + 8, cy, colour));
    parts.push(svgText(left + 20, cy + 4, `${point.shortName}: P ${formatRate(point.precision)}, R ${formatRate(point.recall)}`, { class: "annotation" }));
  });
  const baseY = boxTop + report.points.length * lineHeight + 7;
  parts.push(element("line", { x1: left + 1, y1: baseY, x2: left + 15, y2: baseY, stroke: BASE_RATE_COLOUR, "stroke-width": 1.25, "stroke-dasharray": "3 3" }));
  parts.push(svgText(left + 20, baseY + 4, `base rate ${formatRate(report.prevalence)}`, { class: "annotation" }));
  return parts.join("");
}

function pointSentence(point: OperatingPoint): string {
  return `${point.name}: precision ${formatRate(point.precision)}, recall ${formatRate(point.recall)} (${formatCount(point.truePositives)} right of ${formatCount(point.predicted)} predicted)`;
}

function describePanel(report: LabelReport): string {
  if (report.positives === 0) return `No example in the data carries the label ${report.label}, so its precision–recall curve cannot be drawn.`;
  const points = report.points.map(pointSentence).join("; ");
  return `Precision against recall for ${report.label} over ${countOf(report.curve.length, "score threshold")} (${countOf(report.positives, "example")} ${report.positives === 1 ? "carries" : "carry"} the label). Marked: ${points}.`;
}

/** Text alternative: the operating points, then the best precision reachable at each recall level. */
function dataTable(report: LabelReport): string {
  const rows: (string | number)[][] = report.points.map((point) => [point.name, point.threshold === null ? "—" : formatRate(point.threshold), formatRate(point.precision), formatRate(point.recall)]);
  for (const target of ticks(0.1, 1, 0.1)) {
    const point = thresholdForTargetRecall(report.curve, target);
    if (point) rows.push([`best precision at recall ≥ ${target.toFixed(1)}`, formatRate(point.threshold), formatRate(point.precision), formatRate(point.recall)]);
  }
  return chartDataTable({ caption: `precision–recall of ${report.label}`, headings: ["point", "threshold", "precision", "recall"], rows });
}
