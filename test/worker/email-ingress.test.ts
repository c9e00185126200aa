// The Worker's e-mail handler in real workerd, fed hand-written RFC 5322 messages through
// Miniflare's local trigger (helpers/email-delivery.ts says what is observed and why it is
// trustworthy). The pipeline: moderation (contact-form model) blocks or sends to review,
// then the routing model's topic picks the team. Every forward's X-Sluice-* headers are
// compared with the two models run in Node on the text the message should decode to, so a
// MIME decoding mistake (charset, transfer encoding, encoded words, attachments) changes the
// topic, score or token count and fails the test.

import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEFAULT_APP_CONFIG } from "../../runtime/worker/app-config.ts";
import type { Model } from "../../runtime/model/model.ts";
import { deliverEmail, rfc822Message, type Delivery } from "./helpers/email-delivery.ts";
import { demoModel, removeWorkerBundle, routingModel, startWorker, type RunningWorker } from "./helpers/worker-fixture.ts";

const ROUTES = {
  billing: "billing@vellumcroft.example",
  shipping: "shipping@vellumcroft.example",
  returns: "returns@vellumcroft.example",
  "account-access": "accounts@vellumcroft.example",
  "technical-fault": "repairs@vellumcroft.example",
  "product-question": "product-help@vellumcroft.example",
};
const FALLBACK = "triage@vellumcroft.example";
const MIN_SCORE = 0.7;

let worker: RunningWorker;
let moderation: Model;
let routing: Model;

beforeAll(async () => {
  moderation = demoModel();
  routing = routingModel();
  worker = await startWorker({ EMAIL_ROUTES: JSON.stringify(ROUTES), EMAIL_FALLBACK: FALLBACK, EMAIL_MIN_SCORE: String(MIN_SCORE) });
});

afterAll(async () => {
  await worker?.miniflare.dispose();
  removeWorkerBundle();
});

const deliver = (raw: string, target: RunningWorker = worker): Promise<Delivery> => deliverEmail(target, raw);

/** Precondition in Node: moderation allows `text` and its top topic is `topic`, at or above the minimum score. */
function expectConfidentTopic(text: string, topic: keyof typeof ROUTES): void {
  expect(moderation.decide(text).action).toBe("allow");
  const [top] = routing.classify(text, { top: 1 });
  expect(top.label).toBe(topic);
  expect(top.score).toBeGreaterThanOrEqual(MIN_SCORE);
}

/** The forward must carry what the two models give `text` in Node. */
function expectHeadersFor(delivery: Delivery, text: string): void {
  const [top] = routing.classify(text, { top: 1 });
  expect(delivery.headers["x-sluice-topic"]).toBe(top.label);
  expect(delivery.headers["x-sluice-score"]).toBe(top.score.toFixed(4));
  expect(delivery.headers["x-sluice-moderation"]).toBe(moderation.decide(text).action);
  expect(delivery.headers["x-sluice-tokens"]).toBe(String(moderation.score(text).tokenCount));
  expect(delivery.headers["x-sluice-model"]).toBe(`moderation=${moderation.meta.contentId}; routing=${routing.meta.contentId}`);
}

const BILLING_SUBJECT = "Charged twice for order #A12345";
const BILLING = "Hello, my card was charged twice for order #A12345. Could you refund the second payment? Thanks, Ines";

describe("the shipped configuration", () => {
  // wrangler.toml [vars] holds EMAIL_ROUTES as a TOML literal string (TOML v1.0.0, "Literal strings": no escapes).
  const toml = readFileSync(new URL("../../wrangler.toml", import.meta.url), "utf8");

  it("routes every topic of the routing model to a team, as these tests do", () => {
    const routes = JSON.parse(/^EMAIL_ROUTES = '(.*)'$/m.exec(toml)?.[1] ?? "null") as Record<string, string>;
    expect(Object.keys(routes).sort()).toEqual([...routing.labels]);
    expect(routes).toEqual(ROUTES);
  });

  it("uses the default minimum topic score", () => {
    expect(Number(/^EMAIL_MIN_SCORE = "(.*)"$/m.exec(toml)?.[1])).toBe(DEFAULT_APP_CONFIG.email.minScore);
    expect(DEFAULT_APP_CONFIG.email.minScore).toBe(MIN_SCORE);
  });
});

describe("the e-mail handler forwards allowed mail to the team of its topic", () => {
  it("for a plain-text message", async () => {
    const text = `${BILLING_SUBJECT}\n\n${BILLING}`;
    expectConfidentTopic(text, "billing");
    const delivery = await deliver(rfc822Message([`Subject: ${BILLING_SUBJECT}`, "Content-Type: text/plain; charset=us-ascii"], [BILLING]));
    expect(delivery.status).toBe(200);
    expect(delivery.forwardedTo).toBe(ROUTES.billing);
    expectHeadersFor(delivery, text);
    expect(delivery.headers["x-sluice-moderation"]).toBe("allow");
    expect(delivery.headers["x-sluice-fallback"]).toBeUndefined();
    expect(delivery.headers["x-sluice-reason"]).toBeUndefined();
  });

  it("reading the text/plain part of multipart/alternative, not the HTML one", async () => {
    // RFC 2046 §5.1.4: alternatives in increasing faithfulness; the HTML part here says something else.
    const subject = "Where is my parcel?";
    const body = "Hello, my parcel for order #B23456 was due on Monday and the tracking has not moved since. Could you check with the courier? Thanks, Ines";
    const text = `${subject}\n\n${body}`;
    expectConfidentTopic(text, "shipping");
    const boundary = "alt-boundary-2046";
    const raw = rfc822Message(
      [`Subject: ${subject}`, `Content-Type: multipart/alternative; boundary="${boundary}"`],
      [
        `--${boundary}`,
        "Content-Type: text/plain; charset=utf-8",
        "",
        body,
        `--${boundary}`,
        "Content-Type: text/html; charset=utf-8",
        "",
        "<p>Totally different words in the HTML version: my password reset link expired and I cannot log in.</p>",
        `--${boundary}--`,
      ],
    );
    const delivery = await deliver(raw);
    expect(delivery.forwardedTo).toBe(ROUTES.shipping);
    expectHeadersFor(delivery, text);
  });

  it("decoding a quoted-printable body with soft line breaks and UTF-8 escapes", async () => {
    // RFC 2045 §6.7: "=XX" is one octet (here the UTF-8 bytes of ’ U+2019 and – U+2013), "=" at a line end is a soft break.
    const raw = rfc822Message(
      ["Subject: Return label", "Content-Type: text/plain; charset=utf-8", "Content-Transfer-Encoding: quoted-printable"],
      ["I=E2=80=99d like to return the Mossel desk lamp I bought last week =E2=80=93 how do I get a ret=", "urn label? Kind regards, Tomas"],
    );
    const text = "Return label\n\nI\u2019d like to return the Mossel desk lamp I bought last week \u2013 how do I get a return label? Kind regards, Tomas";
    expectConfidentTopic(text, "returns");
    const delivery = await deliver(raw);
    expect(delivery.forwardedTo).toBe(ROUTES.returns);
    expectHeadersFor(delivery, text);
  });

  it("decoding base64 encoded-word subjects (the RFC 2047 example and UTF-8)", async () => {
    // RFC 2047 §8: this pair of adjacent encoded words decodes to "If you can read this you understand the example."
    const body = "Do you sell replacement parts for the Corlan toaster? Is it available in white? Thanks, Mira";
    const exampleText = `If you can read this you understand the example.\n\n${body}`;
    expectConfidentTopic(exampleText, "product-question");
    const rfcExample = await deliver(
      rfc822Message(["Subject: =?ISO-8859-1?B?SWYgeW91IGNhbiByZWFkIHRoaXMgeW8=?=", " =?ISO-8859-2?B?dSB1bmRlcnN0YW5kIHRoZSBleGFtcGxlLg==?=", "Content-Type: text/plain; charset=us-ascii"], [body]),
    );
    expect(rfcExample.forwardedTo).toBe(ROUTES["product-question"]);
    expectHeadersFor(rfcExample, exampleText);
    // RFC 2047 §4.1 "B" encoding of UTF-8 text; Node's Buffer is the reference base64 encoder (RFC 4648 §4).
    const subject = "Frage zur Lieferung – Pilvo Wasserkocher";
    const encoded = `=?UTF-8?B?${Buffer.from(subject, "utf8").toString("base64")}?=`;
    const question = "When will my parcel arrive? The tracking for order #C34567 has not changed in four days. Thank you, J\u00f6rg";
    const utf8Text = `${subject}\n\n${question}`;
    expectConfidentTopic(utf8Text, "shipping");
    const utf8 = await deliver(rfc822Message([`Subject: ${encoded}`, "Content-Type: text/plain; charset=utf-8", "Content-Transfer-Encoding: 8bit"], [question]));
    expect(utf8.forwardedTo).toBe(ROUTES.shipping);
    expectHeadersFor(utf8, utf8Text);
  });

  it("ignoring attachments, even one that moderation would block", async () => {
    // RFC 2046 §5.1.3 multipart/mixed; RFC 2183 Content-Disposition: attachment; the attachment is base64 (RFC 2045 §6.8).
    const spam = "WIN a FREE prize!!! Click www.example.net/win to claim your reward now";
    expect(moderation.decide(spam).action).toBe("block"); // precondition: read, the attachment would be refused
    const boundary = "mixed-boundary-2183";
    const body = "Hello, please find a screenshot attached. I can't log in to my account, it says my password is wrong, and the reset e-mail never arrives. Thanks, Ada";
    const text = `Can't log in\n\n${body}`;
    expectConfidentTopic(text, "account-access");
    const raw = rfc822Message(
      ["Subject: Can't log in", `Content-Type: multipart/mixed; boundary="${boundary}"`],
      [
        "This is a multi-part message in MIME format.",
        `--${boundary}`,
        "Content-Type: text/plain; charset=us-ascii",
        "",
        body,
        `--${boundary}`,
        'Content-Type: text/plain; charset=us-ascii; name="screenshot-notes.txt"',
        'Content-Disposition: attachment; filename="screenshot-notes.txt"',
        "Content-Transfer-Encoding: base64",
        "",
        Buffer.from(`${spam}\n`, "utf8").toString("base64"),
        `--${boundary}--`,
      ],
    );
    const delivery = await deliver(raw);
    expect(delivery.forwardedTo).toBe(ROUTES["account-access"]);
    expectHeadersFor(delivery, text);
  });

  it("falling back to the HTML body, without its tags, when there is no text part", async () => {
    const raw = rfc822Message(
      ["Subject: Order question", "Content-Type: text/html; charset=utf-8"],
      ["<html><head><style>p { color: red }</style></head><body><p>Hello, could you tell me when the <b>Mossel desk lamp</b> will be back in stock?</p><p>Thanks,&nbsp;Ines</p></body></html>"],
    );
    // The style rule and tags must not reach the models (HTML Living Standard §13.5: &nbsp; is U+00A0).
    const text = "Order question\n\nHello, could you tell me when the Mossel desk lamp will be back in stock?\nThanks, Ines";
    expectConfidentTopic(text, "product-question");
    const delivery = await deliver(raw);
    expect(delivery.forwardedTo).toBe(ROUTES["product-question"]);
    expectHeadersFor(delivery, text);
  });
});

describe("the e-mail handler sends mail to the fallback address", () => {
  it("when the moderation policy puts it in the review band, without routing it", async () => {
    const decision = moderation.decide("hello");
    expect(decision.action).toBe("review"); // precondition: a top score under the policy's review floor
    const delivery = await deliver(rfc822Message(["Content-Type: text/plain; charset=us-ascii"], ["hello"]));
    expect(delivery.status).toBe(200);
    expect(delivery.forwardedTo).toBe(FALLBACK);
    expect(delivery.headers["x-sluice-fallback"]).toBe("true");
    expect(delivery.headers["x-sluice-moderation"]).toBe("review");
    expect(delivery.headers["x-sluice-reason"]).toBe(`the moderation policy asks for review (${decision.label} ${decision.score.toFixed(3)})`);
    expect(delivery.headers["x-sluice-topic"]).toBeUndefined();
    expect(delivery.headers["x-sluice-tokens"]).toBe(String(moderation.score("hello").tokenCount));
  });

  it("when moderation allows it but its top topic scores below EMAIL_MIN_SCORE", async () => {
    const subject = "Order question";
    const body = "Hello, my order arrived and I was charged for it, thanks";
    const text = `${subject}\n\n${body}`;
    const [top] = routing.classify(text, { top: 1 });
    // Preconditions: allowed, the routing model has no threshold of its own, and the topic is uncertain.
    expect(moderation.decide(text).action).toBe("allow");
    expect(routing.meta.policy).toBeNull();
    expect(top.score).toBeLessThan(MIN_SCORE);
    const delivery = await deliver(rfc822Message([`Subject: ${subject}`, "Content-Type: text/plain; charset=us-ascii"], [body]));
    expect(delivery.forwardedTo).toBe(FALLBACK);
    expectHeadersFor(delivery, text);
    expect(delivery.headers["x-sluice-fallback"]).toBe("true");
    expect(delivery.headers["x-sluice-reason"]).toBe(`top topic ${top.label} ${top.score.toFixed(3)} is below its threshold ${MIN_SCORE.toFixed(3)}`);
  });
});

describe("the e-mail handler refuses mail", () => {
  it("that the moderation policy blocks, with the reason, before any routing", async () => {
    const text = "FREE prize\n\nWIN a FREE prize!!! Click www.example.net/win to claim your reward now";
    const decision = moderation.decide(text);
    expect(decision.action).toBe("block"); // precondition, on subject and body
    const delivery = await deliver(rfc822Message(["Subject: FREE prize", "Content-Type: text/plain; charset=us-ascii"], ["WIN a FREE prize!!! Click www.example.net/win to claim your reward now"]));
    expect(delivery.status).toBe(400);
    expect(delivery.body).toContain(`Worker rejected email with the following reason: refused by the moderation policy: classified as spam (${decision.score.toFixed(3)})`);
    expect(delivery.forwardedTo).toBeNull();
  });
});

describe("the e-mail handler with other settings", () => {
  it("uses EMAIL_MIN_SCORE for topics without a threshold of their own", async () => {
    const strict = await startWorker({ EMAIL_ROUTES: JSON.stringify(ROUTES), EMAIL_FALLBACK: FALLBACK, EMAIL_MIN_SCORE: "0.99" });
    try {
      const text = `${BILLING_SUBJECT}\n\n${BILLING}`;
      const [top] = routing.classify(text, { top: 1 });
      expect(top.score).toBeGreaterThanOrEqual(MIN_SCORE);
      expect(top.score).toBeLessThan(0.99); // precondition: confident, but not that confident
      const delivery = await deliver(rfc822Message([`Subject: ${BILLING_SUBJECT}`, "Content-Type: text/plain"], [BILLING]), strict);
      expect(delivery.forwardedTo).toBe(FALLBACK);
      expect(delivery.headers["x-sluice-reason"]).toContain("below its threshold 0.990");
    } finally {
      await strict.miniflare.dispose();
    }
  });

  it("sends a confident topic without a configured route to the fallback address", async () => {
    const { billing: _billing, ...withoutBilling } = ROUTES;
    const partial = await startWorker({ EMAIL_ROUTES: JSON.stringify(withoutBilling), EMAIL_FALLBACK: FALLBACK });
    try {
      const delivery = await deliver(rfc822Message([`Subject: ${BILLING_SUBJECT}`, "Content-Type: text/plain"], [BILLING]), partial);
      expect(delivery.forwardedTo).toBe(FALLBACK);
      expect(delivery.headers["x-sluice-topic"]).toBe("billing");
      expect(delivery.headers["x-sluice-reason"]).toBe("no route is configured for billing");
    } finally {
      await partial.miniflare.dispose();
    }
  });

  it("refuses rather than drops a message that needs the fallback when none is configured", async () => {
    const unrouted = await startWorker({ EMAIL_ROUTES: JSON.stringify(ROUTES) });
    try {
      const delivery = await deliver(rfc822Message(["Content-Type: text/plain"], ["hello"]), unrouted);
      expect(delivery.status).toBe(400);
      expect(delivery.body).toContain("no fallback address is configured");
    } finally {
      await unrouted.miniflare.dispose();
    }
  });
});
