// handleEmail on Node with a stand-in message object, for what Miniflare's local trigger
// cannot carry: messages above its 1 MiB local limit, and headers it prints lower-cased.

import { describe, expect, it } from "vitest";
import { handleEmail, MAX_PARSED_BYTES } from "../../runtime/worker/handle-email.ts";
import { fakeEmailMessage } from "./helpers/fake-email-message.ts";
import { demoModel, routingModel } from "./helpers/worker-fixture.ts";

const SMALL_MESSAGE = "Subject: hi\r\nMessage-ID: <1@example.com>\r\n\r\nhello\r\n";
const fakeMessage = (rawSize: number, raw = SMALL_MESSAGE) => fakeEmailMessage(raw, rawSize);

const models = () => ({ moderation: demoModel(), routing: routingModel() });

describe("handleEmail", () => {
  const config = { routes: { billing: "billing@vellumcroft.example" }, fallback: "triage@vellumcroft.example", minScore: 0.7 };

  it("forwards a message above the parse limit to the fallback address without reading it", async () => {
    const { message, calls } = fakeMessage(MAX_PARSED_BYTES + 1);
    const outcome = await handleEmail(models(), config, message);
    expect(calls.rawRead).toBe(false);
    expect(calls.forwardedTo).toBe("triage@vellumcroft.example");
    expect(calls.headers?.get("X-Sluice-Fallback")).toBe("true");
    expect(calls.headers?.get("X-Sluice-Moderation")).toBe("review");
    expect(calls.headers?.has("X-Sluice-Topic")).toBe(false);
    expect(calls.headers?.get("X-Sluice-Reason")).toContain("more than");
    expect(outcome.reason).toContain("more than");
  });

  it("refuses such a message when no fallback address is configured", async () => {
    const { message, calls } = fakeMessage(MAX_PARSED_BYTES + 1);
    await handleEmail(models(), { ...config, fallback: null }, message);
    expect(calls.rejected).toContain("no fallback address is configured");
    expect(calls.forwardedTo).toBeUndefined();
  });

  it("reads a message within the limit and moderates its subject and body", async () => {
    const { message, calls } = fakeMessage(100);
    const outcome = await handleEmail(models(), config, message);
    expect(calls.rawRead).toBe(true);
    const decision = demoModel().decide("hi\n\nhello");
    expect(outcome.moderation).toEqual({ action: decision.action, label: decision.label, score: decision.score });
  });

  it("sends forwarded headers with their documented names and both models' content ids", async () => {
    const raw = "Subject: Charged twice\r\nMessage-ID: <2@example.com>\r\nContent-Type: text/plain\r\n\r\nHello, my card was charged twice for order #A12345. Could you refund the second payment?\r\n";
    const { message, calls } = fakeMessage(raw.length, raw);
    await handleEmail(models(), config, message);
    expect(calls.forwardedTo).toBe("billing@vellumcroft.example");
    // Forwards may only add X-* headers (Email Workers runtime API, EmailMessage.forward).
    expect([...(calls.headers as Headers).keys()].every((name) => name.startsWith("x-"))).toBe(true);
    expect(calls.headers?.get("X-Sluice-Topic")).toBe("billing");
    expect(calls.headers?.get("X-Sluice-Model")).toBe(`moderation=${demoModel().meta.contentId}; routing=${routingModel().meta.contentId}`);
  });
});
