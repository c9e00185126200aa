// The margin loss and linear drafts of compiler/train/draft.ts and steps.ts, against the
// definitions they implement:
//   - multiclass hinge loss L = max(0, 1 + max_{k≠y} z_k − z_y), subgradient +1 on the rival
//     (the highest other label) and −1 on the gold label while L > 0, else 0 (Crammer and
//     Singer 2001, "On the algorithmic implementation of multiclass kernel-based vector machines",
//     Journal of Machine Learning Research 2, 265-292);
//   - a linear draft: logits z = b + h with h = Σ w·row / Σ w (an identity output layer), i.e.
//     multinomial logistic regression (or the hinge loss) on the pooled features, whose output
//     layer never moves.

import { describe, expect, it } from "vitest";
import { defaultBuildSettings } from "../../../compiler/build/build-settings.ts";
import { withLinearDims } from "../../../compiler/build/linear-dims.ts";
import { createDraft, type SoftmaxLoss } from "../../../compiler/train/draft.ts";
import { createRandom } from "../../../compiler/train/random.ts";
import { createStepScratch, softmaxStep } from "../../../compiler/train/steps.ts";

const LABELS = ["a", "b", "c", "d"];
const FEATURES = Uint32Array.from([0, 2, 2, 3]); // row 2 twice

function draftOf(loss: SoftmaxLoss, options: { linear?: boolean; dims?: number } = {}) {
  const dims = options.dims ?? 6;
  return createDraft({ head: "softmax", labels: LABELS, dims, slots: Uint32Array.from([0, 1, 2, 3]), documentFrequency: new Uint32Array(4).fill(1), rowWeights: null, tree: null, random: createRandom(7), loss, linear: options.linear });
}

describe("the margin loss", () => {
  it("should leave every weight alone when the gold label already leads by the margin", () => {
    const draft = draftOf("margin");
    draft.bias.set([0, 0, 1.5, 0]); // output weights start at zero: the logits are the biases, gold leads by 1.5
    const before = { rows: draft.rows.slice(), outputs: draft.outputs.slice(), bias: draft.bias.slice() };
    const loss = softmaxStep(draft, FEATURES, 0, FEATURES.length, 2, 0.5, createStepScratch(draft.dims, draft.outputCount));
    expect(loss).toBe(0);
    expect(draft.rows).toEqual(before.rows);
    expect(draft.outputs).toEqual(before.outputs);
    expect(draft.bias).toEqual(before.bias);
  });

  it("should report 1 + z_rival − z_gold and move only the gold and rival biases, by the rate", () => {
    const draft = draftOf("margin");
    draft.adaptive = null; // plain steps: the move is exactly the rate times the subgradient
    draft.bias.set([0.25, -0.5, 0.5, 0.125]); // gold 2, rival 0 (0.25): shortfall 1 + 0.25 − 0.5
    const loss = softmaxStep(draft, FEATURES, 0, FEATURES.length, 2, 0.5, createStepScratch(draft.dims, draft.outputCount));
    expect(loss).toBeCloseTo(0.75, 12);
    expect(Array.from(draft.bias)).toEqual([0.25 - 0.5, -0.5, 0.5 + 0.5, 0.125]);
  });
});

describe("a linear draft", () => {
  it("should keep its identity output layer while its rows learn", () => {
    const draft = draftOf("logistic", { linear: true, dims: LABELS.length });
    const identity = draft.outputs.slice();
    for (let k = 0; k < LABELS.length; k++) expect(identity[k * LABELS.length + k]).toBe(1);
    const rowsBefore = draft.rows.slice();
    const scratch = createStepScratch(draft.dims, draft.outputCount);
    for (let step = 0; step < 5; step++) softmaxStep(draft, FEATURES, 0, FEATURES.length, 1, 0.5, scratch);
    expect(draft.outputs).toEqual(identity);
    expect(draft.rows).not.toEqual(rowsBefore);
    // Its logits are the pooled rows plus the bias, so training raised the gold label's.
    expect(scratch.logits[1]).toBe(Math.max(...scratch.logits));
  });

  it("should refuse dims other than the output count", () => {
    expect(() => draftOf("logistic", { linear: true, dims: 6 })).toThrow(/a linear draft needs dims = 4 \(one per output\), got 6/);
  });

  it("should take its dims from the label count, and refuse the tree head", () => {
    const settings = { ...defaultBuildSettings(), linear: true, dims: 32 };
    expect(withLinearDims(settings, "softmax", 26).dims).toBe(26);
    expect(withLinearDims({ ...settings, linear: false }, "softmax", 26).dims).toBe(32);
    expect(() => withLinearDims(settings, "tree", 300)).toThrow(/--linear needs a softmax or sigmoid head/);
  });
});
