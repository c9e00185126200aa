// Character n-grams inside words: each word is framed by an edge byte at both ends, and every
// piece of charMin..charMax characters is hashed with MurmurHash3 over its UTF-8 bytes. A
// hot loop over char codes, so the UTF-8 encoding is written inline. The featurizer calls it
// for every word of a text, or for one word when a model's word cache
// (runtime/model/word-feature-cache.ts) asks, so both see the same slots.

import { charCodesToString } from "./char-codes-to-string.ts";
import { pushSlot, type FeatureBuffer } from "./feature-buffer.ts";
import { finish, mixBlock, mixTail } from "./murmur3.ts";
import { WORD_EDGE } from "./token-kinds.ts";

// Names of recent n-grams by the low bits of their hash. A long word repeats its n-grams
// ("aaaa…" has five distinct ones in a million characters), and two million fresh strings
// cost several times the hashing in allocation and garbage collection; a hit is checked
// against the text itself, so a name is always the n-gram's own characters.
const NAME_CACHE_SIZE = 4096;
const nameCache: string[] = new Array<string>(NAME_CACHE_SIZE).fill("");

/**
 * Appends the character n-grams of the word `chars[first .. first + wordLength)`; with names,
 * `source` (the word's original text when folding changed it, else null) is each one's source.
 */
export function emitWordCharGrams(chars: Uint16Array, first: number, wordLength: number, charMin: number, charMax: number, seed: number, mask: number, out: FeatureBuffer, source: string | null): void {
  const names = out.names;
  const sources = out.sources;
  const framedLength = wordLength + 2; // the word with an edge byte on each side
  // With names, the framed word as people read it ("·" marks the start and the end), made
  // once: each n-gram's name is a slice of it.
  const framedName = names ? `·${charCodesToString(chars, first, first + wordLength)}·` : "";
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
      const hash = finish((bytes & 3) === 0 ? h : mixTail(h, pending), bytes);
      pushSlot(out, hash & mask);
      if (names) {
        const cached = nameCache[hash & (NAME_CACHE_SIZE - 1)];
        if (cached.length === length && framedName.startsWith(cached, start)) names.push(cached);
        else names.push((nameCache[hash & (NAME_CACHE_SIZE - 1)] = framedName.slice(start, start + length)));
      }
      if (sources) sources.push(source);
    }
  }
}
