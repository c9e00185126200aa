// Validation scores of a float draft, straight from its rows (no compile, no file): what the
// build's setting search and early stopping compare after every epoch. Softmax and the tree
// predict the most probable label; sigmoid predicts every label above 1/2.

import { labelScoresFromCounts } from "../metrics/classification-metrics.ts";
import { topLabel } from "../../runtime/model/rank-labels.ts";
import type { Draft } from "./draft.ts";
import type { EncodedExamples } from "./encode.ts";
import { computeHidden, type TreePaths } from "./steps.ts";

export interface DraftScores {
  accuracy: number;
  macroF1: number;
  /** Mean negative log-likelihood of the gold label (softmax, tree) or summed binary cross-entropy (sigmoid). */
  loss: number;
}

/**
 * Scores `draft` on examples already mapped to its rows (mapToRows with the draft's slots).
 * @example scoreDraft(draft, validationRows, null).macroF1
 */
export function scoreDraft(draft: Draft, data: EncodedExamples, paths: TreePaths | null): DraftScores {
  const labelCount = draft.labels.length;
  const dims = draft.dims;
  const hidden = new Float64Array(dims);
  const logits = new Float64Array(draft.outputCount);
  const labelLog = new Float64Array(labelCount);
  const truePositives = new Float64Array(labelCount);
  const predicted = new Float64Array(labelCount);
  const support = new Float64Array(labelCount);
  let correct = 0;
  let lossSum = 0;
  for (let i = 0; i < data.count; i++) {
    computeHidden(draft, data.features, data.offsets[i], data.offsets[i + 1], hidden);
    for (let k = 0; k < draft.outputCount; k++) {
      let z = draft.bias[k];
      const base = k * dims;
      for (let j = 0; j < dims; j++) z += draft.outputs[base + j] * hidden[j];
      logits[k] = z;
    }
    const labelStart = data.labelOffsets[i];
    const labelEnd = data.labelOffsets[i + 1];
    if (draft.head === "sigmoid") {
      let exact = true;
      for (let k = 0; k < labelCount; k++) {
        let gold = false;
        for (let l = labelStart; l < labelEnd; l++) if (data.labelList[l] === k) gold = true;
        const z = logits[k];
        const on = z > 0;
        const signed = gold ? -z : z;
        lossSum += signed > 0 ? signed + Math.log1p(Math.exp(-signed)) : Math.log1p(Math.exp(signed));
        if (gold) support[k]++;
        if (on) predicted[k]++;
        if (on && gold) truePositives[k]++;
        if (on !== gold) exact = false;
      }
      if (exact) correct++;
      continue;
    }
    if (draft.head === "softmax") {
      for (let k = 0; k < labelCount; k++) labelLog[k] = logits[k];
    } else {
      // Tree: a label's log-probability is the sum of log σ(±z) along its path.
      const p = paths as TreePaths;
      for (let k = 0; k < labelCount; k++) {
        let sum = 0;
        for (let q = p.offsets[k]; q < p.offsets[k + 1]; q++) {
          const signed = p.directions[q] * logits[p.nodes[q]];
          sum += signed > 0 ? -Math.log1p(Math.exp(-signed)) : signed - Math.log1p(Math.exp(signed));
        }
        labelLog[k] = sum;
      }
    }
    const best = topLabel(labelLog, 0, labelCount);
    const max = labelLog[best];
    const gold = data.labelList[labelStart];
    if (draft.head === "softmax") {
      let sum = 0;
      for (let k = 0; k < labelCount; k++) sum += Math.exp(labelLog[k] - max);
      lossSum += max + Math.log(sum) - labelLog[gold];
    } else {
      lossSum -= labelLog[gold];
    }
    support[gold]++;
    predicted[best]++;
    if (best === gold) {
      correct++;
      truePositives[gold]++;
    }
  }
  let f1Sum = 0;
  for (let k = 0; k < labelCount; k++) f1Sum += labelScoresFromCounts(truePositives[k], predicted[k], support[k]).f1;
  return {
    accuracy: data.count > 0 ? correct / data.count : 0,
    macroF1: labelCount > 0 ? f1Sum / labelCount : 0,
    loss: data.count > 0 ? lossSum / data.count : 0,
  };
}
