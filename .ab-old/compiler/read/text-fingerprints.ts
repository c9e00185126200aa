// Fingerprints of training texts, for the leakage check: an example of the evaluation data
// whose text the model was trained on makes the metrics look better than they are.
//
// - build compares training and validation texts exactly (`findLeaks`, a Set of normal forms;
//   a build that streams its data uses `TrainingTextCollector`, 12 bytes per text);
// - `eval` has only the model file, which must not carry the training texts, so the build
//   stores a Bloom filter of them (B. H. Bloom, "Space/time trade-offs in hash coding with
//   allowable errors", CACM 13(7):422–426, 1970) in provenance.trainFingerprint.
//
// Filter sizing: m = 8 bits per distinct text and k = 5 hash functions. After n insertions the
// chance that a text never inserted tests positive is (1 − e^{−kn/m})^k (the standard estimate,
// e.g. Broder & Mitzenmacher, "Network applications of Bloom filters: a survey", Internet
// Mathematics 1(4), 2004; citation from memory): (1 − e^{−5/8})^5 ≈ 2.2%. k = 5 is the integer
// nearest below the optimum (m/n)·ln 2 ≈ 5.5, and costs one hash fewer than k = 6 for the same rate.
// The k positions come from two MurmurHash3 values, g_i = h1 + i·h2 mod m (Kirsch & Mitzenmacher,
// "Less hashing, same performance: building a better Bloom filter", ESA 2006), which keeps
// the false-positive rate of k independent hashes.
//
// Past FINGERPRINT_MAX_BYTES (256 KiB, ~262 000 distinct texts) the filter stops growing and
// holds a hash-chosen sample of the texts instead: text t is in the sample when h3(t) ≤ sampleMax,
// with h3 a third MurmurHash3 value. Whether a text is sampled depends only on the text, so eval
// tests exactly the evaluated texts that fall in the sample and scales the hits by the sample
// share (consistent hash sampling; common practice, no source). Small data: sampleMax = 2^32 − 1.
//
// Layout of the bytes (little-endian):
//   u8 layout version (1) | u8 k | u16 reserved (0) | u32 texts inserted n | u32 sampleMax | bit array
// bit j of the array is byte (j >> 3), bit (j & 7); m = 8 × (length − 12).

import { murmur3Bytes } from "../../runtime/featurizer/murmur3.ts";
import { normalizeText } from "../../runtime/featurizer/normalize.ts";

/** Version byte of the fingerprint layout above. */
export const FINGERPRINT_LAYOUT_VERSION = 1;
/** Hash functions per text. */
export const FINGERPRINT_HASHES = 5;
/** Bits of filter per distinct training text. */
export const FINGERPRINT_BITS_PER_TEXT = 8;
/** The bit array never grows beyond this many bytes (the model header is capped at 1 MiB). */
export const FINGERPRINT_MAX_BYTES = 256 * 1024;
const PREFIX_BYTES = 12;
const ALL_TEXTS = 0xffffffff;
// Three fixed, arbitrary seeds (digits of π, e and √2): build and eval must hash alike.
const SEED_FIRST = 0x243f6a88;
const SEED_SECOND = 0xb7e15162;
const SEED_SAMPLE = 0x6a09e667;

/** A decoded fingerprint: the bit array and what is needed to test it. */
export interface TrainingFingerprint {
  hashes: number;
  /** Distinct normalized texts that were inserted. */
  count: number;
  /** Texts whose sampling hash is at most this were inserted (2^32 − 1: every text). */
  sampleMax: number;
  /** Share of all possible texts in the sample: (sampleMax + 1) / 2^32. */
  sampledShare: number;
  /** Number of bits, m. */
  bitCount: number;
  bits: Uint8Array;
}

/** Texts of the evaluated data that were also trained on. */
export interface LeakFindings {
  /** Evaluated examples (duplicates counted each time) whose normal form is a training text. */
  count: number;
  /** Up to three of them, in data order, as given. */
  samples: string[];
}

/**
 * The form two texts share when the model cannot tell them apart: NFKC + lower case (the
 * tokenizer lower-cases ASCII as it reads), runs of whitespace as one space, trimmed.
 * @example fingerprintText("  Refund\n please ") // "refund please"
 */
export function fingerprintText(text: string): string {
  return normalizeText(text).toLowerCase().replace(/\s+/g, " ").trim();
}

/**
 * Gathers training texts one at a time, keeping three 32-bit hashes of each normal form
 * (12 bytes per text, never the text), for builds that stream their data. At the end it gives
 * the fingerprint and a leak check that is exact up to 64-bit hash collisions (probability
 * about n·v / 2^64 for n training and v evaluated texts).
 * @example const collector = new TrainingTextCollector(); collector.add("hi"); collector.fingerprint()
 */
export class TrainingTextCollector {
  private hashes = new Uint32Array(3 * 1024);
  private added = 0;
  private sorted: BigUint64Array | null = null;

  /** Texts added so far (duplicates included). */
  get size(): number {
    return this.added;
  }

  /** Adds one training text. */
  add(text: string): void {
    const normalized = fingerprintText(text);
    if (3 * this.added + 3 > this.hashes.length) {
      const grown = new Uint32Array(this.hashes.length * 2);
      grown.set(this.hashes);
      this.hashes = grown;
    }
    const at = 3 * this.added;
    const bytes = utf8Of(normalized);
    this.hashes[at] = murmur3Bytes(bytes, SEED_FIRST);
    this.hashes[at + 1] = murmur3Bytes(bytes, SEED_SECOND);
    this.hashes[at + 2] = murmur3Bytes(bytes, SEED_SAMPLE);
    this.added++;
    this.sorted = null;
  }

  /** The Bloom filter of the distinct texts added (a hash sample of them past `maxBytes` of bits). */
  fingerprint(maxBytes = FINGERPRINT_MAX_BYTES): Uint8Array {
    const capacity = (maxBytes * 8) / FINGERPRINT_BITS_PER_TEXT;
    const distinct = countDistinct(this.sortedKeys());
    const sampleMax = distinct <= capacity ? ALL_TEXTS : Math.floor((capacity / distinct) * 2 ** 32) - 1;
    const inserted = sampleMax === ALL_TEXTS ? distinct : countDistinct(this.keys((i) => this.hashes[3 * i + 2] <= sampleMax).sort());
    const arrayBytes = Math.min(maxBytes, Math.max(8, Math.ceil((inserted * FINGERPRINT_BITS_PER_TEXT) / 8)));
    const bytes = new Uint8Array(PREFIX_BYTES + arrayBytes);
    const view = new DataView(bytes.buffer);
    bytes[0] = FINGERPRINT_LAYOUT_VERSION;
    bytes[1] = FINGERPRINT_HASHES;
    view.setUint32(4, inserted, true);
    view.setUint32(8, sampleMax, true);
    const bits = bytes.subarray(PREFIX_BYTES);
    const bitCount = arrayBytes * 8;
    // Inserting a text twice sets the same bits, so duplicates need no skipping here.
    for (let i = 0; i < this.added; i++) {
      if (this.hashes[3 * i + 2] > sampleMax) continue;
      forEachPosition(this.hashes[3 * i], this.hashes[3 * i + 1], FINGERPRINT_HASHES, bitCount, (position) => {
        bits[position >>> 3] |= 1 << (position & 7);
      });
    }
    return bytes;
  }

  /** Evaluated texts whose normal form was added (as `findLeaks`, compared by 64-bit hash). */
  findLeaks(evaluated: readonly string[]): LeakFindings {
    const keys = this.sortedKeys();
    const samples: string[] = [];
    let count = 0;
    for (const text of evaluated) {
      const bytes = utf8Of(fingerprintText(text));
      if (!containsSorted(keys, keyOf(murmur3Bytes(bytes, SEED_FIRST), murmur3Bytes(bytes, SEED_SECOND)))) continue;
      count++;
      if (samples.length < 3) samples.push(text);
    }
    return { count, samples };
  }

  private sortedKeys(): BigUint64Array {
    if (this.sorted === null) this.sorted = this.keys(() => true).sort();
    return this.sorted;
  }

  private keys(keep: (i: number) => boolean): BigUint64Array {
    let count = 0;
    for (let i = 0; i < this.added; i++) if (keep(i)) count++;
    const keys = new BigUint64Array(count);
    let at = 0;
    for (let i = 0; i < this.added; i++) if (keep(i)) keys[at++] = keyOf(this.hashes[3 * i], this.hashes[3 * i + 1]);
    return keys;
  }
}

/**
 * A Bloom filter of the normalized training texts, ~1 byte per distinct text (+ 12 bytes),
 * for `provenance.trainFingerprint`.
 * @example const bytes = trainingFingerprint(train.map((e) => e.text)); fingerprintMayContain(readTrainingFingerprint(bytes)!, "hi")
 */
export function trainingFingerprint(texts: readonly string[], maxBytes = FINGERPRINT_MAX_BYTES): Uint8Array {
  const collector = new TrainingTextCollector();
  for (const text of texts) collector.add(text);
  return collector.fingerprint(maxBytes);
}

/**
 * Decodes `provenance.trainFingerprint`: null when absent; throws an Error saying what is
 * wrong when the value is not a fingerprint of a layout this tool reads.
 * @example readTrainingFingerprint(model.meta.provenance.trainFingerprint)?.count
 */
export function readTrainingFingerprint(value: unknown): TrainingFingerprint | null {
  if (value === undefined || value === null) return null;
  if (!(value instanceof Uint8Array)) throw new Error(`provenance.trainFingerprint: expected binary data, got ${Array.isArray(value) ? "an array" : typeof value}`);
  if (value.length < PREFIX_BYTES + 1) throw new Error(`provenance.trainFingerprint: ${value.length} bytes, expected at least ${PREFIX_BYTES + 1}`);
  if (value[0] !== FINGERPRINT_LAYOUT_VERSION) throw new Error(`provenance.trainFingerprint: layout version ${value[0]}, this tool reads version ${FINGERPRINT_LAYOUT_VERSION}`);
  const hashes = value[1];
  if (hashes < 1 || hashes > 32) throw new Error(`provenance.trainFingerprint: ${hashes} hash functions, expected 1 to 32`);
  const view = new DataView(value.buffer, value.byteOffset, value.byteLength);
  const sampleMax = view.getUint32(8, true);
  const bits = value.subarray(PREFIX_BYTES);
  return { hashes, count: view.getUint32(4, true), sampleMax, sampledShare: (sampleMax + 1) / 2 ** 32, bitCount: bits.length * 8, bits };
}

/**
 * Whether `text` falls in the fingerprint's sample of texts (always, unless the training data
 * was too large for a filter of every text): only such texts can be looked up.
 * @example fingerprintCovers(fingerprint, "Where is my parcel?") // true for small training sets
 */
export function fingerprintCovers(fingerprint: TrainingFingerprint, text: string): boolean {
  return fingerprint.sampleMax === ALL_TEXTS || murmur3Bytes(utf8Of(fingerprintText(text)), SEED_SAMPLE) <= fingerprint.sampleMax;
}

/**
 * Whether `text` may have been a training text: false is certain (for a covered text), true is
 * wrong with probability `fingerprintFalsePositiveRate(fingerprint)`. A text outside the sample
 * (see `fingerprintCovers`) gives false.
 * @example fingerprintMayContain(fingerprint, "Where is my parcel?") // true when it was trained on
 */
export function fingerprintMayContain(fingerprint: TrainingFingerprint, text: string): boolean {
  if (!fingerprintCovers(fingerprint, text)) return false;
  const bytes = utf8Of(fingerprintText(text));
  let all = true;
  forEachPosition(murmur3Bytes(bytes, SEED_FIRST), murmur3Bytes(bytes, SEED_SECOND), fingerprint.hashes, fingerprint.bitCount, (position) => {
    if ((fingerprint.bits[position >>> 3] & (1 << (position & 7))) === 0) all = false;
  });
  return all;
}

/**
 * The expected false-positive rate (1 − e^{−kn/m})^k of a fingerprint (Bloom 1970).
 * @example fingerprintFalsePositiveRate({ hashes: 5, count: 1000, bitCount: 8000, bits }) // ≈ 0.0217
 */
export function fingerprintFalsePositiveRate(fingerprint: Pick<TrainingFingerprint, "hashes" | "count" | "bitCount">): number {
  const { hashes, count, bitCount } = fingerprint;
  return Math.pow(1 - Math.exp((-hashes * count) / bitCount), hashes);
}

/**
 * A short description of `provenance.trainFingerprint` for people (inspect), instead of its bytes;
 * null when absent, `{ error }` when unreadable.
 * @example summarizeTrainingFingerprint(model.meta.provenance.trainFingerprint) // { bytes: 4012, texts: 4000, falsePositiveRate: 0.0217, sampledShare: 1 }
 */
export function summarizeTrainingFingerprint(value: unknown): { bytes: number; texts: number; falsePositiveRate: number; sampledShare: number } | { error: string } | null {
  try {
    const fingerprint = readTrainingFingerprint(value);
    if (fingerprint === null) return null;
    return { bytes: (value as Uint8Array).length, texts: fingerprint.count, falsePositiveRate: fingerprintFalsePositiveRate(fingerprint), sampledShare: fingerprint.sampledShare };
  } catch (error) {
    return { error: (error as Error).message };
  }
}

/**
 * Evaluated texts whose normal form (see `fingerprintText`) is also a training text, compared
 * by 64-bit hash as TrainingTextCollector does (the one implementation; exact up to collisions
 * of probability about n·v / 2^64).
 * @example findLeaks(["Refund please"], ["refund  please", "hello"]) // { count: 1, samples: ["refund  please"] }
 */
export function findLeaks(train: readonly string[], evaluated: readonly string[]): LeakFindings {
  const collector = new TrainingTextCollector();
  for (const text of train) collector.add(text);
  return collector.findLeaks(evaluated);
}

/**
 * One warning line about leaked examples, or null when there are none.
 * @example leakWarning({ count: 2, samples: ["hi", "hello"] }, "validation") // "2 validation examples also appear in the training data …"
 */
export function leakWarning(leaks: LeakFindings, evaluatedName: string): string | null {
  if (leaks.count === 0) return null;
  const samples = leaks.samples.map((text) => JSON.stringify(preview(text))).join(", ");
  return `${leaks.count} ${evaluatedName} example${leaks.count === 1 ? "" : "s"} also appear${leaks.count === 1 ? "s" : ""} in the training data (same text after normalization), so their metrics are optimistic; e.g. ${samples}`;
}

const encoder = new TextEncoder();
const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/**
 * The UTF-8 bytes murmur3String hashes, from the platform's encoder (several times faster on
 * long texts). The encoder writes a lone surrogate as U+FFFD where murmur3String writes its
 * 3-byte code unit, so such (malformed) texts take the slow path and hash as before.
 */
export function utf8Of(text: string): Uint8Array {
  if (!LONE_SURROGATE.test(text)) return encoder.encode(text);
  const units: number[] = [];
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i);
    if (code >= 0xd800 && code < 0xdc00 && i + 1 < text.length) {
      const low = text.charCodeAt(i + 1);
      if (low >= 0xdc00 && low < 0xe000) {
        units.push(...encoder.encode(text.slice(i, i + 2)));
        i++;
        continue;
      }
    }
    if (code >= 0xd800 && code < 0xe000) units.push(0xe0 | (code >>> 12), 0x80 | ((code >>> 6) & 0x3f), 0x80 | (code & 0x3f));
    else units.push(...encoder.encode(text[i]));
  }
  return Uint8Array.from(units);
}

// The k bit positions of a text from its two hashes: g_i = (h1 + i·h2) mod m. Computed in
// doubles (h1, h2 < 2^32, i < 32, so no precision is lost) rather than wrapping 32-bit sums.
function forEachPosition(firstHash: number, secondHash: number, hashes: number, bitCount: number, visit: (position: number) => void): void {
  const first = firstHash % bitCount;
  // An h2 of 0 mod m would give k equal positions: step by 1 instead.
  const step = secondHash % bitCount || 1;
  for (let i = 0; i < hashes; i++) visit((first + i * step) % bitCount);
}

function keyOf(firstHash: number, secondHash: number): bigint {
  return (BigInt(firstHash) << 32n) | BigInt(secondHash);
}

function countDistinct(sortedKeys: BigUint64Array): number {
  let distinct = 0;
  for (let i = 0; i < sortedKeys.length; i++) if (i === 0 || sortedKeys[i] !== sortedKeys[i - 1]) distinct++;
  return distinct;
}

function containsSorted(keys: BigUint64Array, key: bigint): boolean {
  let low = 0;
  let high = keys.length - 1;
  while (low <= high) {
    const middle = (low + high) >>> 1;
    if (keys[middle] === key) return true;
    if (keys[middle] < key) low = middle + 1;
    else high = middle - 1;
  }
  return false;
}

function preview(text: string): string {
  const flat = text.replace(/\s+/g, " ").trim();
  return flat.length > 60 ? `${flat.slice(0, 57)}...` : flat;
}
