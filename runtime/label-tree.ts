// The label tree of the tree head (hierarchical softmax over a Huffman tree; Morin &
// Bengio 2005, Huffman coding from Huffman 1952). Nodes 0..K-1 are the labels (leaves),
// K..2K-2 the inner nodes, 2K-2 the root. Inner node i (output row i - K) sends a text to
// its first child with probability σ(logit) and to its second with σ(-logit), so the
// label probabilities are products along root-to-leaf paths and always sum to 1.
//
// Section layout (i32): for each inner node in order, its first child then its second.

/** Read-only view over the tree section. */
export class LabelTree {
  readonly labelCount: number;
  private readonly children: Int32Array;
  private readonly parents: Int32Array;
  private readonly stack: Int32Array;
  private readonly stackProbability: Float64Array;

  constructor(children: Int32Array, labelCount: number) {
    this.labelCount = labelCount;
    this.children = children;
    const nodeCount = 2 * labelCount - 1;
    this.parents = new Int32Array(nodeCount).fill(-1);
    for (let inner = 0; inner < labelCount - 1; inner++) {
      this.parents[children[2 * inner]] = labelCount + inner;
      this.parents[children[2 * inner + 1]] = labelCount + inner;
    }
    this.stack = new Int32Array(nodeCount);
    this.stackProbability = new Float64Array(nodeCount);
  }

  /** The root node id. */
  get root(): number {
    return 2 * this.labelCount - 2;
  }

  /** Output row of the inner node directly above label `label` (for explanations). */
  firstNodeOf(label: number): number {
    return this.parents[label] - this.labelCount;
  }

  /** Probability of every label from the inner nodes' logits (a full traversal, O(K)). */
  labelProbabilities(logits: Float64Array, out: Float32Array): void {
    const stack = this.stack;
    const probability = this.stackProbability;
    const labelCount = this.labelCount;
    let depth = 0;
    stack[0] = this.root;
    probability[0] = 1;
    depth = 1;
    while (depth > 0) {
      depth--;
      const node = stack[depth];
      const p = probability[depth];
      if (node < labelCount) {
        out[node] = p;
        continue;
      }
      const inner = node - labelCount;
      const toFirst = sigmoid(logits[inner]);
      stack[depth] = this.children[2 * inner];
      probability[depth] = p * toFirst;
      depth++;
      stack[depth] = this.children[2 * inner + 1];
      probability[depth] = p * (1 - toFirst);
      depth++;
    }
  }

  /** Inner nodes on the path from the root to `label`, each with the direction taken (+1 first, -1 second). */
  pathOf(label: number): { nodes: number[]; directions: number[] } {
    const nodes: number[] = [];
    const directions: number[] = [];
    let node = label;
    while (this.parents[node] >= 0) {
      const parent = this.parents[node];
      const inner = parent - this.labelCount;
      nodes.push(inner);
      directions.push(this.children[2 * inner] === node ? 1 : -1);
      node = parent;
    }
    nodes.reverse();
    directions.reverse();
    return { nodes, directions };
  }

  /** Null when `children` describes a proper binary tree over `labelCount` leaves, else the problem. */
  static check(children: Int32Array, labelCount: number): string | null {
    if (children.length !== 2 * (labelCount - 1)) return `expected ${2 * (labelCount - 1)} child entries`;
    const nodeCount = 2 * labelCount - 1;
    const seen = new Uint8Array(nodeCount);
    for (let inner = 0; inner < labelCount - 1; inner++) {
      for (let side = 0; side < 2; side++) {
        const child = children[2 * inner + side];
        if (child < 0 || child >= labelCount + inner) return `inner node ${labelCount + inner} has child ${child}: children must be earlier nodes`;
        if (seen[child]) return `node ${child} has two parents`;
        seen[child] = 1;
      }
    }
    for (let node = 0; node < nodeCount - 1; node++) if (!seen[node]) return `node ${node} has no parent`;
    return null;
  }
}

function sigmoid(x: number): number {
  return 1 / (1 + Math.exp(-x));
}
