// CRC-32 (the zlib / PNG / IEEE 802.3 one) against its published check value and two
// outside references: Node's zlib.crc32 (zlib's own implementation) when this Node has
// it, and a bit-at-a-time implementation written here from the algorithm's definition.

import * as zlib from "node:zlib";
import { describe, expect, it } from "vitest";
import { crc32 } from "../../../runtime/format/crc32.ts";

/**
 * Bit-at-a-time CRC-32: reflected polynomial 0xEDB88320, register preset to all ones,
 * final complement (the parameters of CRC-32/ISO-HDLC in the CRC catalogue,
 * https://reveng.sourceforge.net/crc-catalogue/all.htm; same algorithm as RFC 1952
 * section 8). Deliberately the slow textbook form, so it shares no table with the code under test.
 */
function bitwiseCrc32(bytes: Uint8Array): number {
  let crc = 0xffffffff;
  for (const byte of bytes) {
    crc ^= byte;
    for (let bit = 0; bit < 8; bit++) crc = crc & 1 ? (crc >>> 1) ^ 0xedb88320 : crc >>> 1;
  }
  return (crc ^ 0xffffffff) >>> 0;
}

// zlib.crc32 exists from Node 20.15 / 22.2 (Node docs, "zlib.crc32(data[, value])"; version from memory,
// presence checked at run time: the comparisons below run only when it is there).
const zlibCrc32 = (zlib as unknown as { crc32?: (data: Uint8Array, value?: number) => number }).crc32;

/** A small xorshift32 generator (Marsaglia, "Xorshift RNGs", J. Stat. Soft. 2003) for reproducible buffers. */
function randomBytes(length: number, seed: number): Uint8Array {
  let state = seed >>> 0 || 1;
  const bytes = new Uint8Array(length);
  for (let i = 0; i < length; i++) {
    state ^= state << 13;
    state >>>= 0;
    state ^= state >>> 17;
    state ^= state << 5;
    state >>>= 0;
    bytes[i] = state & 0xff;
  }
  return bytes;
}

describe("crc32", () => {
  it('gives the published check value 0xCBF43926 for "123456789"', () => {
    // CRC catalogue, CRC-32/ISO-HDLC: check=0xcbf43926 (https://reveng.sourceforge.net/crc-catalogue/all.htm).
    expect(crc32(new TextEncoder().encode("123456789"))).toBe(0xcbf43926);
  });

  it("gives 0 for no bytes", () => {
    // Preset all ones, complemented at the end, with nothing in between: 0 (CRC catalogue definition).
    expect(crc32(new Uint8Array(0))).toBe(0);
  });

  it("agrees with the bit-at-a-time reference on the check string", () => {
    // Guards the reference itself: it must reproduce the catalogue's check value too.
    expect(bitwiseCrc32(new TextEncoder().encode("123456789"))).toBe(0xcbf43926);
  });

  it.runIf(zlibCrc32 !== undefined)("agrees with zlib.crc32 on random buffers of every length from 0 to 100", () => {
    const reference = zlibCrc32 as (data: Uint8Array) => number;
    for (let length = 0; length <= 100; length++) {
      const bytes = randomBytes(length, 0x9e3779b9 + length);
      expect(crc32(bytes), `length ${length}`).toBe(reference(bytes) >>> 0);
    }
  });

  it("agrees with the bit-at-a-time reference on random buffers of every length from 0 to 100", () => {
    for (let length = 0; length <= 100; length++) {
      const bytes = randomBytes(length, 0x85ebca6b + length);
      expect(crc32(bytes), `length ${length}`).toBe(bitwiseCrc32(bytes));
    }
  });

  it("checks exactly bytes[start, end) for unaligned starts and ends", () => {
    // The range form must equal the CRC of the copied sub-range (zlib when present, else the bitwise reference).
    const reference = zlibCrc32 ? (bytes: Uint8Array) => zlibCrc32(bytes) >>> 0 : bitwiseCrc32;
    const bytes = randomBytes(140, 12345);
    for (let start = 0; start < 11; start++) {
      for (let length = 0; length <= 100; length += 1) {
        const end = start + length;
        expect(crc32(bytes, start, end), `start ${start}, end ${end}`).toBe(reference(bytes.slice(start, end)));
      }
    }
  });

  it("checks a range of a view that starts inside its buffer", () => {
    // A subarray shares the buffer at a byte offset; indexes stay relative to the view.
    const backing = randomBytes(64, 777);
    const view = backing.subarray(3, 61);
    expect(crc32(view, 5, 50)).toBe(bitwiseCrc32(backing.slice(8, 53)));
  });

  it("detects a single flipped bit anywhere in a buffer", () => {
    // Every CRC with a polynomial having more than one term detects all single-bit errors
    // (common practice, no source); this pins that no byte position is skipped.
    const bytes = randomBytes(37, 4242);
    const original = crc32(bytes);
    for (let i = 0; i < bytes.length; i++) {
      for (let bit = 0; bit < 8; bit++) {
        bytes[i] ^= 1 << bit;
        expect(crc32(bytes)).not.toBe(original);
        bytes[i] ^= 1 << bit;
      }
    }
  });
});
