// What each UTF-16 code unit means to the tokenizer. ASCII is filled in at module load;
// every other code unit is classified on first sight with Unicode property regexes and
// cached, so the hot path is one typed-array read per character.

/** Whitespace and control characters: end a chunk (URLs and e-mail addresses never span one). */
export const SPACE = 0;
/** Punctuation that separates tokens but means nothing on its own. */
export const SEPARATOR = 1;
/** Letters and combining marks. */
export const LETTER = 2;
/** Decimal digits. */
export const DIGIT = 3;
/** Punctuation that carries signal and becomes a token: ! ? and currency signs. */
export const KEPT_PUNCTUATION = 4;
/** Zero-width and format characters (U+200B, U+200D, U+FEFF, variation selectors): removed. */
export const DROPPED = 5;
/** Apostrophes: kept inside a word ("don't"), all hashed as U+0027. */
export const APOSTROPHE = 6;
/** . , : — kept only between two digits ("42.50", "10:30"). */
export const DIGIT_JOINER = 7;
/** Pictographic symbols: each one is a token of its own. */
export const EMOJI = 8;
/** First half of a surrogate pair: the code point decides. */
export const HIGH_SURROGATE = 9;

const UNKNOWN = 255;
const classes = new Uint8Array(65536).fill(UNKNOWN);

for (let code = 0; code < 128; code++) classes[code] = classifyAscii(code);

function classifyAscii(code: number): number {
  if (code <= 0x20 || code === 0x7f) return SPACE;
  if ((code >= 0x61 && code <= 0x7a) || (code >= 0x41 && code <= 0x5a)) return LETTER;
  if (code >= 0x30 && code <= 0x39) return DIGIT;
  if (code === 0x21 || code === 0x3f || code === 0x24 || code === 0x25) return KEPT_PUNCTUATION; // ! ? $ %
  if (code === 0x27) return APOSTROPHE;
  if (code === 0x2e || code === 0x2c || code === 0x3a) return DIGIT_JOINER;
  return SEPARATOR;
}

const WHITE_SPACE = /^[\p{White_Space}\p{Cc}]$/u;
const FORMAT = /^[\p{Cf}\u{FE00}-\u{FE0F}\u{20E3}]$/u;
const LETTER_OR_MARK = /^[\p{L}\p{M}]$/u;
const DECIMAL_DIGIT = /^\p{Nd}$/u;
const APOSTROPHES = /^[\u2018\u2019\u02bc]$/u;
const SIGNAL_PUNCTUATION = /^[\p{Sc}\u00a1\u00bf]$/u;
const PICTOGRAPHIC = /^\p{Extended_Pictographic}$/u;

function classifyBmp(code: number): number {
  if (code >= 0xd800 && code < 0xdc00) return HIGH_SURROGATE;
  if (code >= 0xdc00 && code < 0xe000) return SEPARATOR; // a lone low surrogate
  const char = String.fromCharCode(code);
  if (WHITE_SPACE.test(char)) return SPACE;
  if (FORMAT.test(char)) return DROPPED;
  // Before letters: U+02BC (modifier letter apostrophe) is a letter to Unicode, an apostrophe to readers.
  if (APOSTROPHES.test(char)) return APOSTROPHE;
  if (LETTER_OR_MARK.test(char)) return LETTER;
  if (DECIMAL_DIGIT.test(char)) return DIGIT;
  if (SIGNAL_PUNCTUATION.test(char)) return KEPT_PUNCTUATION;
  if (PICTOGRAPHIC.test(char)) return EMOJI;
  return SEPARATOR;
}

/** Class of one UTF-16 code unit (see the constants above). */
export function classOf(code: number): number {
  const cached = classes[code];
  if (cached !== UNKNOWN) return cached;
  const computed = classifyBmp(code);
  classes[code] = computed;
  return computed;
}

const SKIN_TONE_OR_TAG = /^[\u{1F3FB}-\u{1F3FF}\u{E0020}-\u{E007F}]$/u;
const astralCache = new Map<number, number>();

/** Class of a code point above U+FFFF: emoji, dropped (skin tones, tags) or separator. */
export function classOfAstral(codePoint: number): number {
  const cached = astralCache.get(codePoint);
  if (cached !== undefined) return cached;
  const char = String.fromCodePoint(codePoint);
  let result = SEPARATOR;
  if (SKIN_TONE_OR_TAG.test(char)) result = DROPPED;
  else if (PICTOGRAPHIC.test(char) || (codePoint >= 0x1f1e6 && codePoint <= 0x1f1ff)) result = EMOJI;
  if (astralCache.size < 4096) astralCache.set(codePoint, result);
  return result;
}

// Scripts written without spaces between words (Chinese, Japanese kana, Thai, Lao, Khmer,
// Myanmar): a whole sentence would be one "word". With `unspacedScripts` on, each of their
// letters is a token of its own, so word pairs become character pairs (the usual treatment of
// such text when no word segmenter is at hand; common practice, no source).
const UNSPACED = /^[\p{Script=Han}\p{Script=Hiragana}\p{Script=Katakana}\p{Script=Thai}\p{Script=Lao}\p{Script=Khmer}\p{Script=Myanmar}]$/u;
const unspaced = new Uint8Array(65536).fill(UNKNOWN);
for (let code = 0; code < 0x0e00; code++) unspaced[code] = 0; // nothing below Thai (U+0E00) is unspaced

/** Whether a letter (class LETTER) belongs to a script written without spaces. */
export function isUnspacedLetter(code: number): boolean {
  const cached = unspaced[code];
  if (cached !== UNKNOWN) return cached === 1;
  const computed = UNSPACED.test(String.fromCharCode(code)) ? 1 : 0;
  unspaced[code] = computed;
  return computed === 1;
}
