// Axes, grid lines and tick labels shared by the x–y charts of the report.

import { element, svgText, type LinearScale } from "./svg-builder.ts";

/** Where the plot area sits inside the chart. */
export interface PlotArea {
  left: number;
  top: number;
  width: number;
  height: number;
}

/** How tick values are printed (default: two decimals). */
export type TickFormat = (value: number) => string;

const GRID = "#d9d9d9";
const AXIS = "#4d4d4d";
const INK = "#1a1a1a";

/**
 * Ticks from `low` to `high` every `step`, without floating-point drift (0.1 · 3 → 0.3).
 * @example ticks(0, 1, 0.25) // [0, 0.25, 0.5, 0.75, 1]
 */
export function ticks(low: number, high: number, step: number): number[] {
  const values: number[] = [];
  const count = Math.round((high - low) / step);
  for (let i = 0; i <= count; i++) values.push(Number((low + i * step).toFixed(10)));
  return values;
}

/**
 * Grid lines, the two axis lines, tick labels and axis titles of an x–y plot.
 * @example xyAxes(area, x, y, ticks(0, 1, 0.2), ticks(0, 1, 0.2), "recall", "precision")
 */
export function xyAxes(area: PlotArea, x: LinearScale, y: LinearScale, xTicks: number[], yTicks: number[], xTitle: string, yTitle: string, format: TickFormat = (v) => v.toFixed(1)): string {
  const bottom = area.top + area.height;
  const right = area.left + area.width;
  const parts: string[] = [];
  for (const value of xTicks) {
    const px = x(value);
    parts.push(element("line", { x1: px, y1: area.top, x2: px, y2: bottom, stroke: GRID, "stroke-width": 1 }));
    parts.push(svgText(px, bottom + 16, format(value), { "text-anchor": "middle", class: "tick" }));
  }
  for (const value of yTicks) {
    const py = y(value);
    parts.push(element("line", { x1: area.left, y1: py, x2: right, y2: py, stroke: GRID, "stroke-width": 1 }));
    parts.push(svgText(area.left - 6, py + 4, format(value), { "text-anchor": "end", class: "tick" }));
  }
  parts.push(element("line", { x1: area.left, y1: bottom, x2: right, y2: bottom, stroke: AXIS, "stroke-width": 1.5 }));
  parts.push(element("line", { x1: area.left, y1: area.top, x2: area.left, y2: bottom, stroke: AXIS, "stroke-width": 1.5 }));
  parts.push(svgText(area.left + area.width / 2, bottom + 36, xTitle, { "text-anchor": "middle", class: "axis-title", fill: INK }));
  const yMiddle = area.top + area.height / 2;
  parts.push(svgText(0, 0, yTitle, { "text-anchor": "middle", class: "axis-title", fill: INK, transform: `translate(${area.left - 40} ${yMiddle}) rotate(-90)` }));
  return parts.join("");
}
