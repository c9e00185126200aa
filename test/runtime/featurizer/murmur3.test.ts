// MurmurHash3 x86_32 against published test vectors, and the three entry points of
// runtime/featurizer/murmur3.ts (one-shot over bytes, one-shot over a string, byte-by-byte stream)
// against each other.
//
// Vectors: Ian Boyd's table, translated from the SMHasher verification code,
// https://stackoverflow.com/a/31929528 ("MurmurHash3 test vectors"); the same values are
// reproduced in the test suites of the mmh3 Python package and of several other ports
// (checked with the search tool). The seed 0x9747b28c vectors are from the same table.

import { describe, expect, it } from "vitest";
import { Murmur3Stream, murmur3Bytes, murmur3String, murmur3Words } from "../../../runtime/featurizer/murmur3.ts";

interface Vector {
  input: string;
  seed: number;
  expected: number;
}

// Strings are hashed as their UTF-8 bytes (the convention of every listed port).
const STRING_VECTORS: Vector[] = [
  { input: "", seed: 0, expected: 0 }, // stackoverflow.com/a/31929528: empty input, zero seed gives zero
  { input: "", seed: 1, expected: 0x514e28b7 }, // stackoverflow.com/a/31929528
  { input: "", seed: 0xffffffff, expected: 0x81f16f39 }, // stackoverflow.com/a/31929528: the seed is unsigned
  { input: "\0\0\0\0", seed: 0, expected: 0x2362f9de }, // stackoverflow.com/a/31929528: embedded NULs
  { input: "aaaa", seed: 0x9747b28c, expected: 0x5a97808a }, // stackoverflow.com/a/31929528
  { input: "aaa", seed: 0x9747b28c, expected: 0x283e0130 }, // stackoverflow.com/a/31929528: 3-byte tail
  { input: "aa", seed: 0x9747b28c, expected: 0x5d211726 }, // stackoverflow.com/a/31929528: 2-byte tail
  { input: "a", seed: 0x9747b28c, expected: 0x7fa09ea6 }, // stackoverflow.com/a/31929528: 1-byte tail
  { input: "abcd", seed: 0x9747b28c, expected: 0xf0478627 }, // stackoverflow.com/a/31929528
  { input: "abc", seed: 0x9747b28c, expected: 0xc84a62dd }, // stackoverflow.com/a/31929528
  { input: "ab", seed: 0x9747b28c, expected: 0x74875592 }, // stackoverflow.com/a/31929528
  { input: "Hello, world!", seed: 0x9747b28c, expected: 0x24884cba }, // stackoverflow.com/a/31929528
  { input: "ππππππππ", seed: 0x9747b28c, expected: 0xd58063c1 }, // stackoverflow.com/a/31929528: UTF-8, 2 bytes per char
  { input: "a".repeat(256), seed: 0x9747b28c, expected: 0x37405bdc }, // stackoverflow.com/a/31929528: 256 × "a"
  { input: "abc", seed: 0, expected: 0xb3dd93fa }, // stackoverflow.com/a/31929528
  { input: "abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq", seed: 0, expected: 0xee925b90 }, // stackoverflow.com/a/31929528
  { input: "The quick brown fox jumps over the lazy dog", seed: 0x9747b28c, expected: 0x2fa826cd }, // stackoverflow.com/a/31929528
];

// Raw byte vectors from the same table (stackoverflow.com/a/31929528), as hex.
const BYTE_VECTORS: { hex: string; seed: number; expected: number }[] = [
  { hex: "ffffffff", seed: 0, expected: 0x76293b50 }, // 4-byte blocks use unsigned math
  { hex: "21436587", seed: 0, expected: 0xf55b516b }, // blocks are read little-endian
  { hex: "21436587", seed: 0x5082edee, expected: 0x2362f9de }, // a seed that cancels the first block
  { hex: "214365", seed: 0, expected: 0x7e4a8634 }, // 3-byte tail
  { hex: "2143", seed: 0, expected: 0xa0f7b07a }, // 2-byte tail
  { hex: "21", seed: 0, expected: 0x72661cf4 }, // 1-byte tail
  { hex: "000000", seed: 0, expected: 0x85f0b427 },
  { hex: "0000", seed: 0, expected: 0x30f4c306 },
  { hex: "00", seed: 0, expected: 0x514e28b7 },
];

const encoder = new TextEncoder();

function fromHex(hex: string): Uint8Array {
  return Uint8Array.from(hex.match(/../g) ?? [], (pair) => parseInt(pair, 16));
}

function streamHash(bytes: Uint8Array, seed: number): number {
  const stream = new Murmur3Stream();
  stream.reset(seed);
  for (const byte of bytes) stream.pushByte(byte);
  return stream.digest();
}

const label = (v: Vector) => `${JSON.stringify(v.input.length > 20 ? `${v.input.slice(0, 17)}...` : v.input)} seed 0x${v.seed.toString(16)}`;

describe("MurmurHash3 x86_32 over bytes", () => {
  it.each(STRING_VECTORS.map((v) => [label(v), v] as const))("gives the published hash of the UTF-8 bytes of %s", (_, v) => {
    expect(murmur3Bytes(encoder.encode(v.input), v.seed)).toBe(v.expected);
  });

  it.each(BYTE_VECTORS.map((v) => [v.hex, v] as const))("gives the published hash of the bytes %s", (_, v) => {
    expect(murmur3Bytes(fromHex(v.hex), v.seed)).toBe(v.expected);
  });
});

describe("MurmurHash3 x86_32 over a string", () => {
  it.each(STRING_VECTORS.map((v) => [label(v), v] as const))("gives the published hash of %s", (_, v) => {
    expect(murmur3String(v.input, v.seed)).toBe(v.expected);
  });

  it("hashes a character outside the BMP as its 4-byte UTF-8 encoding, like TextEncoder", () => {
    // UTF-8 encodes U+1F600 in 4 bytes (RFC 3629, section 3); TextEncoder is the reference encoder.
    const text = "ok 😀 🇫";
    expect(murmur3String(text, 0x9747b28c)).toBe(murmur3Bytes(encoder.encode(text), 0x9747b28c));
  });
});

describe("the byte-by-byte MurmurHash3 stream", () => {
  it.each(STRING_VECTORS.map((v) => [label(v), v] as const))("gives the published hash of %s", (_, v) => {
    expect(streamHash(encoder.encode(v.input), v.seed)).toBe(v.expected);
  });

  it.each(BYTE_VECTORS.map((v) => [v.hex, v] as const))("gives the published hash of the bytes %s", (_, v) => {
    expect(streamHash(fromHex(v.hex), v.seed)).toBe(v.expected);
  });

  it("reads the hash of every prefix without disturbing the stream", () => {
    // Reference: the one-shot hash of each prefix of a published vector's input.
    const bytes = encoder.encode("The quick brown fox jumps over the lazy dog");
    const stream = new Murmur3Stream();
    stream.reset(0x9747b28c);
    const prefixHashes: number[] = [];
    const expected: number[] = [];
    for (let i = 0; i < bytes.length; i++) {
      stream.pushByte(bytes[i]);
      prefixHashes.push(stream.digest());
      expected.push(murmur3Bytes(bytes.subarray(0, i + 1), 0x9747b28c));
    }
    expect(prefixHashes).toEqual(expected);
    expect(stream.digest()).toBe(0x2fa826cd); // stackoverflow.com/a/31929528
  });

  it("encodes code points with pushCodePoint exactly as UTF-8 bytes would be pushed", () => {
    // RFC 3629 section 3: 1 to 4 bytes per code point; TextEncoder is the reference encoder.
    const codePoints = [0x41, 0x7f, 0x80, 0x3c0, 0x7ff, 0x800, 0x20ac, 0xffff, 0x10000, 0x1f600, 0x10ffff];
    for (const codePoint of codePoints) {
      const stream = new Murmur3Stream();
      stream.reset(7);
      stream.pushCodePoint(codePoint);
      expect(stream.digest()).toBe(murmur3Bytes(encoder.encode(String.fromCodePoint(codePoint)), 7));
    }
  });
});

describe("MurmurHash3 over 32-bit words", () => {
  it("equals the byte hash of the words' little-endian bytes", () => {
    // MurmurHash3 x86_32 reads 4-byte blocks little-endian (SMHasher's getblock32 on x86),
    // so hashing words must equal hashing their little-endian byte serialization.
    const words = Uint32Array.from([0x12345678, 0xffffffff, 0, 0x9747b28c, 0x80000000, 0x00000001]);
    for (let start = 0; start < words.length; start++) {
      for (let count = 0; start + count <= words.length; count++) {
        const bytes = new Uint8Array(count * 4);
        const view = new DataView(bytes.buffer);
        for (let i = 0; i < count; i++) view.setUint32(i * 4, words[start + i], true);
        for (const seed of [0, 1, 0x9747b28c, 0xffffffff]) {
          expect(murmur3Words(words, start, count, seed)).toBe(murmur3Bytes(bytes, seed));
        }
      }
    }
  });

  it("gives the published hash of the block 21 43 65 87 read as one word", () => {
    // stackoverflow.com/a/31929528: bytes 21 43 65 87 with seed 0 hash to 0xF55B516B.
    expect(murmur3Words(Uint32Array.from([0x87654321]), 0, 1, 0)).toBe(0xf55b516b);
  });
});
