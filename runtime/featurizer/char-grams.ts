// Character n-grams inside words: each word is framed by an edge byte at both ends, and every
// piece of charMin..charMax characters is hashed with MurmurHash3 over its UTF-8 bytes. A
// hot loop over char codes, so the UTF-8 encoding is written inline. The featurizer calls it
// for every word of a text, or for one word when a model's word cache
// (runtime/model/word-feature-cache.ts) asks, so both see the same slots.

import { CHAR_GRAM_FEATURE, pushOrigin, pushSlot, type FeatureBuffer } from "./feature-buffer.ts";
import { finish, mixBlock, mixTail } from "./murmur3.ts";
import { WORD_EDGE } from "./token-kinds.ts";

/**
 * Appends the character n-grams of the word `chars[first .. first + wordLength)`, which is
 * token `token` of the text (recorded as their origin when `out` keeps origins).
 */
export function emitWordCharGrams(chars: Uint16Array, first: number, wordLength: number, charMin: number, charMax: number, seed: number, mask: number, out: FeatureBuffer, token: number): void {
  const withOrigins = out.origins !== null;
  const framedLength = wordLength + 2; // the word with an edge byte on each side
  for (let start = 0; start < framedLength; start++) {
    // MurmurHash3 of the UTF-8 bytes of framed[start .. start + length), for each length,
    // in one pass: the running state is read out (without disturbing it) at each length.
    let h = seed | 0;
    let pending = 0;
    let bytes = 0;
    const longest = Math.min(charMax, framedLength - start);
    for (let length = 1; length <= longest; length++) {
      const position = start + length - 1;
      const isEdge = position === 0 || position === framedLength - 1;
      const code = isEdge ? WORD_EDGE : chars[first + position - 1];
      if (code < 0x80) {
        pending |= code << ((bytes & 3) << 3);
        if ((++bytes & 3) === 0) {
          h = mixBlock(h, pending);
          pending = 0;
        }
      } else {
        const byteCount = code < 0x800 ? 2 : 3;
        for (let b = 0; b < byteCount; b++) {
          const byte = byteCount === 2 ? (b === 0 ? 0xc0 | (code >>> 6) : 0x80 | (code & 0x3f)) : b === 0 ? 0xe0 | (code >>> 12) : b === 1 ? 0x80 | ((code >>> 6) & 0x3f) : 0x80 | (code & 0x3f);
          pending |= byte << ((bytes & 3) << 3);
          if ((++bytes & 3) === 0) {
            h = mixBlock(h, pending);
            pending = 0;
          }
        }
      }
      if (length < charMin) continue;
      if (length === 1 && isEdge) continue; // an edge alone says nothing
      pushSlot(out, finish((bytes & 3) === 0 ? h : mixTail(h, pending), bytes) & mask);
      if (withOrigins) pushOrigin(out, CHAR_GRAM_FEATURE, length, token, start);
    }
  }
}

/** A character n-gram as people read it: "·" marks the start or end of the word. */
export function charGramName(chars: Uint16Array, first: number, wordLength: number, start: number, length: number): string {
  let name = "";
  for (let position = start; position < start + length; position++) {
    name += position === 0 || position === wordLength + 1 ? "·" : String.fromCharCode(chars[first + position - 1]);
  }
  return name;
}
