// Property-based checks of the loader (fast-check): whatever bytes it is given, it either
// returns a model that scores or throws ModelFormatError — it never crashes otherwise,
// never hangs and never half-loads. The decoder-facing cases follow msgpackr's own
// practice of decoding every truncated prefix of a valid input.
import { readFileSync } from "node:fs";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { loadModel, ModelFormatError } from "../../../runtime/index.ts";
import { headerOf, withChecksum, withHeader } from "./model-mutations.ts";

const goldenFiles: [string, Uint8Array][] = [
  ["version 1, hidden rows", new Uint8Array(readFileSync(new URL("../../fixtures/golden/tiny.sluice", import.meta.url)))],
  ["version 2, logit rows", new Uint8Array(readFileSync(new URL("../../fixtures/golden/tiny-v2.sluice", import.meta.url)))],
];

function expectRefused(bytes: Uint8Array, code?: string): void {
  let thrown: unknown = null;
  try {
    loadModel(bytes);
  } catch (error) {
    thrown = error;
  }
  expect(thrown).toBeInstanceOf(ModelFormatError);
  if (code) expect((thrown as ModelFormatError).code).toBe(code);
}

function goldenHeader(golden: Uint8Array): Record<string, any> {
  return headerOf(golden);
}

describe.each(goldenFiles)("loadModel on hostile bytes (%s)", (_name, golden) => {
  it("should refuse random bytes with a ModelFormatError", () => {
    fc.assert(
      fc.property(fc.uint8Array({ minLength: 0, maxLength: 4096 }), (bytes) => {
        expectRefused(bytes);
      }),
      { numRuns: 500 },
    );
  });

  it("should refuse random bytes behind a valid magic number", () => {
    fc.assert(
      fc.property(fc.uint8Array({ minLength: 0, maxLength: 4096 }), (tail) => {
        const bytes = new Uint8Array(8 + tail.length);
        bytes.set(golden.subarray(0, 8));
        bytes.set(tail, 8);
        expectRefused(bytes);
      }),
      { numRuns: 500 },
    );
  });

  it("should refuse every truncated prefix of a valid file", () => {
    for (let length = 0; length < golden.length; length++) expectRefused(golden.subarray(0, length));
  });

  it("should refuse every single-byte flip anywhere in a valid file with a checksum error or earlier", () => {
    for (let at = 0; at < golden.length; at++) {
      const flipped = golden.slice();
      flipped[at] ^= 0x5a;
      expectRefused(flipped);
    }
  });

  it("should never crash on single-byte flips that carry a recomputed checksum", () => {
    // Past the checksum, a flip either trips a structural check or yields a model that
    // still scores (a flipped weight is a different but valid model).
    for (let at = 8; at < golden.length - 4; at++) {
      const flipped = golden.slice();
      flipped[at] ^= 0xff;
      const bytes = withChecksum(flipped);
      try {
        const model = loadModel(bytes);
        const scores = model.score("refund my parcel").scores;
        for (const score of scores) expect(Number.isFinite(score)).toBe(true);
      } catch (error) {
        expect(error).toBeInstanceOf(ModelFormatError);
      }
    }
  });

  it("should refuse absurd lengths and counts in the header", () => {
    const base = goldenHeader(golden);
    const cases: [string, (h: Record<string, any>) => void, string][] = [
      ["rowCount", (h) => (h.rowCount = 0x7fffffff), "bad-section"], // the header is well-formed; the sections cannot hold that many rows
      ["dims", (h) => (h.dims = 1e9), "bad-header"],
      ["outputCount", (h) => (h.outputCount = 1e6), "bad-header"],
      ["labels", (h) => (h.labels = []), "bad-header"],
      ["hashBits", (h) => (h.featurizer.hashBits = 31), "bad-header"],
      ["bucketBits", (h) => (h.index = { bucketBits: 24, lowBits: -12 }), "bad-header"],
      ["temperature", (h) => (h.calibration = { temperature: -1 }), "bad-header"],
      ["labels type", (h) => (h.labels = "billing"), "bad-header"],
      ["normalization", (h) => (h.featurizer.normalization = 99), "bad-header"],
      ["rowSpace", (h) => (h.rowSpace = h.rowSpace === undefined ? "logits" : "sideways"), "bad-header"], // v1: must be absent; v2: hidden or logits
    ];
    // Logit rows described as hidden ones: the output layer sections are missing.
    if (base.rowSpace === "logits") cases.push(["rowSpace hidden over logit rows", (h) => (h.rowSpace = "hidden"), "bad-section"]);
    // Version 2 int8 files say how their row scales and weights are coded.
    if (base.rowSpace !== undefined) {
      cases.push(["rowScaleCodes", (h) => (h.quantization = { ...h.quantization, rowScaleCodes: "linear" }), "bad-header"]);
      cases.push(["weightStep without TF-IDF", (h) => (h.quantization = { ...h.quantization, weightStep: 0.5 }), "bad-header"]);
      cases.push(["quantization missing", (h) => delete h.quantization, "bad-header"]);
    }
    // The unchanged header round-trips, so each refusal below is the field's doing.
    expect(loadModel(withHeader(golden, structuredClone(base))).meta.labels).toEqual(["billing", "shipping"]);
    for (const [, mutate, code] of cases) {
      const header = structuredClone(base);
      mutate(header);
      expectRefused(withHeader(golden, header), code);
    }
  });

  it("should refuse a header length that points past the end of the file", () => {
    const bytes = golden.slice();
    new DataView(bytes.buffer).setUint32(12, 0xfffffff0, true);
    expectRefused(bytes);
  });

  it("should refuse a section directory that declares an absurd section count", () => {
    const bytes = golden.slice();
    const view = new DataView(bytes.buffer);
    const directory = (16 + view.getUint32(12, true) + 7) & ~7;
    view.setUint32(directory, 1_000_000, true);
    expectRefused(withChecksum(bytes), "bad-section");
  });

  it("should load the untouched golden file from an unaligned Uint8Array too", () => {
    const padded = new Uint8Array(golden.length + 3);
    padded.set(golden, 3);
    const model = loadModel(padded.subarray(3));
    expect(model.classify("refund")[0].label).toBeTypeOf("string");
  });
});
