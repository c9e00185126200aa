// The heat map's ramp follows its stated rule (one hue, even OKLab lightness steps) and stays
// legible under colour-vision deficiencies. Outside reference: culori, a general-purpose colour
// library — its OKLab/OKLCH conversions (Ottosson 2020) and its deficiency filters (Machado,
// Oliveira & Fernandes, "A Physiologically-based Model for Simulation of Color Vision
// Deficiency", IEEE TVCG 2009, at severity 1).
import { converter, filterDeficiencyDeuter, filterDeficiencyProt, filterDeficiencyTrit, formatHex } from "culori";
import { describe, expect, it } from "vitest";
import { oklchToHex, RAMP_DARKEST, RAMP_HUE, RAMP_LIGHTEST, rampColour } from "../../../compiler/report/colour-ramp.ts";
import { heatColour } from "../../../compiler/report/report-palettes.ts";

const toOklab = converter("oklab");
const toOklch = converter("oklch");
const STEPS = 10;
const ramp = Array.from({ length: STEPS + 1 }, (_, i) => rampColour(i / STEPS));

function distance(first: string, second: string): number {
  const a = toOklab(first);
  const b = toOklab(second);
  return Math.hypot((a.l as number) - (b.l as number), (a.a as number) - (b.a as number), (a.b as number) - (b.b as number));
}

describe("the heat map's colour ramp", () => {
  it("should convert OKLCH to sRGB as culori does", () => {
    for (const [l, c, h] of [[0.7, 0.1, 250], [0.5, 0.05, 30], [0.9, 0.03, 140], [1, 0, 0]]) {
      expect(oklchToHex(l, c, h)).toBe(formatHex({ mode: "oklch", l, c, h }));
    }
  });

  it("should step lightness evenly from the stated lightest to the stated darkest", () => {
    const step = (RAMP_DARKEST - RAMP_LIGHTEST) / STEPS;
    ramp.forEach((colour, i) => {
      // 8-bit rounding moves L by up to about 0.003.
      expect(Math.abs((toOklab(colour).l as number) - (RAMP_LIGHTEST + step * i))).toBeLessThan(0.005);
    });
  });

  it("should keep one hue from end to end", () => {
    for (const colour of ramp.slice(1)) {
      const hue = toOklch(colour).h as number;
      expect(Math.abs(hue - RAMP_HUE)).toBeLessThan(6);
    }
  });

  it("should keep every step apart and in order under protanopia, deuteranopia and tritanopia", () => {
    for (const simulate of [filterDeficiencyProt(1), filterDeficiencyDeuter(1), filterDeficiencyTrit(1)]) {
      const seen = ramp.map((colour) => formatHex(simulate(colour)));
      for (let i = 1; i < seen.length; i++) {
        // 0.03 in OKLab is well above a just-noticeable difference (about 0.02, common practice, no source).
        expect(distance(seen[i - 1], seen[i])).toBeGreaterThan(0.03);
        expect(toOklab(seen[i]).l as number).toBeLessThan(toOklab(seen[i - 1]).l as number);
      }
    }
  });

  it("should be what the confusion map paints with", () => {
    expect(heatColour(0)).toBe(ramp[0]);
    expect(heatColour(1)).toBe(ramp[STEPS]);
  });
});
