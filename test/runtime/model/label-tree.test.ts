// The tree head's probabilities are a proper distribution, and best-first top-k search
// finds exactly the labels a full traversal ranks highest.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { huffmanTree } from "../../../compiler/train/huffman.ts";
import { LabelTree } from "../../../runtime/model/label-tree.ts";

function randomTree(counts: number[]) {
  return new LabelTree(huffmanTree(counts), counts.length);
}

describe("LabelTree", () => {
  it("should give label probabilities that sum to 1 for random logits", () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 1, max: 1000 }), { minLength: 2, maxLength: 300 }), fc.integer({ min: 0, max: 2 ** 31 }), (counts, seed) => {
        const tree = randomTree(counts);
        let state = seed;
        const logits = Float64Array.from({ length: counts.length - 1 }, () => {
          state = (Math.imul(state, 1103515245) + 12345) >>> 0;
          return (state / 2 ** 32 - 0.5) * 20;
        });
        const probabilities = new Float32Array(counts.length);
        tree.labelProbabilities(logits, probabilities);
        const sum = probabilities.reduce((a, b) => a + b, 0);
        expect(Math.abs(sum - 1)).toBeLessThan(1e-5);
      }),
      { numRuns: 200 },
    );
  });

  it("should find by best-first search the same top labels as a full traversal", () => {
    const counts = Array.from({ length: 500 }, (_, i) => 1 + ((i * 7919) % 97));
    const tree = randomTree(counts);
    const logits = Float64Array.from({ length: counts.length - 1 }, (_, i) => Math.sin(i * 12.9898) * 4);
    const all = new Float32Array(counts.length);
    tree.labelProbabilities(logits, all);
    const expected = Array.from(all, (p, label) => ({ p, label })).sort((a, b) => b.p - a.p).slice(0, 5);
    const labels = new Int32Array(counts.length);
    const probabilities = new Float64Array(counts.length);
    let scored = 0;
    const found = tree.topLabels(5, { nodeLogit: (inner) => (scored++, logits[inner]) }, labels, probabilities);
    expect(found).toBe(5);
    expect(Array.from(labels.subarray(0, 5))).toEqual(expected.map((e) => e.label));
    for (let i = 0; i < 5; i++) expect(probabilities[i]).toBeCloseTo(expected[i].p, 6);
    // It scored only part of the 499 inner nodes.
    expect(scored).toBeLessThan(counts.length - 1);
  });

  it("should refuse a tree where a node has two parents", () => {
    expect(LabelTree.check(Int32Array.from([0, 1, 0, 3]), 3)).toMatch(/two parents/);
  });
});
