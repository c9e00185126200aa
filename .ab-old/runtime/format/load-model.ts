// Reads a .sluice file: checks everything first, then builds typed-array views over the
// bytes (no copy when they are 8-byte aligned, as ArrayBuffers and whole-file reads are).
// Any problem throws ModelFormatError before a Model exists: a file is never half-loaded.

import { unpack } from "msgpackr/unpack";
import { crc32 } from "./crc32.ts";
import { ModelFormatError } from "../errors.ts";
import {
  CHECKSUM_BYTES,
  DIRECTORY_ENTRY_BYTES,
  ELEMENT,
  ELEMENT_BYTES,
  HEADER_LENGTH_OFFSET,
  MAGIC,
  MAX_HEADER_BYTES,
  MAX_SECTIONS,
  PRELUDE_BYTES,
  SECTION,
  SECTION_ALIGNMENT,
  SUPPORTED_VERSIONS,
  VERSION_OFFSET,
  alignUp,
  rowScaleOfCode,
  sectionNameOf,
  type SectionName,
} from "./format.ts";
import { firstOutOfRange, MAX_ROW_WEIGHT, MAX_STORED_MAGNITUDE } from "./header-limits.ts";
import { LabelTree } from "../model/label-tree.ts";
import { validateHeader, type ModelHeader } from "./model-header.ts";
import { Model } from "../model/model.ts";
import { SlotIndex } from "./slot-index.ts";

interface SectionEntry {
  id: number;
  elementType: number;
  offset: number;
  byteLength: number;
}

/**
 * Loads a model from the bytes of a .sluice file.
 * @example
 * const model = loadModel(await (await fetch("/model.sluice")).arrayBuffer());
 * model.classify("where is my parcel?"); // [{ label: "shipping", score: 0.97 }]
 */
export function loadModel(input: Uint8Array | ArrayBuffer): Model {
  let bytes = toBytes(input);
  const length = bytes.length;
  if (length < MAGIC.length) throw new ModelFormatError("truncated", `the file has ${length} bytes, fewer than the ${MAGIC.length}-byte magic number`, length);
  for (let i = 0; i < MAGIC.length; i++) {
    if (bytes[i] !== MAGIC[i]) throw new ModelFormatError("bad-magic", "not a Sluice model file: the magic number \\x89SLUICE\\n is missing", i);
  }
  if (length < PRELUDE_BYTES + CHECKSUM_BYTES) throw new ModelFormatError("truncated", `the file ends inside the ${PRELUDE_BYTES}-byte prelude`, length);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const version = view.getUint16(VERSION_OFFSET, true);
  if (!SUPPORTED_VERSIONS.includes(version)) {
    throw new ModelFormatError(
      "unsupported-version",
      `format version ${version} is not supported: this runtime reads version ${SUPPORTED_VERSIONS.join(", ")}; rebuild the model with a matching Sluice or upgrade the runtime`,
      VERSION_OFFSET,
    );
  }
  const headerLength = view.getUint32(HEADER_LENGTH_OFFSET, true);
  if (headerLength > MAX_HEADER_BYTES) throw new ModelFormatError("bad-header", `the header declares ${headerLength} bytes, more than the ${MAX_HEADER_BYTES} allowed`, HEADER_LENGTH_OFFSET);
  const headerEnd = PRELUDE_BYTES + headerLength;
  const directoryStart = alignUp(headerEnd);
  if (directoryStart + 8 + CHECKSUM_BYTES > length) throw new ModelFormatError("truncated", `the file ends before the section directory at byte ${directoryStart}`, length);
  const storedChecksum = view.getUint32(length - CHECKSUM_BYTES, true);
  const actualChecksum = crc32(bytes, 0, length - CHECKSUM_BYTES);
  if (storedChecksum !== actualChecksum) {
    throw new ModelFormatError("checksum", `checksum mismatch (CRC-32): the trailer says ${hex(storedChecksum)}, the bytes give ${hex(actualChecksum)}; the file is corrupt or truncated`, length - CHECKSUM_BYTES);
  }
  let decoded: unknown;
  try {
    decoded = unpack(bytes.subarray(PRELUDE_BYTES, headerEnd));
  } catch (error) {
    throw new ModelFormatError("bad-header", `the MessagePack header cannot be decoded: ${(error as Error).message}`, PRELUDE_BYTES);
  }
  const header = validateHeader(decoded, PRELUDE_BYTES, version);
  const entries = readDirectory(view, directoryStart, length - CHECKSUM_BYTES);
  if (bytes.byteOffset % SECTION_ALIGNMENT !== 0) bytes = bytes.slice(); // one aligned copy
  const parts = buildParts(bytes, header, entries, version);
  return new Model({ ...parts, contentId: hex(storedChecksum).slice(2), byteLength: length });
}

function toBytes(input: Uint8Array | ArrayBuffer): Uint8Array {
  if (input instanceof Uint8Array) return input;
  if (input instanceof ArrayBuffer) return new Uint8Array(input);
  if (ArrayBuffer.isView(input)) {
    const viewInput = input as ArrayBufferView;
    return new Uint8Array(viewInput.buffer, viewInput.byteOffset, viewInput.byteLength);
  }
  throw new ModelFormatError("bad-magic", `expected the model as a Uint8Array or ArrayBuffer, got ${input === null ? "null" : typeof input}`);
}

function readDirectory(view: DataView, start: number, dataEnd: number): Map<number, SectionEntry> {
  const count = view.getUint32(start, true);
  if (count > MAX_SECTIONS) throw new ModelFormatError("bad-section", `the directory declares ${count} sections, more than ${MAX_SECTIONS}`, start);
  const entriesStart = start + 8;
  const entriesEnd = entriesStart + count * DIRECTORY_ENTRY_BYTES;
  if (entriesEnd > dataEnd) throw new ModelFormatError("truncated", `the file ends inside the section directory (${count} entries)`, dataEnd);
  const entries = new Map<number, SectionEntry>();
  const ordered: SectionEntry[] = [];
  for (let i = 0; i < count; i++) {
    const at = entriesStart + i * DIRECTORY_ENTRY_BYTES;
    const entry: SectionEntry = {
      id: view.getUint32(at, true),
      elementType: view.getUint32(at + 4, true),
      offset: view.getUint32(at + 8, true),
      byteLength: view.getUint32(at + 12, true),
    };
    const name = sectionNameOf(entry.id);
    if (name === undefined) throw new ModelFormatError("bad-section", `unknown section id ${entry.id}`, at);
    if (entries.has(entry.id)) throw new ModelFormatError("bad-section", `section "${name}" appears twice`, at);
    if (ELEMENT_BYTES[entry.elementType] === undefined) throw new ModelFormatError("bad-section", `section "${name}" has unknown element type ${entry.elementType}`, at + 4);
    if (entry.offset % SECTION_ALIGNMENT !== 0) throw new ModelFormatError("bad-section", `section "${name}" starts at ${entry.offset}, not a multiple of ${SECTION_ALIGNMENT}`, at + 8);
    if (entry.offset < entriesEnd || entry.offset + entry.byteLength > dataEnd) {
      throw new ModelFormatError("bad-section", `section "${name}" spans bytes ${entry.offset}..${entry.offset + entry.byteLength}, outside the data area ${entriesEnd}..${dataEnd}`, at + 8);
    }
    if (entry.byteLength % ELEMENT_BYTES[entry.elementType] !== 0) throw new ModelFormatError("bad-section", `section "${name}" length ${entry.byteLength} is not a whole number of elements`, at + 12);
    entries.set(entry.id, entry);
    ordered.push(entry);
  }
  ordered.sort((a, b) => a.offset - b.offset);
  for (let i = 1; i < ordered.length; i++) {
    const previous = ordered[i - 1];
    if (previous.offset + previous.byteLength > ordered[i].offset) {
      throw new ModelFormatError("bad-section", `sections "${sectionNameOf(previous.id)}" and "${sectionNameOf(ordered[i].id)}" overlap`, ordered[i].offset);
    }
  }
  checkNoStrayBytes(view, ordered, alignUp(entriesEnd), dataEnd);
  return entries;
}

/**
 * The sections tile the data area: between them only the zero padding to the next multiple
 * of 8, and the last one ends at the checksum. Bytes nobody reads could hide anything (and
 * would make two files with the same model differ), so they are refused.
 */
function checkNoStrayBytes(view: DataView, ordered: SectionEntry[], firstOffset: number, dataEnd: number): void {
  let cursor = firstOffset;
  for (const entry of ordered) {
    if (entry.offset !== cursor) throw new ModelFormatError("bad-section", `${entry.offset - cursor} stray bytes before section "${sectionNameOf(entry.id)}" (sections follow each other, 8-aligned)`, cursor);
    const end = entry.offset + entry.byteLength;
    cursor = Math.min(alignUp(end), dataEnd);
    for (let at = end; at < cursor; at++) if (view.getUint8(at) !== 0) throw new ModelFormatError("bad-section", "padding after a section is not zero", at);
  }
  if (cursor !== dataEnd) throw new ModelFormatError("bad-section", `${dataEnd - cursor} stray bytes between the last section and the checksum`, cursor);
}

type Parts = Omit<ConstructorParameters<typeof Model>[0], "contentId" | "byteLength">;

function buildParts(bytes: Uint8Array, header: ModelHeader, entries: Map<number, SectionEntry>, version: number): Parts {
  const { dims, rowCount, outputCount } = header;
  const int8 = header.precision === "int8";
  const bucketCount = 2 ** header.index.bucketBits + 1;
  const bucketType = rowCount < 65536 ? "u16" : "u32";
  const keyType = header.index.lowBits <= 8 ? "u8" : "u16";
  const take = (name: SectionName, element: keyof typeof ELEMENT, count: number, required = true) => {
    const entry = entries.get(SECTION[name]);
    if (entry === undefined) {
      if (required) throw new ModelFormatError("bad-section", `required section "${name}" is missing`);
      return null;
    }
    if (entry.elementType !== ELEMENT[element]) throw new ModelFormatError("bad-section", `section "${name}" must hold ${element} values`, entry.offset);
    const expected = count * ELEMENT_BYTES[entry.elementType];
    if (entry.byteLength !== expected) throw new ModelFormatError("bad-section", `section "${name}" has ${entry.byteLength} bytes; the header implies ${expected}`, entry.offset);
    entries.delete(SECTION[name]);
    return view(bytes, entry, element, count);
  };
  const buckets = take("slotBuckets", bucketType, bucketCount) as Uint16Array | Uint32Array;
  const keys = take("slotKeys", keyType, rowCount) as Uint8Array | Uint16Array;
  const logitRows = header.rowSpace === "logits";
  const rows = take("rows", int8 ? "i8" : "f32", rowCount * (logitRows ? outputCount : dims)) as Int8Array | Float32Array;
  // Version 2 int8 files store scale codes and u16 weights: decoded once here, so scoring
  // reads float32 values either way (4 bytes per row at load, for 3 + 2 fewer in the file).
  const compact = int8 && version >= 2;
  const rowScales = !int8 ? null : compact ? decodeRowScales(take("rowScales", "u8", rowCount) as Uint8Array) : (take("rowScales", "f32", rowCount) as Float32Array);
  const weightStep = header.quantization?.weightStep ?? 0;
  const rowWeights = header.weighting !== "tfidf" ? null : compact ? decodeWeights(take("rowWeights", "u16", rowCount) as Uint16Array, weightStep) : (take("rowWeights", "f32", rowCount) as Float32Array);
  const outputWeights = logitRows ? null : (take("outputWeights", int8 ? "i8" : "f32", outputCount * dims) as Int8Array | Float32Array);
  const outputScales = int8 && !logitRows ? (take("outputScales", "f32", outputCount) as Float32Array) : null;
  const outputBias = take("outputBias", "f32", outputCount) as Float32Array;
  const tree = header.head === "tree" ? (take("tree", "i32", 2 * (header.labels.length - 1)) as Int32Array) : null;
  for (const leftover of entries.values()) {
    throw new ModelFormatError("bad-section", `section "${sectionNameOf(leftover.id)}" does not belong in a ${header.precision} ${header.weighting} ${header.head} model with ${header.rowSpace} rows`, leftover.offset);
  }
  const indexProblem = SlotIndex.check(buckets, keys, header.index.lowBits);
  if (indexProblem) throw new ModelFormatError("bad-section", `slot index: ${indexProblem}`);
  if (tree) {
    const treeProblem = LabelTree.check(tree, header.labels.length);
    if (treeProblem) throw new ModelFormatError("bad-section", `label tree: ${treeProblem}`);
  }
  // Every stored float within the ranges the compiler writes (header-limits.ts), so scores
  // stay finite. Decoded scales and weights are in range by construction (a code table, u16 ×
  // a checked step). Scales and weights must not be negative: a weight sum could then cancel.
  const storedAsFloats: [string, Float32Array | null, number, number][] = [
    ["rowScales", compact ? null : rowScales, 0, MAX_STORED_MAGNITUDE],
    ["rowWeights", compact ? null : rowWeights, 0, MAX_ROW_WEIGHT],
    ["outputScales", outputScales, 0, MAX_STORED_MAGNITUDE],
    ["outputBias", outputBias, -MAX_STORED_MAGNITUDE, MAX_STORED_MAGNITUDE],
    ["rows", int8 ? null : (rows as Float32Array), -MAX_STORED_MAGNITUDE, MAX_STORED_MAGNITUDE],
    ["outputWeights", int8 ? null : (outputWeights as Float32Array | null), -MAX_STORED_MAGNITUDE, MAX_STORED_MAGNITUDE],
  ];
  for (const [name, values, min, max] of storedAsFloats) {
    const at = values === null ? -1 : firstOutOfRange(values, min, max);
    if (at >= 0) throw new ModelFormatError("bad-section", `section "${name}" value ${at} is ${(values as Float32Array)[at]}, outside [${min}, ${max}]`);
  }
  return {
    header,
    index: new SlotIndex(buckets, keys, header.index.lowBits),
    rows,
    rowScales,
    rowWeights,
    outputWeights,
    outputScales,
    outputBias,
    tree,
  };
}

function view(bytes: Uint8Array, entry: SectionEntry, element: keyof typeof ELEMENT, count: number) {
  const offset = bytes.byteOffset + entry.offset;
  switch (element) {
    case "u8":
      return new Uint8Array(bytes.buffer, offset, count);
    case "i8":
      return new Int8Array(bytes.buffer, offset, count);
    case "u16":
      return new Uint16Array(bytes.buffer, offset, count);
    case "u32":
      return new Uint32Array(bytes.buffer, offset, count);
    case "f32":
      return new Float32Array(bytes.buffer, offset, count);
    case "i32":
      return new Int32Array(bytes.buffer, offset, count);
  }
}

const ROW_SCALES = Float32Array.from({ length: 256 }, (_, code) => rowScaleOfCode(code));

function decodeRowScales(codes: Uint8Array): Float32Array {
  const scales = new Float32Array(codes.length);
  for (let i = 0; i < codes.length; i++) scales[i] = ROW_SCALES[codes[i]];
  return scales;
}

function decodeWeights(steps: Uint16Array, step: number): Float32Array {
  const weights = new Float32Array(steps.length);
  for (let i = 0; i < steps.length; i++) weights[i] = steps[i] * step;
  return weights;
}


function hex(value: number): string {
  return `0x${value.toString(16).padStart(8, "0")}`;
}

