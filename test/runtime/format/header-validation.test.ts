// The header schema at load: each case an outside probe found loading and then failing open
// (NaN scores that "allow" everything) or crashing in decide, as a named test. Every file
// below has a valid CRC-32, so only the validator stands between it and a Model.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { loadModel, ModelFormatError } from "../../../runtime/index.ts";
import { SECTION } from "../../../runtime/format/format.ts";
import { ensureDemoModel } from "../../../scripts/demo-model.ts";
import { headerOf, withChecksum, withHeader } from "./model-mutations.ts";

const golden = new Uint8Array(readFileSync(new URL("../../fixtures/golden/tiny-v2.sluice", import.meta.url)));
// The demo moderation model: int8, version 2, with a block/review policy (scripts/demo-model.ts).
const policyModel = new Uint8Array(readFileSync(ensureDemoModel()));

function refusal(bytes: Uint8Array): ModelFormatError {
  try {
    loadModel(bytes);
  } catch (error) {
    if (error instanceof ModelFormatError) return error;
    throw error;
  }
  throw new Error("the file loaded");
}

function edited(file: Uint8Array, edit: (header: Record<string, any>) => void): Uint8Array {
  const header = headerOf(file);
  edit(header);
  return withHeader(file, header);
}

describe("header validation", () => {
  it("loads both untouched files, so each refusal below is the edit's doing", () => {
    expect(loadModel(withHeader(golden, headerOf(golden))).labels).toEqual(["billing", "shipping"]);
    expect(loadModel(withHeader(policyModel, headerOf(policyModel))).meta.policy?.rules.length).toBeGreaterThan(0);
  });

  it("should refuse a calibration temperature of 5e-324, which makes every score NaN", () => {
    // 1 / 5e-324 is Infinity in IEEE 754 double arithmetic (the smallest subnormal's reciprocal overflows).
    const error = refusal(edited(golden, (h) => (h.calibration.temperature = 5e-324)));
    expect(error.code).toBe("bad-header");
    expect(error.message).toContain("calibration.temperature");
  });

  it("should refuse a temperature above the writer's search range", () => {
    expect(refusal(edited(golden, (h) => (h.calibration.temperature = 1e6))).message).toContain("calibration.temperature");
  });

  it("should refuse a TF-IDF weight step of 1e300, which overflows once multiplied by a u16", () => {
    const tfidf = (h: Record<string, any>, step: number) => {
      h.weighting = "tfidf";
      h.quantization.weightStep = step;
    };
    expect(refusal(edited(golden, (h) => tfidf(h, 1e300))).message).toContain("quantization.weightStep");
    expect(refusal(edited(golden, (h) => tfidf(h, 1e-300))).message).toContain("quantization.weightStep");
  });

  it("should refuse a policy without rules", () => {
    expect(refusal(edited(policyModel, (h) => (h.policy = {}))).message).toContain("policy.rules");
    expect(refusal(edited(policyModel, (h) => (h.policy = { rules: 5 }))).message).toContain("policy.rules");
  });

  it.each([
    ["a threshold that is a string", { threshold: "x" }, "threshold"],
    ["a NaN threshold", { threshold: NaN }, "threshold"],
    ["a negative threshold", { threshold: -1 }, "threshold"],
    ["a threshold above 1", { threshold: 1.5 }, "threshold"],
    ["an unknown action", { action: "shred" }, "action"],
    ["an allow action (allow is what no rule means)", { action: "allow" }, "action"],
    ["a label that is not a string", { label: 3 }, "label"],
    ["a label the model does not have", { label: "nonsense" }, "label"],
    ["a review band above its threshold", { reviewFrom: 2 }, "reviewFrom"],
    ["a route without a destination", { action: "route", routeTo: undefined }, "routeTo"],
  ])("should refuse a policy rule with %s", (_name, change, field) => {
    const error = refusal(edited(policyModel, (h) => Object.assign(h.policy.rules[0], change)));
    expect(error.code).toBe("bad-header");
    expect(error.message).toContain(`policy.rules[0].${field}`);
  });

  it("should refuse label names that are not strings, or the same name twice", () => {
    expect(refusal(edited(golden, (h) => (h.labels = ["billing", 3]))).message).toContain("labels");
    expect(refusal(edited(golden, (h) => (h.labels = ["billing", "billing"]))).message).toContain("distinct");
  });

  it.each([
    ["NaN", NaN],
    ["Infinity", Infinity],
    ["2^25, beyond the ±2^24 any stored float may hold", 2 ** 25],
  ])("should refuse an output bias of %s in a section, which the header cannot see", (_name, value) => {
    // Sections are located through the directory (runtime/format/FORMAT.md): after the
    // 16-byte preamble and the header, 8-aligned; a u32 count, then 16-byte entries of
    // id, element type, offset and byte length.
    const view = new DataView(golden.buffer, golden.byteOffset, golden.byteLength);
    const directory = (16 + view.getUint32(12, true) + 7) & ~7;
    let biasOffset = -1;
    for (let i = 0; i < view.getUint32(directory, true); i++) {
      const entry = directory + 8 + 16 * i;
      if (view.getUint32(entry, true) === SECTION.outputBias) biasOffset = view.getUint32(entry + 8, true);
    }
    expect(biasOffset).toBeGreaterThan(0);
    const bytes = golden.slice();
    new DataView(bytes.buffer).setFloat32(biasOffset, value, true);
    const error = refusal(withChecksum(bytes));
    expect(error.message).toContain("outputBias");
  });

  it('should refuse uncertainBelow: "x"', () => {
    expect(refusal(edited(policyModel, (h) => (h.policy.uncertainBelow = "x"))).message).toContain("policy.uncertainBelow");
  });

  it("should refuse thresholds of a sigmoid head outside [0, 1]", () => {
    expect(refusal(edited(golden, (h) => (h.thresholds = [0.5, NaN]))).message).toContain("thresholds");
  });

  it("should refuse a 64-bit integer in provenance, which JSON.stringify cannot write", () => {
    // MessagePack's uint 64 (0xcf) holds values beyond 2^53; msgpackr decodes them as BigInt
    // (msgpackr README, "int64AsType"), and JSON.stringify throws a TypeError on a BigInt
    // (ECMA-262, SerializeJSONProperty step 10).
    const error = refusal(edited(golden, (h) => (h.provenance = { examples: 2n ** 64n - 1n })));
    expect(error.message).toContain("provenance.examples");
  });

  it("should refuse junk bytes between the last section and the checksum", () => {
    const bytes = new Uint8Array(golden.length + 8);
    bytes.set(golden.subarray(0, golden.length - 4));
    bytes.fill(0x41, golden.length - 4, golden.length + 4);
    const error = refusal(withChecksum(bytes));
    expect(error.code).toBe("bad-section");
    expect(error.message).toContain("between the last section and the checksum");
  });

  it("should refuse non-zero padding between sections", () => {
    // The tiny model's sections do not all end on a multiple of 8, so some padding byte exists.
    const view = new DataView(golden.buffer, golden.byteOffset, golden.byteLength);
    const directory = (16 + view.getUint32(12, true) + 7) & ~7;
    const count = view.getUint32(directory, true);
    let padding = -1;
    for (let i = 0; i < count && padding < 0; i++) {
      const end = view.getUint32(directory + 8 + 16 * i + 8, true) + view.getUint32(directory + 8 + 16 * i + 12, true);
      if (end % 8 !== 0 && end < golden.length - 4) padding = end;
    }
    expect(padding).toBeGreaterThan(0);
    const bytes = golden.slice();
    bytes[padding] = 1;
    expect(refusal(withChecksum(bytes)).message).toContain("padding");
  });
});
