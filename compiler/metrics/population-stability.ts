// Population stability index: how far one distribution over the same bins (live traffic) has
// moved from a reference (the validation split). PSI = Σ (a_i − e_i) · ln(a_i / e_i) over the
// bins' shares. An empty bin would make the logarithm infinite, so every share is floored at
// PSI_FLOOR first (common practice, no source). Reading: below 0.1 little change, 0.1–0.25 a
// moderate shift, above 0.25 a large one (the usual rule of thumb; common practice, no source).

export const PSI_FLOOR = 1e-4;

export interface PopulationStability {
  psi: number;
  /** Per bin: the two shares and the bin's term of the sum. */
  bins: { bin: string; expected: number; actual: number; term: number }[];
  reading: "little change" | "moderate shift" | "large shift" | "no data";
}

/**
 * PSI of `actual` counts against `expected` counts, over the union of their bins.
 * @example populationStability({ a: 50, b: 50 }, { a: 25, b: 75 }).psi // 0.2747
 */
export function populationStability(expected: Readonly<Record<string, number>>, actual: Readonly<Record<string, number>>): PopulationStability {
  const bins = [...new Set([...Object.keys(expected), ...Object.keys(actual)])].sort();
  const total = (counts: Readonly<Record<string, number>>) => bins.reduce((sum, bin) => sum + (counts[bin] ?? 0), 0);
  const expectedTotal = total(expected);
  const actualTotal = total(actual);
  if (expectedTotal === 0 || actualTotal === 0) return { psi: Number.NaN, bins: [], reading: "no data" };
  let psi = 0;
  const rows = bins.map((bin) => {
    const e = Math.max(PSI_FLOOR, (expected[bin] ?? 0) / expectedTotal);
    const a = Math.max(PSI_FLOOR, (actual[bin] ?? 0) / actualTotal);
    const term = (a - e) * Math.log(a / e);
    psi += term;
    return { bin, expected: (expected[bin] ?? 0) / expectedTotal, actual: (actual[bin] ?? 0) / actualTotal, term };
  });
  return { psi, bins: rows, reading: psi < 0.1 ? "little change" : psi <= 0.25 ? "moderate shift" : "large shift" };
}
