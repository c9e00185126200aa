// The token comparison agrees with Node's crypto.timingSafeEqual (the reference for
// equal-length byte strings) and handles what timingSafeEqual refuses: other lengths.

import { timingSafeEqual } from "node:crypto";
import { describe, expect, it } from "vitest";
import { constantTimeEqual } from "../../runtime/worker/constant-time-equal.ts";

describe("constantTimeEqual", () => {
  const pairs: [string, string][] = [
    ["s3cret-token", "s3cret-token"],
    ["s3cret-token", "s3cret-tokem"],
    ["a", "b"],
    ["Grüße", "Grüße"],
    ["Grüße", "Grusse"],
    ["\u{1f511}key", "\u{1f511}key"],
  ];

  it("agrees with crypto.timingSafeEqual on UTF-8 bytes of equal length", () => {
    for (const [a, b] of pairs) {
      const bytesA = Buffer.from(a, "utf8");
      const bytesB = Buffer.from(b, "utf8");
      if (bytesA.length !== bytesB.length) continue;
      expect(constantTimeEqual(a, b), `${a} vs ${b}`).toBe(timingSafeEqual(bytesA, bytesB));
    }
  });

  it("is false for a prefix, an extension and the empty string", () => {
    expect(constantTimeEqual("s3cret", "s3cret-token")).toBe(false);
    expect(constantTimeEqual("s3cret-token-and-more", "s3cret-token")).toBe(false);
    expect(constantTimeEqual("", "s3cret-token")).toBe(false);
  });

  it("never accepts anything when the expected secret is empty", () => {
    expect(constantTimeEqual("", "")).toBe(false);
  });

  it("compares bytes, not UTF-16 code units: é precomposed differs from e + combining accent", () => {
    // Unicode Standard Annex #15: U+00E9 and U+0065 U+0301 are canonically equivalent but different bytes.
    expect(constantTimeEqual("caf\u00e9", "cafe\u0301")).toBe(false);
  });
});
