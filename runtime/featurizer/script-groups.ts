// The writing system of a letter, coarsely: enough to see a word that mixes scripts (UTS #39
// calls such a string mixed-script) and to tell the alphabets that never put invisible
// characters inside words from the scripts that need them (ZWJ and ZWNJ in Indic, Persian).
// Classified on first sight with Unicode property regexes and cached, like char-classes.ts.

export const LATIN = 1;
export const GREEK = 2;
export const CYRILLIC = 4;
/** Han, Hiragana, Katakana, Hangul and Bopomofo: UTS #39 lets them mix with each other and with Latin. */
export const CJK = 8;
/** Any other script's letters. */
export const OTHER = 16;
/** Scripts whose words never hold a zero-width character between two letters. */
export const ALPHABETS = LATIN | GREEK | CYRILLIC;

const UNKNOWN = 255;
const groups = new Uint8Array(65536).fill(UNKNOWN);
for (let code = 0; code < 128; code++) groups[code] = (code | 0x20) >= 0x61 && (code | 0x20) <= 0x7a ? LATIN : 0;

const LETTER = /^\p{L}$/u;
const LATIN_LETTER = /^\p{Script=Latin}$/u;
const GREEK_LETTER = /^[\p{Script=Greek}\p{Script=Coptic}]$/u;
const CYRILLIC_LETTER = /^\p{Script=Cyrillic}$/u;
const CJK_LETTER = /^[\p{Script=Han}\p{Script=Hiragana}\p{Script=Katakana}\p{Script=Hangul}\p{Script=Bopomofo}\u30FC]$/u;

function classify(char: string): number {
  if (!LETTER.test(char)) return 0; // marks, digits, punctuation: Common or Inherited, no script of their own
  if (LATIN_LETTER.test(char)) return LATIN;
  if (GREEK_LETTER.test(char)) return GREEK;
  if (CYRILLIC_LETTER.test(char)) return CYRILLIC;
  if (CJK_LETTER.test(char)) return CJK;
  return OTHER;
}

const astralGroups = new Map<number, number>();

/** The script group of a code point (0 for anything that is not a letter). */
export function scriptGroupOf(codePoint: number): number {
  if (codePoint < 65536) {
    const cached = groups[codePoint];
    if (cached !== UNKNOWN) return cached;
    const computed = classify(String.fromCharCode(codePoint));
    groups[codePoint] = computed;
    return computed;
  }
  const cached = astralGroups.get(codePoint);
  if (cached !== undefined) return cached;
  const computed = classify(String.fromCodePoint(codePoint));
  if (astralGroups.size < 4096) astralGroups.set(codePoint, computed);
  return computed;
}

/**
 * Whether one word's script groups mix: two or more groups, except Latin with CJK (which
 * UTS #39's "Highly Restrictive" level allows, as in Japanese "Tシャツ").
 */
export function isMixedScript(mask: number): boolean {
  return (mask & (mask - 1)) !== 0 && (mask & ~(LATIN | CJK)) !== 0;
}
