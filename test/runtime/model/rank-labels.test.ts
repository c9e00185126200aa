// The one argmax of a score row (topLabel) and the top-k ranking beside it. Argmax with the
// first index winning ties is the convention of NumPy's argmax ("In case of multiple
// occurrences of the maximum values, the indices corresponding to the first occurrence are
// returned", numpy.argmax docs).

import { describe, expect, it } from "vitest";
import { rankLabels, topLabel } from "../../../runtime/model/rank-labels.ts";

describe("topLabel", () => {
  it("returns the index of the highest score of a whole row", () => {
    expect(topLabel(new Float32Array([0.1, 0.7, 0.2]))).toBe(1);
    expect(topLabel([3, -1, 2, 5])).toBe(3);
  });

  it("gives a tie to the lower index, as numpy.argmax does", () => {
    expect(topLabel([0.2, 0.4, 0.4, 0.1])).toBe(1);
  });

  it("reads one row of a flat texts × labels array by its start and width", () => {
    const scores = new Float64Array([0.9, 0.05, 0.05, /* text 1 */ 0.1, 0.2, 0.7]);
    expect(topLabel(scores, 0, 3)).toBe(0);
    expect(topLabel(scores, 3, 3)).toBe(2);
  });

  it("agrees with the first-ranked label of rankLabels", () => {
    const row = new Float32Array([0.3, 0.1, 0.3, 0.25]);
    expect(rankLabels(row, 1)[0]).toBe(topLabel(row));
  });
});
