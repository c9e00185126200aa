// Population stability index against values worked out by hand from its definition,
// PSI = Σ (a − e) · ln(a / e) over bin shares (common practice, no source for the formula).

import { describe, expect, it } from "vitest";
import { populationStability, PSI_FLOOR } from "../../../compiler/metrics/population-stability.ts";

describe("populationStability", () => {
  it("should be 0 for the same distribution, whatever the totals", () => {
    expect(populationStability({ a: 10, b: 30 }, { a: 100, b: 300 }).psi).toBeCloseTo(0, 12);
  });

  it("should match a hand-computed two-bin shift", () => {
    // e = (0.5, 0.5), a = (0.25, 0.75): (−0.25)·ln(0.5) + 0.25·ln(1.5) = 0.173287 + 0.101366 = 0.274653.
    const result = populationStability({ a: 50, b: 50 }, { a: 25, b: 75 });
    expect(result.psi).toBeCloseTo(0.274653, 5);
    expect(result.reading).toBe("large shift");
  });

  it("should floor an empty bin instead of going infinite, and cover bins of either side", () => {
    // e = (1, 0) floored to (1, 1e-4); a = (0.5, 0.5): (−0.5)·ln(0.5) + (0.5 − 1e-4)·ln(0.5 / 1e-4).
    const expected = -0.5 * Math.log(0.5) + (0.5 - PSI_FLOOR) * Math.log(0.5 / PSI_FLOOR);
    const result = populationStability({ ok: 10 }, { ok: 5, spam: 5 });
    expect(result.bins.map((b) => b.bin)).toEqual(["ok", "spam"]);
    expect(result.psi).toBeCloseTo(expected, 10);
  });

  it("should say there is no data when one side is empty", () => {
    expect(populationStability({}, { a: 1 }).reading).toBe("no data");
  });
});
