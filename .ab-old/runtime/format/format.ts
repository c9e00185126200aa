// The .sluice byte layout, defined once: the loader and the compiler's writer both import
// these constants. The byte table is in FORMAT.md beside this file.

/** "\x89SLUICE\n": a high byte catches 7-bit transfers, the newline catches line-ending rewrites. */
export const MAGIC = new Uint8Array([0x89, 0x53, 0x4c, 0x55, 0x49, 0x43, 0x45, 0x0a]);
/**
 * Format version this runtime writes. Bump on any change of meaning. Version 2 added the
 * header's `rowSpace` (rows may hold each feature's contribution to every logit, with the
 * output layer multiplied in at compile time; version 1 files always hold hidden-space rows)
 * and stores int8 files' per-row scales as one-byte codes and TF-IDF weights as u16 steps.
 * Version 3 added the featurizer setting `unspacedScripts` (letters of scripts written without
 * spaces become one token each); older files lack it and featurize exactly as they always did.
 */
export const FORMAT_VERSION = 3;
/** Versions the loader accepts. */
export const SUPPORTED_VERSIONS: readonly number[] = [1, 2, 3];

// Fixed prelude: magic(8) | u16 version | u16 flags | u32 header length | header bytes.
export const PRELUDE_BYTES = 16;
export const VERSION_OFFSET = 8;
export const FLAGS_OFFSET = 10;
export const HEADER_LENGTH_OFFSET = 12;
/** A header longer than this is refused before it is parsed. */
export const MAX_HEADER_BYTES = 1 << 20;

// Section directory, 8-aligned after the header: u32 count | u32 reserved | entries.
// Each entry: u32 id | u32 element type | u32 absolute offset | u32 byte length.
export const DIRECTORY_ENTRY_BYTES = 16;
export const MAX_SECTIONS = 64;
/** Every section starts on a multiple of this, so typed-array views need no copy. */
export const SECTION_ALIGNMENT = 8;
/** u32 CRC-32 of every byte before it. */
export const CHECKSUM_BYTES = 4;

/** Section ids. */
export const SECTION = {
  /** Bucket directory of the kept-slot index: first row of each bucket (u16 or u32), plus one end entry. */
  slotBuckets: 1,
  /** Low bits of each kept slot, in row order (u8 or u16). */
  slotKeys: 2,
  /** Per-row dequantization scale of int8 rows: f32 in version 1, a u8 code (rowScaleOfCode) in version 2. */
  rowScales: 3,
  /** Feature rows (i8 or f32): rowCount × dims, or rowCount × outputCount when rowSpace is "logits". */
  rows: 4,
  /** Per-row feature weight (inverse document frequency), TF-IDF only: f32, or u16 multiples of quantization.weightStep in version 2 int8 files. */
  rowWeights: 5,
  /** Per-output-row dequantization scale (f32); absent for float32 output weights and for "logits" rows. */
  outputScales: 6,
  /** Output weights, outputCount × dims (i8 or f32); absent for "logits" rows (multiplied into them). */
  outputWeights: 7,
  /** Output bias, one per output row (f32). */
  outputBias: 8,
  /** Label tree of the tree head (i32, see FORMAT.md). */
  tree: 9,
} as const;

export type SectionName = keyof typeof SECTION;

/** Element types of sections. */
export const ELEMENT = { u8: 1, i8: 2, u16: 3, u32: 4, f32: 5, i32: 6 } as const;
export type ElementName = keyof typeof ELEMENT;
export const ELEMENT_BYTES: Record<number, number> = { 1: 1, 2: 1, 3: 2, 4: 4, 5: 4, 6: 4 };

/** Rounds up to the next multiple of SECTION_ALIGNMENT. */
export function alignUp(offset: number): number {
  return (offset + SECTION_ALIGNMENT - 1) & ~(SECTION_ALIGNMENT - 1);
}

/** The section name of an id, or undefined. */
export function sectionNameOf(id: number): SectionName | undefined {
  for (const name of Object.keys(SECTION) as SectionName[]) if (SECTION[name] === id) return name;
  return undefined;
}

/**
 * Per-row scales of version 2 int8 files are one byte: code 0 is a zero scale, code c ≥ 1 is
 * 2^((c − 192) / 8), from 2^−23.9 to 2^7.9 in steps of 2^(1/8) (9%). A row is quantized
 * against the smallest code whose scale covers max|row| / 127, so its largest value still
 * uses at least 117 of the 127 steps: under 0.1 bit lost against a float32 scale, 3 bytes saved.
 */
export const ROW_SCALE_CODE_BIAS = 192;
export const ROW_SCALE_CODE_STEPS = 8;

/** The scale of a one-byte row scale code, as a float32 value. */
export function rowScaleOfCode(code: number): number {
  return code === 0 ? 0 : Math.fround(2 ** ((code - ROW_SCALE_CODE_BIAS) / ROW_SCALE_CODE_STEPS));
}
