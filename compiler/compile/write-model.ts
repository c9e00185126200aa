// Serializes a model to the .sluice layout defined in runtime/format/format.ts (byte table in
// runtime/format/FORMAT.md). The writer imports the same constants the loader reads.

import { pack, unpack } from "msgpackr";
import { crc32 } from "../../runtime/format/crc32.ts";
import { policyToStored } from "../../runtime/format/stored-policy.ts";
import {
  CHECKSUM_BYTES,
  DIRECTORY_ENTRY_BYTES,
  ELEMENT,
  FORMAT_VERSION,
  HEADER_LENGTH_OFFSET,
  MAGIC,
  MAX_HEADER_BYTES,
  PRELUDE_BYTES,
  SECTION,
  VERSION_OFFSET,
  alignUp,
  rowScaleOfCode,
  type SectionName,
} from "../../runtime/format/format.ts";
import { validateHeader, type ModelHeader } from "../../runtime/format/model-header.ts";
import { chooseBucketBits } from "../../runtime/format/slot-index.ts";
import type { ModelArrays } from "../../runtime/model/model-types.ts";
import { rowScaleCodeCovering } from "./quantize.ts";

/** A model ready to write: header fields plus numeric arrays. `index` is computed here. */
export interface ModelContents extends ModelArrays {
  header: Omit<ModelHeader, "index" | "rowCount" | "quantization">;
  /** Slot of each row, strictly ascending. */
  slots: Uint32Array;
}

type Typed = Int8Array | Uint8Array | Uint16Array | Uint32Array | Int32Array | Float32Array;

interface PlannedSection {
  name: SectionName;
  element: keyof typeof ELEMENT;
  data: Typed;
}

/**
 * The bytes of a model file.
 * @example const bytes = writeModel(contents); loadModel(bytes).classify("hi")
 */
export function writeModel(contents: ModelContents): Uint8Array {
  const hashBits = contents.header.featurizer.hashBits;
  const rowCount = contents.slots.length;
  const bucketBits = chooseBucketBits(rowCount, hashBits);
  const lowBits = hashBits - bucketBits;
  const { buckets, keys } = buildSlotIndex(contents.slots, bucketBits, lowBits);
  const int8 = contents.header.precision === "int8";
  const tfidf = contents.header.weighting === "tfidf";
  const weights = tfidf && int8 ? weightSteps(contents.rowWeights as Float32Array) : null;
  const header: ModelHeader = {
    ...contents.header,
    rowCount,
    quantization: int8 ? { scheme: "symmetric-per-row", bits: 8, rowScaleCodes: "log2-eighths", weightStep: weights ? weights.step : null } : null,
    index: { bucketBits, lowBits },
  };
  const headerBytes = pack(orderedHeader(header)) as Uint8Array;
  checkWrittenHeader(headerBytes);
  if (headerBytes.length > MAX_HEADER_BYTES) throw new Error(`model header is ${headerBytes.length} bytes, over the ${MAX_HEADER_BYTES}-byte limit (too many labels?)`);
  const hiddenRows = header.rowSpace === "hidden";
  if (hiddenRows !== (contents.outputWeights !== null)) throw new Error(`writeModel: ${header.rowSpace} rows ${hiddenRows ? "need" : "take no"} output weights`);
  const sections: PlannedSection[] = [
    { name: "slotBuckets", element: rowCount < 65536 ? "u16" : "u32", data: buckets },
    { name: "slotKeys", element: lowBits <= 8 ? "u8" : "u16", data: keys },
    { name: "rows", element: int8 ? "i8" : "f32", data: contents.rows },
  ];
  if (int8) sections.push({ name: "rowScales", element: "u8", data: rowScaleCodes(contents.rowScales as Float32Array) });
  if (tfidf) sections.push(weights ? { name: "rowWeights", element: "u16", data: weights.steps } : { name: "rowWeights", element: "f32", data: contents.rowWeights as Float32Array });
  if (hiddenRows) {
    sections.push({ name: "outputWeights", element: int8 ? "i8" : "f32", data: contents.outputWeights as Int8Array | Float32Array });
    if (int8) sections.push({ name: "outputScales", element: "f32", data: contents.outputScales as Float32Array });
  }
  sections.push({ name: "outputBias", element: "f32", data: contents.outputBias });
  if (header.head === "tree") sections.push({ name: "tree", element: "i32", data: contents.tree as Int32Array });

  const directoryStart = alignUp(PRELUDE_BYTES + headerBytes.length);
  let cursor = alignUp(directoryStart + 8 + sections.length * DIRECTORY_ENTRY_BYTES);
  const placed = sections.map((section) => {
    const offset = cursor;
    cursor = alignUp(offset + section.data.byteLength);
    return { ...section, offset };
  });
  const dataEnd = placed.length > 0 ? placed[placed.length - 1].offset + placed[placed.length - 1].data.byteLength : cursor;
  const total = dataEnd + CHECKSUM_BYTES;
  const bytes = new Uint8Array(total);
  const view = new DataView(bytes.buffer);
  bytes.set(MAGIC, 0);
  view.setUint16(VERSION_OFFSET, FORMAT_VERSION, true);
  view.setUint32(HEADER_LENGTH_OFFSET, headerBytes.length, true);
  bytes.set(headerBytes, PRELUDE_BYTES);
  view.setUint32(directoryStart, placed.length, true);
  placed.forEach((section, i) => {
    const at = directoryStart + 8 + i * DIRECTORY_ENTRY_BYTES;
    view.setUint32(at, SECTION[section.name], true);
    view.setUint32(at + 4, ELEMENT[section.element], true);
    view.setUint32(at + 8, section.offset, true);
    view.setUint32(at + 12, section.data.byteLength, true);
    bytes.set(new Uint8Array(section.data.buffer, section.data.byteOffset, section.data.byteLength), section.offset);
  });
  view.setUint32(dataEnd, crc32(bytes, 0, dataEnd), true);
  return bytes;
}

/**
 * The header as the loader will read it must pass the loader's own schema (one validator for
 * both sides): a writer bug is found here, naming the field, not by a user whose model is refused.
 */
function checkWrittenHeader(headerBytes: Uint8Array): void {
  try {
    validateHeader(unpack(headerBytes), PRELUDE_BYTES, FORMAT_VERSION);
  } catch (error) {
    throw new Error(`writeModel: the header would be refused by the loader: ${(error as Error).message}`);
  }
}

/** One-byte codes of row scales that came from compile/quantize.ts (each must be a code's exact scale). */
function rowScaleCodes(scales: Float32Array): Uint8Array {
  const codes = new Uint8Array(scales.length);
  for (let row = 0; row < scales.length; row++) {
    const scale = scales[row];
    if (scale === 0) continue;
    const code = scale > 0 && scale <= rowScaleOfCode(255) ? rowScaleCodeCovering(scale) : 0;
    if (code === 0 || rowScaleOfCode(code) !== scale) throw new Error(`writeModel: row ${row} has scale ${scale}, which is not the scale of a one-byte code (quantize rows with compile/quantize.ts)`);
    codes[row] = code;
  }
  return codes;
}

/**
 * TF-IDF weights as u16 multiples of max / 65535: a relative error under 1e-4 for weights of
 * 1 or more (inverse document frequencies here are ln((1 + N) / (1 + df)) + 1 ≥ 1, at most ~20).
 */
function weightSteps(weights: Float32Array): { steps: Uint16Array; step: number } {
  let max = 0;
  for (let i = 0; i < weights.length; i++) max = Math.max(max, weights[i]);
  const step = max > 0 ? max / 65535 : 1;
  const steps = new Uint16Array(weights.length);
  for (let i = 0; i < weights.length; i++) steps[i] = Math.min(65535, Math.max(0, Math.round(weights[i] / step)));
  return { steps, step };
}

/** Bytes each section takes in a file written from `contents` (for build reports). */
export function sectionSizes(bytes: Uint8Array): Record<string, number> {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const headerLength = view.getUint32(HEADER_LENGTH_OFFSET, true);
  const directoryStart = alignUp(PRELUDE_BYTES + headerLength);
  const count = view.getUint32(directoryStart, true);
  const sizes: Record<string, number> = { header: headerLength + PRELUDE_BYTES };
  const names = Object.fromEntries(Object.entries(SECTION).map(([name, id]) => [id, name]));
  for (let i = 0; i < count; i++) {
    const at = directoryStart + 8 + i * DIRECTORY_ENTRY_BYTES;
    sizes[names[view.getUint32(at, true)] ?? `section-${view.getUint32(at, true)}`] = view.getUint32(at + 12, true);
  }
  return sizes;
}

function buildSlotIndex(slots: Uint32Array, bucketBits: number, lowBits: number): { buckets: Uint16Array | Uint32Array; keys: Uint8Array | Uint16Array } {
  const bucketCount = 2 ** bucketBits;
  const buckets = slots.length < 65536 ? new Uint16Array(bucketCount + 1) : new Uint32Array(bucketCount + 1);
  const keys = lowBits <= 8 ? new Uint8Array(slots.length) : new Uint16Array(slots.length);
  const lowMask = lowBits === 0 ? 0 : (1 << lowBits) - 1;
  let row = 0;
  for (let bucket = 0; bucket < bucketCount; bucket++) {
    buckets[bucket] = row;
    while (row < slots.length && slots[row] >>> lowBits === bucket) {
      if (row > 0 && slots[row] <= slots[row - 1]) throw new Error("writeModel: slots must be strictly ascending");
      keys[row] = slots[row] & lowMask;
      row++;
    }
  }
  if (row !== slots.length) throw new Error(`writeModel: slot ${slots[row]} is outside the ${bucketBits + lowBits}-bit feature space`);
  buckets[bucketCount] = row;
  return { buckets, keys };
}

/** A fixed key order, so equal models give equal bytes. */
function orderedHeader(header: ModelHeader): Record<string, unknown> {
  return {
    labels: header.labels,
    head: header.head,
    dims: header.dims,
    rowSpace: header.rowSpace,
    rowCount: header.rowCount,
    outputCount: header.outputCount,
    featurizer: {
      normalization: header.featurizer.normalization,
      wordSpan: header.featurizer.wordSpan,
      charMin: header.featurizer.charMin,
      charMax: header.featurizer.charMax,
      hashBits: header.featurizer.hashBits,
      hashSeed: header.featurizer.hashSeed,
      maxTokens: header.featurizer.maxTokens,
      unspacedScripts: header.featurizer.unspacedScripts === true,
    },
    weighting: header.weighting,
    precision: header.precision,
    quantization: header.quantization,
    index: header.index,
    calibration: header.calibration,
    thresholds: header.thresholds,
    policy: policyToStored(header.policy),
    metrics: header.metrics,
    provenance: header.provenance,
  };
}
