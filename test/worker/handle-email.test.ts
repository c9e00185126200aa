// handleEmail on Node with a stand-in message object, for what Miniflare's local trigger
// cannot carry: messages above its 1 MiB local limit.

import { describe, expect, it } from "vitest";
import { handleEmail, MAX_PARSED_BYTES } from "../../runtime/worker/handle-email.ts";
import type { IncomingEmailMessage } from "../../runtime/worker/platform-types.ts";
import { demoModel } from "./helpers/worker-fixture.ts";

function fakeMessage(rawSize: number) {
  const calls: { forwardedTo?: string; headers?: Headers; rejected?: string; rawRead: boolean } = { rawRead: false };
  const message: IncomingEmailMessage = {
    from: "ines.varga@example.com",
    to: "contact@vellumcroft.example",
    headers: new Headers(),
    rawSize,
    get raw(): ReadableStream<Uint8Array> {
      calls.rawRead = true;
      return new Blob(["Subject: hi\r\nMessage-ID: <1@example.com>\r\n\r\nhello\r\n"]).stream();
    },
    setReject: async (reason) => {
      calls.rejected = reason;
    },
    forward: async (address, headers) => {
      calls.forwardedTo = address;
      calls.headers = headers;
    },
  };
  return { message, calls };
}

describe("handleEmail", () => {
  const config = { routes: { ok: "support@vellumcroft.example" }, fallback: "triage@vellumcroft.example", minScore: 0.5 };

  it("forwards a message above the parse limit to the fallback address without reading it", async () => {
    const { message, calls } = fakeMessage(MAX_PARSED_BYTES + 1);
    const outcome = await handleEmail(demoModel(), config, message);
    expect(calls.rawRead).toBe(false);
    expect(calls.forwardedTo).toBe("triage@vellumcroft.example");
    expect(calls.headers?.get("X-Sluice-Fallback")).toBe("true");
    expect(calls.headers?.has("X-Sluice-Label")).toBe(false);
    expect(outcome.reason).toContain("more than");
  });

  it("refuses such a message when no fallback address is configured", async () => {
    const { message, calls } = fakeMessage(MAX_PARSED_BYTES + 1);
    await handleEmail(demoModel(), { ...config, fallback: null }, message);
    expect(calls.rejected).toContain("no fallback address is configured");
    expect(calls.forwardedTo).toBeUndefined();
  });

  it("reads and classifies a message within the limit", async () => {
    const { message, calls } = fakeMessage(100);
    const outcome = await handleEmail(demoModel(), config, message);
    expect(calls.rawRead).toBe(true);
    expect(outcome.label).toBe(demoModel().classify("hi\n\nhello", { top: 1 })[0].label);
  });
});
