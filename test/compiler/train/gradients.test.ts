// The SGD steps of compiler/train/steps.ts against two outside references:
//   1. the analytic gradient of each head's loss, derived and computed here in float64
//      (softmax + negative log-likelihood, independent sigmoids + binary cross-entropy,
//      hierarchical softmax over a Huffman tree), and
//   2. central finite differences of the example loss, where the loss is what a step
//      with learning rate 0 returns (it reports the loss before updating, and moves nothing).
// Checking gradients by central differences is common practice, no source.
//
// Model (the same as runtime/model/model.ts): hidden h = Σ_f w_f·r_f / W with W = Σ_f w_f over the
// example's feature occurrences f (w_f = 1, or the row's IDF under TF-IDF), logits
// z_k = b_k + O_k·h. With g_k = ∂L/∂z_k:
//   ∂L/∂O_kj = g_k·h_j,   ∂L/∂b_k = g_k,   ∂L/∂r_row = (Σ_{f with row_f = row} w_f / W) · Σ_k g_k·O_k
// so a feature that occurs twice gets twice its share.
//   softmax:  L = −log p_gold,  p = softmax(z),         g_k = p_k − [k = gold]
//   sigmoid:  L = Σ_k −log σ(±z_k) (+ for gold labels), g_k = σ(z_k) − [k gold]
//   tree:     L = Σ_{nodes on gold's path} −log σ(d·z_node), d = +1 toward the first child,
//             −1 toward the second (runtime/model/label-tree.ts), so g_node = −d·σ(−d·z_node)
//
// Tolerances, and why. The draft stores Float32; all arithmetic here and in the steps is float64.
//   - Step vs analytic gradient: the only difference is the float32 rounding of each stored
//     update, at most half an ulp per store; parameters stay below 2 in magnitude (ulp ≤ 2^-23)
//     and a row of a repeated feature is stored twice, so |Δ + g| ≤ 2^-22 + 1e-4·|g|.
//   - Finite differences with ε = 1e-2: the perturbed value is read back from the Float32
//     array, so the divisor is exact; the loss is float64, so rounding adds ~1e-14. What
//     remains is the central difference's truncation error ε²/6·|L'''|. Along one logit,
//     |L'''| ≤ max|σ''| = 1/(6√3) ≈ 0.096 for the logistic and softmax losses, giving
//     1.6e-6; rows and output weights move the logits through factors below 1. Hence
//     |fd − g| ≤ 3e-6 + 1e-4·|g| (measured worst case 1.6e-6, for a bias).

import { describe, expect, it } from "vitest";
import { huffmanTree, treePaths } from "../../../compiler/train/huffman.ts";
import { createDraft, type Draft } from "../../../compiler/train/draft.ts";
import { createRandom } from "../../../compiler/train/random.ts";
import { createStepScratch, sigmoidStep, softmaxStep, treeStep, type TreePaths } from "../../../compiler/train/steps.ts";

const LABELS = ["alpha", "beta", "gamma", "delta", "epsilon"];
const DIMS = 5;
const ROW_COUNT = 7;
const LABEL_COUNTS = [5, 9, 12, 13, 16]; // label frequencies for the Huffman tree: the gold label (2) sits two nodes deep
const IDF = Float32Array.from([1, 2.2, 1.5, 3.1, 1.25, 2.7, 1.9]);

// The example: feature rows[start, end) = rows 1, 3, 3, 5 (row 3 twice); rows 6 and 0 lie
// outside the range and must not count.
const FEATURES = Uint32Array.from([6, 1, 3, 3, 5, 0]);
const START = 1;
const END = 5;
const GOLD = 2;
// Sigmoid gold labels: labelList[1, 3) = {0, 2}.
const LABEL_LIST = Int32Array.from([4, 0, 2, 1]);
const LABEL_START = 1;
const LABEL_END = 3;

const EPSILON = 1e-2;
const STEP_ABSOLUTE = 2 ** -22;
const DIFFERENCE_ABSOLUTE = 3e-6;
const RELATIVE = 1e-4;

type Head = "softmax" | "sigmoid" | "tree";
type Parameter = "outputs" | "bias" | "rows";

interface Setup {
  draft: Draft;
  paths: TreePaths | null;
}

function makeSetup(head: Head, tfidf: boolean): Setup {
  const random = createRandom(20240601);
  const tree = head === "tree" ? huffmanTree(LABEL_COUNTS) : null;
  const draft = createDraft({
    head,
    labels: LABELS,
    dims: DIMS,
    slots: Uint32Array.from({ length: ROW_COUNT }, (_, i) => i * 3),
    documentFrequency: new Uint32Array(ROW_COUNT).fill(1),
    rowWeights: tfidf ? IDF.slice() : null,
    tree,
    random,
  });
  // A fresh draft has zero output weights; give them and the biases non-zero values so
  // every term of the gradient is exercised.
  for (let i = 0; i < draft.outputs.length; i++) draft.outputs[i] = random.next() * 2 - 1;
  for (let i = 0; i < draft.bias.length; i++) draft.bias[i] = random.next() * 2 - 1;
  return { draft, paths: tree ? treePaths(tree, LABELS.length) : null };
}

function copyDraft(draft: Draft): Draft {
  return { ...draft, rows: draft.rows.slice(), outputs: draft.outputs.slice(), bias: draft.bias.slice() };
}

/** Runs the head's step on `draft` (in place) and returns the loss it reports. */
function runStep(head: Head, draft: Draft, paths: TreePaths | null, learningRate: number): number {
  const scratch = createStepScratch(draft.dims, draft.outputCount);
  if (head === "softmax") return softmaxStep(draft, FEATURES, START, END, GOLD, learningRate, scratch);
  if (head === "sigmoid") return sigmoidStep(draft, FEATURES, START, END, LABEL_LIST, LABEL_START, LABEL_END, learningRate, scratch);
  return treeStep(draft, FEATURES, START, END, GOLD, paths as TreePaths, learningRate, scratch);
}

/** The example loss, from a step with learning rate 0 on a copy. */
function lossOf(head: Head, draft: Draft, paths: TreePaths | null): number {
  return runStep(head, copyDraft(draft), paths, 0);
}

const sigmoid = (x: number) => 1 / (1 + Math.exp(-x));

/** Root-to-leaf path of `label` read straight from the tree's child table (not from treePaths). */
function pathFromTree(tree: Int32Array, labelCount: number, label: number): { nodes: number[]; directions: number[] } {
  const parentOf = new Map<number, number>();
  for (let inner = 0; inner < labelCount - 1; inner++) {
    parentOf.set(tree[2 * inner], labelCount + inner);
    parentOf.set(tree[2 * inner + 1], labelCount + inner);
  }
  const nodes: number[] = [];
  const directions: number[] = [];
  for (let node = label; parentOf.has(node); node = parentOf.get(node) as number) {
    const inner = (parentOf.get(node) as number) - labelCount;
    nodes.unshift(inner);
    directions.unshift(tree[2 * inner] === node ? 1 : -1);
  }
  return { nodes, directions };
}

interface Gradient {
  loss: number;
  outputs: Float64Array;
  bias: Float64Array;
  rows: Float64Array;
}

/** The analytic gradient of the example loss (see the derivation at the top), in float64. */
function analyticGradient(head: Head, draft: Draft): Gradient {
  const dims = draft.dims;
  const weightOf = (row: number) => (draft.rowWeights === null ? 1 : draft.rowWeights[row]);
  let total = 0;
  const hidden = new Float64Array(dims);
  for (let f = START; f < END; f++) {
    const row = FEATURES[f];
    total += weightOf(row);
    for (let j = 0; j < dims; j++) hidden[j] += weightOf(row) * draft.rows[row * dims + j];
  }
  for (let j = 0; j < dims; j++) hidden[j] /= total;
  const logits = Array.from({ length: draft.outputCount }, (_, k) => {
    let z = draft.bias[k];
    for (let j = 0; j < dims; j++) z += draft.outputs[k * dims + j] * hidden[j];
    return z;
  });
  const gradLogits = new Float64Array(draft.outputCount);
  let loss = 0;
  if (head === "softmax") {
    const max = Math.max(...logits);
    const exps = logits.map((z) => Math.exp(z - max));
    const sum = exps.reduce((a, b) => a + b, 0);
    loss = -Math.log(exps[GOLD] / sum);
    for (let k = 0; k < logits.length; k++) gradLogits[k] = exps[k] / sum - (k === GOLD ? 1 : 0);
  } else if (head === "sigmoid") {
    const gold = new Set(LABEL_LIST.subarray(LABEL_START, LABEL_END));
    for (let k = 0; k < logits.length; k++) {
      const target = gold.has(k) ? 1 : 0;
      loss -= Math.log(target === 1 ? sigmoid(logits[k]) : 1 - sigmoid(logits[k]));
      gradLogits[k] = sigmoid(logits[k]) - target;
    }
  } else {
    const { nodes, directions } = pathFromTree(draft.tree as Int32Array, LABELS.length, GOLD);
    nodes.forEach((node, p) => {
      const d = directions[p];
      loss -= Math.log(sigmoid(d * logits[node]));
      gradLogits[node] += -d * sigmoid(-d * logits[node]);
    });
  }
  const outputs = new Float64Array(draft.outputs.length);
  const gradHidden = new Float64Array(dims);
  for (let k = 0; k < draft.outputCount; k++) {
    for (let j = 0; j < dims; j++) {
      outputs[k * dims + j] = gradLogits[k] * hidden[j];
      gradHidden[j] += gradLogits[k] * draft.outputs[k * dims + j];
    }
  }
  const rows = new Float64Array(draft.rows.length);
  for (let f = START; f < END; f++) {
    const row = FEATURES[f];
    for (let j = 0; j < dims; j++) rows[row * dims + j] += (weightOf(row) / total) * gradHidden[j];
  }
  return { loss, outputs, bias: Float64Array.from(gradLogits), rows };
}

/** Central difference of the loss in one parameter, dividing by the perturbation actually stored. */
function centralDifference(head: Head, setup: Setup, parameter: Parameter, index: number): number {
  const plus = copyDraft(setup.draft);
  plus[parameter][index] += EPSILON;
  const minus = copyDraft(setup.draft);
  minus[parameter][index] -= EPSILON;
  const step = plus[parameter][index] - minus[parameter][index];
  return (lossOf(head, plus, setup.paths) - lossOf(head, minus, setup.paths)) / step;
}

function expectClose(actual: number, expected: number, absolute: number, where: string): void {
  const allowed = absolute + RELATIVE * Math.abs(expected);
  expect(Math.abs(actual - expected), `${where}: ${actual} vs ${expected}`).toBeLessThanOrEqual(allowed);
}

const CASES: [string, Head, boolean][] = [
  ["softmax, mean weighting", "softmax", false],
  ["softmax, TF-IDF weighting", "softmax", true],
  ["sigmoid, mean weighting", "sigmoid", false],
  ["sigmoid, TF-IDF weighting", "sigmoid", true],
  ["tree, mean weighting", "tree", false],
  ["tree, TF-IDF weighting", "tree", true],
];

describe.each(CASES)("the %s step", (_, head, tfidf) => {
  const setup = makeSetup(head, tfidf);
  const gradient = analyticGradient(head, setup.draft);

  it("reports the loss derived here", () => {
    expectClose(lossOf(head, setup.draft, setup.paths), gradient.loss, 1e-12, "loss");
  });

  it("moves every parameter by minus the analytic gradient when the learning rate is 1", () => {
    const stepped = copyDraft(setup.draft);
    runStep(head, stepped, setup.paths, 1);
    for (const parameter of ["outputs", "bias", "rows"] as const) {
      for (let i = 0; i < stepped[parameter].length; i++) {
        const change = stepped[parameter][i] - setup.draft[parameter][i];
        expectClose(change, -gradient[parameter][i], STEP_ABSOLUTE, `${parameter}[${i}]`);
      }
    }
  });

  it("leaves the draft it was given untouched when the learning rate is 0", () => {
    const copy = copyDraft(setup.draft);
    runStep(head, copy, setup.paths, 0);
    expect(copy.outputs).toEqual(setup.draft.outputs);
    expect(copy.bias).toEqual(setup.draft.bias);
    expect(copy.rows).toEqual(setup.draft.rows);
  });

  it("has output-weight gradients that match central finite differences", () => {
    for (let i = 0; i < setup.draft.outputs.length; i++) {
      expectClose(centralDifference(head, setup, "outputs", i), gradient.outputs[i], DIFFERENCE_ABSOLUTE, `outputs[${i}]`);
    }
  });

  it("has bias gradients that match central finite differences", () => {
    for (let i = 0; i < setup.draft.bias.length; i++) {
      expectClose(centralDifference(head, setup, "bias", i), gradient.bias[i], DIFFERENCE_ABSOLUTE, `bias[${i}]`);
    }
  });

  it("has feature-row gradients that match central finite differences, the repeated feature counting twice", () => {
    for (let i = 0; i < setup.draft.rows.length; i++) {
      expectClose(centralDifference(head, setup, "rows", i), gradient.rows[i], DIFFERENCE_ABSOLUTE, `rows[${i}]`);
    }
    // The repeated row (3) must carry a real gradient, and rows outside [start, end) none.
    const rowNorm = (row: number) => Math.hypot(...gradient.rows.subarray(row * DIMS, (row + 1) * DIMS));
    expect(rowNorm(3)).toBeGreaterThan(1e-3);
    for (const absent of [0, 2, 4, 6]) expect(rowNorm(absent)).toBe(0);
  });
});

describe("the tree head's paths", () => {
  it("follow the Huffman tree's child table, first child +1 and second −1", () => {
    // runtime/model/label-tree.ts: an inner node sends a text to its first child with probability σ(logit).
    const tree = huffmanTree(LABEL_COUNTS);
    const paths = treePaths(tree, LABELS.length);
    for (let label = 0; label < LABELS.length; label++) {
      const expected = pathFromTree(tree, LABELS.length, label);
      const start = paths.offsets[label];
      const end = paths.offsets[label + 1];
      expect(Array.from(paths.nodes.subarray(start, end))).toEqual(expected.nodes);
      expect(Array.from(paths.directions.subarray(start, end))).toEqual(expected.directions);
    }
  });
});
