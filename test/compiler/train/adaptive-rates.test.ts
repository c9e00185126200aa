// Adaptive learning rates in compiler/train/steps.ts against the published update rule:
// Adagrad (Duchi, Hazan & Singer, "Adaptive Subgradient Methods for Online Learning and
// Stochastic Optimization", JMLR 12, 2011) moves a parameter by −η·g_t / √(Σ_{s≤t} g_s²). The
// row-wise form used here keeps one sum per row (of the mean squared gradient over the row's
// coordinates), so a row's first step is −η·g / √(mean(g²)): the gradient's direction, with a
// root-mean-square step of η whatever the gradient's scale. Its gradient comes from the plain
// step with learning rate 1, which subtracts exactly the gradient (gradients.test.ts checks
// that against the analytic gradient and finite differences).

import { describe, expect, it } from "vitest";
import { createDraft, type Draft } from "../../../compiler/train/draft.ts";
import { createRandom } from "../../../compiler/train/random.ts";
import { createStepScratch, softmaxStep } from "../../../compiler/train/steps.ts";

const DIMS = 4;
const LABELS = ["a", "b", "c"];
// Rows 1, 3 and 4 once each (a repeated row would add to its sum twice within one step).
const FEATURES = Uint32Array.from([1, 3, 4]);
const GOLD = 1;
const RATE = 0.05;

function makeDraft(adaptive: boolean): Draft {
  const random = createRandom(99);
  const draft = createDraft({ head: "softmax", labels: LABELS, dims: DIMS, slots: Uint32Array.from([0, 1, 2, 3, 4]), documentFrequency: new Uint32Array(5).fill(1), rowWeights: null, tree: null, random, adaptive });
  for (let i = 0; i < draft.outputs.length; i++) draft.outputs[i] = random.next() * 2 - 1;
  for (let i = 0; i < draft.bias.length; i++) draft.bias[i] = random.next() * 2 - 1;
  return draft;
}

const step = (draft: Draft, rate: number) => softmaxStep(draft, FEATURES, 0, FEATURES.length, GOLD, rate, createStepScratch(DIMS, LABELS.length));

/** The gradient of one example: what a plain step with learning rate 1 subtracts. */
function gradient(): { rows: Float64Array; outputs: Float64Array; bias: Float64Array } {
  const before = makeDraft(false);
  const after = makeDraft(false);
  step(after, 1);
  const minus = (a: Float32Array, b: Float32Array) => Float64Array.from(a, (value, i) => value - b[i]);
  return { rows: minus(before.rows, after.rows), outputs: minus(before.outputs, after.outputs), bias: minus(before.bias, after.bias) };
}

describe("row-wise adaptive learning rates", () => {
  it("move each touched row along its gradient by a root-mean-square step of η on the first step", () => {
    const g = gradient();
    const draft = makeDraft(true);
    const before = Float64Array.from(draft.rows);
    step(draft, RATE);
    for (let row = 0; row < 5; row++) {
      const rowGradient = g.rows.subarray(row * DIMS, (row + 1) * DIMS);
      const meanSquare = rowGradient.reduce((sum, x) => sum + x * x, 0) / DIMS;
      for (let j = 0; j < DIMS; j++) {
        const moved = before[row * DIMS + j] - draft.rows[row * DIMS + j];
        const expected = meanSquare === 0 ? 0 : (RATE * rowGradient[j]) / Math.sqrt(meanSquare + 1e-8);
        // Float32 storage: half an ulp of values below 1 (2^-24), plus the relative slack of ε.
        expect(Math.abs(moved - expected)).toBeLessThan(1e-7 + 1e-4 * Math.abs(expected));
      }
      // Rows outside the example keep a zero sum; touched rows hold their mean squared gradient
      // (stored as Float32: within 2^-24 relative).
      expect(Math.abs((draft.adaptive?.rows[row] as number) - meanSquare)).toBeLessThanOrEqual(1e-7 * meanSquare);
    }
  });

  it("give each bias a first step of exactly η against its gradient's sign", () => {
    const g = gradient();
    const draft = makeDraft(true);
    const before = Float64Array.from(draft.bias);
    step(draft, RATE);
    for (let k = 0; k < LABELS.length; k++) expect(before[k] - draft.bias[k]).toBeCloseTo(RATE * Math.sign(g.bias[k]), 6);
  });

  it("shrink later steps as squared gradients add up (second step divided by √(g₁² + g₂²))", () => {
    const draft = makeDraft(true);
    step(draft, RATE);
    const sumAfterOne = draft.adaptive?.bias[GOLD] as number;
    const before = draft.bias[GOLD];
    // The second step's own gradient, from a plain rate-1 step on a copy of the draft as it is now.
    const copy: Draft = { ...draft, rows: draft.rows.slice(), outputs: draft.outputs.slice(), bias: draft.bias.slice(), adaptive: null };
    step(copy, 1);
    const g2 = before - copy.bias[GOLD];
    step(draft, RATE);
    expect(before - draft.bias[GOLD]).toBeCloseTo((RATE * g2) / Math.sqrt(sumAfterOne + g2 * g2 + 1e-8), 6);
  });

  it("leave plain SGD unchanged when off (no accumulators)", () => {
    expect(makeDraft(false).adaptive).toBeNull();
  });
});
