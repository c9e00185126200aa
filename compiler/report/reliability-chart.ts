// Reliability diagram (Guo, Pleiss, Sun & Weinberger, "On Calibration of Modern Neural
// Networks", ICML 2017, fig. 1): the top score's confidence split into equal-width bins; each
// bar is the accuracy of its bin, the diagonal is perfect calibration. A histogram above it
// shows how many examples each bin holds, since a bin of three examples says little.

import { REPORT_WORDS } from "./report-words.ts";
import type { ReliabilityBin } from "../metrics/index.ts";
import { chartDataTable } from "./html-table.ts";
import { escapeHtml } from "./escape-html.ts";
import { OKABE_ITO } from "./report-palettes.ts";
import { countOf, formatCount, formatRate } from "./report-format.ts";
import { ticks, xyAxes, type PlotArea } from "./svg-axes.ts";
import { element, linearScale, svgChart, svgText } from "./svg-builder.ts";

const WIDTH = 640;
const HISTOGRAM: PlotArea = { left: 64, top: 22, width: 540, height: 62 };
const MAIN: PlotArea = { left: 64, top: 100, width: 540, height: 250 };
const HEIGHT = MAIN.top + MAIN.height + 70;
const BAR = OKABE_ITO.blue;
const MEAN = OKABE_ITO.vermillion;

/**
 * The reliability-diagram figure with its ECE and a data table of the bins.
 * @example renderReliabilityDiagram(data.bins, data.ece)
 */
export function renderReliabilityDiagram(bins: readonly ReliabilityBin[], ece: number): string {
  const x = linearScale([0, 1], [MAIN.left, MAIN.left + MAIN.width]);
  const y = linearScale([0, 1], [MAIN.top + MAIN.height, MAIN.top]);
  const total = bins.reduce((sum, bin) => sum + bin.count, 0);
  const largest = Math.max(1, ...bins.map((bin) => bin.count));
  const histogramY = linearScale([0, largest], [HISTOGRAM.top + HISTOGRAM.height, HISTOGRAM.top + 12]);
  const parts: string[] = [];

  // Histogram of examples per bin.
  parts.push(element("line", { x1: HISTOGRAM.left, y1: HISTOGRAM.top + HISTOGRAM.height, x2: HISTOGRAM.left + HISTOGRAM.width, y2: HISTOGRAM.top + HISTOGRAM.height, stroke: "#4d4d4d", "stroke-width": 1.5 }));
  parts.push(svgText(0, 0, "examples", { "text-anchor": "middle", class: "axis-title", transform: `translate(${HISTOGRAM.left - 40} ${HISTOGRAM.top + HISTOGRAM.height / 2 + 4}) rotate(-90)` }));
  for (const bin of bins) {
    if (bin.count === 0) continue;
    const left = x(bin.low) + 1.5;
    const barWidth = x(bin.high) - x(bin.low) - 3;
    const top = histogramY(bin.count);
    parts.push(element("rect", { x: left, y: top, width: barWidth, height: HISTOGRAM.top + HISTOGRAM.height - top, fill: "#8c8c8c" }));
    parts.push(svgText(left + barWidth / 2, top - 3, formatCount(bin.count), { "text-anchor": "middle", class: "bar-count" }));
  }

  // Accuracy bars, the mean confidence of each bin, and the diagonal.
  parts.push(xyAxes(MAIN, x, y, ticks(0, 1, 0.2), ticks(0, 1, 0.2), REPORT_WORDS.topScore, REPORT_WORDS.shareRight));
  for (const bin of bins) {
    if (bin.count === 0) continue;
    const left = x(bin.low) + 1.5;
    const barWidth = x(bin.high) - x(bin.low) - 3;
    parts.push(element("rect", { x: left, y: y(bin.accuracy), width: barWidth, height: y(0) - y(bin.accuracy), fill: BAR, stroke: "#00466e", "stroke-width": 1 }));
    parts.push(element("line", { x1: left - 1, y1: y(bin.meanConfidence), x2: left + barWidth + 1, y2: y(bin.meanConfidence), stroke: MEAN, "stroke-width": 3 }));
  }
  parts.push(element("line", { x1: x(0), y1: y(0), x2: x(1), y2: y(1), stroke: "#000000", "stroke-width": 1.5, "stroke-dasharray": "6 4" }));
  parts.push(element("rect", { x: MAIN.left + 8, y: MAIN.top + 8, width: 178, height: 24, fill: "#ffffff", "fill-opacity": 0.9, stroke: "#bdbdbd", rx: 3 }));
  parts.push(svgText(MAIN.left + 16, MAIN.top + 25, `ECE ${formatRate(ece)} (${bins.length} bins)`, { class: "headline-number" }));

  // Key under the axis title; each entry starts where the previous one's words end (about
  // 6.2 px per character at the annotation's 11 px size).
  const keyY = HEIGHT - 12;
  const barKeyX = MAIN.left;
  const markKeyX = barKeyX + 20 + textWidth(REPORT_WORDS.barMeaning) + 16;
  const diagonalKeyX = markKeyX + 22 + textWidth(REPORT_WORDS.markMeaning) + 16;
  parts.push(element("rect", { x: barKeyX, y: keyY - 10, width: 14, height: 12, fill: BAR, stroke: "#00466e" }));
  parts.push(svgText(barKeyX + 20, keyY, REPORT_WORDS.barMeaning, { class: "annotation" }));
  parts.push(element("line", { x1: markKeyX, y1: keyY - 4, x2: markKeyX + 16, y2: keyY - 4, stroke: MEAN, "stroke-width": 3 }));
  parts.push(svgText(markKeyX + 22, keyY, REPORT_WORDS.markMeaning, { class: "annotation" }));
  parts.push(element("line", { x1: diagonalKeyX, y1: keyY - 4, x2: diagonalKeyX + 24, y2: keyY - 4, stroke: "#000000", "stroke-width": 1.5, "stroke-dasharray": "6 4" }));
  parts.push(svgText(diagonalKeyX + 30, keyY, REPORT_WORDS.diagonalMeaning, { class: "annotation" }));

  const description = describe(bins, ece, total);
  const svg = svgChart({ id: "reliability", width: WIDTH, height: HEIGHT, title: "Reliability diagram", description }, parts.join(""));
  const table = chartDataTable({
    caption: "reliability bins",
    headings: ["confidence bin", "examples", "mean confidence", "accuracy", "gap"],
    rows: bins.map((bin) => [`${formatRate(bin.low)}–${formatRate(bin.high)}`, bin.count, bin.count ? formatRate(bin.meanConfidence) : "—", bin.count ? formatRate(bin.accuracy) : "—", bin.count ? formatRate(bin.accuracy - bin.meanConfidence) : "—"]),
    numericColumns: [1, 2, 3, 4],
  });
  return `<figure class="chart-figure side-by-side">${svg}<div class="chart-notes"><figcaption>${escapeHtml(description)}</figcaption>${table}</div></figure>`;
}

function describe(bins: readonly ReliabilityBin[], ece: number, total: number): string {
  if (total === 0) return "No scored examples, so there is nothing to calibrate.";
  const fullest = bins.reduce((best, bin) => (bin.count > best.count ? bin : best), bins[0]);
  const over = bins.reduce((sum, bin) => sum + (bin.meanConfidence > bin.accuracy ? bin.count : 0), 0);
  return (
    `Accuracy against confidence of the top label for ${countOf(total, "example")} in ${bins.length} equal-width bins; expected calibration error ${formatRate(ece)}. ` +
    `The fullest bin (${formatRate(fullest.low)}–${formatRate(fullest.high)}) holds ${countOf(fullest.count, "example")}: accuracy ${formatRate(fullest.accuracy)} at mean confidence ${formatRate(fullest.meanConfidence)}. ` +
    `${countOf(over, "example")} ${over === 1 ? "falls" : "fall"} in bins where the model is more confident than it is accurate (bars below the diagonal).`
  );
}

function textWidth(text: string): number {
  return Math.ceil(text.length * 6.2);
}
