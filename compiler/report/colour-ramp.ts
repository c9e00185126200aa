// The heat map's colour ramp, computed from a stated rule rather than typed-in anchors:
//
//   one hue (RAMP_HUE, a blue), lightness falling in even steps of OKLab L from
//   RAMP_LIGHTEST (an empty cell, near the white page) to RAMP_DARKEST (a full cell), and
//   the largest chroma up to RAMP_CHROMA that sRGB can show at that lightness.
//
// Lightness alone carries the value, so the order survives greyscale printing and every
// colour-vision deficiency (test/compiler/report/colour-ramp.test.ts checks the steps stay
// apart under simulated protanopia, deuteranopia and tritanopia). OKLab is Björn Ottosson's
// perceptual colour space ("A perceptual color space for image processing", 2020); even
// steps of L are close to even steps of perceived lightness.

/** Hue angle in OKLCH, degrees. */
export const RAMP_HUE = 250;
/** OKLab lightness of an empty cell and of a full one. */
export const RAMP_LIGHTEST = 0.97;
export const RAMP_DARKEST = 0.32;
/** Chroma the ramp reaches for where sRGB allows it. */
export const RAMP_CHROMA = 0.14;

/**
 * OKLab (L, a, b) → linear sRGB, with Ottosson's published matrices (2020; from memory,
 * checked against culori's conversion in the test).
 */
function oklabToLinearSrgb(lightness: number, a: number, b: number): [number, number, number] {
  const l = (lightness + 0.3963377774 * a + 0.2158037573 * b) ** 3;
  const m = (lightness - 0.1055613458 * a - 0.0638541728 * b) ** 3;
  const s = (lightness - 0.0894841775 * a - 1.291485548 * b) ** 3;
  return [4.0767416621 * l - 3.3077115913 * m + 0.2309699292 * s, -1.2684380046 * l + 2.6097574011 * m - 0.3413193965 * s, -0.0041960863 * l - 0.7034186147 * m + 1.707614701 * s];
}

/** Linear sRGB channel → gamma-encoded 0..255 (IEC 61966-2-1 transfer function). */
function encode(channel: number): number {
  const c = channel <= 0.0031308 ? 12.92 * channel : 1.055 * channel ** (1 / 2.4) - 0.055;
  return Math.round(Math.min(1, Math.max(0, c)) * 255);
}

function inGamut(rgb: readonly number[]): boolean {
  return rgb.every((c) => c >= -1e-6 && c <= 1 + 1e-6);
}

/**
 * The sRGB colour "#rrggbb" of OKLCH (lightness, chroma, hue), with chroma lowered by bisection
 * until it fits in sRGB (hue and lightness are kept: they carry the meaning).
 * @example oklchToHex(1, 0, 0) // "#ffffff"
 */
export function oklchToHex(lightness: number, chroma: number, hueDegrees: number): string {
  const angle = (hueDegrees * Math.PI) / 180;
  const at = (c: number) => oklabToLinearSrgb(lightness, c * Math.cos(angle), c * Math.sin(angle));
  let low = 0;
  let high = chroma;
  if (!inGamut(at(high))) {
    for (let step = 0; step < 30; step++) {
      const middle = (low + high) / 2;
      if (inGamut(at(middle))) low = middle;
      else high = middle;
    }
    high = low;
  }
  return `#${at(high).map((c) => encode(c).toString(16).padStart(2, "0")).join("")}`;
}

/**
 * The ramp's colour for a share in [0, 1]: 0 = lightest (empty), 1 = darkest (full). Not a
 * finite number → the empty colour.
 * @example rampColour(0) // the pale end, near white
 */
export function rampColour(share: number): string {
  const t = Number.isFinite(share) ? Math.min(1, Math.max(0, share)) : 0;
  return oklchToHex(RAMP_LIGHTEST + (RAMP_DARKEST - RAMP_LIGHTEST) * t, RAMP_CHROMA, RAMP_HUE);
}

/** The rule in words, for the report's footer and legend. */
export const RAMP_RULE = `one hue (OKLCH ${RAMP_HUE}°), lightness in even OKLab steps from ${RAMP_LIGHTEST} (none) to ${RAMP_DARKEST} (all)`;
