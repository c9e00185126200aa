// The Worker's e-mail handler in real workerd, fed hand-written RFC 5322 messages through
// Miniflare's local trigger (POST /cdn-cgi/handler/email?from=…&to=…).
//
// What we observe, and why it is trustworthy: Miniflare's stand-in for message.forward()
// writes "Email handler forwarded message with rcptTo: <address> headers: …" to its log
// (INFO) and the trigger answers 200; an awaited message.setReject(reason) makes the
// trigger answer 400 "Worker rejected email with the following reason: <reason>"
// (miniflare 4.20260426.0, src/workers/core/email.ts). The test captures the log through
// Miniflare's `log` option. The X-Sluice-Score and X-Sluice-Tokens headers of a forward
// are compared with the model run in Node on the text the message should decode to, so a
// MIME decoding mistake (charset, transfer encoding, encoded words) changes them and fails.

import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Model } from "../../runtime/model.ts";
import { demoModel, startWorker, removeWorkerBundle, type RunningWorker } from "./helpers/worker-fixture.ts";

const ROUTES = { ok: "support@vellumcroft.example", spam: "spam-review@vellumcroft.example", abusive: "moderation@vellumcroft.example" };
const FALLBACK = "triage@vellumcroft.example";
const SENDER = "ines.varga@example.com";
const RECIPIENT = "contact@vellumcroft.example";

let worker: RunningWorker;
let model: Model;
let messageNumber = 0;

beforeAll(async () => {
  model = demoModel();
  worker = await startWorker({ EMAIL_ROUTES: JSON.stringify(ROUTES), EMAIL_FALLBACK: FALLBACK, EMAIL_MIN_SCORE: "0.5" });
});

afterAll(async () => {
  await worker?.miniflare.dispose();
  removeWorkerBundle();
});

/**
 * An RFC 5322 message: header fields (§3.6: Date, From, To, Subject, Message-ID), an empty
 * line, then the body, every line ending in CRLF (§2.1, §2.3). MIME fields follow RFC 2045 §4-6.
 */
function message(fields: string[], body: string[]): string {
  messageNumber++;
  const header = [
    "Date: Tue, 01 Dec 2026 09:30:00 +0000",
    `From: Ines Varga <${SENDER}>`,
    `To: ${RECIPIENT}`,
    `Message-ID: <test-${messageNumber}@example.com>`,
    "MIME-Version: 1.0",
    ...fields,
  ];
  return [...header, "", ...body, ""].join("\r\n");
}

interface Delivery {
  status: number;
  body: string;
  forwardedTo: string | null;
  headers: Record<string, string>;
}

/** Sends a message through the local e-mail trigger and reads what the Worker did. */
async function deliver(raw: string, target: RunningWorker = worker): Promise<Delivery> {
  target.log.clear();
  const response = await target.fetch(`/cdn-cgi/handler/email?from=${encodeURIComponent(SENDER)}&to=${encodeURIComponent(RECIPIENT)}`, { method: "POST", body: raw });
  const body = await response.text();
  const forward = target.log.entries.map((entry) => entry.message).find((text) => text.includes("Email handler forwarded message"));
  const headers: Record<string, string> = {};
  let forwardedTo: string | null = null;
  if (forward !== undefined) {
    forwardedTo = /rcptTo: (\S+)/.exec(forward)?.[1] ?? null;
    for (const match of forward.matchAll(/^\s+(x-[a-z-]+): (.*)$/gm)) headers[match[1]] = match[2];
  }
  return { status: response.status, body, forwardedTo, headers };
}

/** The forward must carry the label, score and token count the model gives `text` in Node. */
function expectClassifiedAs(delivery: Delivery, text: string): void {
  const [top] = model.classify(text, { top: 1 });
  expect(delivery.headers["x-sluice-label"]).toBe(top.label);
  expect(delivery.headers["x-sluice-score"]).toBe(top.score.toFixed(4));
  expect(delivery.headers["x-sluice-tokens"]).toBe(String(model.score(text).tokenCount));
  expect(delivery.headers["x-sluice-model"]).toBe(model.meta.version);
}

const QUESTION_SUBJECT = "Order question";
const QUESTION = "Hello, could you tell me when the Mossel desk lamp will be back in stock? Thanks, Ines";

describe("the e-mail handler", () => {
  it("forwards a plain-text message to the route of its label", async () => {
    const expectedText = `${QUESTION_SUBJECT}\n\n${QUESTION}`;
    expect(model.decide(expectedText).action).toBe("allow"); // precondition: a confident "ok"
    const delivery = await deliver(message([`Subject: ${QUESTION_SUBJECT}`, "Content-Type: text/plain; charset=us-ascii"], [QUESTION]));
    expect(delivery.status).toBe(200);
    expect(delivery.forwardedTo).toBe(ROUTES.ok);
    expectClassifiedAs(delivery, expectedText);
    expect(delivery.headers["x-sluice-action"]).toBe("allow");
    expect(delivery.headers["x-sluice-fallback"]).toBeUndefined();
  });

  it("reads the text/plain part of multipart/alternative, not the HTML one", async () => {
    // RFC 2046 §5.1.4: alternatives in increasing faithfulness; the HTML part here says something else.
    const boundary = "alt-boundary-2046";
    const raw = message(
      ["Subject: Order question", `Content-Type: multipart/alternative; boundary="${boundary}"`],
      [
        `--${boundary}`,
        "Content-Type: text/plain; charset=utf-8",
        "",
        QUESTION,
        `--${boundary}`,
        "Content-Type: text/html; charset=utf-8",
        "",
        "<p>Totally different words in the HTML version, with extra free prizes!!!</p>",
        `--${boundary}--`,
      ],
    );
    const delivery = await deliver(raw);
    expect(delivery.forwardedTo).toBe(ROUTES.ok);
    expectClassifiedAs(delivery, `${QUESTION_SUBJECT}\n\n${QUESTION}`);
  });

  it("decodes a quoted-printable body with soft line breaks and UTF-8 escapes", async () => {
    // RFC 2045 §6.7: "=XX" is one octet (here the UTF-8 bytes of ’ U+2019 and – U+2013), "=" at a line end is a soft break.
    const raw = message(
      ["Subject: Lamp shade", "Content-Type: text/plain; charset=utf-8", "Content-Transfer-Encoding: quoted-printable"],
      ["I=E2=80=99d like to order a spare shade for my Mossel desk lamp =E2=80=93 is th=", "at possible? Kind regards, Tomas"],
    );
    const expectedText = "Lamp shade\n\nI\u2019d like to order a spare shade for my Mossel desk lamp \u2013 is that possible? Kind regards, Tomas";
    const delivery = await deliver(raw);
    expect(delivery.forwardedTo).toBe(ROUTES.ok);
    expectClassifiedAs(delivery, expectedText);
  });

  it("decodes base64 encoded-word subjects (the RFC 2047 example and UTF-8)", async () => {
    // RFC 2047 §8: this pair of adjacent encoded words decodes to "If you can read this you understand the example."
    const body = "Is the Corlan throw blanket made from recycled materials? Thanks, Mira";
    const rfcExample = await deliver(
      message(["Subject: =?ISO-8859-1?B?SWYgeW91IGNhbiByZWFkIHRoaXMgeW8=?=", " =?ISO-8859-2?B?dSB1bmRlcnN0YW5kIHRoZSBleGFtcGxlLg==?=", "Content-Type: text/plain; charset=us-ascii"], [body]),
    );
    expectClassifiedAs(rfcExample, `If you can read this you understand the example.\n\n${body}`);
    // RFC 2047 §4.1 "B" encoding of UTF-8 text; Node's Buffer is the reference base64 encoder (RFC 4648 §4).
    const subject = "Frage zur Lieferung – Pilvo Wasserkocher";
    const encoded = `=?UTF-8?B?${Buffer.from(subject, "utf8").toString("base64")}?=`;
    const question = "Could you tell me whether the Pilvo kettle ships to the islands? Thank you, J\u00f6rg";
    const utf8 = await deliver(message([`Subject: ${encoded}`, "Content-Type: text/plain; charset=utf-8", "Content-Transfer-Encoding: 8bit"], [question]));
    expect(utf8.forwardedTo).toBe(ROUTES.ok);
    expectClassifiedAs(utf8, `${subject}\n\n${question}`);
  });

  it("ignores attachments when classifying", async () => {
    // RFC 2046 §5.1.3 multipart/mixed; RFC 2183 Content-Disposition: attachment; the attachment is base64 (RFC 2045 §6.8).
    const boundary = "mixed-boundary-2183";
    const attachment = Buffer.from("WIN a FREE prize!!! Click www.example.net/win to claim your reward now\n", "utf8").toString("base64");
    const body = "Hello, please find my notes attached. Could you send me a copy of the invoice for order #A12345? Thanks, Ada";
    const raw = message(
      ["Subject: Invoice copy", `Content-Type: multipart/mixed; boundary="${boundary}"`],
      [
        "This is a multi-part message in MIME format.",
        `--${boundary}`,
        "Content-Type: text/plain; charset=us-ascii",
        "",
        body,
        `--${boundary}`,
        'Content-Type: text/plain; charset=us-ascii; name="notes.txt"',
        'Content-Disposition: attachment; filename="notes.txt"',
        "Content-Transfer-Encoding: base64",
        "",
        attachment,
        `--${boundary}--`,
      ],
    );
    const delivery = await deliver(raw);
    expect(delivery.forwardedTo).toBe(ROUTES.ok);
    expectClassifiedAs(delivery, `Invoice copy\n\n${body}`);
  });

  it("falls back to the HTML body, without its tags, when there is no text part", async () => {
    const raw = message(
      [`Subject: ${QUESTION_SUBJECT}`, "Content-Type: text/html; charset=utf-8"],
      ["<html><head><style>p { color: red }</style></head><body><p>Hello, could you tell me when the <b>Mossel desk lamp</b> will be back in stock?</p><p>Thanks,&nbsp;Ines</p></body></html>"],
    );
    const delivery = await deliver(raw);
    expect(delivery.forwardedTo).toBe(ROUTES.ok);
    // The style rule and tags must not reach the model (HTML Living Standard §13.5: &nbsp; is U+00A0).
    expectClassifiedAs(delivery, `${QUESTION_SUBJECT}\n\nHello, could you tell me when the Mossel desk lamp will be back in stock?\nThanks, Ines`);
  });

  it("sends a message the policy puts in the review band to the fallback address", async () => {
    expect(model.decide("hello").action).toBe("review"); // precondition
    const delivery = await deliver(message(["Content-Type: text/plain; charset=us-ascii"], ["hello"]));
    expect(delivery.status).toBe(200);
    expect(delivery.forwardedTo).toBe(FALLBACK);
    expect(delivery.headers["x-sluice-fallback"]).toBe("true");
    expect(delivery.headers["x-sluice-action"]).toBe("review");
  });

  it("sends a message whose top score is below its label's policy threshold to the fallback address", async () => {
    const text = "Cheap followers and likes, best SEO offer, buy now at www.example.net";
    const rule = model.meta.policy?.rules.find((candidate) => candidate.label === "spam");
    const [top] = model.classify(text, { top: 1 });
    // Preconditions: the policy allows it, yet spam is on top below the spam rule's threshold.
    expect(model.decide(text).action).toBe("allow");
    expect(top.label).toBe("spam");
    expect(top.score).toBeLessThan(rule?.threshold ?? 0);
    const delivery = await deliver(message(["Content-Type: text/plain; charset=us-ascii"], [text]));
    expect(delivery.forwardedTo).toBe(FALLBACK);
    expect(delivery.headers["x-sluice-label"]).toBe("spam");
  });

  it("refuses a message the policy blocks, with the reason", async () => {
    const text = "WIN a FREE prize!!! Click www.example.net/win to claim your reward now";
    expect(model.decide(`FREE prize\n\n${text}`).action).toBe("block"); // precondition, on subject and body
    const delivery = await deliver(message(["Subject: FREE prize", "Content-Type: text/plain; charset=us-ascii"], [text]));
    expect(delivery.status).toBe(400);
    expect(delivery.body).toContain("Worker rejected email with the following reason: refused by policy: classified as spam");
    expect(delivery.forwardedTo).toBeNull();
  });
});

describe("the e-mail handler with other settings", () => {
  it("uses EMAIL_MIN_SCORE for labels without a policy threshold", async () => {
    const strict = await startWorker({ EMAIL_ROUTES: JSON.stringify(ROUTES), EMAIL_FALLBACK: FALLBACK, EMAIL_MIN_SCORE: "0.97" });
    try {
      const text = `${QUESTION_SUBJECT}\n\n${QUESTION}`;
      const [top] = model.classify(text, { top: 1 });
      expect(top.label).toBe("ok");
      expect(top.score).toBeLessThan(0.97); // precondition: confident, but not that confident
      const delivery = await deliver(message([`Subject: ${QUESTION_SUBJECT}`, "Content-Type: text/plain"], [QUESTION]), strict);
      expect(delivery.forwardedTo).toBe(FALLBACK);
    } finally {
      await strict.miniflare.dispose();
    }
  });

  it("refuses rather than drops a message that needs the fallback when none is configured", async () => {
    const unrouted = await startWorker({ EMAIL_ROUTES: JSON.stringify(ROUTES) });
    try {
      const delivery = await deliver(message(["Content-Type: text/plain"], ["hello"]), unrouted);
      expect(delivery.status).toBe(400);
      expect(delivery.body).toContain("no fallback address is configured");
    } finally {
      await unrouted.miniflare.dispose();
    }
  });
});
