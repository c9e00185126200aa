// The confusion matrix as a heat map: rows are gold labels, columns predicted labels; each
// cell shows its count, and its colour is the cell's share of its row (row-normalized), so a
// rare label's errors are as visible as a common label's.

import { REPORT_WORDS } from "./report-words.ts";
import { escapeHtml } from "./escape-html.ts";
import { chartDataTable } from "./html-table.ts";
import { heatColour, textColourOn } from "./report-palettes.ts";
import { countOf, formatCount, formatPercent, formatRate, shorten } from "./report-format.ts";
import { element, svgChart, svgText } from "./svg-builder.ts";
import type { EvaluationReport } from "../evaluate/evaluate.ts";

/** Beyond this many labels the matrix shows the most frequent gold labels only. */
export const MATRIX_LABEL_LIMIT = 30;
/** Fill of a row whose gold label has no examples (no share to colour). */
const EMPTY_ROW_FILL = "#eeeeee";
const INK = "#1a1a1a";
const LABEL_CHARACTERS = 22;
// Approximate advance of one character at the chart's 12px label font.
const CHARACTER_WIDTH = 7;

/**
 * The confusion-matrix figure: heat map with counts, colour legend and a data table.
 * @example renderConfusionMatrix(evaluation)
 */
export function renderConfusionMatrix(evaluation: EvaluationReport): string {
  const all = evaluation.confusionLabels;
  const support = evaluation.confusion.map((row) => row.reduce((sum, count) => sum + count, 0));
  let shown = all.map((_, i) => i);
  if (shown.length > MATRIX_LABEL_LIMIT) shown = [...shown].sort((a, b) => support[b] - support[a] || a - b).slice(0, MATRIX_LABEL_LIMIT).sort((a, b) => a - b);
  const names = shown.map((i) => shorten(all[i], LABEL_CHARACTERS));

  const n = shown.length;
  const cell = n <= 4 ? 96 : n <= 8 ? 76 : n <= 15 ? 48 : 30;
  const longest = Math.max(...names.map((name) => [...name].length), 1);
  // Count text shrinks with the cells so four digits still fit inside one.
  const sizeClass = cell >= 56 ? "cell-large" : cell >= 40 ? "cell-medium" : "cell-small";
  const rowLabelWidth = Math.min(170, 14 + longest * CHARACTER_WIDTH);
  const rotateColumns = longest * CHARACTER_WIDTH > cell - 8;
  const columnLabelHeight = rotateColumns ? Math.min(140, 16 + longest * CHARACTER_WIDTH * 0.72) : 22;
  const left = 28 + rowLabelWidth;
  const top = 26 + columnLabelHeight;
  const legendX = left + n * cell + 28;
  const width = legendX + 100;
  const height = Math.max(top + n * cell + 16, top + 200);

  const parts: string[] = [];
  parts.push(svgText(left + (n * cell) / 2, 16, REPORT_WORDS.modelAnswer, { "text-anchor": "middle", class: "axis-title", fill: INK }));
  parts.push(svgText(0, 0, REPORT_WORDS.dataLabel, { "text-anchor": "middle", class: "axis-title", fill: INK, transform: `translate(14 ${top + (n * cell) / 2}) rotate(-90)` }));
  shown.forEach((gold, r) => {
    const y = top + r * cell;
    parts.push(svgText(left - 8, y + cell / 2 + 4, names[r], { "text-anchor": "end", class: "label", fill: INK }));
    shown.forEach((predicted, c) => {
      const x = left + c * cell;
      const count = evaluation.confusion[gold][predicted];
      const share = support[gold] > 0 ? count / support[gold] : null;
      const fill = share === null ? EMPTY_ROW_FILL : heatColour(share);
      const ink = textColourOn(fill);
      parts.push(element("rect", { x, y, width: cell, height: cell, fill, stroke: "#ffffff", "stroke-width": 1 }));
      const showShare = share !== null && cell >= 56;
      const countY = y + cell / 2 + (showShare ? 0 : 5);
      parts.push(svgText(x + cell / 2, countY, formatCount(count), { "text-anchor": "middle", class: `cell ${sizeClass}${gold === predicted ? " cell-diagonal" : ""}`, fill: ink }));
      if (showShare) parts.push(svgText(x + cell / 2, countY + 15, formatPercent(share), { "text-anchor": "middle", class: "cell-share", fill: ink }));
    });
  });
  names.forEach((name, c) => {
    const x = left + c * cell + cell / 2;
    if (rotateColumns) parts.push(svgText(0, 0, name, { "text-anchor": "start", class: "label", fill: INK, transform: `translate(${x - 4} ${top - 8}) rotate(-45)` }));
    else parts.push(svgText(x, top - 8, name, { "text-anchor": "middle", class: "label", fill: INK }));
  });
  parts.push(legend(legendX, top, Math.min(160, Math.max(120, n * cell))));

  // The sentence speaks for every label, drawn or not.
  const everyLabel = all.map((_, i) => i);
  const diagonal = everyLabel.reduce((sum, i) => sum + evaluation.confusion[i][i], 0);
  const worst = largestConfusion(evaluation, everyLabel);
  const description =
    `Rows are the labels in the data, columns the model's answers; colour is the part of the row, from pale (0%) to dark blue (100%). ` +
    `${formatCount(diagonal)} of ${formatCount(evaluation.examples)} examples are on the diagonal (accuracy ${formatRate(evaluation.accuracy)}).` +
    (worst ? ` The largest confusion: ${countOf(worst.count, "text")} labelled ${all[worst.gold]} were predicted as ${all[worst.predicted]}.` : " There are no confusions.");
  const svg = svgChart({ id: "confusion", width, height, title: "Confusion matrix", description }, parts.join(""));

  const note = shown.length < all.length ? `<p class="note">Only the ${shown.length} most frequent labels in the data of ${all.length} are drawn; the data table has them all.</p>` : "";
  const table = chartDataTable({
    caption: `confusion counts (rows: ${REPORT_WORDS.dataLabel}, columns: ${REPORT_WORDS.modelAnswer})`,
    headings: ["in the data \\ model", ...all, "total"],
    rows: all.map((label, g) => [label, ...evaluation.confusion[g], support[g]]),
  });
  return `<figure class="chart-figure side-by-side">${svg}<div class="chart-notes"><figcaption>${escapeHtml(description)}</figcaption>${note}${table}</div></figure>`;
}

/** A vertical colour bar from 0% (bottom) to 100% (top) of the gold row. */
function legend(x: number, top: number, height: number): string {
  const steps = 20;
  const parts: string[] = [svgText(x, top - 8, REPORT_WORDS.rowShare, { class: "legend-title", fill: INK })];
  // Stacked rects rather than an SVG gradient: no ids to keep unique, and it prints the same.
  for (let s = 0; s < steps; s++) {
    const share = 1 - (s + 0.5) / steps;
    parts.push(element("rect", { x, y: top + (s * height) / steps, width: 16, height: height / steps + 0.5, fill: heatColour(share) }));
  }
  parts.push(element("rect", { x, y: top, width: 16, height, fill: "none", stroke: "#4d4d4d", "stroke-width": 1 }));
  for (const share of [0, 0.25, 0.5, 0.75, 1]) {
    const y = top + (1 - share) * height;
    parts.push(element("line", { x1: x + 16, y1: y, x2: x + 20, y2: y, stroke: "#4d4d4d" }));
    parts.push(svgText(x + 23, y + 4, formatPercent(share), { class: "tick", fill: INK }));
  }
  parts.push(element("rect", { x, y: top + height + 14, width: 16, height: 12, fill: EMPTY_ROW_FILL, stroke: "#4d4d4d", "stroke-width": 1 }));
  parts.push(svgText(x + 23, top + height + 24, REPORT_WORDS.emptyRow, { class: "tick", fill: INK }));
  return parts.join("");
}

function largestConfusion(evaluation: EvaluationReport, shown: number[]): { gold: number; predicted: number; count: number } | null {
  let best: { gold: number; predicted: number; count: number } | null = null;
  for (const gold of shown) {
    for (const predicted of shown) {
      const count = evaluation.confusion[gold][predicted];
      if (gold !== predicted && count > 0 && (best === null || count > best.count)) best = { gold, predicted, count };
    }
  }
  return best;
}
