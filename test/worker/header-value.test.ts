// X-Sluice-* header values: one line of printable ASCII, or RFC 2047 encoded words that a
// mail reader decodes back. The decoder is postal-mime's decodeWords, an independent
// implementation of RFC 2047 (the same library the Worker parses incoming mail with).

import { decodeWords } from "postal-mime";
import { describe, expect, it } from "vitest";
import { headerValue } from "../../runtime/worker/header-value.ts";

describe("headerValue", () => {
  it("keeps printable ASCII as it is", () => {
    expect(headerValue("top topic billing 0.650 is below its threshold 0.700")).toBe("top topic billing 0.650 is below its threshold 0.700");
  });

  it("puts a multi-line text on one line", () => {
    expect(headerValue("one\r\ntwo\tthree")).toBe("one two three");
  });

  it("encodes UTF-8 as RFC 2047 B words that decode back", () => {
    const value = headerValue("Rückgabe");
    // RFC 2047 §4.1: =?charset?B?base64?=; Node's Buffer is the reference base64 encoder (RFC 4648 §4).
    expect(value).toBe(`=?UTF-8?B?${Buffer.from("Rückgabe", "utf8").toString("base64")}?=`);
    expect(decodeWords(value)).toBe("Rückgabe");
  });

  it("splits a long text into words of at most 75 characters, never inside a character", () => {
    const text = "Lieferung – 配送の問題 😀 ".repeat(8).trim();
    const value = headerValue(text);
    const words = value.split(" ");
    expect(words.length).toBeGreaterThan(1);
    // RFC 2047 §2: "An 'encoded-word' may not be more than 75 characters long".
    for (const word of words) expect(word.length).toBeLessThanOrEqual(75);
    // Every word decodes on its own (RFC 2047 §5 (3): each holds whole characters).
    for (const word of words) expect(Buffer.from(word.slice(10, -2), "base64").toString("utf8")).not.toContain("\ufffd");
    expect(decodeWords(value)).toBe(text);
  });

  it("gives a value the Headers class accepts for any text", () => {
    // Fetch standard §5.2: a header value is a byte sequence; a string above U+00FF makes Headers throw.
    expect(() => new Headers({ "x-test": "配送" })).toThrow();
    expect(() => new Headers({ "x-test": headerValue("配送\n😀") })).not.toThrow();
  });
});
