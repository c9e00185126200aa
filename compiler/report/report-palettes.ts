import { rampColour } from "./colour-ramp.ts";

// Colours of the report, chosen to stay readable for people with colour-vision deficiencies
// and to meet WCAG 2.1 contrast (SC 1.4.3 for text, SC 1.4.11 for lines and marks).

/**
 * Okabe & Ito, "Color Universal Design (CUD): how to make figures and presentations that are
 * friendly to colorblind people", 2008 (J*Fly): the eight-colour categorical set. Only the
 * five with at least 3:1 contrast against the white page (WCAG 2.1 SC 1.4.11) draw lines;
 * orange, sky blue and yellow are too light for thin lines on white.
 */
export const OKABE_ITO = {
  orange: "#E69F00",
  skyBlue: "#56B4E9",
  bluishGreen: "#009E73",
  yellow: "#F0E442",
  blue: "#0072B2",
  vermillion: "#D55E00",
  reddishPurple: "#CC79A7",
  black: "#000000",
} as const;

const LINE_COLOURS = [OKABE_ITO.blue, OKABE_ITO.vermillion, OKABE_ITO.bluishGreen, OKABE_ITO.reddishPurple, OKABE_ITO.black];
// After five labels colours repeat, so the dash pattern changes: colour and dash together
// keep every label's line distinct without relying on hue alone (WCAG 2.1 SC 1.4.1).
const DASHES = ["", "8 4", "2 3", "10 3 2 3"];

/** A line style for the `index`-th label: an Okabe–Ito colour and a dash pattern ("" = solid). */
export interface LineStyle {
  colour: string;
  dash: string;
}

/**
 * The line style of label number `index` (0-based): five colours, then the next dash pattern.
 * @example lineStyle(0) // { colour: "#0072B2", dash: "" }
 */
export function lineStyle(index: number): LineStyle {
  const colour = LINE_COLOURS[index % LINE_COLOURS.length];
  const dash = DASHES[Math.floor(index / LINE_COLOURS.length) % DASHES.length];
  return { colour, dash };
}

/** The line colours in use (for tests of their contrast). */
export const LINE_COLOUR_LIST: readonly string[] = LINE_COLOURS;

/**
 * The heat-map colour of a share in [0, 1]: pale for an empty cell, dark for a full one ("more
 * ink = more examples"), from the computed ramp in colour-ramp.ts.
 * @example heatColour(0) // the ramp's pale end
 */
export function heatColour(share: number): string {
  return rampColour(share);
}

/**
 * WCAG 2.1 relative luminance of an sRGB colour "#rrggbb" (definition in WCAG 2.1, §"relative luminance").
 * @example relativeLuminance("#ffffff") // 1
 */
export function relativeLuminance(colour: string): number {
  const [r, g, b] = parseHex(colour).map((channel) => {
    const c = channel / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

/**
 * WCAG 2.1 contrast ratio (L1 + 0.05) / (L2 + 0.05) of two colours, from 1 to 21.
 * @example contrastRatio("#000000", "#ffffff") // 21
 */
export function contrastRatio(first: string, second: string): number {
  const a = relativeLuminance(first);
  const b = relativeLuminance(second);
  return (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);
}

/**
 * Black or white, whichever contrasts more with `background` (for numbers printed on cells).
 * @example textColourOn("#440154") // "#ffffff"
 */
export function textColourOn(background: string): string {
  return contrastRatio(background, "#000000") >= contrastRatio(background, "#ffffff") ? "#000000" : "#ffffff";
}

function parseHex(colour: string): [number, number, number] {
  const match = /^#([0-9a-f]{6})$/i.exec(colour);
  if (!match) throw new Error(`expected a colour as #rrggbb, got "${colour}"`);
  const value = parseInt(match[1], 16);
  return [(value >> 16) & 255, (value >> 8) & 255, value & 255];
}

