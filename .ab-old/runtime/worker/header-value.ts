// Values for the X-Sluice-* headers a forwarded message gains. Headers may only hold
// printable ASCII on one line, and the Headers class throws on characters above U+00FF,
// which would lose the message. Labels and reasons come from the model file, so any text
// can appear: printable ASCII passes as it is; anything else becomes RFC 2047 "B"
// encoded words (UTF-8, base64), which mail clients decode in unstructured fields.

// RFC 2047 §2: an encoded word is at most 75 characters. "=?UTF-8?B?" + "?=" take 12, so
// the base64 part may be 63 characters; 45 bytes encode to 60 (RFC 4648 §4: 4 per 3 bytes).
const BYTES_PER_WORD = 45;
const MAX_CHARACTERS = 300;
const utf8 = new TextEncoder();

/**
 * One-line header value for `text`: printable ASCII as is, else RFC 2047 encoded words.
 * Line breaks and tabs become spaces; the text is cut at 300 characters.
 * @example headerValue("billing") // "billing"
 * @example headerValue("Rückgabe") // "=?UTF-8?B?UsO8Y2tnYWJl?="
 */
export function headerValue(text: string): string {
  const oneLine = [...text.replace(/[\r\n\t]+/g, " ")].slice(0, MAX_CHARACTERS).join("");
  if (/^[\x20-\x7e]*$/.test(oneLine)) return oneLine;
  const words: string[] = [];
  let pending: number[] = [];
  // Split between characters, never inside one: each word must decode to whole UTF-8 (RFC 2047 §5 (3)).
  for (const character of oneLine) {
    const bytes = utf8.encode(character);
    if (pending.length + bytes.length > BYTES_PER_WORD) {
      words.push(encodedWord(pending));
      pending = [];
    }
    for (let i = 0; i < bytes.length; i++) pending.push(bytes[i]);
  }
  if (pending.length > 0) words.push(encodedWord(pending));
  // Whitespace between adjacent encoded words is not displayed (RFC 2047 §6.2).
  return words.join(" ");
}

function encodedWord(bytes: number[]): string {
  return `=?UTF-8?B?${btoa(String.fromCharCode(...bytes))}?=`;
}
