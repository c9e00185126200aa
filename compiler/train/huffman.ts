// Huffman coding (D. A. Huffman, "A Method for the Construction of Minimum-Redundancy
// Codes", Proc. IRE 40(9), 1952) over label frequencies, for the tree head: frequent
// labels get short paths, so training costs O(dims · average code length) per example.
// Built with the two-queue method (van Leeuwen, 1976): leaves sorted by count, merged
// nodes come out in non-decreasing order, ties broken by node id for determinism.

import type { TreePaths } from "./steps.ts";

/**
 * Children of the inner nodes (node ids as in runtime/model/label-tree.ts: labels 0..K-1, inner
 * K..2K-2, root last) for the given label counts.
 * @example huffmanTree([5, 9, 12, 13, 16, 45]) // Int32Array of 10 child ids
 */
export function huffmanTree(counts: ArrayLike<number>): Int32Array {
  const labelCount = counts.length;
  if (labelCount < 2) throw new Error("a label tree needs at least 2 labels");
  const weight = new Float64Array(2 * labelCount - 1);
  for (let i = 0; i < labelCount; i++) weight[i] = counts[i];
  const leaves = Int32Array.from({ length: labelCount }, (_, i) => i).sort((a, b) => weight[a] - weight[b] || a - b);
  const children = new Int32Array(2 * (labelCount - 1));
  let leafNext = 0;
  let innerNext = labelCount; // first unmerged inner node
  let innerEnd = labelCount; // next inner node id to create
  const takeSmallest = (): number => {
    const leafAvailable = leafNext < labelCount;
    const innerAvailable = innerNext < innerEnd;
    if (leafAvailable && (!innerAvailable || weight[leaves[leafNext]] <= weight[innerNext])) return leaves[leafNext++];
    return innerNext++;
  };
  while (innerEnd < 2 * labelCount - 1) {
    const first = takeSmallest();
    const second = takeSmallest();
    const inner = innerEnd - labelCount;
    children[2 * inner] = first;
    children[2 * inner + 1] = second;
    weight[innerEnd] = weight[first] + weight[second];
    innerEnd++;
  }
  return children;
}

/** Code length (depth) of every label in a tree from `huffmanTree`. */
export function codeLengths(children: Int32Array, labelCount: number): Int32Array {
  const depth = new Int32Array(2 * labelCount - 1);
  for (let inner = labelCount - 2; inner >= 0; inner--) {
    const node = labelCount + inner;
    depth[children[2 * inner]] = depth[node] + 1;
    depth[children[2 * inner + 1]] = depth[node] + 1;
  }
  return depth.slice(0, labelCount);
}

/** Root-to-leaf paths for training: inner node (output row) and direction per step. */
export function treePaths(children: Int32Array, labelCount: number): TreePaths {
  const parent = new Int32Array(2 * labelCount - 1).fill(-1);
  for (let inner = 0; inner < labelCount - 1; inner++) {
    parent[children[2 * inner]] = labelCount + inner;
    parent[children[2 * inner + 1]] = labelCount + inner;
  }
  const offsets = new Uint32Array(labelCount + 1);
  const nodes: number[] = [];
  const directions: number[] = [];
  for (let label = 0; label < labelCount; label++) {
    const pathNodes: number[] = [];
    const pathDirections: number[] = [];
    let node = label;
    while (parent[node] >= 0) {
      const inner = parent[node] - labelCount;
      pathNodes.push(inner);
      pathDirections.push(children[2 * inner] === node ? 1 : -1);
      node = parent[node];
    }
    for (let i = pathNodes.length - 1; i >= 0; i--) {
      nodes.push(pathNodes[i]);
      directions.push(pathDirections[i]);
    }
    offsets[label + 1] = nodes.length;
  }
  return { offsets, nodes: Int32Array.from(nodes), directions: Int8Array.from(directions) };
}
