// Two shares per category side by side (e.g. validation vs live traffic), as horizontal bar
// pairs with their values printed, plus the data table that is the chart's text alternative.

import { escapeHtml } from "./escape-html.ts";
import { chartDataTable } from "./html-table.ts";
import { OKABE_ITO } from "./report-palettes.ts";
import { formatPercent } from "./report-format.ts";
import { element, linearScale, svgChart, svgText } from "./svg-builder.ts";

export interface PairedBars {
  id: string;
  title: string;
  description: string;
  series: [string, string];
  rows: { category: string; first: number; second: number }[];
}

const WIDTH = 720;
const LEFT = 170;
const ROW = 34;
const TOP = 34;

/**
 * The figure for two series of shares in [0, 1].
 * @example renderPairedBars({ id: "labels", title: "Labels", description: "…", series: ["validation", "traffic"], rows: [{ category: "ok", first: 0.8, second: 0.7 }] })
 */
export function renderPairedBars(chart: PairedBars): string {
  const colours = [OKABE_ITO.blue, OKABE_ITO.orange];
  const height = TOP + chart.rows.length * ROW + 20;
  const largest = Math.max(0.01, ...chart.rows.flatMap((r) => [r.first, r.second]));
  const x = linearScale([0, largest * 1.15], [LEFT, WIDTH - 20]);
  const parts: string[] = [];
  chart.series.forEach((name, i) => {
    parts.push(element("rect", { x: LEFT + i * 160, y: 8, width: 12, height: 12, fill: colours[i] }));
    parts.push(svgText(LEFT + i * 160 + 18, 18, name, { class: "annotation" }));
  });
  chart.rows.forEach((row, i) => {
    const y = TOP + i * ROW;
    parts.push(svgText(LEFT - 10, y + 19, row.category, { "text-anchor": "end", class: "label" }));
    [row.first, row.second].forEach((value, j) => {
      const barY = y + 3 + j * 14;
      parts.push(element("rect", { x: LEFT, y: barY, width: Math.max(1, x(value) - LEFT), height: 12, fill: colours[j] }));
      parts.push(svgText(x(value) + 5, barY + 10, formatPercent(value), { class: "bar-value" }));
    });
  });
  const svg = svgChart({ id: chart.id, width: WIDTH, height, title: chart.title, description: chart.description }, parts.join(""));
  const table = chartDataTable({ caption: chart.title, headings: ["category", ...chart.series], rows: chart.rows.map((r) => [r.category, formatPercent(r.first), formatPercent(r.second)]) });
  return `<figure class="chart-figure">${svg}<figcaption>${escapeHtml(chart.description)}</figcaption>${table}</figure>`;
}
