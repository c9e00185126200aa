// Normalization: the text the tokenizer reads. Pure-ASCII text (most traffic) is never copied.
//
// Version 1: Unicode NFKC (fullwidth letters, ligatures and styled letters become plain ones),
// then lower case. Zero-width and control characters are removed by the tokenizer, which also
// lower-cases ASCII as it reads.
//
// Version 2 (evasion folding, the default of new models): version 1, with lookalike letters
// folded to their UTS #39 prototype between NFKC and lower case (fold-lookalikes.ts), and the
// tokenizer's folding rules on (leetspeak, padding, letter runs, spaced letters: evasion-rules.ts
// and tokenizer.ts).
//
// Version 3 (the default of new models since 2026-12-04): version 2 with three of the
// tokenizer's folding rules revised (evasion-rules.ts, spaced-letter-runs.ts): every run of one
// letter reads as one letter ("free", "freeeee" → "fre"), a leetspeak reading drops the ". , :"
// between its digits, and a run of spaced letters whose gap changes starts again at the letter
// before the change. A model records its version, so a version 1 or 2 model reads text exactly
// as it was trained to.
//
// toLowerCase stands in for full Unicode case folding: they differ for a handful of
// characters (final sigma, some Cherokee letters), an accepted gap recorded here.

import { LookalikeFolder, type FoldNotes } from "./fold-lookalikes.ts";

/** The newest rules, which new models record. Bumped whenever the rules (or the tokenizer's) change meaning. */
export const NORMALIZATION_VERSION = 3;

/** The versions this runtime reads text by. */
export const NORMALIZATION_VERSIONS: readonly number[] = [1, 2, 3];

const NON_ASCII = /[^\x00-\x7f]/;

/**
 * The text the tokenizer reads under version 1: unchanged when ASCII, else NFKC + lower case.
 * @example normalizeText("ＦＲＥＥ Café") // "free café"
 */
export function normalizeText(text: string): string {
  if (!NON_ASCII.test(text)) return text;
  return text.normalize("NFKC").toLowerCase();
}

const NO_NOTES: FoldNotes = Object.freeze({ mixedScript: false, hiddenChars: false, mixedWord: "", hiddenWord: "" });

/** The normalization of one version; version 2 keeps what its lookalike pass noticed in `notes`. */
export class TextNormalizer {
  private readonly folder: LookalikeFolder | null;
  /** What the last `normalize` call noticed (always clear under version 1 and for ASCII text). */
  notes: FoldNotes = NO_NOTES;

  constructor(version: number) {
    this.folder = version >= 2 ? new LookalikeFolder() : null;
  }

  normalize(text: string): string {
    const folder = this.folder;
    if (folder === null) return normalizeText(text);
    if (!NON_ASCII.test(text)) {
      this.notes = NO_NOTES;
      return text;
    }
    const folded = folder.fold(text.normalize("NFKC"));
    this.notes = folder.notes;
    return folded.toLowerCase();
  }

  /**
   * `normalize(text)` and, for each of its code units, the span of `text` it came from
   * (explanations only: this allocates). Each whitespace-free chunk is normalized on its own
   * (which adds up to the whole: no rule looks across whitespace); a chunk that kept its length
   * maps character by character, any other to its whole span.
   */
  normalizeWithOrigins(text: string): { text: string; origins: Origins } {
    const normalized = this.normalize(text);
    const notes = { ...this.notes };
    const lower = NON_ASCII.test(text); // then the whole text was lower-cased, ASCII chunks too
    const start: number[] = [];
    const end: number[] = [];
    let rebuilt = "";
    for (const match of text.matchAll(/\s+|\S+/gu)) {
      const chunk = match[0];
      const at = match.index as number;
      const piece = lower ? this.normalize(chunk).toLowerCase() : chunk;
      rebuilt += piece;
      const exact = piece.length === chunk.length;
      for (let p = 0; p < piece.length; p++) {
        start.push(exact ? at + p : at);
        end.push(exact ? at + p + 1 : at + chunk.length);
      }
    }
    this.notes = notes;
    if (rebuilt !== normalized) return { text: normalized, origins: { start: start.map(() => 0), end: start.map(() => text.length) } };
    return { text: normalized, origins: { start, end } };
  }
}

/** Where each code unit of a normalized text came from in the original text (explanations only). */
export interface Origins {
  start: number[];
  end: number[];
}
