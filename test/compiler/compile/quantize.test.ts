// Row quantization against one-byte scale codes (runtime/format/format.ts): symmetric int8 with a
// per-row scale is common practice (no source); the checks below are the arithmetic bounds of
// rounding to the nearest step (half a step at most) and of the code grid (steps of 2^(1/8)).
import { describe, expect, it } from "vitest";
import { dequantizeRows, quantizeRows, rowScaleCodeCovering } from "../../../compiler/compile/quantize.ts";
import { rowScaleOfCode } from "../../../runtime/format/format.ts";

describe("rowScaleCodeCovering", () => {
  it("picks the smallest code whose scale covers the need", () => {
    for (const needed of [1e-7, 3.3e-5, 0.001, 0.0078125, 0.5, 1, 3.14159, 100]) {
      const code = rowScaleCodeCovering(needed);
      expect(rowScaleOfCode(code)).toBeGreaterThanOrEqual(needed);
      if (code > 1) expect(rowScaleOfCode(code - 1)).toBeLessThan(needed);
    }
  });

  it("maps powers of two to exact codes: 2^0 is code 192, 2^1 is 200 (eight steps per octave)", () => {
    expect(rowScaleCodeCovering(1)).toBe(192);
    expect(rowScaleOfCode(192)).toBe(1);
    expect(rowScaleOfCode(200)).toBe(2);
    expect(rowScaleOfCode(0)).toBe(0);
  });

  it("refuses a weight too large for any code", () => {
    expect(() => rowScaleCodeCovering(1e6)).toThrowError(/beyond what an int8 row scale code can hold/);
  });
});

describe("quantizeRows", () => {
  it("keeps every value within half a step, with a step at most 2^(1/8) above max|row| / 127", () => {
    const width = 6;
    const matrix = Float32Array.from({ length: 600 }, (_, i) => Math.sin(i * 1.7) * 10 ** ((i % 7) - 3));
    const { values, scales } = quantizeRows(matrix, width);
    const restored = dequantizeRows(values, scales, width);
    for (let row = 0; row < 100; row++) {
      let maxAbs = 0;
      for (let j = 0; j < width; j++) maxAbs = Math.max(maxAbs, Math.abs(matrix[row * width + j]));
      expect(scales[row]).toBeGreaterThanOrEqual(maxAbs / 127);
      expect(scales[row]).toBeLessThanOrEqual((maxAbs / 127) * 2 ** (1 / 8) * (1 + 1e-6));
      for (let j = 0; j < width; j++) expect(Math.abs(restored[row * width + j] - matrix[row * width + j])).toBeLessThanOrEqual(scales[row] / 2 + 1e-12);
    }
  });

  it("gives an all-zero row a zero scale", () => {
    const { values, scales } = quantizeRows(new Float32Array([0, 0, 0, 1, -2, 0.5]), 3);
    expect(scales[0]).toBe(0);
    expect(Array.from(values.subarray(0, 3))).toEqual([0, 0, 0]);
    // The largest value lands within the top 2^(1/8) of the range: |q| from 117 to 127.
    expect(values[4]).toBeLessThanOrEqual(-117);
    expect(values[4]).toBeGreaterThanOrEqual(-127);
  });
});

describe("writeModel with int8 rows", () => {
  it("refuses a row scale that is not a one-byte code's scale, instead of rounding it silently", async () => {
    const { writeModel } = await import("../../../compiler/compile/write-model.ts");
    const contents = {
      header: {
        labels: ["a", "b"], head: "softmax" as const, dims: 4, rowSpace: "logits" as const, outputCount: 2,
        featurizer: { normalization: 1, wordSpan: 1, charMin: 0, charMax: 0, hashBits: 12, hashSeed: 0, maxTokens: 100 },
        weighting: "mean" as const, precision: "int8" as const, calibration: { temperature: 1 }, thresholds: null, policy: null, metrics: {}, provenance: {},
      },
      slots: Uint32Array.from([5]), rows: Int8Array.from([10, -10]), rowScales: Float32Array.from([0.3]), rowWeights: null,
      outputWeights: null, outputScales: null, outputBias: new Float32Array(2), tree: null,
    };
    expect(() => writeModel(contents)).toThrowError(/row 0 has scale 0.3.*not the scale of a one-byte code/);
    contents.rowScales = Float32Array.from([rowScaleOfCode(180)]);
    expect(writeModel(contents).length).toBeGreaterThan(0);
  });
});
