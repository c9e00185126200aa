// The text of a parsed e-mail that the model reads: the subject, a blank line, then the
// plain-text body, or, when the message has only an HTML body, that HTML reduced to text.
// Attachments are never read.

import type { Email } from "postal-mime";

/**
 * Subject and body of a parsed message as one text ("" when both are empty).
 * @example emailText({ subject: "Refund", text: "Please refund order #A12345", ... }) // "Refund\n\nPlease refund order #A12345"
 */
export function emailText(email: Pick<Email, "subject" | "text" | "html">): string {
  const subject = (email.subject ?? "").trim();
  const body = (email.text !== undefined && email.text.trim() !== "" ? email.text : htmlToPlainText(email.html ?? "")).trim();
  return subject === "" ? body : body === "" ? subject : `${subject}\n\n${body}`;
}

// Named entities common in mail bodies; anything else numeric is decoded below.
const NAMED_ENTITIES: Record<string, string> = { amp: "&", lt: "<", gt: ">", quot: '"', apos: "'", nbsp: " " };

/**
 * HTML without scripts, styles, comments and tags; block ends become line breaks and the
 * common character references are decoded (HTML Living Standard §13.5, named and numeric
 * character references).
 * @example htmlToPlainText("<p>Hello&nbsp;<b>there</b></p>") // "Hello there"
 */
export function htmlToPlainText(html: string): string {
  return html
    .replace(/<!--[\s\S]*?-->/g, " ")
    .replace(/<(script|style|head|template)\b[\s\S]*?<\/\1\s*>/gi, " ")
    .replace(/<br\b[^>]*>/gi, "\n")
    .replace(/<\/(p|div|li|tr|h[1-6]|blockquote|table)\s*>/gi, "\n")
    // Inline elements do not separate words ("par<b>cel</b>" is one word); other tags do.
    .replace(/<\/?(a|b|i|u|em|strong|span|font|small|big|sub|sup|mark|code)\b[^>]*>/gi, "")
    .replace(/<[^>]*>/g, " ")
    .replace(/&(#x[0-9a-f]+|#[0-9]+|[a-z]+);/gi, (match, name: string) => decodeEntity(match, name))
    .replace(/[ \t\u00a0]+/g, " ")
    .replace(/ *\n */g, "\n")
    .replace(/\n{3,}/g, "\n\n")
    .trim();
}

function decodeEntity(match: string, name: string): string {
  if (name[0] !== "#") return NAMED_ENTITIES[name.toLowerCase()] ?? match;
  const code = name[1] === "x" || name[1] === "X" ? Number.parseInt(name.slice(2), 16) : Number.parseInt(name.slice(1), 10);
  return Number.isInteger(code) && code > 0 && code <= 0x10ffff && (code < 0xd800 || code > 0xdfff) ? String.fromCodePoint(code) : match;
}
