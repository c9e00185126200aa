// The golden files pin each format version byte for byte: if the writer or the loader changes
// the meaning of any byte, these checks fail, and the change must bump FORMAT_VERSION,
// update runtime/format/FORMAT.md and write a new golden file (npm run golden) beside the old ones,
// which the loader must keep reading. tiny.sluice is version 1 (hidden-space rows and an
// output layer); tiny-v2.sluice is version 2 with logit rows (the output layer multiplied in).
// The values below were recorded from the files when they were made; the layout checks
// decode the bytes by hand, independently of the loader.
import { readFileSync } from "node:fs";
import { unpack } from "msgpackr";
import { describe, expect, it } from "vitest";
import { crc32, loadModel, ModelFormatError } from "../../../runtime/index.ts";

const bytes = new Uint8Array(readFileSync(new URL("../../fixtures/golden/tiny.sluice", import.meta.url)));
const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);

describe("the version 1 golden model file", () => {
  it("starts with the magic number and format version 1", () => {
    expect(Array.from(bytes.subarray(0, 8))).toEqual([0x89, 0x53, 0x4c, 0x55, 0x49, 0x43, 0x45, 0x0a]);
    expect(view.getUint16(8, true)).toBe(1);
    expect(view.getUint16(10, true)).toBe(0);
  });

  it("has a MessagePack header any reader can decode, with the recorded fields", () => {
    const headerLength = view.getUint32(12, true);
    expect(headerLength).toBe(838);
    const header = unpack(bytes.subarray(16, 16 + headerLength)) as Record<string, any>;
    expect(header.labels).toEqual(["billing", "shipping"]);
    expect(header.head).toBe("softmax");
    expect(header.dims).toBe(4);
    expect(header.rowCount).toBe(40);
    expect(header.featurizer).toEqual({ normalization: 1, wordSpan: 2, charMin: 0, charMax: 0, hashBits: 12, hashSeed: 0, maxTokens: 2000 });
    expect(header.precision).toBe("int8");
    expect(header.quantization).toEqual({ scheme: "symmetric-per-row", bits: 8 });
    expect(header.index).toEqual({ bucketBits: 5, lowBits: 7 });
    expect(header.provenance.builtAt).toBe("2026-01-01T00:00:00.000Z");
  });

  it("lists its sections at the recorded 8-aligned offsets", () => {
    const directory = 856;
    expect(view.getUint32(directory, true)).toBe(7);
    const entries = Array.from({ length: 7 }, (_, i) => {
      const at = directory + 8 + 16 * i;
      return [view.getUint32(at, true), view.getUint32(at + 4, true), view.getUint32(at + 8, true), view.getUint32(at + 12, true)];
    });
    // [id, element type, offset, byte length]: slotBuckets u16, slotKeys u8, rows i8, rowScales f32, outputWeights i8, outputScales f32, outputBias f32
    expect(entries).toEqual([
      [1, 3, 976, 66],
      [2, 1, 1048, 40],
      [4, 2, 1088, 160],
      [3, 5, 1248, 160],
      [7, 2, 1408, 8],
      [6, 5, 1416, 8],
      [8, 5, 1424, 8],
    ]);
    for (const [, , offset] of entries) expect(offset % 8).toBe(0);
  });

  it("ends with the CRC-32 of everything before it", () => {
    expect(bytes.length).toBe(1436);
    expect(view.getUint32(bytes.length - 4, true)).toBe(crc32(bytes, 0, bytes.length - 4));
    expect(loadModel(bytes).meta.contentId).toBe("622a3296");
  });

  it("scores texts exactly as when it was recorded", () => {
    const model = loadModel(bytes);
    expect(model.classify("refund my parcel", { top: 2 })).toEqual([
      { label: "billing", score: Math.fround(0.5585723519325256) },
      { label: "shipping", score: Math.fround(0.44142767786979675) },
    ]);
    expect(Array.from(model.score("where is my refund").scores)).toEqual([0.47352010011672974, 0.5264798998832703]);
  });

  it("is refused with a clear message when its version is one this runtime does not know", () => {
    const future = bytes.slice();
    new DataView(future.buffer).setUint16(8, 4, true);
    expect(() => loadModel(future)).toThrowError(ModelFormatError);
    expect(() => loadModel(future)).toThrowError(/format version 4 is not supported: this runtime reads version 1, 2, 3/);
  });
});

const bytesV2 = new Uint8Array(readFileSync(new URL("../../fixtures/golden/tiny-v2.sluice", import.meta.url)));
const viewV2 = new DataView(bytesV2.buffer, bytesV2.byteOffset, bytesV2.byteLength);

describe("the version 2 golden model file (logit rows)", () => {
  it("starts with the magic number and format version 2", () => {
    expect(Array.from(bytesV2.subarray(0, 8))).toEqual([0x89, 0x53, 0x4c, 0x55, 0x49, 0x43, 0x45, 0x0a]);
    expect(viewV2.getUint16(8, true)).toBe(2);
    expect(viewV2.getUint16(10, true)).toBe(0);
  });

  it("declares logit rows in its header", () => {
    const headerLength = viewV2.getUint32(12, true);
    expect(headerLength).toBe(1010);
    const header = unpack(bytesV2.subarray(16, 16 + headerLength)) as Record<string, any>;
    expect(header.rowSpace).toBe("logits");
    expect(header.dims).toBe(4);
    expect(header.outputCount).toBe(2);
    expect(header.rowCount).toBe(40);
    // Version 2: row scales as one-byte codes (format.ts, rowScaleOfCode); no TF-IDF here, so no weight step.
    expect(header.quantization).toEqual({ scheme: "symmetric-per-row", bits: 8, rowScaleCodes: "log2-eighths", weightStep: null });
  });

  it("lists rows of outputCount values, one-byte row scale codes and no output layer", () => {
    const directory = 1032;
    expect(viewV2.getUint32(directory, true)).toBe(5);
    const entries = Array.from({ length: 5 }, (_, i) => {
      const at = directory + 8 + 16 * i;
      return [viewV2.getUint32(at, true), viewV2.getUint32(at + 4, true), viewV2.getUint32(at + 8, true), viewV2.getUint32(at + 12, true)];
    });
    // slotBuckets u16, slotKeys u8, rows i8 (40 rows × 2 logits), rowScales u8 codes, outputBias f32
    expect(entries).toEqual([
      [1, 3, 1120, 66],
      [2, 1, 1192, 40],
      [4, 2, 1232, 80],
      [3, 1, 1312, 40],
      [8, 5, 1352, 8],
    ]);
  });

  it("ends with the CRC-32 of everything before it and scores texts exactly as when it was recorded", () => {
    expect(bytesV2.length).toBe(1364);
    expect(viewV2.getUint32(bytesV2.length - 4, true)).toBe(crc32(bytesV2, 0, bytesV2.length - 4));
    const model = loadModel(bytesV2);
    expect(model.meta.contentId).toBe("d859c089");
    expect(model.meta.rowSpace).toBe("logits");
    expect(model.classify("refund my parcel", { top: 2 })).toEqual([
      { label: "billing", score: Math.fround(0.5584453344345093) },
      { label: "shipping", score: Math.fround(0.4415546655654907) },
    ]);
    expect(Array.from(model.score("where is my refund").scores)).toEqual([0.47312408685684204, 0.526875913143158]);
  });

  it("scores like the version 1 file of the same training data, up to quantization", () => {
    // Same examples and settings; version 1 quantized rows and output layer separately,
    // version 2 quantizes their product once, so scores agree to a few thousandths.
    const v1 = loadModel(bytes);
    const v2 = loadModel(bytesV2);
    for (const text of ["refund my parcel", "where is my refund", "invoice late delivery", "charged twice"]) {
      const a = v1.score(text).scores;
      const b = v2.score(text).scores;
      for (let k = 0; k < a.length; k++) expect(Math.abs(a[k] - b[k])).toBeLessThan(0.005);
    }
  });
});

const bytesV3 = new Uint8Array(readFileSync(new URL("../../fixtures/golden/tiny-v3.sluice", import.meta.url)));

describe("the version 3 golden model file (unspaced scripts)", () => {
  it("starts with format version 3 and records unspacedScripts in its featurizer settings", () => {
    const view = new DataView(bytesV3.buffer, bytesV3.byteOffset, bytesV3.byteLength);
    expect(view.getUint16(8, true)).toBe(3);
    const header = unpack(bytesV3.subarray(16, 16 + view.getUint32(12, true))) as Record<string, any>;
    expect(header.featurizer.unspacedScripts).toBe(true);
  });

  it("reads Japanese text one letter per token, with letter pairs as word pairs", () => {
    const model = loadModel(bytesV3);
    const explained = model.explain("配送", { top: 1 });
    expect(explained.tokenCount).toBe(2);
    expect(explained.labels[0].features.map((f) => f.feature).sort()).toEqual(["配", "配 送", "送"].sort());
  });

  it("scores texts exactly as when it was recorded", () => {
    expect(bytesV3.length).toBe(1604);
    const model = loadModel(bytesV3);
    expect(model.meta.contentId).toBe("204584e4");
    expect(model.classify("refund my parcel", { top: 2 })).toEqual([
      { label: "billing", score: Math.fround(0.550634503364563) },
      { label: "shipping", score: Math.fround(0.449365496635437) },
    ]);
    expect(Array.from(model.score("配送が遅い").scores)).toEqual([0.2786082625389099, 0.7213917374610901]);
  });
});

describe("older files under the version 3 runtime", () => {
  it("keep reading an unspaced run as one word, as they were built to", () => {
    // The version 2 file has no unspacedScripts setting: "配送" stays one token there.
    const explained = loadModel(bytesV2).explain("配送", { top: 1 });
    expect(explained.tokenCount).toBe(1);
  });
});

const bytesV3n2 = new Uint8Array(readFileSync(new URL("../../fixtures/golden/tiny-v3-n2.sluice", import.meta.url)));

describe("the version 3 golden model file with normalization 2 (evasion folding)", () => {
  it("records normalization 2 in its featurizer settings", () => {
    const view = new DataView(bytesV3n2.buffer, bytesV3n2.byteOffset, bytesV3n2.byteLength);
    expect(view.getUint16(8, true)).toBe(3);
    const header = unpack(bytesV3n2.subarray(16, 16 + view.getUint32(12, true))) as Record<string, any>;
    expect(header.featurizer).toEqual({ normalization: 2, wordSpan: 2, charMin: 0, charMax: 0, hashBits: 12, hashSeed: 0, maxTokens: 2000, unspacedScripts: true });
  });

  it("scores texts exactly as when it was recorded, evasive spellings as the clean text", () => {
    expect(bytesV3n2.length).toBe(1644);
    expect(crc32(bytesV3n2, 0, bytesV3n2.length - 4)).toBe(new DataView(bytesV3n2.buffer, bytesV3n2.byteOffset).getUint32(bytesV3n2.length - 4, true));
    const model = loadModel(bytesV3n2);
    expect(model.meta.contentId).toBe("446f368a");
    const clean = [0.550634503364563, 0.449365496635437];
    // Cyrillic е and а, leetspeak, spaced letters: the words the model knows.
    for (const text of ["refund my parcel", "r\u0435fund my p\u0430rcel", "r3fund my p4rcel", "r e f u n d my parcel"]) {
      expect(Array.from(model.score(text).scores), text).toEqual(clean);
    }
  });

  it("explains a folded feature with the original text it came from", () => {
    const model = loadModel(bytesV3n2);
    const features = model.explain("r\u0435fund my parcel", { top: 1, features: 20 }).labels[0].features;
    expect(features.find((f) => f.feature === "refund")?.foldedFrom).toEqual(["r\u0435fund"]);
    expect(features.find((f) => f.feature === "my")?.foldedFrom).toBeUndefined();
  });
});

const bytesV3n3 = new Uint8Array(readFileSync(new URL("../../fixtures/golden/tiny-v3-n3.sluice", import.meta.url)));

describe("the version 3 golden model file with normalization 3 (runs of one letter read as one)", () => {
  it("records normalization 3 in its featurizer settings", () => {
    const view = new DataView(bytesV3n3.buffer, bytesV3n3.byteOffset, bytesV3n3.byteLength);
    expect(view.getUint16(8, true)).toBe(3);
    const header = unpack(bytesV3n3.subarray(16, 16 + view.getUint32(12, true))) as Record<string, any>;
    expect(header.featurizer).toEqual({ normalization: 3, wordSpan: 2, charMin: 0, charMax: 0, hashBits: 12, hashSeed: 0, maxTokens: 2000, unspacedScripts: true });
  });

  it("scores texts exactly as when it was recorded, evasive spellings as the clean text", () => {
    expect(bytesV3n3.length).toBe(1716);
    expect(crc32(bytesV3n3, 0, bytesV3n3.length - 4)).toBe(new DataView(bytesV3n3.buffer, bytesV3n3.byteOffset).getUint32(bytesV3n3.length - 4, true));
    const model = loadModel(bytesV3n3);
    expect(model.meta.contentId).toBe("91a97d9f");
    expect(Array.from(model.score("refund my parcel").scores)).toEqual([0.22200025618076324, 0.777999758720398]);
    // Stretched, spaced, dotted and leetspeak words: the words the model knows, doubled letters read as one.
    const clean = [0.9997060894966125, 0.00029389309929683805];
    for (const text of ["my account was billed twice", "my acount was biled twice", "my accoooount was billlled twice", "my a c c o u n t was b.i.l.l.e.d twice", "my acc0unt was billed twice"]) {
      expect(Array.from(model.score(text).scores), text).toEqual(clean);
    }
  });

  it("explains a word read with a shortened run with the original text it came from", () => {
    const features = loadModel(bytesV3n3).explain("my accoooount was billed", { top: 1, features: 20 }).labels[0].features;
    expect(features.find((f) => f.feature === "acount")?.foldedFrom).toEqual(["accoooount"]);
    expect(features.find((f) => f.feature === "my")?.foldedFrom).toBeUndefined();
  });
});

describe("older files under the normalization 3 runtime", () => {
  it("keep reading text by normalization 2: a doubled letter stays two letters there", () => {
    const model = loadModel(bytesV3n2);
    expect(model.meta.featurizer.normalization).toBe(2);
    expect(Array.from(model.score("refund my parrcel").scores)).not.toEqual(Array.from(model.score("refund my parcel").scores));
    expect(Array.from(model.score("refund my parrcel").scores)).toEqual([0.9156292080879211, 0.08437078446149826]);
  });

  it("keep reading text by normalization 1: no folding, exactly as they were built", () => {
    // tiny-v3.sluice records normalization 1: the leetspeak word is not "refund" there.
    const model = loadModel(bytesV3);
    expect(model.meta.featurizer.normalization).toBe(1);
    expect(Array.from(model.score("r3fund my parcel").scores)).not.toEqual(Array.from(model.score("refund my parcel").scores));
    expect(model.explain("r3fund", { top: 1 }).labels[0].features.every((f) => f.foldedFrom === undefined)).toBe(true);
  });
});
