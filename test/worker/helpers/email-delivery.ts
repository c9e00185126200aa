// Sends RFC 5322 messages to the Worker through Miniflare's local e-mail trigger
// (POST /cdn-cgi/handler/email?from=…&to=…) and reads back what the Worker did.
//
// What we observe, and why it is trustworthy: Miniflare's stand-in for message.forward()
// logs "Email handler forwarded message with\n  rcptTo: <address>\n  headers:\n    <name>: <value>"
// (INFO) and the trigger answers 200; an awaited message.setReject(reason) makes the trigger
// answer 400 "Worker rejected email with the following reason: <reason>" (miniflare
// 4.20260426.0, src/workers/core/email.ts, renderEmailHeaders). The log is captured through
// Miniflare's `log` option (worker-fixture.ts).

import type { RunningWorker } from "./worker-fixture.ts";

export const SENDER = "ines.varga@example.com";
export const RECIPIENT = "support@vellumcroft.example";

let messageNumber = 0;

/**
 * An RFC 5322 message: header fields (§3.6: Date, From, To, Message-ID, then `fields`), an
 * empty line, then the body, every line ending in CRLF (§2.1, §2.3). MIME fields follow
 * RFC 2045 §4-6. Miniflare's trigger requires the Message-ID.
 * @example rfc822Message(["Subject: Refund", "Content-Type: text/plain"], ["Please refund order #A12345"])
 */
export function rfc822Message(fields: string[], body: string[]): string {
  messageNumber++;
  const header = [
    "Date: Tue, 01 Dec 2026 09:30:00 +0000",
    `From: Ines Varga <${SENDER}>`,
    `To: ${RECIPIENT}`,
    `Message-ID: <test-${messageNumber}-${process.pid}@example.com>`,
    "MIME-Version: 1.0",
    ...fields,
  ];
  return [...header, "", ...body, ""].join("\r\n");
}

/** What the Worker did with one message. */
export interface Delivery {
  status: number;
  body: string;
  /** The forward's destination; null when nothing was forwarded. */
  forwardedTo: string | null;
  /** Headers the forward added, names lower-cased as Miniflare prints them. */
  headers: Record<string, string>;
}

/**
 * Sends a raw message through the local trigger and reads the forward (or refusal).
 * @example const delivery = await deliverEmail(worker, rfc822Message([...], [...])); delivery.forwardedTo
 */
export async function deliverEmail(worker: RunningWorker, raw: string): Promise<Delivery> {
  worker.log.clear();
  const response = await worker.fetch(`/cdn-cgi/handler/email?from=${encodeURIComponent(SENDER)}&to=${encodeURIComponent(RECIPIENT)}`, { method: "POST", body: raw });
  const body = await response.text();
  const forward = worker.log.entries.map((entry) => entry.message).find((text) => text.includes("Email handler forwarded message"));
  const headers: Record<string, string> = {};
  let forwardedTo: string | null = null;
  if (forward !== undefined) {
    forwardedTo = /rcptTo: (\S+)/.exec(forward)?.[1] ?? null;
    for (const match of forward.matchAll(/^\s+(x-[a-z-]+): (.*)$/gm)) headers[match[1]] = match[2];
  }
  return { status: response.status, body, forwardedTo, headers };
}
