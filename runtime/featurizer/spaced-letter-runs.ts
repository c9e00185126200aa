// The evasion folding rule of normalization 2 that acts across tokens: a run of three or more
// single letters each one separator apart, the same separator each time ("f r e e",
// "f.r.e.e", "f-r-e-e"), becomes one word. The tokenizer (tokenizer.ts, addToken) holds the run
// open here while it grows and joins it when something else follows; joining rewrites the
// run's first token in the tokenizer's arrays and drops the others. The rest of the word-level
// rules are pure functions in evasion-rules.ts.

import { isUnspacedLetter } from "./char-classes.ts";
import { charCodesToString } from "./char-codes-to-string.ts";
import { lowerAscii } from "./chunk-shapes.ts";
import { hashCodes } from "./evasion-rules.ts";

/** The tokenizer's token arrays, which a joined run is written into. */
export interface TokenArrays {
  tokenHashes: Uint32Array;
  tokenCharStart: Int32Array;
  tokenCharEnd: Int32Array;
  wordChars: Uint16Array;
  tokenNames: string[];
  tokenTextEnd: number[];
  tokenTotal: number;
}

/** The open run of single letters of one tokenize call. */
export class SpacedLetterRun {
  /** Letters in the open run (0: none open). */
  count = 0;
  /** Index of the run's first token. */
  private first = 0;
  /** Text offset just after the run's last letter. */
  private end = 0;
  /** The character between the run's first two letters, which every later gap must repeat. */
  private separator = -1;
  private letters = new Uint16Array(64);

  /**
   * @param revised normalization 3: a joined run reads each run of one letter as one letter, as
   * words do ("f r e e" → "fre", like "free"); and when two letters one gap apart break a run
   * because the gap differs ("e-m a i l"), the second one starts the next run ("e", "mail"),
   * rather than being left alone ("e", "m", "ail").
   */
  constructor(
    private readonly tokens: TokenArrays,
    private readonly wordSeed: number,
    private readonly revised = false,
  ) {}

  /** A single letter at `at` of `text` was read: it continues the open run, or starts a new one. */
  extend(text: string, at: number, withNames: boolean): void {
    const separator = at > 0 ? text.charCodeAt(at - 1) : -1;
    const adjacent = this.count > 0 && at === this.end + 1;
    const continues = adjacent && (this.count === 1 || separator === this.separator);
    if (this.revised && adjacent && !continues && this.count === 2) {
      // The run's second letter and this one make a run of their own, one `separator` apart.
      this.first = this.tokens.tokenTotal - 1;
      this.letters[0] = this.letters[1];
      this.count = 1;
      this.separator = separator;
    } else if (!continues) {
      this.join(withNames); // closes the open run, if any
      this.first = this.tokens.tokenTotal;
    } else if (this.count === 1) {
      this.separator = separator;
    }
    if (this.count === this.letters.length) {
      const grown = new Uint16Array(this.letters.length * 2);
      grown.set(this.letters);
      this.letters = grown;
    }
    this.letters[this.count++] = lowerAscii(text.charCodeAt(at));
    this.end = at + 1;
  }

  /** Closes the open run of single letters: three or more become one word. */
  join(withNames: boolean): void {
    const count = this.count;
    this.count = 0;
    const first = this.first;
    const tokens = this.tokens;
    if (count < 3 || first + count > tokens.tokenTotal) return; // the run's last letter may have been past the token limit
    const last = first + count - 1;
    let letterCount = count;
    if (this.revised) {
      letterCount = 1;
      for (let k = 1; k < count; k++) {
        const letter = this.letters[k];
        if (letter !== this.letters[letterCount - 1] || (letter >= 0x0e00 && isUnspacedLetter(letter))) this.letters[letterCount++] = letter;
      }
    }
    tokens.tokenHashes[first] = hashCodes(this.letters, 0, letterCount, this.wordSeed);
    tokens.tokenCharEnd[first] = tokens.tokenCharEnd[last];
    const charStart = tokens.tokenCharStart[first];
    if (letterCount < count && tokens.tokenCharEnd[last] - charStart === count) {
      // The word's characters, when kept (for character n-grams: then the letters lie one after
      // another), are its shortened letters, in the room its letters took.
      tokens.wordChars.set(this.letters.subarray(0, letterCount), charStart);
      tokens.tokenCharEnd[first] = charStart + letterCount;
    }
    if (withNames) {
      tokens.tokenNames[first] = charCodesToString(this.letters, 0, letterCount);
      tokens.tokenTextEnd[first] = tokens.tokenTextEnd[last];
    }
    tokens.tokenTotal = first + 1;
  }

  /** The tokens from `tokenTotal` on were taken back (an e-mail address): so are their letters. */
  takeBack(tokenTotal: number): void {
    this.count = Math.max(0, Math.min(this.count, tokenTotal - this.first)); // stays 0 when none is open
  }
}
