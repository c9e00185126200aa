// Small builders for inline SVG written as strings on the server: the report ships no
// script, so every chart is finished markup. Text content and attribute values are escaped
// here, so a chart can pass labels from the model straight in.

import { escapeHtml } from "./escape-html.ts";

/** Attribute values; undefined and false leave the attribute out. */
export type SvgAttributes = Record<string, string | number | boolean | undefined>;

/** What every chart declares so assistive technology can announce it. */
export interface ChartFrame {
  /** Unique id prefix within the page (letters, digits, hyphens). */
  id: string;
  width: number;
  height: number;
  /** Short name, read first by screen readers. */
  title: string;
  /** One or two sentences saying what the chart shows and its main finding. */
  description: string;
}

/**
 * A complete `<svg role="img">` with `<title>` and `<desc>` referenced by `aria-labelledby`
 * (the pattern recommended by the W3C SVG Accessibility API Mappings for standalone graphics).
 * No xmlns: the HTML parser puts inline `<svg>` in the SVG namespace by itself.
 * @example svgChart({ id: "c", width: 10, height: 10, title: "t", description: "d" }, "")
 */
export function svgChart(frame: ChartFrame, body: string): string {
  const titleId = `${frame.id}-title`;
  const descriptionId = `${frame.id}-desc`;
  return (
    `<svg role="img" aria-labelledby="${titleId} ${descriptionId}" ` +
    `viewBox="0 0 ${frame.width} ${frame.height}" width="${frame.width}" height="${frame.height}" class="chart">` +
    `<title id="${titleId}">${escapeHtml(frame.title)}</title><desc id="${descriptionId}">${escapeHtml(frame.description)}</desc>` +
    `${body}</svg>`
  );
}

/**
 * One element with escaped attributes; `content` is inserted as is (already markup).
 * @example element("rect", { x: 0, y: 0, width: 4, height: 4 }) // '<rect x="0" y="0" width="4" height="4"/>'
 */
export function element(name: string, attributes: SvgAttributes, content?: string): string {
  let markup = `<${name}`;
  for (const [key, value] of Object.entries(attributes)) {
    if (value === undefined || value === false || value === "") continue;
    markup += value === true ? ` ${key}` : ` ${key}="${escapeHtml(typeof value === "number" ? round(value) : value)}"`;
  }
  return content === undefined ? `${markup}/>` : `${markup}>${content}</${name}>`;
}

/**
 * A `<text>` element; `content` is plain text and gets escaped.
 * @example svgText(10, 20, "a < b", { "text-anchor": "middle" })
 */
export function svgText(x: number, y: number, content: string, attributes: SvgAttributes = {}): string {
  return element("text", { x, y, ...attributes }, escapeHtml(content));
}

/**
 * A polyline through points, leaving out points within `minStep` pixels of the last one kept
 * (the last point is always kept): a curve over thousands of thresholds then costs only about
 * as many points as it has visible pixels.
 * @example svgPolyline([[0, 0], [1, 1]], { stroke: "#000" })
 */
export function svgPolyline(points: readonly (readonly [number, number])[], attributes: SvgAttributes, minStep = 0.5): string {
  const kept: string[] = [];
  let lastX = Number.NaN;
  let lastY = Number.NaN;
  points.forEach(([x, y], i) => {
    const isLast = i === points.length - 1;
    if (!isLast && Math.abs(x - lastX) < minStep && Math.abs(y - lastY) < minStep) return;
    kept.push(`${round(x)},${round(y)}`);
    lastX = x;
    lastY = y;
  });
  return element("polyline", { points: kept.join(" "), fill: "none", ...attributes });
}

/** A linear map from a data interval to a pixel interval. */
export interface LinearScale {
  (value: number): number;
  domain: readonly [number, number];
  range: readonly [number, number];
}

/**
 * Maps `domain` linearly onto `range` (ranges may run backwards, as SVG's y axis does).
 * @example linearScale([0, 1], [100, 0])(0.25) // 75
 */
export function linearScale(domain: readonly [number, number], range: readonly [number, number]): LinearScale {
  const span = domain[1] - domain[0] || 1;
  const scale = ((value: number) => range[0] + ((value - domain[0]) / span) * (range[1] - range[0])) as LinearScale;
  scale.domain = domain;
  scale.range = range;
  return scale;
}

/** Pixel coordinates with at most two decimals keep the markup short. */
function round(value: number): string {
  return String(Math.round(value * 100) / 100);
}
