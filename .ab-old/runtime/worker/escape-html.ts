// Escapes text for HTML element content and quoted attribute values (the five characters
// HTML gives meaning to: & < > " ').

const HTML_ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };

/**
 * @example escapeHtml('<b title="x">') // "&lt;b title=&quot;x&quot;&gt;"
 */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (character) => HTML_ESCAPES[character]);
}
