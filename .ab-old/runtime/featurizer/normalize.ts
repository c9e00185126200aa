// Normalization, version 1: Unicode NFKC (fullwidth letters, ligatures and styled
// letters become plain ones), then lower case. Zero-width and control characters are
// removed by the tokenizer, which also lower-cases ASCII as it reads, so pure-ASCII
// text (most traffic) is never copied.
//
// toLowerCase stands in for full Unicode case folding: they differ for a handful of
// characters (final sigma, some Cherokee letters), an accepted gap recorded here.

/** Bumped whenever the rules below (or the tokenizer's) change meaning; stored in every model. */
export const NORMALIZATION_VERSION = 1;

const NON_ASCII = /[^\x00-\x7f]/;

/**
 * The text the tokenizer reads: unchanged when ASCII, else NFKC + lower case.
 * @example normalizeText("ＦＲＥＥ Café") // "free café"
 */
export function normalizeText(text: string): string {
  if (!NON_ASCII.test(text)) return text;
  return text.normalize("NFKC").toLowerCase();
}
