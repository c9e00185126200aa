// The page shell: one HTML document with its style sheet inline, a contents list and the
// sections in order. The Content-Security-Policy forbids every fetch and every script, so the
// file stays self-contained even if something in it tried to load more; the data: icon stops
// browsers from asking for /favicon.ico when the page is served over HTTP.

import { escapeHtml } from "./escape-html.ts";
import { REPORT_STYLES } from "./report-styles.ts";

/** One `<section>` with an `<h2>`; `body` is finished (escaped) markup. */
export interface PageSection {
  id: string;
  heading: string;
  body: string;
}

export interface PageContent {
  title: string;
  /** Plain text under the h1. */
  lede: string;
  /** Finished markup between the lede and the contents (summary, caveats). */
  introduction: string;
  sections: PageSection[];
  /** Plain text of the footer. */
  footer: string;
}

const SECURITY_POLICY = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'";

/**
 * The complete HTML document.
 * @example renderPage({ title: "Report", lede: "", introduction: "", sections: [], footer: "" })
 */
export function renderPage(content: PageContent): string {
  const contents = content.sections.map((section) => `<li><a href="#${section.id}">${escapeHtml(section.heading)}</a></li>`).join("");
  const sections = content.sections.map((section) => `<section aria-labelledby="${section.id}"><h2 id="${section.id}">${escapeHtml(section.heading)}</h2>${section.body}</section>`).join("\n");
  return [
    "<!doctype html>",
    '<html lang="en">',
    "<head>",
    '<meta charset="utf-8">',
    `<meta http-equiv="Content-Security-Policy" content="${SECURITY_POLICY}">`,
    '<meta name="viewport" content="width=device-width, initial-scale=1">',
    '<meta name="color-scheme" content="light">',
    '<link rel="icon" href="data:,">',
    `<title>${escapeHtml(content.title)}</title>`,
    `<style>${REPORT_STYLES}</style>`,
    "</head>",
    "<body>",
    "<main>",
    `<h1>${escapeHtml(content.title)}</h1>`,
    `<p class="lede">${escapeHtml(content.lede)}</p>`,
    content.introduction,
    `<nav aria-label="Contents"><ul>${contents}</ul></nav>`,
    sections,
    `<footer><p>${escapeHtml(content.footer)}</p></footer>`,
    "</main>",
    "</body>",
    "</html>",
    "",
  ].join("\n");
}
