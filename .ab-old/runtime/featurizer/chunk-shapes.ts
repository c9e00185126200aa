// Shape tests on raw text: where a chunk ends, what trails it, and whether it is a URL or an
// e-mail address. Pure functions over char codes, read by the tokenizer.

import { DIGIT, LETTER, SPACE, classOf } from "./char-classes.ts";

export function lowerAscii(code: number): number {
  return code >= 0x41 && code <= 0x5a ? code + 32 : code;
}

export function isOpeningBracket(code: number): boolean {
  return code === 0x28 || code === 0x3c || code === 0x5b || code === 0x22 || code === 0x27; // ( < [ " '
}

/** End of the whitespace-free chunk that contains `from`. */
export function chunkEnd(text: string, from: number, length: number): number {
  let end = from;
  while (end < length) {
    const c = text.charCodeAt(end);
    if (c < 0x80 ? c <= 0x20 || c === 0x7f : classOf(c) === SPACE) break;
    end++;
  }
  return end;
}

/** `end` moved back over trailing punctuation (a URL or address ends before ". , ) …"). */
export function trimTrailingPunctuation(text: string, start: number, end: number): number {
  while (end > start && isTrailingPunctuation(text.charCodeAt(end - 1))) end--;
  return end;
}

export function isTrailingPunctuation(code: number): boolean {
  // . , ; : ! ? ) > ] " '
  return code === 0x2e || code === 0x2c || code === 0x3b || code === 0x3a || code === 0x21 || code === 0x3f ||
    code === 0x29 || code === 0x3e || code === 0x5d || code === 0x22 || code === 0x27;
}

export function startsWithAscii(text: string, at: number, prefix: string): boolean {
  if (at + prefix.length > text.length) return false;
  for (let i = 0; i < prefix.length; i++) {
    if (lowerAscii(text.charCodeAt(at + i)) !== prefix.charCodeAt(i)) return false;
  }
  return true;
}

/** Where the host starts when [start, end) is a URL ("http://", "https://" or "www."), else -1. */
export function urlHostOffset(text: string, start: number, end: number): number {
  const first = lowerAscii(text.charCodeAt(start));
  if (first !== 0x68 && first !== 0x77) return -1; // neither "h" nor "w"
  let hostStart = -1;
  if (startsWithAscii(text, start, "https://")) hostStart = start + 8;
  else if (startsWithAscii(text, start, "http://")) hostStart = start + 7;
  else if (startsWithAscii(text, start, "www.")) hostStart = start;
  if (hostStart < 0 || hostStart >= end) return -1;
  const hostClass = classOf(text.charCodeAt(hostStart));
  return hostClass === LETTER || hostClass === DIGIT ? hostStart : -1;
}

/** local@domain.tld with a plain local part and a domain whose last label has 2+ letters. */
export function isEmailAddress(text: string, start: number, at: number, end: number): boolean {
  for (let i = start; i < at; i++) {
    const c = text.charCodeAt(i);
    const cls = classOf(c);
    if (!(cls === LETTER || cls === DIGIT || c === 0x2e || c === 0x5f || c === 0x25 || c === 0x2b || c === 0x2d)) return false;
  }
  let lastDot = -1;
  for (let i = at + 1; i < end; i++) {
    const c = text.charCodeAt(i);
    const cls = classOf(c);
    if (c === 0x2e) lastDot = i;
    else if (!(cls === LETTER || cls === DIGIT || c === 0x2d)) return false;
  }
  if (lastDot <= at + 1 || end - lastDot - 1 < 2) return false;
  for (let i = lastDot + 1; i < end; i++) if (classOf(text.charCodeAt(i)) !== LETTER) return false;
  return true;
}
