// The evasion folding rule of normalization 2 that acts across tokens: a run of three or more
// single letters each one separator apart, the same separator each time ("f r e e",
// "f.r.e.e", "f-r-e-e"), becomes one word. The tokenizer (tokenizer.ts, addToken) holds the run
// open here while it grows and joins it when something else follows; joining rewrites the
// run's first token in the tokenizer's arrays and drops the others. The rest of the word-level
// rules are pure functions in evasion-rules.ts.

import { charCodesToString } from "./char-codes-to-string.ts";
import { lowerAscii } from "./chunk-shapes.ts";
import { hashCodes } from "./evasion-rules.ts";

/** The tokenizer's token arrays, which a joined run is written into. */
export interface TokenArrays {
  tokenHashes: Uint32Array;
  tokenCharEnd: Int32Array;
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

  constructor(
    private readonly tokens: TokenArrays,
    private readonly wordSeed: number,
  ) {}

  /** A single letter at `at` of `text` was read: it continues the open run, or starts a new one. */
  extend(text: string, at: number, withNames: boolean): void {
    const separator = at > 0 ? text.charCodeAt(at - 1) : -1;
    const continues = this.count > 0 && at === this.end + 1 && (this.count === 1 || separator === this.separator);
    if (!continues) {
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
    tokens.tokenHashes[first] = hashCodes(this.letters, 0, count, this.wordSeed);
    tokens.tokenCharEnd[first] = tokens.tokenCharEnd[last];
    if (withNames) {
      tokens.tokenNames[first] = charCodesToString(this.letters, 0, count);
      tokens.tokenTextEnd[first] = tokens.tokenTextEnd[last];
    }
    tokens.tokenTotal = first + 1;
  }

  /** The tokens from `tokenTotal` on were taken back (an e-mail address): so are their letters. */
  takeBack(tokenTotal: number): void {
    this.count = Math.max(0, Math.min(this.count, tokenTotal - this.first)); // stays 0 when none is open
  }
}
