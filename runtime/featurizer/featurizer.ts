// The one featurizer: normalize → tokenize → n-grams → hash, shared by training and serving.
// Every feature is a MurmurHash3 x86_32 value masked into 2^hashBits slots. Hashes are
// computed over char codes as they are read: no n-gram substring is ever built unless
// the caller asks for names (explanations).

import {
  APOSTROPHE,
  DIGIT,
  DIGIT_JOINER,
  DROPPED,
  EMOJI,
  HIGH_SURROGATE,
  KEPT_PUNCTUATION,
  LETTER,
  SPACE,
  classOf,
  classOfAstral,
} from "./char-classes.ts";
import { Murmur3Stream, finish, mixBlock, mixTail, murmur3String, murmur3Words } from "./murmur3.ts";
import { normalizeText } from "./normalize.ts";

/** Settings that define the feature space; stored in every model file. */
export interface FeaturizerSettings {
  /** Version of the normalization and tokenization rules (see normalize.ts). */
  normalization: number;
  /** Longest word n-gram: 1 = words only, 2 = words + pairs. */
  wordSpan: number;
  /** Shortest character n-gram inside a word; 0 turns character n-grams off. */
  charMin: number;
  /** Longest character n-gram inside a word. */
  charMax: number;
  /** The feature space has 2^hashBits slots. */
  hashBits: number;
  /** Seed of every hash (each feature kind derives its own from it). */
  hashSeed: number;
  /** Tokens beyond this count are ignored, and the caller is told. */
  maxTokens: number;
}

/** Reusable output of `featurize`: the slots of one text, plus optional readable names. */
export interface FeatureBuffer {
  slots: Uint32Array;
  count: number;
  tokenCount: number;
  truncated: boolean;
  /** When not null, `names[i]` describes `slots[i]` (explanations only: this allocates). */
  names: string[] | null;
}

/** A buffer for `featurize`; pass `withNames` only for explanations. */
export function createFeatureBuffer(capacity = 1024, withNames = false): FeatureBuffer {
  return { slots: new Uint32Array(capacity), count: 0, tokenCount: 0, truncated: false, names: withNames ? [] : null };
}

// Token kinds.
const WORD = 1;
const NUMBER = 2;
const CODE = 3;
const URL = 4;
const EMAIL = 5;
const MARK = 6; // kept punctuation or emoji

// Character n-grams are framed by this byte at both ends of a word, so prefixes and
// suffixes differ from inner pieces. Control characters never survive tokenization,
// so 0x01 cannot collide with text.
const WORD_EDGE = 0x01;
/** ASCII letters (lower-cased) and digits as the bytes a word hashes; 0 for every other code. */
const ASCII_WORD_BYTES = Uint8Array.from({ length: 128 }, (_, code) => {
  if (code >= 0x41 && code <= 0x5a) return code + 32;
  return (code >= 0x61 && code <= 0x7a) || (code >= 0x30 && code <= 0x39) ? code : 0;
});
const NUMBER_NAMES = ["[number:1]", "[number:2]", "[number:3]", "[number:4]", "[number:5+]"];

/**
 * Builds a featurizer for fixed settings (precomputes seeds and shape hashes).
 * @example
 * const featurizer = createFeaturizer({ normalization: 1, wordSpan: 2, charMin: 3, charMax: 4, hashBits: 18, hashSeed: 0, maxTokens: 2000 });
 * const buffer = createFeatureBuffer();
 * featurizer.featurize("Where is my parcel?", buffer); // buffer.count features in buffer.slots
 */
export function createFeaturizer(settings: FeaturizerSettings): Featurizer {
  return new Featurizer(settings);
}

export class Featurizer {
  readonly settings: FeaturizerSettings;
  private readonly mask: number;
  private readonly wordSeed: number;
  private readonly charSeed: number;
  private readonly ngramSeed: number;
  private readonly hostSeed: number;
  private readonly numberHashes: Uint32Array;
  private readonly codeHash: number;
  private readonly emailHash: number;
  private readonly anyUrlHash: number;
  /** MARK tokens "?", "??", "???", "!", "!!", "!!!" (the fast path's trailing marks). */
  private readonly markHashes: Uint32Array;
  private readonly stream = new Murmur3Stream();

  // Scratch, reused across calls and grown on demand.
  private tokenHashes = new Uint32Array(256);
  private tokenKinds = new Uint8Array(256);
  private tokenCharStart = new Int32Array(256);
  private tokenCharEnd = new Int32Array(256);
  private wordChars: Uint16Array = new Uint16Array(2048);
  private tokenNames: string[] = [];
  private tokenTotal = 0;
  private wordCharTotal = 0;
  private withNames = false;
  /** Whether readWord must keep the word's characters (for character n-grams or names). */
  private keepWordChars = false;
  private readonly maxTokens: number;

  constructor(settings: FeaturizerSettings) {
    this.settings = { ...settings };
    this.maxTokens = settings.maxTokens;
    this.mask = settings.hashBits >= 32 ? 0xffffffff : (1 << settings.hashBits) - 1;
    const seed = settings.hashSeed >>> 0;
    this.wordSeed = seed;
    this.charSeed = (seed ^ 0x2545f491) >>> 0;
    this.ngramSeed = (seed ^ 0x6c8e9cf5) >>> 0;
    this.hostSeed = (seed ^ 0x1b56c4e9) >>> 0;
    const shapeSeed = (seed ^ 0x7f4a7c15) >>> 0;
    this.numberHashes = Uint32Array.from(NUMBER_NAMES, (name) => murmur3String(name, shapeSeed));
    this.codeHash = murmur3String("[code]", shapeSeed);
    this.emailHash = murmur3String("[email]", shapeSeed);
    this.anyUrlHash = murmur3String("[url]", shapeSeed);
    this.markHashes = Uint32Array.from(["?", "??", "???", "!", "!!", "!!!"], (mark) => murmur3String(mark, this.wordSeed));
  }

  /**
   * Writes the features of `text` into `out` (reset first). Allocation-free for ASCII text
   * once the buffers have grown to fit, unless `out.names` is set.
   */
  featurize(text: string, out: FeatureBuffer): void {
    out.count = 0;
    out.truncated = false;
    this.withNames = out.names !== null;
    this.keepWordChars = this.withNames || this.settings.charMin > 0;
    if (out.names) out.names.length = 0;
    this.tokenNames.length = 0;
    const normalized = normalizeText(text);
    this.tokenize(normalized);
    out.tokenCount = this.tokenTotal;
    out.truncated = this.hasMoreText;
    this.emitFeatures(out);
  }

  // ---- tokenization ----------------------------------------------------------------

  /** Set when a token beyond maxTokens was found: the text was cut (and reading stopped). */
  private hasMoreText = false;

  private tokenize(text: string): void {
    this.tokenTotal = 0;
    this.wordCharTotal = 0;
    this.hasMoreText = false;
    const length = text.length;
    let i = 0;
    while (i < length && !this.hasMoreText) {
      const code = text.charCodeAt(i);
      if (code < 0x80 ? code <= 0x20 || code === 0x7f : classOf(code) === SPACE) {
        i++;
        continue;
      }
      const plainEnd = this.plainChunks ? this.readPlainChunk(text, i, length) : -1;
      i = plainEnd >= 0 ? plainEnd : this.readChunk(text, i, length);
    }
  }

  /** Off only in tests, to check that the fast path reads exactly what readChunk reads. */
  plainChunks = true;

  /**
   * Fast path for the most common chunks: one ASCII word (letters and digits, with apostrophes
   * between letters, as in "can't"), then at most one of , . ; : or a run of ? or !, then
   * whitespace or the end of the text. Returns where the chunk ends, or -1, having changed
   * nothing, when the chunk needs readChunk (anything else, a URL-like start, or the token
   * limit). It yields exactly the tokens readChunk would (test/runtime/featurizer/featurizer-fast-path.test.ts).
   */
  private readPlainChunk(text: string, start: number, length: number): number {
    const first = text.charCodeAt(start) | 0x20; // lower-cases ASCII letters
    const second = text.charCodeAt(start + 1) | 0x20;
    if ((first === 0x68 && second === 0x74) || (first === 0x77 && second === 0x77)) return -1; // "ht…", "ww…": maybe a URL
    let h = this.wordSeed | 0;
    let pending = 0;
    let digits = 0;
    let apostrophes = 0;
    let previous = 0; // the last byte hashed
    let i = start;
    while (i < length) {
      const code = text.charCodeAt(i);
      let byte = code < 0x80 ? ASCII_WORD_BYTES[code] : 0;
      if (byte === 0) {
        if (code !== 0x27 || previous < 0x61 || i + 1 >= length) break;
        // An apostrophe joins two letters; a non-ASCII next character is left to readChunk.
        const next = text.charCodeAt(i + 1);
        if (next >= 0x80) return -1;
        if (ASCII_WORD_BYTES[next] < 0x61) break;
        byte = 0x27;
        apostrophes++;
      } else if (byte <= 0x39) {
        digits++;
      }
      pending |= byte << (((i - start) & 3) << 3);
      if (((i - start + 1) & 3) === 0) {
        h = mixBlock(h, pending);
        pending = 0;
      }
      previous = byte;
      i++;
    }
    const bytes = i - start;
    if (bytes === 0) return -1;
    let end = i;
    let markCode = 0;
    let markRepeats = 0;
    if (end < length) {
      let next = text.charCodeAt(end);
      if (next === 0x2c || next === 0x2e || next === 0x3b || next === 0x3a) {
        next = ++end < length ? text.charCodeAt(end) : 0x20;
      } else if (next === 0x3f || next === 0x21) {
        markCode = next;
        const runStart = end;
        while (end < length && text.charCodeAt(end) === markCode) end++;
        markRepeats = Math.min(end - runStart, 3);
        next = end < length ? text.charCodeAt(end) : 0x20;
      }
      if (!(next <= 0x20 || next === 0x7f)) return -1;
    }
    if (this.tokenTotal + (markCode === 0 ? 1 : 2) > this.maxTokens) return -1;
    const charStart = this.wordCharTotal;
    if (this.keepWordChars) {
      while (this.wordChars.length < charStart + bytes) this.growWordChars();
      for (let c = 0; c < bytes; c++) {
        const code = text.charCodeAt(start + c);
        this.wordChars[charStart + c] = code === 0x27 ? 0x27 : ASCII_WORD_BYTES[code];
      }
      this.wordCharTotal = charStart + bytes;
    }
    if (digits + apostrophes === bytes) {
      const bucket = Math.min(digits, 5) - 1;
      this.addToken(NUMBER, this.numberHashes[bucket], -1, -1, NUMBER_NAMES[bucket]);
    } else if (digits >= 3) {
      this.addToken(CODE, this.codeHash, -1, -1, "[code]");
    } else {
      const name = this.withNames ? String.fromCharCode(...this.wordChars.subarray(charStart, charStart + bytes)) : "";
      const hash = finish((bytes & 3) === 0 ? h : mixTail(h, pending), bytes);
      this.addToken(WORD, hash, charStart, charStart + bytes, name);
    }
    if (markCode !== 0) {
      const hash = this.markHashes[(markCode === 0x3f ? 0 : 3) + markRepeats - 1];
      this.addToken(MARK, hash, -1, -1, this.withNames ? String.fromCharCode(markCode).repeat(markRepeats) : "");
    }
    return end;
  }

  /**
   * Reads one chunk (a run without whitespace) from `start`; returns where it ended. A chunk
   * is a URL, an e-mail address, or ordinary tokens. Most chunks are ordinary, so they are
   * read in one pass; only a chunk that starts like a URL, or that turned out to hold "@",
   * is looked at again.
   */
  private readChunk(text: string, start: number, length: number): number {
    let coreStart = start;
    while (coreStart < length && isOpeningBracket(text.charCodeAt(coreStart))) coreStart++;
    // Every URL form read here starts with "ht" or "ww" (a cheap test before scanning the chunk;
    // `| 0x20` lower-cases ASCII letters, and urlHostOffset below makes the exact check).
    const first = text.charCodeAt(coreStart) | 0x20;
    const second = text.charCodeAt(coreStart + 1) | 0x20;
    if ((first === 0x68 && second === 0x74) || (first === 0x77 && second === 0x77)) {
      const end = chunkEnd(text, coreStart, length);
      const coreEnd = trimTrailingPunctuation(text, coreStart, end);
      const hostStart = urlHostOffset(text, coreStart, coreEnd);
      if (hostStart >= 0) {
        this.addUrl(text, hostStart, coreEnd);
        return this.tokenizeSpan(text, coreEnd, length);
      }
    }
    const tokensBefore = this.tokenTotal;
    const charsBefore = this.wordCharTotal;
    this.atSign = -1;
    const end = this.tokenizeSpan(text, start, length);
    const atSign = this.atSign;
    if (atSign > coreStart) {
      const coreEnd = trimTrailingPunctuation(text, coreStart, end);
      if (atSign < coreEnd && isEmailAddress(text, coreStart, atSign, coreEnd)) {
        // Take back the pieces read from the address and keep it as one shape token.
        this.tokenTotal = tokensBefore;
        this.wordCharTotal = charsBefore;
        this.hasMoreText = false;
        this.addToken(EMAIL, this.emailHash, -1, -1, "[email]");
        return this.tokenizeSpan(text, coreEnd, length);
      }
    }
    return end;
  }

  /** Position of the first "@" met by the last tokenizeSpan call, or -1. */
  private atSign = -1;

  private addUrl(text: string, hostStart: number, end: number): void {
    let hostEnd = hostStart;
    while (hostEnd < end) {
      const c = text.charCodeAt(hostEnd);
      if (c === 0x2f || c === 0x3f || c === 0x23 || c === 0x3a) break; // / ? # :
      hostEnd++;
    }
    if (hostEnd - hostStart > 4 && startsWithAscii(text, hostStart, "www.")) hostStart += 4;
    const stream = this.stream;
    stream.reset(this.hostSeed);
    for (let i = hostStart; i < hostEnd; i++) stream.pushCodePoint(lowerAscii(text.charCodeAt(i)));
    const name = this.withNames ? `[url ${text.slice(hostStart, hostEnd).toLowerCase()}]` : "";
    this.addToken(URL, stream.digest(), -1, -1, name);
  }

  /**
   * Ordinary tokens (words, numbers, codes, kept punctuation, emoji) from `start` up to the
   * next whitespace; returns where it stopped.
   */
  private tokenizeSpan(text: string, start: number, end: number): number {
    const stream = this.stream;
    let i = start;
    while (i < end && !this.hasMoreText) {
      const code = text.charCodeAt(i);
      const cls = classOf(code);
      if (cls === SPACE) break;
      if (cls === LETTER || cls === DIGIT) {
        i = this.readWord(text, i, end);
      } else if (cls === KEPT_PUNCTUATION) {
        let runEnd = i + 1;
        while (runEnd < end && text.charCodeAt(runEnd) === code) runEnd++;
        const repeats = Math.min(runEnd - i, 3);
        stream.reset(this.wordSeed);
        for (let r = 0; r < repeats; r++) stream.pushCodePoint(code);
        this.addToken(MARK, stream.digest(), -1, -1, this.withNames ? String.fromCharCode(code).repeat(repeats) : "");
        i = runEnd;
      } else if (cls === EMOJI) {
        stream.reset(this.wordSeed);
        stream.pushCodePoint(code);
        this.addToken(MARK, stream.digest(), -1, -1, this.withNames ? String.fromCharCode(code) : "");
        i++;
      } else if (cls === HIGH_SURROGATE && i + 1 < end) {
        const low = text.charCodeAt(i + 1);
        if (low >= 0xdc00 && low < 0xe000) {
          const codePoint = 0x10000 + ((code - 0xd800) << 10) + (low - 0xdc00);
          if (classOfAstral(codePoint) === EMOJI) {
            stream.reset(this.wordSeed);
            stream.pushCodePoint(codePoint);
            this.addToken(MARK, stream.digest(), -1, -1, this.withNames ? String.fromCodePoint(codePoint) : "");
          }
          i += 2;
        } else {
          i++;
        }
      } else {
        if (code === 0x40 && this.atSign < 0) this.atSign = i;
        i++; // separators, dropped characters, lone surrogates
      }
    }
    return i;
  }

  /** Reads one word/number/code run starting at `start`; returns where it ended. */
  private readWord(text: string, start: number, end: number): number {
    // Locals instead of fields in this loop: it runs once per character of every text.
    let chars = this.wordChars;
    let total = this.wordCharTotal;
    const charStart = total;
    const keepChars = this.keepWordChars;
    let letters = 0;
    let digits = 0;
    let i = start;
    let previousClass = -1;
    // MurmurHash3 of the word's UTF-8 bytes, computed as the characters are read.
    let h = this.wordSeed | 0;
    let pending = 0;
    let bytes = 0;
    while (i < end) {
      const code = text.charCodeAt(i);
      const cls = classOf(code);
      let kept: number;
      if (cls === LETTER) {
        kept = code >= 0x41 && code <= 0x5a ? code + 32 : code;
        letters++;
      } else if (cls === DIGIT) {
        kept = code;
        digits++;
      } else if (cls === DROPPED) {
        i++;
        continue;
      } else if (cls === APOSTROPHE || cls === DIGIT_JOINER) {
        // Joins only when the next character continues the run (letters for an
        // apostrophe, digits on both sides for . , :).
        const nextClass = i + 1 < end ? classOf(text.charCodeAt(i + 1)) : -1;
        const joins = cls === APOSTROPHE ? nextClass === LETTER && previousClass === LETTER : nextClass === DIGIT && previousClass === DIGIT;
        if (!joins) break;
        kept = cls === APOSTROPHE ? 0x27 : code;
      } else {
        break;
      }
      if (keepChars) {
        if (total === chars.length) chars = this.growWordChars();
        chars[total++] = kept;
      }
      if (kept < 0x80) {
        pending |= kept << ((bytes & 3) << 3);
        if ((++bytes & 3) === 0) {
          h = mixBlock(h, pending);
          pending = 0;
        }
      } else {
        const count = kept < 0x800 ? 2 : 3;
        for (let b = 0; b < count; b++) {
          const byte = count === 2 ? (b === 0 ? 0xc0 | (kept >>> 6) : 0x80 | (kept & 0x3f)) : b === 0 ? 0xe0 | (kept >>> 12) : b === 1 ? 0x80 | ((kept >>> 6) & 0x3f) : 0x80 | (kept & 0x3f);
          pending |= byte << ((bytes & 3) << 3);
          if ((++bytes & 3) === 0) {
            h = mixBlock(h, pending);
            pending = 0;
          }
        }
      }
      previousClass = cls;
      i++;
    }
    this.wordCharTotal = total;
    if (letters === 0) {
      const bucket = Math.min(digits, 5) - 1;
      this.addToken(NUMBER, this.numberHashes[bucket], -1, -1, NUMBER_NAMES[bucket]);
    } else if (digits >= 3) {
      this.addToken(CODE, this.codeHash, -1, -1, "[code]");
    } else {
      const name = this.withNames ? String.fromCharCode(...chars.subarray(charStart, total)) : "";
      const hash = finish((bytes & 3) === 0 ? h : mixTail(h, pending), bytes);
      this.addToken(WORD, hash, charStart, total, name);
    }
    return i;
  }

  private growWordChars(): Uint16Array {
    const grown = new Uint16Array(this.wordChars.length * 2);
    grown.set(this.wordChars);
    this.wordChars = grown;
    return grown;
  }

  private addToken(kind: number, hash: number, charStart: number, charEnd: number, name: string): void {
    if (this.tokenTotal >= this.maxTokens) {
      this.hasMoreText = true; // one token past the limit: the text is cut here
      return;
    }
    const index = this.tokenTotal;
    if (index === this.tokenHashes.length) this.growTokens();
    this.tokenHashes[index] = hash;
    this.tokenKinds[index] = kind;
    this.tokenCharStart[index] = charStart;
    this.tokenCharEnd[index] = charEnd;
    if (this.withNames) this.tokenNames[index] = name;
    this.tokenTotal = index + 1;
  }

  private growTokens(): void {
    const size = this.tokenHashes.length * 2;
    const hashes = new Uint32Array(size);
    hashes.set(this.tokenHashes);
    this.tokenHashes = hashes;
    const kinds = new Uint8Array(size);
    kinds.set(this.tokenKinds);
    this.tokenKinds = kinds;
    const starts = new Int32Array(size);
    starts.set(this.tokenCharStart);
    this.tokenCharStart = starts;
    const ends = new Int32Array(size);
    ends.set(this.tokenCharEnd);
    this.tokenCharEnd = ends;
  }

  // ---- features --------------------------------------------------------------------

  private emitFeatures(out: FeatureBuffer): void {
    const mask = this.mask;
    const tokens = this.tokenTotal;
    const hashes = this.tokenHashes;
    const kinds = this.tokenKinds;
    const names = out.names;
    for (let t = 0; t < tokens; t++) {
      pushSlot(out, hashes[t] & mask);
      if (names) names.push(this.tokenNames[t]);
      if (kinds[t] === URL) {
        pushSlot(out, this.anyUrlHash & mask);
        if (names) names.push("[url]");
      }
    }
    const wordSpan = this.settings.wordSpan;
    for (let n = 2; n <= wordSpan; n++) {
      const seed = (this.ngramSeed + n) >>> 0;
      for (let t = 0; t + n <= tokens; t++) {
        pushSlot(out, murmur3Words(hashes, t, n, seed) & mask);
        if (names) names.push(this.tokenNames.slice(t, t + n).join(" "));
      }
    }
    if (this.settings.charMin > 0) this.emitCharGrams(out);
  }

  private emitCharGrams(out: FeatureBuffer): void {
    const { charMin, charMax } = this.settings;
    const mask = this.mask;
    const chars = this.wordChars;
    const names = out.names;
    const seed = this.charSeed;
    for (let t = 0; t < this.tokenTotal; t++) {
      if (this.tokenKinds[t] !== WORD) continue;
      const first = this.tokenCharStart[t];
      const wordLength = this.tokenCharEnd[t] - first;
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
            const count = code < 0x800 ? 2 : 3;
            for (let b = 0; b < count; b++) {
              const byte = count === 2 ? (b === 0 ? 0xc0 | (code >>> 6) : 0x80 | (code & 0x3f)) : b === 0 ? 0xe0 | (code >>> 12) : b === 1 ? 0x80 | ((code >>> 6) & 0x3f) : 0x80 | (code & 0x3f);
              pending |= byte << ((bytes & 3) << 3);
              if ((++bytes & 3) === 0) {
                h = mixBlock(h, pending);
                pending = 0;
              }
            }
          }
          if (length < charMin) continue;
          if (length === 1 && isEdge) continue; // an edge alone says nothing
          const digest = finish((bytes & 3) === 0 ? h : mixTail(h, pending), bytes);
          pushSlot(out, digest & mask);
          if (names) names.push(charGramName(chars, first, wordLength, start, length));
        }
      }
    }
  }
}

function pushSlot(out: FeatureBuffer, slot: number): void {
  if (out.count === out.slots.length) {
    const grown = new Uint32Array(out.slots.length * 2);
    grown.set(out.slots);
    out.slots = grown;
  }
  out.slots[out.count++] = slot;
}

/** A character n-gram as people read it: "·" marks the start or end of the word. */
function charGramName(chars: Uint16Array, first: number, wordLength: number, start: number, length: number): string {
  let name = "";
  for (let position = start; position < start + length; position++) {
    name += position === 0 || position === wordLength + 1 ? "·" : String.fromCharCode(chars[first + position - 1]);
  }
  return name;
}

function lowerAscii(code: number): number {
  return code >= 0x41 && code <= 0x5a ? code + 32 : code;
}

function isOpeningBracket(code: number): boolean {
  return code === 0x28 || code === 0x3c || code === 0x5b || code === 0x22 || code === 0x27; // ( < [ " '
}

/** End of the whitespace-free chunk that contains `from`. */
function chunkEnd(text: string, from: number, length: number): number {
  let end = from;
  while (end < length) {
    const c = text.charCodeAt(end);
    if (c < 0x80 ? c <= 0x20 || c === 0x7f : classOf(c) === SPACE) break;
    end++;
  }
  return end;
}

/** `end` moved back over trailing punctuation (a URL or address ends before ". , ) …"). */
function trimTrailingPunctuation(text: string, start: number, end: number): number {
  while (end > start && isTrailingPunctuation(text.charCodeAt(end - 1))) end--;
  return end;
}

function isTrailingPunctuation(code: number): boolean {
  // . , ; : ! ? ) > ] " '
  return code === 0x2e || code === 0x2c || code === 0x3b || code === 0x3a || code === 0x21 || code === 0x3f ||
    code === 0x29 || code === 0x3e || code === 0x5d || code === 0x22 || code === 0x27;
}

function startsWithAscii(text: string, at: number, prefix: string): boolean {
  if (at + prefix.length > text.length) return false;
  for (let i = 0; i < prefix.length; i++) {
    if (lowerAscii(text.charCodeAt(at + i)) !== prefix.charCodeAt(i)) return false;
  }
  return true;
}

/** Where the host starts when [start, end) is a URL ("http://", "https://" or "www."), else -1. */
function urlHostOffset(text: string, start: number, end: number): number {
  const first = lowerAscii(text.charCodeAt(start));
  if (first !== 0x68 && first !== 0x77) return -1; // neither "h" nor "w"
  let hostStart = -1;
  if (startsWithAscii(text, start, "https://")) hostStart = start + 8;
  else if (startsWithAscii(text, start, "http://")) hostStart = start + 7;
  else if (startsWithAscii(text, start, "www.")) hostStart = start;
  if (hostStart < 0 || hostStart >= end) return -1;
  const hostClass = classOf(text.charCodeAt(hostStart));
  return hostClass === LETTER || hostClass === DIGIT ? hostStart : -1;
}

/** local@domain.tld with a plain local part and a domain whose last label has 2+ letters. */
function isEmailAddress(text: string, start: number, at: number, end: number): boolean {
  for (let i = start; i < at; i++) {
    const c = text.charCodeAt(i);
    const cls = classOf(c);
    if (!(cls === LETTER || cls === DIGIT || c === 0x2e || c === 0x5f || c === 0x25 || c === 0x2b || c === 0x2d)) return false;
  }
  let lastDot = -1;
  for (let i = at + 1; i < end; i++) {
    const c = text.charCodeAt(i);
    const cls = classOf(c);
    if (c === 0x2e) lastDot = i;
    else if (!(cls === LETTER || cls === DIGIT || c === 0x2d)) return false;
  }
  if (lastDot <= at + 1 || end - lastDot - 1 < 2) return false;
  for (let i = lastDot + 1; i < end; i++) if (classOf(text.charCodeAt(i)) !== LETTER) return false;
  return true;
}
