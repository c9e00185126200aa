// The kept-slot index: lookups find exactly the stored slots, and a malformed index is refused
// at load with what is wrong. The layout is the one runtime/format/FORMAT.md describes: rows in
// ascending slot order, buckets[b] .. buckets[b + 1] the rows whose slot's top bits are b, keys
// the low bits.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { SlotIndex } from "../../../runtime/format/slot-index.ts";

/** The index of sorted distinct `slots` with `lowBits` low bits in the keys. */
function indexOf(slots: number[], bucketBits: number, lowBits: number) {
  const buckets = new Uint32Array((1 << bucketBits) + 1);
  for (const slot of slots) buckets[(slot >>> lowBits) + 1]++;
  for (let b = 1; b < buckets.length; b++) buckets[b] += buckets[b - 1];
  const keys = Uint16Array.from(slots, (slot) => slot & ((1 << lowBits) - 1));
  return { buckets, keys };
}

describe("the slot index", () => {
  it("should find every stored slot at its row and no other slot", () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.integer({ min: 0, max: (1 << 12) - 1 }), { maxLength: 300 }), (unsorted) => {
        const slots = [...unsorted].sort((a, b) => a - b);
        const { buckets, keys } = indexOf(slots, 4, 8);
        expect(SlotIndex.check(buckets, keys, 8)).toBeNull();
        const index = new SlotIndex(buckets, keys, 8);
        const rowOfSlot = new Map(slots.map((slot, row) => [slot, row]));
        for (let slot = 0; slot < 1 << 12; slot++) expect(index.rowOf(slot)).toBe(rowOfSlot.get(slot) ?? -1);
      }),
      { numRuns: 25 },
    );
  });

  it("should say what is wrong with a malformed index", () => {
    const good = indexOf([3, 9, 300, 301, 4000], 4, 8);
    expect(SlotIndex.check(good.buckets, good.keys, 8)).toBeNull();
    const shifted = Uint32Array.from(good.buckets, (b, i) => (i === 0 ? 1 : b));
    expect(SlotIndex.check(shifted, good.keys, 8)).toBe("the first bucket must start at row 0");
    const short = Uint32Array.from(good.buckets, (b, i) => (i === good.buckets.length - 1 ? b - 1 : b));
    expect(SlotIndex.check(short, good.keys, 8)).toBe("the last bucket must end at the row count");
    const backwards = good.buckets.slice();
    backwards[2] = 0; // bucket 1 (slots 256-511) would end at row 0, before its start at row 2
    expect(SlotIndex.check(backwards, good.keys, 8)).toBe("bucket 1 ends before it starts");
    const unsorted = good.keys.slice();
    [unsorted[2], unsorted[3]] = [unsorted[3], unsorted[2]]; // 300 and 301 share bucket 1
    expect(SlotIndex.check(good.buckets, unsorted, 8)).toBe("keys are not strictly increasing inside the bucket of row 3");
    expect(SlotIndex.check(good.buckets, good.keys, 7)).toBe("a key is beyond 7 bits");
  });
});
