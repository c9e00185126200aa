// A model written by hand (not trained), so its scores are known exactly: dims 1, float32,
// mean weighting, word features only. Every feature slot of a marker word gets one value v,
// so a text made of that one word has hidden = v and logit_k = (w_k · v + bias_k) / T.
// Texts without a marker word have hidden = 0, so their logits are the biases / T.

import { createFeatureBuffer, createFeaturizer, type FeaturizerSettings } from "../../../runtime/featurizer/featurizer.ts";
import { loadModel } from "../../../runtime/format/load-model.ts";
import type { HeadKind } from "../../../runtime/format/model-header.ts";
import type { Model } from "../../../runtime/model/model.ts";
import { NORMALIZATION_VERSION } from "../../../runtime/featurizer/normalize.ts";
import type { Policy } from "../../../runtime/model/policy.ts";
import { writeModel } from "../../../compiler/compile/write-model.ts";

export interface HandMadeModelSpec {
  labels: string[];
  /** Marker word → its hidden value. */
  words: Record<string, number>;
  /** One weight per label (the output layer, dims 1). */
  outputWeights: number[];
  bias?: number[];
  head?: Exclude<HeadKind, "tree">;
  temperature?: number;
  thresholds?: number[] | null;
  policy?: Policy | null;
  provenance?: Record<string, unknown>;
}

export const HAND_MADE_FEATURIZER: FeaturizerSettings = { normalization: NORMALIZATION_VERSION, wordSpan: 1, charMin: 0, charMax: 0, hashBits: 18, hashSeed: 0, maxTokens: 2000 };

/** The file bytes of the model described by `spec`. */
export function handMadeModelBytes(spec: HandMadeModelSpec): Uint8Array {
  const featurizer = createFeaturizer(HAND_MADE_FEATURIZER);
  const buffer = createFeatureBuffer();
  const valueOfSlot = new Map<number, number>();
  for (const [word, value] of Object.entries(spec.words)) {
    featurizer.featurize(word, buffer);
    for (let f = 0; f < buffer.count; f++) {
      const slot = buffer.slots[f];
      if (valueOfSlot.has(slot) && valueOfSlot.get(slot) !== value) throw new Error(`hand-made model: the marker words collide on slot ${slot}; pick other words`);
      valueOfSlot.set(slot, value);
    }
  }
  const slots = Uint32Array.from([...valueOfSlot.keys()].sort((a, b) => a - b));
  const head = spec.head ?? "softmax";
  return writeModel({
    header: {
      labels: spec.labels,
      head,
      rowSpace: "hidden",
      dims: 1,
      outputCount: spec.labels.length,
      featurizer: HAND_MADE_FEATURIZER,
      weighting: "mean",
      precision: "float32",
      calibration: { temperature: spec.temperature ?? 1 },
      thresholds: spec.thresholds ?? null,
      policy: spec.policy ?? null,
      metrics: {},
      provenance: { fields: { text: ["text"], label: "label" }, ...spec.provenance },
    },
    slots,
    rows: Float32Array.from(slots, (slot) => valueOfSlot.get(slot) as number),
    rowScales: null,
    rowWeights: null,
    outputWeights: Float32Array.from(spec.outputWeights),
    outputScales: null,
    outputBias: Float32Array.from(spec.bias ?? spec.labels.map(() => 0)),
    tree: null,
  });
}

/** The loaded model described by `spec`. */
export function handMadeModel(spec: HandMadeModelSpec): Model {
  return loadModel(handMadeModelBytes(spec));
}

/** The logit whose sigmoid is p: a two-label softmax [0, v] puts p on the second label. */
export function logit(p: number): number {
  return Math.log(p / (1 - p));
}
