// rankRows (compiler/compile/prune.ts) sorts by importance, highest first, ties toward the lower
// row id. It is a hand-written merge sort (to keep the heap small on a million rows); the
// reference here is the JavaScript engine's own sort with the same comparator (ECMA-262,
// %TypedArray%.prototype.sort), on values with many ties.

import { describe, expect, it } from "vitest";
import { rankRows } from "../../../compiler/compile/prune.ts";
import { createRandom } from "../../../compiler/train/random.ts";

const referenceRanking = (importance: Float64Array) => Int32Array.from({ length: importance.length }, (_, i) => i).sort((a, b) => importance[b] - importance[a] || a - b);

describe("rankRows", () => {
  it("orders rows as the engine's sort does, ties broken toward the lower row id", () => {
    const random = createRandom(31);
    for (const count of [0, 1, 2, 3, 7, 64, 1000, 4099]) {
      // Few distinct values (many ties), zeros, and one very large value.
      const importance = Float64Array.from({ length: count }, () => Math.floor(random.next() * 9) / 4);
      if (count > 5) importance[5] = 1e300;
      expect(Array.from(rankRows(importance))).toEqual(Array.from(referenceRanking(importance)));
    }
  });

  it("puts the most important row first", () => {
    expect(Array.from(rankRows(Float64Array.from([0.5, 2, 0.5, 1])))).toEqual([1, 3, 0, 2]);
  });
});
