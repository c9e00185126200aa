// MurmurHash3, x86 32-bit variant (Austin Appleby, public domain, SMHasher project).
// Two forms share the same mixing code: a one-shot hash over bytes or a string's
// UTF-8 encoding, and a streaming form the featurizer drives byte by byte so that
// n-grams are hashed without building substrings.

const C1 = 0xcc9e2d51;
const C2 = 0x1b873593;

/** Mixes one 32-bit block into the running hash `h` and returns the new hash. */
export function mixBlock(h: number, k: number): number {
  k = Math.imul(k, C1);
  k = (k << 15) | (k >>> 17);
  k = Math.imul(k, C2);
  h ^= k;
  h = (h << 13) | (h >>> 19);
  return (Math.imul(h, 5) + 0xe6546b64) | 0;
}

/** Mixes the 1–3 trailing bytes (packed little-endian in `k`) into `h`. */
export function mixTail(h: number, k: number): number {
  k = Math.imul(k, C1);
  k = (k << 15) | (k >>> 17);
  k = Math.imul(k, C2);
  return h ^ k;
}

/** The final avalanche ("fmix32"), after xoring in the byte length. */
export function finish(h: number, byteLength: number): number {
  h ^= byteLength;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/**
 * MurmurHash3 x86_32 of raw bytes.
 * @example murmur3Bytes(new Uint8Array(0), 1) // 0x514e28b7
 */
export function murmur3Bytes(bytes: Uint8Array, seed: number): number {
  let h = seed | 0;
  const blockEnd = bytes.length & ~3;
  for (let i = 0; i < blockEnd; i += 4) {
    h = mixBlock(h, bytes[i] | (bytes[i + 1] << 8) | (bytes[i + 2] << 16) | (bytes[i + 3] << 24));
  }
  const rest = bytes.length & 3;
  if (rest > 0) {
    let k = 0;
    if (rest === 3) k ^= bytes[blockEnd + 2] << 16;
    if (rest >= 2) k ^= bytes[blockEnd + 1] << 8;
    k ^= bytes[blockEnd];
    h = mixTail(h, k);
  }
  return finish(h, bytes.length);
}

/**
 * Streaming MurmurHash3 state: feed bytes one at a time, read the hash at any point
 * without disturbing the stream (so one pass yields the hashes of every prefix).
 */
export class Murmur3Stream {
  private hash = 0;
  private pending = 0;
  private length = 0;

  /** Starts a new stream with the given seed. */
  reset(seed: number): void {
    this.hash = seed | 0;
    this.pending = 0;
    this.length = 0;
  }

  /** Appends one byte (0–255). */
  pushByte(byte: number): void {
    const shift = (this.length & 3) << 3;
    this.pending |= byte << shift;
    this.length++;
    if ((this.length & 3) === 0) {
      this.hash = mixBlock(this.hash, this.pending);
      this.pending = 0;
    }
  }

  /** Appends the UTF-8 encoding of one UTF-16 code unit, or of a surrogate pair's code point. */
  pushCodePoint(codePoint: number): void {
    if (codePoint < 0x80) {
      this.pushByte(codePoint);
    } else if (codePoint < 0x800) {
      this.pushByte(0xc0 | (codePoint >>> 6));
      this.pushByte(0x80 | (codePoint & 0x3f));
    } else if (codePoint < 0x10000) {
      this.pushByte(0xe0 | (codePoint >>> 12));
      this.pushByte(0x80 | ((codePoint >>> 6) & 0x3f));
      this.pushByte(0x80 | (codePoint & 0x3f));
    } else {
      this.pushByte(0xf0 | (codePoint >>> 18));
      this.pushByte(0x80 | ((codePoint >>> 12) & 0x3f));
      this.pushByte(0x80 | ((codePoint >>> 6) & 0x3f));
      this.pushByte(0x80 | (codePoint & 0x3f));
    }
  }

  /** The hash of everything pushed so far. */
  digest(): number {
    const h = (this.length & 3) === 0 ? this.hash : mixTail(this.hash, this.pending);
    return finish(h, this.length);
  }
}

const sharedStream = new Murmur3Stream();

/**
 * MurmurHash3 x86_32 of a string's UTF-8 encoding (lone surrogates encode as U+FFFD would
 * not: they are encoded as their 3-byte code unit, which never happens after normalization).
 * @example murmur3String("Hello, world!", 1234) // 0xfaf6cdb3
 */
export function murmur3String(text: string, seed: number): number {
  sharedStream.reset(seed);
  for (let i = 0; i < text.length; i++) {
    let code = text.charCodeAt(i);
    if (code >= 0xd800 && code < 0xdc00 && i + 1 < text.length) {
      const low = text.charCodeAt(i + 1);
      if (low >= 0xdc00 && low < 0xe000) {
        code = 0x10000 + ((code - 0xd800) << 10) + (low - 0xdc00);
        i++;
      }
    }
    sharedStream.pushCodePoint(code);
  }
  return sharedStream.digest();
}

/** MurmurHash3 x86_32 of a sequence of 32-bit words (little-endian), used for word n-grams. */
export function murmur3Words(words: Uint32Array, start: number, count: number, seed: number): number {
  let h = seed | 0;
  for (let i = 0; i < count; i++) h = mixBlock(h, words[start + i] | 0);
  return finish(h, count * 4);
}

