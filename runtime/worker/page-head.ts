// The start of every page the Worker serves (the playground, the review page): the document
// head and the house style they share, so both keep one look; each page adds its own rules
// and closes the style element. Colours are the ones the pages' contrast tests check.

import { escapeHtml } from "./escape-html.ts";

/**
 * `<!doctype html>` up to the open `<style>` element (with the request's CSP nonce) and the shared rules.
 * @example `${pageHead("Sluice review", nonce)}  .note { color: #4a4a4a; }\n</style>…`
 */
export function pageHead(title: string, nonce: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style nonce="${escapeHtml(nonce)}">
  :root { color-scheme: light; }
  body { font: 16px/1.5 system-ui, sans-serif; color: #1a1a1a; background: #ffffff; margin: 0 auto; max-width: 46rem; padding: 1.5rem; }
  h1 { font-size: 1.5rem; margin: 0 0 .25rem; }
  label { display: block; font-weight: 600; margin: 1rem 0 .25rem; }
`;
}
