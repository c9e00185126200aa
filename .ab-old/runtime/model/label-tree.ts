// The label tree of the tree head (hierarchical softmax over a Huffman tree; Morin &
// Bengio 2005, Huffman coding from Huffman 1952). Nodes 0..K-1 are the labels (leaves),
// K..2K-2 the inner nodes, 2K-2 the root. Inner node i (output row i - K) sends a text to
// its first child with probability σ(logit) and to its second with σ(-logit), so the
// label probabilities are products along root-to-leaf paths and always sum to 1.
//
// Section layout (i32): for each inner node in order, its first child then its second.

/** Computes one inner node's (temperature-scaled) logit on demand. */
export interface NodeScorer {
  nodeLogit(inner: number): number;
}

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

  /**
   * The `k` most probable labels by best-first search: nodes are expanded in order of
   * their path probability, so only the inner nodes on the way to the winners are scored
   * (about k · log2 K of them for a balanced tree) instead of all K − 1.
   * Writes labels and probabilities, best first; returns how many were found.
   */
  topLabels(k: number, scorer: NodeScorer, labels: Int32Array, probabilities: Float64Array): number {
    const heapNodes = this.stack;
    const heapProbability = this.stackProbability;
    this.heapSize = 0;
    this.pushHeap(this.root, 1);
    let found = 0;
    while (this.heapSize > 0 && found < k) {
      const node = heapNodes[0];
      const p = heapProbability[0];
      // Pop: move the last entry to the top and sift it down.
      const size = --this.heapSize;
      const lastNode = heapNodes[size];
      const lastProbability = heapProbability[size];
      let i = 0;
      while (true) {
        let child = 2 * i + 1;
        if (child >= size) break;
        if (child + 1 < size && heapProbability[child + 1] > heapProbability[child]) child++;
        if (heapProbability[child] <= lastProbability) break;
        heapNodes[i] = heapNodes[child];
        heapProbability[i] = heapProbability[child];
        i = child;
      }
      heapNodes[i] = lastNode;
      heapProbability[i] = lastProbability;
      if (node < this.labelCount) {
        labels[found] = node;
        probabilities[found] = p;
        found++;
        continue;
      }
      const inner = node - this.labelCount;
      const toFirst = sigmoid(scorer.nodeLogit(inner));
      this.pushHeap(this.children[2 * inner], p * toFirst);
      this.pushHeap(this.children[2 * inner + 1], p * (1 - toFirst));
    }
    return found;
  }

  private heapSize = 0;

  /** Max-heap insert on the scratch arrays (no allocation). */
  private pushHeap(node: number, p: number): void {
    const heapNodes = this.stack;
    const heapProbability = this.stackProbability;
    let i = this.heapSize++;
    while (i > 0) {
      const parent = (i - 1) >> 1;
      if (heapProbability[parent] >= p) break;
      heapNodes[i] = heapNodes[parent];
      heapProbability[i] = heapProbability[parent];
      i = parent;
    }
    heapNodes[i] = node;
    heapProbability[i] = p;
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
