// The tokenizer of the one featurizer: splits normalized text into chunks at whitespace and
// reads each chunk as a URL, an e-mail address, or words / numbers / codes / kept punctuation
// / emoji. Each token's MurmurHash3 is computed while its characters are read; word
// characters are kept only when character n-grams or names need them. This file is one hot
// loop over char codes (it runs once per character of every text: readPlainChunk, the fast
// path; readChunk and tokenizeSpan; readWord), so it stays long (about 500 lines) on purpose
// rather than being split into calls. The evasion folding rules it applies under
// normalization 2 live apart: the word-level rules in evasion-rules.ts, the joining of spaced
// single letters in spaced-letter-runs.ts; only their few inline checks stay in readWord's loop.

import { charCodesToString } from "./char-codes-to-string.ts";
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
  isUnspacedLetter,
} from "./char-classes.ts";
import { chunkEnd, isEmailAddress, isOpeningBracket, lowerAscii, startsWithAscii, trimTrailingPunctuation, urlHostOffset } from "./chunk-shapes.ts";
import type { FeatureSeeds } from "./feature-seeds.ts";
import { Murmur3Stream, finish, mixBlock, mixTail, murmur3String } from "./murmur3.ts";
import { capRuns, collapseLeetReading, endsInRepeatedDigit, hashCodes, leetLetterOfDigit, paddingEnd, symbolLetter } from "./evasion-rules.ts";
import { SpacedLetterRun } from "./spaced-letter-runs.ts";
import { ASCII_WORD_BYTES, CODE, EMAIL, MARK, NUMBER, NUMBER_NAMES, URL, WORD } from "./token-kinds.ts";

/** Reads tokens into reusable typed arrays; the featurizer reads them back after `tokenize`. */
export class Tokenizer {
  private readonly wordSeed: number;
  private readonly hostSeed: number;
  private readonly numberHashes: Uint32Array;
  private readonly codeHash: number;
  private readonly emailHash: number;
  /** MARK tokens "?", "??", "???", "!", "!!", "!!!" (the fast path's trailing marks). */
  private readonly markHashes: Uint32Array;
  private readonly stream = new Murmur3Stream();
  private readonly maxTokens: number;

  // Scratch, reused across calls and grown on demand; read by the featurizer after tokenize.
  tokenHashes = new Uint32Array(256);
  tokenKinds = new Uint8Array(256);
  tokenCharStart = new Int32Array(256);
  tokenCharEnd = new Int32Array(256);
  wordChars: Uint16Array = new Uint16Array(2048);
  tokenNames: string[] = [];
  tokenTotal = 0;
  private wordCharTotal = 0;
  private withNames = false;
  /** Whether readWord must keep the word's characters (for character n-grams or names). */
  private keepWordChars = false;

  /** Letters of scripts without spaces become one token each (featurizer setting unspacedScripts). */
  private readonly splitUnspaced: boolean;
  /** The evasion folding rules of normalization 2 and later (leetspeak, padding, runs, spaced letters). */
  private readonly fold: boolean;
  /**
   * Normalization 3's revisions of those rules (evasion-rules.ts): every run of one letter reads
   * as one letter ("free" → "fre", "freeeee" → "fre"), except in scripts written without spaces;
   * a leetspeak reading drops the ". , :" that joined two digits ("a3.0a" → "aeoa"); a run of
   * spaced letters whose gap changes starts again at the letter before the change.
   */
  private readonly foldRevised: boolean;

  /** Names mode only: where each token lies in the text read (for the original span in explanations). */
  tokenTextStart: number[] = [];
  tokenTextEnd: number[] = [];
  /**
   * Features that are not tokens (no word pairs, no character n-grams): the one-run form of a
   * word whose letter runs were shortened ("freeeee" → token "fre", extra "free").
   */
  extraHashes: number[] = [];
  extraNames: string[] = [];
  extraTextStart: number[] = [];
  extraTextEnd: number[] = [];
  extraTotal = 0;

  // The text being read, and its open run of single letters (see addToken).
  private text = "";
  private readonly singles: SpacedLetterRun;

  constructor(seeds: FeatureSeeds, maxTokens: number, splitUnspaced = false, normalization = 1) {
    this.maxTokens = maxTokens;
    this.splitUnspaced = splitUnspaced;
    this.fold = normalization >= 2;
    this.foldRevised = normalization >= 3;
    this.wordSeed = seeds.word;
    this.hostSeed = seeds.host;
    this.numberHashes = Uint32Array.from(NUMBER_NAMES, (name) => murmur3String(name, seeds.shape));
    this.codeHash = murmur3String("[code]", seeds.shape);
    this.emailHash = murmur3String("[email]", seeds.shape);
    this.markHashes = Uint32Array.from(["?", "??", "???", "!", "!!", "!!!"], (mark) => murmur3String(mark, this.wordSeed));
    this.singles = new SpacedLetterRun(this, this.wordSeed, this.foldRevised);
  }

  /** Set when a token beyond maxTokens was found: the text was cut (and reading stopped). */
  hasMoreText = false;

  /** Reads the tokens of normalized `text`; names are kept only when `withNames`. */
  tokenize(text: string, withNames: boolean, keepWordChars: boolean): void {
    this.withNames = withNames;
    this.keepWordChars = keepWordChars;
    this.tokenNames.length = 0;
    this.tokenTotal = 0;
    this.wordCharTotal = 0;
    this.hasMoreText = false;
    this.extraTotal = 0;
    this.text = text;
    this.singles.count = 0;
    const length = text.length;
    const plainChunks = this.plainChunks;
    let i = 0;
    while (i < length && !this.hasMoreText) {
      if (plainChunks) {
        i = this.readPlainChunks(text, i, length);
        if (i >= length) break;
      }
      const code = text.charCodeAt(i);
      if (code < 0x80 ? code <= 0x20 || code === 0x7f : classOf(code) === SPACE) {
        i++;
        continue;
      }
      i = this.readChunk(text, i, length);
    }
    if (this.singles.count > 0) this.singles.join(this.withNames);
    this.text = "";
  }

  private addExtra(hash: number, name: string, textStart: number, textEnd: number): void {
    const index = this.extraTotal++;
    this.extraHashes[index] = hash;
    if (this.withNames) {
      this.extraNames[index] = name;
      this.extraTextStart[index] = textStart;
      this.extraTextEnd[index] = textEnd;
    }
  }

  /** Off only in tests, to check that the fast path reads exactly what readChunk reads. */
  plainChunks = true;

  /**
   * Fast path for the most common chunks: one ASCII word (letters and digits, with apostrophes
   * between letters, as in "can't"), then at most one of , . ; : or a run of ? or !, then
   * whitespace or the end of the text. Reads such chunks one after another, with the ASCII
   * whitespace between them, from `from`; returns where it stopped: the end of the text, or
   * the start of a chunk it left unread for readChunk (anything else, a URL-like start, the
   * token limit) or of non-ASCII whitespace. One call reads a run of plain chunks (a call per
   * chunk measured 1 µs of 15 for a 300-token text). It yields exactly the tokens readChunk
   * would (test/runtime/featurizer/featurizer-fast-path.test.ts).
   */
  private readPlainChunks(text: string, from: number, length: number): number {
    // Locals instead of fields: they do not change while a text is read.
    const wordSeed = this.wordSeed | 0;
    const fold = this.fold; // tested first, so normalization 1 pays nothing for the folding checks
    const foldRevised = this.foldRevised;
    const keepWordChars = this.keepWordChars;
    const withNames = this.withNames;
    const maxTokens = this.maxTokens;
    let start = from;
    while (start < length) {
      const head = text.charCodeAt(start);
      if (head <= 0x20 || head === 0x7f) {
        start++;
        continue;
      }
      if (head >= 0x80) return start;
      const first = head | 0x20; // lower-cases ASCII letters
      if ((first === 0x68 || first === 0x77) && (text.charCodeAt(start + 1) | 0x20) === (first === 0x68 ? 0x74 : 0x77)) return start; // "ht…", "ww…": maybe a URL
      let h = wordSeed;
      let pending = 0;
      let digits = 0;
      let apostrophes = 0;
      let previous = 0; // the last byte hashed
      let beforePrevious = 0;
      let bytes = 0; // bytes hashed: under normalization 3 a letter repeating the one before is not
      let i = start;
      while (i < length) {
        const code = text.charCodeAt(i);
        let byte = code < 0x80 ? ASCII_WORD_BYTES[code] : 0;
        if (byte === 0) {
          if (code !== 0x27 || previous < 0x61 || i + 1 >= length) break;
          // An apostrophe joins two letters; a non-ASCII next character is left to readChunk.
          const next = text.charCodeAt(i + 1);
          if (next >= 0x80) return start;
          if (ASCII_WORD_BYTES[next] < 0x61) break;
          byte = 0x27;
          apostrophes++;
        } else if (byte <= 0x39) {
          digits++;
        } else if (fold && byte === previous) {
          // A letter repeating the one before ("free", "freeee"): normalization 3 reads a run
          // of one letter as one letter, here as in readWord; under normalization 2 a run of
          // three or more is the folding reader's to bound.
          if (foldRevised) {
            i++;
            continue;
          }
          if (byte === beforePrevious) return start;
        }
        pending |= byte << ((bytes & 3) << 3);
        if ((++bytes & 3) === 0) {
          h = mixBlock(h, pending);
          pending = 0;
        }
        beforePrevious = previous;
        previous = byte;
        i++;
      }
      if (bytes === 0) return start;
      // Letters mixed with digits ("fr33"): the folding reader decides whether they are leetspeak.
      if (fold && digits > 0 && digits + apostrophes < bytes) return start;
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
        if (!(next <= 0x20 || next === 0x7f)) return start;
      }
      if (this.tokenTotal + (markCode === 0 ? 1 : 2) > maxTokens) return start;
      const charStart = this.wordCharTotal;
      if (keepWordChars) {
        while (this.wordChars.length < charStart + bytes) this.growWordChars();
        let c = charStart;
        for (let k = start; k < i; k++) {
          const code = text.charCodeAt(k);
          const byte = code === 0x27 ? 0x27 : ASCII_WORD_BYTES[code];
          if (foldRevised && c > charStart && byte > 0x39 && byte === this.wordChars[c - 1]) continue; // the letter run read as one, as hashed
          this.wordChars[c++] = byte;
        }
        this.wordCharTotal = charStart + bytes;
      }
      if (digits + apostrophes === bytes) {
        const bucket = Math.min(digits, 5) - 1;
        this.addToken(NUMBER, this.numberHashes[bucket], -1, -1, NUMBER_NAMES[bucket], start, i);
      } else if (digits >= 3) {
        this.addToken(CODE, this.codeHash, -1, -1, "[code]", start, i);
      } else {
        const name = withNames ? charCodesToString(this.wordChars, charStart, charStart + bytes) : "";
        const hash = finish((bytes & 3) === 0 ? h : mixTail(h, pending), bytes);
        this.addToken(WORD, hash, charStart, charStart + bytes, name, start, i);
      }
      if (markCode !== 0) {
        const hash = this.markHashes[(markCode === 0x3f ? 0 : 3) + markRepeats - 1];
        this.addToken(MARK, hash, -1, -1, withNames ? String.fromCharCode(markCode).repeat(markRepeats) : "", i, end);
      }
      start = end;
    }
    return start;
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
    const extrasBefore = this.extraTotal;
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
        this.extraTotal = Math.min(this.extraTotal, extrasBefore);
        this.singles.takeBack(tokensBefore);
        this.addToken(EMAIL, this.emailHash, -1, -1, "[email]", coreStart, coreEnd);
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
    this.addToken(URL, stream.digest(), -1, -1, name, hostStart, hostEnd);
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
      } else if (this.fold && (code === 0x24 || code === 0x20ac) && i + 1 < end && classOf(text.charCodeAt(i + 1)) === LETTER) {
        i = this.readWord(text, i, end); // "$ex", "€asy": a symbol standing for a letter
      } else if (cls === KEPT_PUNCTUATION) {
        let runEnd = i + 1;
        while (runEnd < end && text.charCodeAt(runEnd) === code) runEnd++;
        const repeats = Math.min(runEnd - i, 3);
        stream.reset(this.wordSeed);
        for (let r = 0; r < repeats; r++) stream.pushCodePoint(code);
        this.addToken(MARK, stream.digest(), -1, -1, this.withNames ? String.fromCharCode(code).repeat(repeats) : "", i, runEnd);
        i = runEnd;
      } else if (cls === EMOJI) {
        stream.reset(this.wordSeed);
        stream.pushCodePoint(code);
        this.addToken(MARK, stream.digest(), -1, -1, this.withNames ? String.fromCharCode(code) : "", i, i + 1);
        i++;
      } else if (cls === HIGH_SURROGATE && i + 1 < end) {
        const low = text.charCodeAt(i + 1);
        if (low >= 0xdc00 && low < 0xe000) {
          const codePoint = 0x10000 + ((code - 0xd800) << 10) + (low - 0xdc00);
          if (classOfAstral(codePoint) === EMOJI) {
            stream.reset(this.wordSeed);
            stream.pushCodePoint(codePoint);
            this.addToken(MARK, stream.digest(), -1, -1, this.withNames ? String.fromCodePoint(codePoint) : "", i, i + 2);
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

  /**
   * Reads one word/number/code run starting at `start`; returns where it ended. Under the
   * evasion folding rules (normalization 2; see evasion-rules.ts) it also reads symbols and
   * digits standing for letters, drops padding inside a word and bounds runs of one letter;
   * those rewrite the word's characters, which are therefore always kept here (and dropped
   * again when nothing else needs them), and then hash it again.
   */
  private readWord(text: string, start: number, end: number): number {
    // Locals instead of fields in this loop: it runs once per character of every text.
    let chars = this.wordChars;
    let total = this.wordCharTotal;
    const charStart = total;
    const fold = this.fold;
    const foldRevised = this.foldRevised;
    let letters = 0;
    let digits = 0;
    let nonLeetDigits = 0;
    let leadingDigits = 0;
    let digitThenLetter = false;
    let longRun = false;
    let runLength = 0;
    let previousKept = -1;
    let i = start;
    let previousClass = -1;
    const splitUnspaced = this.splitUnspaced;
    let single = false;
    // MurmurHash3 of the word's UTF-8 bytes, computed as the characters are read.
    let h = this.wordSeed | 0;
    let pending = 0;
    let bytes = 0;
    while (i < end) {
      const code = text.charCodeAt(i);
      let cls = classOf(code);
      let kept: number;
      if (cls === LETTER) {
        if (splitUnspaced && code >= 0x0e00 && isUnspacedLetter(code)) {
          if (letters + digits > 0) break; // the word read so far ends before it
          single = true; // this letter is a token of its own
        }
        kept = code >= 0x41 && code <= 0x5a ? code + 32 : code;
        letters++;
        if (digits > 0) digitThenLetter = true;
      } else if (cls === DIGIT) {
        kept = code;
        digits++;
        if (letters === 0) leadingDigits++;
        if (leetLetterOfDigit(code) === 0) nonLeetDigits++;
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
        if (!fold) break;
        const nextClass = i + 1 < end ? classOf(text.charCodeAt(i + 1)) : -1;
        const letter = symbolLetter(code, previousClass, nextClass);
        if (letter === 0) {
          const after = previousClass === LETTER || previousClass === DIGIT ? paddingEnd(text, i, end) : i;
          const afterClass = after > i && after < end ? classOf(text.charCodeAt(after)) : -1;
          if (afterClass !== LETTER && !(afterClass === DIGIT && previousClass === LETTER)) break;
          i = after; // "fr*ee": padding inside a word is dropped
          continue;
        }
        if (code === 0x40 && this.atSign < 0) this.atSign = i; // still looked at as an e-mail address
        kept = letter;
        cls = LETTER;
        letters++;
      }
      if (foldRevised && kept === previousKept && cls === LETTER && !(kept >= 0x0e00 && isUnspacedLetter(kept))) {
        letters--; // normalization 3: a run of one letter reads as one letter
        i++;
        continue;
      }
      if (total === chars.length) chars = this.growWordChars();
      chars[total++] = kept;
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
      if (kept !== previousKept) {
        runLength = 1;
        previousKept = kept;
      } else if (++runLength >= 3 && cls === LETTER) {
        longRun = true;
      }
      previousClass = cls;
      i++;
      if (single) break;
    }
    const keep = this.keepWordChars;
    // Digits stand for letters ("m0ney", "h4x0r", "fr33") only under evasion-rules.ts's conditions.
    const leet = fold && digits > 0 && nonLeetDigits === 0 && (digits < letters || (digits === letters && digits < 3)) &&
      (leadingDigits === 0 || (leadingDigits === 1 && letters >= 3)) && (digitThenLetter || endsInRepeatedDigit(chars, charStart, total));
    if (letters === 0) {
      const bucket = Math.min(digits, 5) - 1;
      this.addToken(NUMBER, this.numberHashes[bucket], -1, -1, NUMBER_NAMES[bucket], start, i);
    } else if (digits >= 3 && !leet) {
      this.addToken(CODE, this.codeHash, -1, -1, "[code]", start, i);
    } else {
      let hash = finish((bytes & 3) === 0 ? h : mixTail(h, pending), bytes);
      if (leet || (longRun && fold)) {
        if (leet) {
          for (let c = charStart; c < total; c++) {
            const letter = leetLetterOfDigit(chars[c]);
            if (letter !== 0) chars[c] = letter;
          }
          if (foldRevised) total = collapseLeetReading(chars, charStart, total);
        }
        const capped = capRuns(chars, charStart, total);
        const doubled = capped.doubled;
        if (doubled !== null) this.addExtra(hashCodes(doubled, 0, doubled.length, this.wordSeed), this.withNames ? charCodesToString(doubled, 0, doubled.length) : "", start, i);
        total = capped.end;
        hash = hashCodes(chars, charStart, total, this.wordSeed);
      }
      const name = this.withNames ? charCodesToString(chars, charStart, total) : "";
      this.addToken(WORD, hash, charStart, total, name, start, i);
    }
    this.wordCharTotal = keep ? total : charStart;
    return i;
  }

  private growWordChars(): Uint16Array {
    const grown = new Uint16Array(this.wordChars.length * 2);
    grown.set(this.wordChars);
    this.wordChars = grown;
    return grown;
  }

  /**
   * Appends one token. Under the folding rules, a run of three or more single letters each one
   * separator apart, the same separator each time ("f r e e", "f.r.e.e", "f-r-e-e"), becomes
   * one word: the run is held open while it grows and joined when something else follows
   * (spaced-letter-runs.ts).
   */
  private addToken(kind: number, hash: number, charStart: number, charEnd: number, name: string, textStart: number, textEnd: number): void {
    if (this.fold) {
      if (kind === WORD && textEnd - textStart === 1) {
        this.singles.extend(this.text, textStart, this.withNames);
      } else if (this.singles.count > 0) {
        this.singles.join(this.withNames);
      }
    }
    if (this.tokenTotal >= this.maxTokens) {
      this.hasMoreText = true; // one token past the limit: the text is cut here
      return;
    }
    const index = this.tokenTotal;
    if (this.withNames) {
      this.tokenTextStart[index] = textStart;
      this.tokenTextEnd[index] = textEnd;
    }
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
}
