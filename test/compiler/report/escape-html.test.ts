import { describe, expect, it } from "vitest";
import { escapeHtml, safeId } from "../../../compiler/report/escape-html.ts";

describe("escapeHtml", () => {
  it("replaces the characters that end text or attribute values with character references", () => {
    // WHATWG HTML, "serializing HTML fragments" / "escaping a string": & → &amp;, < → &lt;,
    // > → &gt;, " → &quot; (attribute mode); &#39; for ' is the numeric reference of U+0027.
    expect(escapeHtml(`<a href="x">Tom & Jerry's</a>`)).toBe("&lt;a href=&quot;x&quot;&gt;Tom &amp; Jerry&#39;s&lt;/a&gt;");
  });

  it("escapes an ampersand first, so existing references are shown, not decoded", () => {
    // Same source: "&lt;" in data must display as the five characters &lt; (one escape pass).
    expect(escapeHtml("&lt;")).toBe("&amp;lt;");
  });

  it("leaves other text, including non-ASCII, unchanged", () => {
    // UTF-8 pages need no references for other characters (WHATWG HTML, "character encodings").
    expect(escapeHtml("précision ≥ 0.95 — ok ✓")).toBe("précision ≥ 0.95 — ok ✓");
  });
});

describe("safeId", () => {
  it("keeps only letters, digits and hyphens so the id fits in a space-separated list", () => {
    // WAI-ARIA 1.2: aria-labelledby is an ID reference list separated by ASCII whitespace, so
    // an id must not contain spaces; quotes and angle brackets could end the attribute.
    expect(safeId("pr", 'Account access "<x>"', 3)).toBe("pr-3-account-access-x");
  });

  it("keeps labels that clean to the same text apart by their index", () => {
    // WHATWG HTML, "the id attribute": ids must be unique in the document.
    expect(safeId("pr", "a b", 0)).not.toBe(safeId("pr", "a-b", 1));
    expect(safeId("pr", "<<>>", 4)).toBe("pr-4");
  });
});
