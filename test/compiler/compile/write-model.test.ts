// The writer and the loader share one header schema (runtime/format/model-header.ts): every
// header the writer emits passes the validator, and a header the loader would refuse is
// refused at write time, naming the field.
import { describe, expect, it } from "vitest";
import { writeModel, type ModelContents } from "../../../compiler/compile/write-model.ts";
import { validateHeader } from "../../../runtime/format/model-header.ts";
import { loadModel, NORMALIZATION_VERSION } from "../../../runtime/index.ts";
import { headerOf } from "../../runtime/format/model-mutations.ts";

/** A two-label, two-row float32 model written by hand. */
function contents(change: Partial<ModelContents["header"]> = {}): ModelContents {
  return {
    header: {
      labels: ["ok", "spam"],
      head: "softmax",
      dims: 2,
      rowSpace: "hidden",
      outputCount: 2,
      featurizer: { normalization: NORMALIZATION_VERSION, wordSpan: 1, charMin: 0, charMax: 0, hashBits: 8, hashSeed: 0, maxTokens: 100 },
      weighting: "mean",
      precision: "float32",
      calibration: { temperature: 1 },
      thresholds: null,
      policy: { rules: [{ label: "spam", action: "block", threshold: 0.9, reviewFrom: 0.5 }] },
      metrics: {},
      provenance: {},
      ...change,
    },
    slots: new Uint32Array([3, 200]),
    rows: new Float32Array([1, 0, 0, 1]),
    rowScales: null,
    rowWeights: null,
    outputWeights: new Float32Array([1, -1, -1, 1]),
    outputScales: null,
    outputBias: new Float32Array([0, 0]),
    tree: null,
  };
}

describe("writeModel and the header schema", () => {
  it("writes a header the loader's validator accepts", () => {
    const bytes = writeModel(contents());
    expect(() => validateHeader(headerOf(bytes), 16, 2)).not.toThrow();
    expect(loadModel(bytes).meta.policy?.rules[0].threshold).toBe(0.9);
  });

  it("refuses to write a policy threshold outside [0, 1]", () => {
    const policy = { rules: [{ label: "spam", action: "block" as const, threshold: 1.5 }] };
    expect(() => writeModel(contents({ policy }))).toThrow(/policy\.rules\[0\]\.threshold/);
  });

  it("refuses to write a temperature outside the calibration range", () => {
    expect(() => writeModel(contents({ calibration: { temperature: 5e-324 } }))).toThrow(/calibration\.temperature/);
  });
});
