// The draft: an uncompressed float model inside the compiler, before pruning and
// quantization. Rows exist only for kept slots (seen in ≥ minDocs training examples).

import type { HeadKind } from "../../runtime/format/model-header.ts";
import type { RandomSource } from "./random.ts";

export interface Draft {
  head: HeadKind;
  labels: string[];
  dims: number;
  /** Slot of each row, ascending. */
  slots: Uint32Array;
  /** Training examples each row's slot occurs in. */
  documentFrequency: Uint32Array;
  /** rowCount × dims. */
  rows: Float32Array;
  /** IDF per row under TF-IDF weighting, else null. */
  rowWeights: Float32Array | null;
  /** outputCount × dims: one row per label, or per inner node of the label tree. */
  outputs: Float32Array;
  bias: Float32Array;
  outputCount: number;
  /** Children of the inner nodes (tree head only; see runtime/model/label-tree.ts). */
  tree: Int32Array | null;
  /** Summed squared gradients per row, output row and bias (adaptive learning rates), else null. */
  adaptive: AdaptiveState | null;
  /** What the softmax head's steps minimize (see SoftmaxLoss); the other heads ignore it. */
  loss: SoftmaxLoss;
  /**
   * The output layer is the identity and is never trained (dims = outputCount): each row holds
   * its feature's per-label logits, a full-rank linear model like logistic regression or a
   * linear SVM fits, with no narrow hidden layer in between.
   */
  linear: boolean;
}

/**
 * "logistic": the negative log-likelihood of the softmax. "margin": the multiclass hinge loss
 * max(0, 1 + max_{k≠y} z_k − z_y) (Crammer and Singer 2001, "On the algorithmic implementation of
 * multiclass kernel-based vector machines"), which stops pushing an example once its label leads
 * by a margin of 1, and so spends the rows on the examples still misread. Serving is unchanged:
 * the runtime's softmax of the same logits, which temperature scaling then calibrates.
 */
export type SoftmaxLoss = "logistic" | "margin";

/** Row-wise Adagrad accumulators: one float per feature row, per output row and per bias. */
export interface AdaptiveState {
  rows: Float32Array;
  outputs: Float32Array;
  bias: Float32Array;
}

/**
 * A fresh draft: rows uniform in ±1/dims, output weights zero — the usual start for this
 * model family (common practice, no source): the output starts neutral, rows break symmetry.
 */
export function createDraft(options: {
  head: HeadKind;
  labels: string[];
  dims: number;
  slots: Uint32Array;
  documentFrequency: Uint32Array;
  rowWeights: Float32Array | null;
  tree: Int32Array | null;
  random: RandomSource;
  shared?: boolean;
  /** Per-row adaptive learning rates (row-wise Adagrad, see steps.ts). */
  adaptive?: boolean;
  loss?: SoftmaxLoss;
  /** Identity output layer, rows of logits (see Draft.linear); needs dims = the output count. */
  linear?: boolean;
}): Draft {
  const { dims, slots, random } = options;
  const outputCount = options.head === "tree" ? options.labels.length - 1 : options.labels.length;
  const allocate = (length: number) =>
    options.shared ? new Float32Array(new SharedArrayBuffer(length * 4)) : new Float32Array(length);
  const rows = allocate(slots.length * dims);
  const bound = 1 / dims;
  for (let i = 0; i < rows.length; i++) rows[i] = (random.next() * 2 - 1) * bound;
  const outputs = allocate(outputCount * dims);
  if (options.linear) {
    if (dims !== outputCount) throw new Error(`a linear draft needs dims = ${outputCount} (one per output), got ${dims}`);
    for (let k = 0; k < outputCount; k++) outputs[k * dims + k] = 1;
  }
  return {
    head: options.head,
    labels: options.labels,
    dims,
    slots,
    documentFrequency: options.documentFrequency,
    rows,
    rowWeights: options.rowWeights,
    outputs,
    bias: allocate(outputCount),
    outputCount,
    tree: options.tree,
    adaptive: options.adaptive ? { rows: allocate(slots.length), outputs: allocate(outputCount), bias: allocate(outputCount) } : null,
    loss: options.loss ?? "logistic",
    linear: options.linear ?? false,
  };
}
