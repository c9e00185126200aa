// Which text of a parsed e-mail the model reads, and how an HTML-only body becomes text.

import { describe, expect, it } from "vitest";
import { emailText, htmlToPlainText } from "../../runtime/worker/email-text.ts";

describe("emailText", () => {
  it("joins the subject and the plain body with a blank line", () => {
    expect(emailText({ subject: " Refund ", text: "Please refund order #A12345.\n", html: "<p>ignored</p>" })).toBe("Refund\n\nPlease refund order #A12345.");
  });

  it("uses the HTML body only when there is no plain one", () => {
    expect(emailText({ subject: undefined, text: undefined, html: "<p>Where is my <b>par</b>cel?</p>" })).toBe("Where is my parcel?");
  });

  it("is empty when the message has neither subject nor body", () => {
    expect(emailText({ subject: undefined, text: undefined, html: undefined })).toBe("");
  });
});

describe("htmlToPlainText", () => {
  it("drops scripts, styles, comments and the head", () => {
    const html = "<html><head><title>T</title><style>p{}</style></head><body><!-- hidden --><script>alert(1)</script><p>Visible</p></body></html>";
    expect(htmlToPlainText(html)).toBe("Visible");
  });

  it("turns line breaks and block ends into new lines", () => {
    expect(htmlToPlainText("<p>One</p><p>Two<br>Three</p>")).toBe("One\nTwo\nThree");
  });

  it("decodes named and numeric character references", () => {
    // HTML Living Standard §13.5: &amp; & (U+0026), &#8217; ’ (U+2019), &#x20AC; € (U+20AC), &nbsp; U+00A0 (folded to a space here).
    expect(htmlToPlainText("Fish &amp; chips &#8217; &#x20AC;5&nbsp;now &bogus;")).toBe("Fish & chips \u2019 \u20ac5 now &bogus;");
  });

  it("leaves an out-of-range numeric reference as written", () => {
    expect(htmlToPlainText("bad &#1114112; and &#xD800;")).toBe("bad &#1114112; and &#xD800;");
  });
});
