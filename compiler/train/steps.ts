// One SGD step per example for each head. Forward: hidden = Σ w·row / Σ w, logits from the
// output rows. Backward: the gradient of the example's loss with respect to the logits,
// pushed to the output rows and, through the hidden vector, to every feature row.
// All gradients are computed before any weight moves, so a step with learning rate 1
// subtracts exactly the gradient (the finite-difference test relies on this).

import { addFloatRow } from "../../runtime/model/scoring-kernels.ts";
import type { Draft } from "./draft.ts";

/** Scratch vectors reused by every step (one set per training thread). */
export interface StepScratch {
  hidden: Float64Array;
  gradHidden: Float64Array;
  logits: Float64Array;
  gradLogits: Float64Array;
}

export function createStepScratch(dims: number, outputCount: number): StepScratch {
  return {
    hidden: new Float64Array(dims),
    gradHidden: new Float64Array(dims),
    logits: new Float64Array(outputCount),
    gradLogits: new Float64Array(outputCount),
  };
}

/** Label paths of a tree head: inner nodes and the direction (+1 first child, −1 second) per label. */
export interface TreePaths {
  offsets: Uint32Array;
  nodes: Int32Array;
  directions: Int8Array;
}

/**
 * hidden = Σ w_f row_f / Σ w_f over features[start, end); returns Σ w_f. Each row is added by
 * the runtime's own kernel (addFloatRow), so training and serving share one Σ w·row.
 * `hidden` is `draft.dims` long.
 */
export function computeHidden(draft: Draft, features: Uint32Array, start: number, end: number, hidden: Float64Array): number {
  const dims = draft.dims;
  const rows = draft.rows;
  const weights = draft.rowWeights;
  hidden.fill(0);
  let total = 0;
  for (let f = start; f < end; f++) {
    const row = features[f];
    const weight = weights === null ? 1 : weights[row];
    total += weight;
    addFloatRow(hidden, rows, row * dims, weight);
  }
  if (total > 0) {
    const inverse = 1 / total;
    for (let j = 0; j < dims; j++) hidden[j] *= inverse;
  }
  return total;
}

function outputLogit(draft: Draft, output: number, hidden: Float64Array): number {
  const dims = draft.dims;
  const base = output * dims;
  const outputs = draft.outputs;
  let sum = draft.bias[output];
  for (let j = 0; j < dims; j++) sum += outputs[base + j] * hidden[j];
  return sum;
}

/**
 * Moves output row `output` and its bias by −lr·g and accumulates g·row into gradHidden.
 * With adaptive rates (row-wise Adagrad) the step is divided by the root of the row's summed
 * squared gradients, so rare and frequent outputs, rows and biases each get a step of their
 * own scale (Duchi, Hazan and Singer 2011, "Adaptive subgradient methods"; one accumulator per
 * row rather than per weight, which keeps memory at one float per row).
 */
function updateOutput(draft: Draft, output: number, g: number, learningRate: number, s: StepScratch, hiddenSquare: number): void {
  const dims = draft.dims;
  const base = output * dims;
  const outputs = draft.outputs;
  const adaptive = draft.adaptive;
  let outputRate = learningRate;
  let biasRate = learningRate;
  if (adaptive) {
    adaptive.outputs[output] += g * g * hiddenSquare;
    adaptive.bias[output] += g * g;
    outputRate = learningRate / Math.sqrt(adaptive.outputs[output] + ADAPTIVE_EPSILON);
    biasRate = learningRate / Math.sqrt(adaptive.bias[output] + ADAPTIVE_EPSILON);
  }
  if (draft.linear) {
    // The identity layer of a linear draft stays as it is: logit k is hidden[k].
    s.gradHidden[output] += g;
  } else {
    for (let j = 0; j < dims; j++) {
      s.gradHidden[j] += g * outputs[base + j];
      outputs[base + j] -= outputRate * g * s.hidden[j];
    }
  }
  draft.bias[output] -= biasRate * g;
}

/** Keeps the first adaptive steps finite when a row's gradients have all been zero. */
const ADAPTIVE_EPSILON = 1e-8;

function meanSquare(vector: Float64Array, dims: number): number {
  let sum = 0;
  for (let j = 0; j < dims; j++) sum += vector[j] * vector[j];
  return sum / dims;
}

/** rows −= lr · (w_f / Σw) · gradHidden for every feature occurrence (adaptive: per row, see updateOutput). */
function updateRows(draft: Draft, features: Uint32Array, start: number, end: number, totalWeight: number, learningRate: number, s: StepScratch, gold = -1, rival = -1): void {
  if (totalWeight <= 0) return;
  const dims = draft.dims;
  const rows = draft.rows;
  const weights = draft.rowWeights;
  const gradHidden = s.gradHidden;
  const adaptive = draft.adaptive;
  const gradSquare = adaptive ? meanSquare(gradHidden, dims) : 0;
  const perWeight = 1 / totalWeight; // one division per example, not per feature
  for (let f = start; f < end; f++) {
    const row = features[f];
    const share = weights === null ? perWeight : perWeight * weights[row];
    let scale = learningRate * share;
    if (adaptive) {
      adaptive.rows[row] += share * share * gradSquare;
      scale /= Math.sqrt(adaptive.rows[row] + ADAPTIVE_EPSILON);
    }
    const base = row * dims;
    if (rival >= 0) {
      // Only two columns have a gradient (see softmaxStep): the others would subtract zero.
      rows[base + gold] -= scale * gradHidden[gold];
      rows[base + rival] -= scale * gradHidden[rival];
      continue;
    }
    let j = 0;
    for (; j + 3 < dims; j += 4) {
      rows[base + j] -= scale * gradHidden[j];
      rows[base + j + 1] -= scale * gradHidden[j + 1];
      rows[base + j + 2] -= scale * gradHidden[j + 2];
      rows[base + j + 3] -= scale * gradHidden[j + 3];
    }
    for (; j < dims; j++) rows[base + j] -= scale * gradHidden[j];
  }
}

/**
 * Softmax head: negative log-likelihood of `gold` (or the margin loss, see draft.loss). Returns the loss before the update.
 * `trainRows = false` freezes the feature rows (fine-tuning the output after pruning).
 */
export function softmaxStep(draft: Draft, features: Uint32Array, start: number, end: number, gold: number, learningRate: number, s: StepScratch, trainRows = true): number {
  const totalWeight = computeHidden(draft, features, start, end, s.hidden);
  const loss = softmaxOutputStep(draft, gold, learningRate, s);
  if (!trainRows) return loss;
  if (draft.loss !== "margin") {
    updateRows(draft, features, start, end, totalWeight, learningRate, s);
  } else if (loss > 0) {
    // Under the margin loss an example past its margin has no gradient: its rows stay as they
    // are. Otherwise a linear draft's hidden gradient is the logits' (identity layer), non-zero
    // only for the gold label and its rival, so only those two columns of each row move.
    let rival = -1;
    if (draft.linear) for (let k = 0; k < draft.outputCount; k++) if (s.gradLogits[k] > 0) rival = k;
    updateRows(draft, features, start, end, totalWeight, learningRate, s, gold, rival);
  }
  return loss;
}

/**
 * The output half of softmaxStep, from the hidden vector in `s.hidden` (fills s.gradHidden).
 * Returns the loss the draft minimizes (draft.loss: logistic or margin).
 */
export function softmaxOutputStep(draft: Draft, gold: number, learningRate: number, s: StepScratch): number {
  const count = draft.outputCount;
  let max = -Infinity;
  for (let k = 0; k < count; k++) {
    const z = outputLogit(draft, k, s.hidden);
    s.logits[k] = z;
    if (z > max) max = z;
  }
  const loss = draft.loss === "margin" ? marginGradient(s.logits, gold, count, s.gradLogits) : logisticGradient(s.logits, max, gold, count, s.gradLogits);
  s.gradHidden.fill(0);
  const hiddenSquare = draft.adaptive ? meanSquare(s.hidden, draft.dims) : 0;
  // A zero gradient changes nothing (the margin loss moves two outputs at most): skip it.
  for (let k = 0; k < count; k++) if (s.gradLogits[k] !== 0) updateOutput(draft, k, s.gradLogits[k], learningRate, s, hiddenSquare);
  return loss;
}

/** Softmax negative log-likelihood of `gold` and its gradient p − onehot(gold) (`max` is the largest logit). */
function logisticGradient(logits: Float64Array, max: number, gold: number, count: number, gradLogits: Float64Array): number {
  let sum = 0;
  for (let k = 0; k < count; k++) sum += Math.exp(logits[k] - max);
  const logSum = max + Math.log(sum);
  for (let k = 0; k < count; k++) gradLogits[k] = Math.exp(logits[k] - logSum) - (k === gold ? 1 : 0);
  return logSum - logits[gold];
}

/**
 * Multiclass hinge loss max(0, 1 + z_r − z_gold), r the highest other label, and its
 * subgradient: +1 on r and −1 on gold while the margin is short of 1, else zero (the example
 * is left alone). Crammer and Singer 2001 (see SoftmaxLoss in draft.ts).
 */
function marginGradient(logits: Float64Array, gold: number, count: number, gradLogits: Float64Array): number {
  gradLogits.fill(0);
  let rival = -1;
  for (let k = 0; k < count; k++) if (k !== gold && (rival < 0 || logits[k] > logits[rival])) rival = k;
  if (rival < 0) return 0; // one label: nothing to separate
  const shortfall = 1 + logits[rival] - logits[gold];
  if (shortfall <= 0) return 0;
  gradLogits[rival] = 1;
  gradLogits[gold] = -1;
  return shortfall;
}

/** Independent sigmoids with binary cross-entropy, gold labels in labels[labelStart, labelEnd). */
export function sigmoidStep(draft: Draft, features: Uint32Array, start: number, end: number, labels: Int32Array, labelStart: number, labelEnd: number, learningRate: number, s: StepScratch, trainRows = true): number {
  const totalWeight = computeHidden(draft, features, start, end, s.hidden);
  const loss = sigmoidOutputStep(draft, labels, labelStart, labelEnd, learningRate, s);
  if (trainRows) updateRows(draft, features, start, end, totalWeight, learningRate, s);
  return loss;
}

/** The output half of sigmoidStep, from the hidden vector in `s.hidden`. */
export function sigmoidOutputStep(draft: Draft, labels: Int32Array, labelStart: number, labelEnd: number, learningRate: number, s: StepScratch): number {
  const count = draft.outputCount;
  let loss = 0;
  for (let k = 0; k < count; k++) {
    let target = 0;
    for (let l = labelStart; l < labelEnd; l++) if (labels[l] === k) target = 1;
    const z = outputLogit(draft, k, s.hidden);
    // log(1 + e^-z) for target 1, log(1 + e^z) for target 0, computed stably.
    const signed = target === 1 ? -z : z;
    loss += signed > 0 ? signed + Math.log1p(Math.exp(-signed)) : Math.log1p(Math.exp(signed));
    s.gradLogits[k] = 1 / (1 + Math.exp(-z)) - target;
  }
  s.gradHidden.fill(0);
  const hiddenSquare = draft.adaptive ? meanSquare(s.hidden, draft.dims) : 0;
  for (let k = 0; k < count; k++) updateOutput(draft, k, s.gradLogits[k], learningRate, s, hiddenSquare);
  return loss;
}

/** Hierarchical softmax: binary logistic losses along the gold label's path only. */
export function treeStep(draft: Draft, features: Uint32Array, start: number, end: number, gold: number, paths: TreePaths, learningRate: number, s: StepScratch, trainRows = true): number {
  const totalWeight = computeHidden(draft, features, start, end, s.hidden);
  const loss = treeOutputStep(draft, gold, paths, learningRate, s);
  if (trainRows) updateRows(draft, features, start, end, totalWeight, learningRate, s);
  return loss;
}

/** The output half of treeStep, from the hidden vector in `s.hidden`. */
export function treeOutputStep(draft: Draft, gold: number, paths: TreePaths, learningRate: number, s: StepScratch): number {
  const pathStart = paths.offsets[gold];
  const pathEnd = paths.offsets[gold + 1];
  let loss = 0;
  for (let p = pathStart; p < pathEnd; p++) {
    const node = paths.nodes[p];
    const z = outputLogit(draft, node, s.hidden);
    const signed = paths.directions[p] * z; // log σ(signed) is this node's log-probability
    loss += signed > 0 ? Math.log1p(Math.exp(-signed)) : -signed + Math.log1p(Math.exp(signed));
    s.gradLogits[p - pathStart] = (1 / (1 + Math.exp(-z)) - (paths.directions[p] > 0 ? 1 : 0));
  }
  s.gradHidden.fill(0);
  const hiddenSquare = draft.adaptive ? meanSquare(s.hidden, draft.dims) : 0;
  for (let p = pathStart; p < pathEnd; p++) updateOutput(draft, paths.nodes[p], s.gradLogits[p - pathStart], learningRate, s, hiddenSquare);
  return loss;
}
