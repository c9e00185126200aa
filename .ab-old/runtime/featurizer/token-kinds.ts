// Token kinds and the byte tables shared by the tokenizer and the character n-grams.

export const WORD = 1;
export const NUMBER = 2;
export const CODE = 3;
export const URL = 4;
export const EMAIL = 5;
export const MARK = 6; // kept punctuation or emoji

// Character n-grams are framed by this byte at both ends of a word, so prefixes and
// suffixes differ from inner pieces. Control characters never survive tokenization,
// so 0x01 cannot collide with text.
export const WORD_EDGE = 0x01;
/** ASCII letters (lower-cased) and digits as the bytes a word hashes; 0 for every other code. */
export const ASCII_WORD_BYTES = Uint8Array.from({ length: 128 }, (_, code) => {
  if (code >= 0x41 && code <= 0x5a) return code + 32;
  return (code >= 0x61 && code <= 0x7a) || (code >= 0x30 && code <= 0x39) ? code : 0;
});
export const NUMBER_NAMES = ["[number:1]", "[number:2]", "[number:3]", "[number:4]", "[number:5+]"];
