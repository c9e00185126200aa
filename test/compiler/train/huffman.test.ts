// Huffman code lengths against a textbook worked example.
import { describe, expect, it } from "vitest";
import { codeLengths, huffmanTree, treePaths } from "../../../compiler/train/huffman.ts";
import { LabelTree } from "../../../runtime/model/label-tree.ts";

describe("huffmanTree", () => {
  it("should give the optimal code lengths of the textbook example", () => {
    // Cormen, Leiserson, Rivest & Stein, "Introduction to Algorithms" (3rd ed., §16.3,
    // Figure 16.3/16.5): frequencies a:45 b:13 c:12 d:16 e:9 f:5 (thousands) give the
    // optimal prefix code a=0, b=101, c=100, d=111, e=1101, f=1100 — lengths 1,3,3,3,4,4,
    // cost 224,000 bits (from memory).
    const counts = [45, 13, 12, 16, 9, 5];
    const lengths = Array.from(codeLengths(huffmanTree(counts), counts.length));
    expect(lengths).toEqual([1, 3, 3, 3, 4, 4]);
    expect(lengths.reduce((sum, length, i) => sum + length * counts[i], 0)).toBe(224);
  });

  it("should build a tree the runtime accepts, whose paths end at their labels", () => {
    const counts = [5, 1, 1, 2, 8, 3, 3, 1, 9, 4];
    const children = huffmanTree(counts);
    expect(LabelTree.check(children, counts.length)).toBeNull();
    const paths = treePaths(children, counts.length);
    const lengths = codeLengths(children, counts.length);
    for (let label = 0; label < counts.length; label++) expect(paths.offsets[label + 1] - paths.offsets[label]).toBe(lengths[label]);
  });

  it("should give equal lengths to equal counts that are a power of two", () => {
    // Eight equally frequent symbols: a complete tree, every code 3 bits (common practice, no source).
    expect(Array.from(codeLengths(huffmanTree(new Array(8).fill(1)), 8))).toEqual(new Array(8).fill(3));
  });
});
