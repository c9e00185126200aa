// Every piece of text that comes from a model file or a data file passes through here before
// it reaches the report: labels, texts, file names, settings. The five characters replaced are
// the ones that can end a text node or an attribute value in HTML (WHATWG HTML, "escaping a
// string", plus the apostrophe so single-quoted attributes are safe too); the same escapes are
// valid XML, so the output works inside inline SVG as well.

const REPLACEMENTS: Record<string, string> = {
  "&": "&amp;",
  "<": "&lt;",
  ">": "&gt;",
  '"': "&quot;",
  "'": "&#39;",
};

/**
 * Text made safe for an HTML or SVG text node or a quoted attribute value.
 * @example escapeHtml('<script>"x"</script>') // "&lt;script&gt;&quot;x&quot;&lt;/script&gt;"
 */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (character) => REPLACEMENTS[character]);
}

/**
 * A string that can be used as an HTML id and in `aria-labelledby`: letters, digits and
 * hyphens only, so a label such as `a b"<` cannot break out of the attribute or collide with
 * the space-separated id list. `index` keeps ids of labels that clean to the same text apart.
 * @example safeId("pr", "account access", 2) // "pr-2-account-access"
 */
export function safeId(prefix: string, text: string, index: number): string {
  const cleaned = text.toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 40);
  return `${prefix}-${index}${cleaned ? `-${cleaned}` : ""}`;
}
