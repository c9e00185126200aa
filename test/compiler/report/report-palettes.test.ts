import { describe, expect, it } from "vitest";
import { contrastRatio, heatColour, LINE_COLOUR_LIST, lineStyle, OKABE_ITO, relativeLuminance, textColourOn } from "../../../compiler/report/report-palettes.ts";

describe("WCAG contrast", () => {
  it("gives 21:1 for black on white and 1:1 for a colour on itself", () => {
    // WCAG 2.1, definition of "contrast ratio": (L1 + 0.05) / (L2 + 0.05), ranging from 1 to 21.
    expect(contrastRatio("#000000", "#ffffff")).toBeCloseTo(21, 10);
    expect(contrastRatio("#0072B2", "#0072B2")).toBe(1);
  });

  it("gives #767676 on white just over 4.5:1", () => {
    // WebAIM's contrast checker: #767676 on #FFFFFF is 4.54:1, the lightest grey passing AA (from memory).
    expect(contrastRatio("#767676", "#ffffff")).toBeCloseTo(4.54, 2);
  });

  it("weights green most in relative luminance", () => {
    // WCAG 2.1, definition of "relative luminance": L = 0.2126 R + 0.7152 G + 0.0722 B (linearized sRGB).
    expect(relativeLuminance("#00ff00")).toBeCloseTo(0.7152, 4);
    expect(relativeLuminance("#ff0000")).toBeCloseTo(0.2126, 4);
    expect(relativeLuminance("#0000ff")).toBeCloseTo(0.0722, 4);
  });
});

describe("palettes", () => {
  it("uses the Okabe–Ito colours", () => {
    // Okabe & Ito 2008, "Color Universal Design": orange (230,159,0), sky blue (86,180,233),
    // bluish green (0,158,115), yellow (240,228,66), blue (0,114,178), vermillion (213,94,0),
    // reddish purple (204,121,167), black (from memory).
    expect(OKABE_ITO).toEqual({ orange: "#E69F00", skyBlue: "#56B4E9", bluishGreen: "#009E73", yellow: "#F0E442", blue: "#0072B2", vermillion: "#D55E00", reddishPurple: "#CC79A7", black: "#000000" });
    for (const colour of LINE_COLOUR_LIST) expect(Object.values(OKABE_ITO)).toContain(colour);
  });

  it("draws lines only in colours with at least 3:1 contrast against the white page", () => {
    // WCAG 2.1 SC 1.4.11 (non-text contrast): graphical objects need 3:1 against adjacent colours.
    for (const colour of LINE_COLOUR_LIST) expect(contrastRatio(colour, "#ffffff")).toBeGreaterThanOrEqual(3);
  });

  it("changes the dash pattern when the colours repeat", () => {
    // WCAG 2.1 SC 1.4.1 (use of colour): colour must not be the only visual means of distinction.
    const styles = Array.from({ length: 12 }, (_, i) => lineStyle(i));
    const keys = styles.map((s) => `${s.colour} ${s.dash}`);
    expect(new Set(keys).size).toBe(12);
  });

  it("prints heat-map numbers with at least 4.5:1 contrast on every cell colour", () => {
    // WCAG 2.1 SC 1.4.3 (contrast, minimum): 4.5:1 for normal text.
    for (let i = 0; i <= 100; i++) {
      const fill = heatColour(i / 100);
      expect(contrastRatio(fill, textColourOn(fill))).toBeGreaterThanOrEqual(4.5);
    }
  });
});
