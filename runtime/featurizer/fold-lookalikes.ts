// Normalization version 2's pass over the NFKC form of a non-ASCII text: lookalike letters
// folded to their UTS #39 prototype, word by word, and the evidence of an evasion attempt
// noted (a word mixing scripts, an invisible or bidirectional control character).
//
// A word (a run of letters, marks, digits and format characters) is folded only when every
// letter in it is Latin, a mark, or a lookalike with a prototype: "frее" (Cyrillic е) and
// "РАҮРАL" become "free" and "paypal", while a Russian or Greek word, whose other letters
// have no Latin prototype, keeps its own letters ("привет" is not turned into "пpивeт").
// This is the UTS #39 skeleton restricted to the table's mappings, applied where a word could
// be read as Latin; the standard defines the skeleton on identifiers, not on running text.

import { DIGIT, DROPPED, LETTER, classOf } from "./char-classes.ts";
import { confusablePrototype } from "./confusables.ts";
import { ALPHABETS, LATIN, isMixedScript, scriptGroupOf } from "./script-groups.ts";

/** What the fold noticed about the text (reset by each call). */
export interface FoldNotes {
  /** A word mixed scripts (e.g. Latin with Cyrillic). */
  mixedScript: boolean;
  /** A bidirectional control anywhere, or a format character (zero-width space, joiner, soft hyphen…) inside a word of Latin, Greek or Cyrillic letters. */
  hiddenChars: boolean;
  /** The first such words, as written after NFKC (for explanations). */
  mixedWord: string;
  hiddenWord: string;
}

function createFoldNotes(): FoldNotes {
  return { mixedScript: false, hiddenChars: false, mixedWord: "", hiddenWord: "" };
}


const NEXT_NON_ASCII = /[^\x00-\x7f]/g;

function isBidiControl(code: number): boolean {
  return (code >= 0x202a && code <= 0x202e) || (code >= 0x2066 && code <= 0x2069);
}

/**
 * Folds the lookalikes of NFKC texts, one text per call; reused, so a call allocates only
 * when a word is folded. Not reentrant (one per featurizer).
 */
export class LookalikeFolder {
  readonly notes: FoldNotes = createFoldNotes();
  private text = "";
  private pieces: string[] = [];
  private copied = 0;
  private wordStart = -1;
  private mask = 0;
  private hasLookalike = false;
  private foldable = true;
  private hiddenInWord = false;

  /**
   * `text` (already NFKC) with lookalikes folded in the words that can be read as Latin;
   * `notes` records mixed scripts and hidden characters.
   * @example new LookalikeFolder().fold("frее") // "free", and notes.mixedScript is true
   */
  fold(text: string): string {
    const notes = this.notes;
    notes.mixedScript = false;
    notes.hiddenChars = false;
    notes.mixedWord = "";
    notes.hiddenWord = "";
    this.text = text;
    this.pieces.length = 0;
    this.copied = 0;
    const length = text.length;
    // Only words holding a non-ASCII code unit can fold, mix scripts or hide characters: skip
    // to such a unit, step back to its word's start, and read that word.
    let scanned = 0;
    let i = 0;
    while (i < length) {
      NEXT_NON_ASCII.lastIndex = i;
      if (!NEXT_NON_ASCII.test(text)) break; // a native scan: far quicker than a loop over char codes
      i = NEXT_NON_ASCII.lastIndex - 1;
      const code = text.charCodeAt(i);
      if (unitClass(text, i) < 0) {
        if (isBidiControl(code)) notes.hiddenChars = true;
        i++;
        continue;
      }
      let start = i;
      while (start > scanned && unitClass(text, start - 1) >= 0) start--;
      i = scanned = this.readWord(start);
    }
    if (this.pieces.length === 0) return text;
    this.pieces.push(text.slice(this.copied));
    // NFKC again: a prototype may compose with a mark that followed the lookalike ("ꓑ́" → "ṕ").
    const folded = this.pieces.join("").normalize("NFKC");
    this.pieces.length = 0;
    this.text = "";
    return folded;
  }

  /** Reads the word that starts at `start` (format characters before its first letter are not part of it); returns its end. */
  private readWord(start: number): number {
    const text = this.text;
    const notes = this.notes;
    this.wordStart = -1;
    let i = start;
    for (;;) {
      const cls = unitClass(text, i);
      if (cls < 0) break;
      const code = text.charCodeAt(i);
      if (cls === DROPPED) {
        if (isBidiControl(code)) notes.hiddenChars = true;
        if (this.wordStart >= 0) this.hiddenInWord = true;
      } else {
        if (this.wordStart < 0) this.startWord(i);
        if (code < 0x80) {
          if (code >= 0x41) this.mask |= LATIN;
        } else {
          const group = cls === LETTER ? scriptGroupOf(code) : 0;
          if (confusablePrototype(code) !== "") this.hasLookalike = true;
          else if (cls === DIGIT || (group !== 0 && group !== LATIN)) this.foldable = false;
          this.mask |= group;
        }
      }
      i++;
    }
    if (this.wordStart >= 0) this.endWord(i);
    return i;
  }

  private startWord(at: number): void {
    this.wordStart = at;
    this.mask = 0;
    this.hasLookalike = false;
    this.foldable = true;
    this.hiddenInWord = false;
  }

  private endWord(end: number): void {
    const { text, notes, wordStart } = this;
    if (isMixedScript(this.mask) && !notes.mixedScript) {
      notes.mixedScript = true;
      notes.mixedWord = text.slice(wordStart, end);
    }
    // A format character inside a word written only in alphabets (ZWJ and ZWNJ belong inside Indic and Persian words).
    if (this.hiddenInWord && (this.mask & ~ALPHABETS) === 0 && this.mask !== 0) {
      notes.hiddenChars = true;
      if (notes.hiddenWord === "") notes.hiddenWord = text.slice(wordStart, end);
    }
    if (!this.hasLookalike || !this.foldable) return;
    const pieces = this.pieces;
    pieces.push(text.slice(this.copied, wordStart));
    for (let i = wordStart; i < end; i++) {
      const code = text.charCodeAt(i);
      const prototype = code < 0x80 ? "" : confusablePrototype(code);
      pieces.push(prototype === "" ? text[i] : prototype);
    }
    this.copied = end;
  }
}

/**
 * What a code unit is to a word: LETTER, DIGIT or DROPPED (a format character), or -1 for
 * anything that ends one (surrogates too: the tokenizer reads no letters above U+FFFF).
 */
function unitClass(text: string, at: number): number {
  if (at >= text.length) return -1;
  const code = text.charCodeAt(at);
  if (code < 0x80) {
    const lower = code | 0x20;
    return lower >= 0x61 && lower <= 0x7a ? LETTER : code >= 0x30 && code <= 0x39 ? DIGIT : -1;
  }
  const cls = classOf(code);
  return cls === LETTER || cls === DIGIT || cls === DROPPED ? cls : -1;
}
