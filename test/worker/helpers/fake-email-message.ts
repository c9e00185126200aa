// A stand-in for the platform's incoming e-mail message, for running handleEmail on Node:
// it records what the handler did (forward, headers, reject) and whether it read the body.

import type { IncomingEmailMessage } from "../../../runtime/worker/platform-types.ts";

export interface FakeMessageCalls {
  forwardedTo?: string;
  headers?: Headers;
  rejected?: string;
  rawRead: boolean;
}

/**
 * A message whose body is `raw` and whose reported size is `rawSize` (default: raw's length).
 * @example const { message, calls } = fakeEmailMessage("Subject: hi\r\n\r\nhello\r\n"); await handleEmail(models, config, message); calls.forwardedTo
 */
export function fakeEmailMessage(raw: string, rawSize = new TextEncoder().encode(raw).length): { message: IncomingEmailMessage; calls: FakeMessageCalls } {
  const calls: FakeMessageCalls = { rawRead: false };
  const message: IncomingEmailMessage = {
    from: "ines.varga@example.com",
    to: "support@vellumcroft.example",
    headers: new Headers(),
    rawSize,
    get raw(): ReadableStream<Uint8Array> {
      calls.rawRead = true;
      return new Blob([raw]).stream();
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
