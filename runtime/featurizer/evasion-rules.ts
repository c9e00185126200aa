// The evasion folding rules of normalization 2 that act inside words, as small pure functions
// the tokenizer's word reader (tokenizer.ts, readWord) calls under normalization 2. Each rule is narrow on
// purpose, so ordinary words, numbers, prices, codes, URLs and e-mail addresses read as before:
// - digits stand for letters only in a word of more letters than digits (or at most two of each), all of whose digits have a letter
//   reading (0 o, 1 i, 3 e, 4 a, 5 s, 7 t, 8 b, 9 g; 2 and 6 have none that readers agree on),
//   where a digit is followed by a letter ("m0ney", "0ffer") or the word ends in a repeated digit
//   ("fr33"): "mp3", "win10", "covid19", "14th" and "10am" stay as written;
// - @ and ! stand for a and i only between two letters, $ for s before a letter, € for e beside one;
// - padding symbols (* _ ~ ^ ` | \ + = # · •) between two letters, or a letter and a digit, are dropped;
// - a run of three or more of one letter becomes one letter ("mooooney" → "money", "sooo" → "so"),
//   and the form with two ("freeeee" → "free") is emitted as an extra feature beside it: people
//   stretch the letter they sound, which is a single letter in most words and a double in some.
// Normalization 3 replaces that last rule: every run of one letter, two included, reads as one
// letter in every word (readWord; "free" and "freeeee" are both "fre"), since nothing in a
// stretched word tells which reading was meant, and the wrong one lost the word's pairs; letters
// of scripts written without spaces keep version 2's rule (a doubled sign is a word there). It
// also drops the ". , :" between two digits of a leetspeak reading (collapseLeetReading).
// Common practice, no source: the readings are the usual leetspeak ones.
import { LETTER, isUnspacedLetter } from "./char-classes.ts";
import { charCodesToString } from "./char-codes-to-string.ts";
import { Murmur3Stream } from "./murmur3.ts";

const LEET_DIGITS = "oi eas tbg"; // the letter each digit 0–9 stands for, " " for none

/** The letter a digit stands for in leetspeak, or 0. */
export function leetLetterOfDigit(code: number): number {
  if (code < 0x30 || code > 0x39) return 0;
  const letter = LEET_DIGITS.charCodeAt(code - 0x30);
  return letter === 0x20 ? 0 : letter;
}

/** The letter a symbol stands for between its neighbours (char classes, -1 for none), or 0. */
export function symbolLetter(code: number, previousClass: number, nextClass: number): number {
  if (code === 0x40) return previousClass === LETTER && nextClass === LETTER ? 0x61 : 0; // @ → a
  if (code === 0x21) return previousClass === LETTER && nextClass === LETTER ? 0x69 : 0; // ! → i
  if (code === 0x24) return nextClass === LETTER && (previousClass === LETTER || previousClass === -1) ? 0x73 : 0; // $ → s
  if (code === 0x20ac) return previousClass === LETTER || (previousClass === -1 && nextClass === LETTER) ? 0x65 : 0; // € → e
  return 0;
}

/** Whether `chars[start..end)` ends in two or more of one digit ("fr33"). */
export function endsInRepeatedDigit(chars: Uint16Array, start: number, end: number): boolean {
  const last = chars[end - 1];
  return end - start >= 2 && last >= 0x30 && last <= 0x39 && chars[end - 2] === last;
}

function isPadding(code: number): boolean {
  // * _ ~ ^ ` | \ + = # · •
  return code === 0x2a || code === 0x5f || code === 0x7e || code === 0x5e || code === 0x60 || code === 0x7c || code === 0x5c ||
    code === 0x2b || code === 0x3d || code === 0x23 || code === 0xb7 || code === 0x2022;
}

/** End of the run of padding symbols that starts at `from` (`from` itself when there is none). */
export function paddingEnd(text: string, from: number, end: number): number {
  let i = from;
  while (i < end && isPadding(text.charCodeAt(i))) i++;
  return i;
}

/**
 * Shortens runs of three or more of one letter in `chars[start..end)` to one, in place. Returns
 * the new end, and the word with those runs at two letters instead (null when there was no such run).
 */
export function capRuns(chars: Uint16Array, start: number, end: number): { end: number; doubled: Uint16Array | null } {
  let write = start;
  let longRun = false;
  const doubled: number[] = [];
  let read = start;
  while (read < end) {
    const code = chars[read];
    let runEnd = read + 1;
    if (!(code >= 0x30 && code <= 0x39)) while (runEnd < end && chars[runEnd] === code) runEnd++;
    const length = runEnd - read;
    if (length >= 3) longRun = true;
    for (let k = 0; k < (length >= 3 ? 1 : length); k++) chars[write++] = code;
    for (let k = 0; k < Math.min(length, 2); k++) doubled.push(code);
    read = runEnd;
  }
  return { end: write, doubled: longRun ? Uint16Array.from(doubled) : null };
}

/**
 * Normalization 3: a leetspeak reading in `chars[start..end)` (its digits already letters) read
 * as a word is: the ". , :" that joined two of its digits dropped ("a3.0a" → "aeoa", which reads
 * the same again), and each run of one letter shortened to one ("fr33" → "fre", as "free"
 * reads), but for letters of scripts written without spaces, as in readWord; a combining mark
 * after a digit read as a letter is composed with it first. Returns the new end.
 */
export function collapseLeetReading(chars: Uint16Array, start: number, end: number): number {
  // A digit read as a letter may carry a combining mark ("3\u0301" → "e\u0301"), which the
  // text's NFKC could not compose with a digit: compose it now, so a word read again reads the same.
  let nonAscii = false;
  for (let i = start; i < end && !nonAscii; i++) nonAscii = chars[i] >= 0x80;
  if (nonAscii) {
    const composed = charCodesToString(chars, start, end).normalize("NFKC");
    if (composed.length <= end - start) {
      for (let i = 0; i < composed.length; i++) chars[start + i] = composed.charCodeAt(i);
      end = start + composed.length;
    }
  }
  let write = start;
  for (let read = start; read < end; read++) {
    const code = chars[read];
    if (code === 0x2e || code === 0x2c || code === 0x3a) continue; // . , :
    if (write > start && chars[write - 1] === code && !(code >= 0x0e00 && isUnspacedLetter(code))) continue;
    chars[write++] = code;
  }
  return write;
}

const stream = new Murmur3Stream();

/** MurmurHash3 of the UTF-8 encoding of UTF-16 code units (word characters: no surrogates). */
export function hashCodes(chars: Uint16Array, start: number, end: number, seed: number): number {
  stream.reset(seed);
  for (let i = start; i < end; i++) stream.pushCodePoint(chars[i]);
  return stream.digest();
}

