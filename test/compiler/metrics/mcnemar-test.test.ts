import { describe, it, expect } from "vitest";
import { mcnemarTest } from "../../../compiler/metrics/index.ts";

describe("mcnemarTest", () => {
  it("matches the contingencytables McNemar exact conditional test on Cavo et al.'s table", () => {
    // R package contingencytables, chapter 8 tests (stored repository ocbe-uio/contingencytables):
    // table rbind(c(59, 6), c(16, 80)) (Cavo et al., 2012) →
    // "The McNemar exact conditional test: P = 0.052479". Discordant pairs 6 + 16 = 22 < 25 → exact.
    const result = mcnemarTest(6, 16);
    expect(result.method).toBe("exact");
    expect(result.pValue).toBeCloseTo(0.052479, 6);
  });

  it("matches the exact test on Bentur et al.'s airway table by hand", () => {
    // Table rbind(c(1, 1), c(7, 12)) (Bentur et al., 2009), the contingencytables example data;
    // by hand p = 2·(C(8,0) + C(8,1))/2⁸ = 18/256 = 0.0703125. Fagerland, Lydersen & Laake (2013)
    // report 0.070 for it (from memory).
    expect(mcnemarTest(1, 7).pValue).toBeCloseTo(0.0703125, 12);
  });

  it("matches R's mcnemar.test on Agresti's presidential approval data", () => {
    // R documentation, stats::mcnemar.test example: Agresti (1990) p. 350, approval in two surveys,
    // matrix(c(794, 86, 150, 570), nrow = 2) → "McNemar's chi-squared = 16.818, df = 1,
    // p-value = 4.115e-05" (output read in stored public R sessions). Discordant 150 and 86.
    const result = mcnemarTest(150, 86);
    expect(result.method).toBe("chi-square-corrected");
    expect(result.statistic).toBeCloseTo(16.818, 3);
    expect(result.pValue).toBeCloseTo(4.115e-5, 8);
  });

  it("gives the same p-value when b and c are swapped", () => {
    // The two-sided test is symmetric in b and c (same data as the R example above).
    expect(mcnemarTest(86, 150).pValue).toBe(mcnemarTest(150, 86).pValue);
  });

  it("switches from the exact test to chi-square at 25 discordant pairs", () => {
    // Cut-off b + c < 25 for the exact test (common practice, no source; stated in mcnemar-test.ts).
    expect(mcnemarTest(10, 14).method).toBe("exact");
    expect(mcnemarTest(10, 15).method).toBe("chi-square-corrected");
  });

  it("returns p = 1 for equal discordant counts", () => {
    // R's mcnemar.test skips the continuity correction when b = c, giving statistic 0 and p = 1.
    const result = mcnemarTest(40, 40);
    expect(result.statistic).toBe(0);
    expect(result.pValue).toBe(1);
  });

  it("returns p = 1 when there are no discordant pairs", () => {
    // No disagreement, no evidence: P(X ≤ 0) = 1 for n = 0.
    expect(mcnemarTest(0, 0)).toEqual({ b: 0, c: 0, statistic: 0, pValue: 1, method: "exact" });
  });

  it("rejects a negative count", () => {
    expect(() => mcnemarTest(-1, 3)).toThrow(/b = -1, expected an integer ≥ 0/);
  });
});
