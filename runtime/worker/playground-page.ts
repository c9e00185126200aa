// GET /: a one-file playground. Type a text, see every label's score, the decision and
// the features that drove the top labels. No framework and no external assets; the inline
// style and script carry the per-response CSP nonce, so the page needs no 'unsafe-inline'.
// Results are written with textContent only, never as HTML.

import type { Model } from "../index.ts";
import { escapeHtml } from "./escape-html.ts";
import { pageHead } from "./page-head.ts";

/**
 * The page's HTML for one response.
 * @example c.html(playgroundPage(model, c.get("secureHeadersNonce")))
 */
export function playgroundPage(model: Model, nonce: string): string {
  const meta = model.meta;
  const nonceAttribute = escapeHtml(nonce);
  const labels = meta.labels.map(escapeHtml).join(", ");
  return `${pageHead("Sluice playground", nonce)}  .model { color: #4a4a4a; margin: 0 0 1.25rem; }
  .hint { color: #4a4a4a; font-weight: 400; font-size: .9rem; }
  textarea, input { box-sizing: border-box; width: 100%; font: inherit; color: #1a1a1a; background: #ffffff; border: 2px solid #5c5c5c; border-radius: 4px; padding: .5rem; }
  textarea { min-height: 8rem; resize: vertical; }
  button { margin-top: 1rem; font: inherit; font-weight: 600; color: #ffffff; background: #0b4f8a; border: 2px solid #0b4f8a; border-radius: 4px; padding: .5rem 1.25rem; cursor: pointer; }
  button:hover { background: #083b68; }
  button:disabled { background: #5c5c5c; border-color: #5c5c5c; cursor: progress; }
  :focus-visible { outline: 3px solid #b35c00; outline-offset: 2px; }
  table { border-collapse: collapse; width: 100%; margin-top: .75rem; }
  caption { text-align: left; font-weight: 600; padding: .25rem 0; }
  th, td { text-align: left; padding: .3rem .5rem; border-bottom: 1px solid #c8c8c8; }
  td.number, th.number { font-variant-numeric: tabular-nums; text-align: right; white-space: nowrap; }
  meter { width: 10rem; height: 1rem; }
  .decision { font-size: 1.1rem; margin: 1.25rem 0 0; }
  .note { color: #4a4a4a; font-size: .9rem; }
  .error { color: #a50e0e; font-weight: 600; }
</style>
</head>
<body>
<main>
<h1>Sluice playground</h1>
<p class="model">Model <code id="model-content-id">${escapeHtml(meta.contentId)}</code>, labels: ${labels}</p>
<form id="classify-form" data-label-count="${meta.labels.length}">
  <label for="text">Text to classify</label>
  <textarea id="text" name="text" required aria-describedby="text-hint"></textarea>
  <span id="text-hint" class="hint">Press Ctrl+Enter (or ⌘+Enter) to classify.</span>
  <label for="token">API token <span class="hint">(only if this server asks for one; kept in this page only)</span></label>
  <input id="token" name="token" type="password" autocomplete="off">
  <button id="submit" type="submit">Classify</button>
</form>
<p id="error" class="error" role="alert"></p>
<section id="result" aria-live="polite" aria-label="Result"></section>
</main>
<script nonce="${nonceAttribute}">
(() => {
  const form = document.getElementById("classify-form");
  const textField = document.getElementById("text");
  const tokenField = document.getElementById("token");
  const button = document.getElementById("submit");
  const errorLine = document.getElementById("error");
  const result = document.getElementById("result");
  const labelCount = Number(form.dataset.labelCount);
  const element = (tag, text, className) => {
    const node = document.createElement(tag);
    if (text !== undefined) node.textContent = text;
    if (className) node.className = className;
    return node;
  };
  const percent = (score) => (score * 100).toFixed(1) + "%";
  const signed = (value) => (value >= 0 ? "+" : "") + value.toFixed(3);
  function render(body) {
    result.replaceChildren();
    const decision = element("p", "", "decision");
    decision.id = "decision";
    decision.append("Decision: ", element("strong", body.decision.action), " (" + body.decision.label + " " + percent(body.decision.score) + ")");
    result.append(decision);
    if (body.decision.action === "review") result.append(element("p", "Uncertain: a person should look at this one.", "note"));
    if (body.truncated) result.append(element("p", "Only the first " + body.tokenCount + " tokens were read.", "note"));
    const scores = element("table");
    scores.id = "scores";
    scores.append(element("caption", "Scores"));
    const head = element("tr");
    head.append(element("th", "Label"), element("th", "Score", "number"), element("th", "Share"));
    scores.append(head);
    for (const entry of body.labels) {
      const row = element("tr");
      row.className = "score-row";
      const bar = element("meter");
      bar.min = 0; bar.max = 1; bar.value = entry.score;
      bar.setAttribute("aria-label", entry.label + " score");
      const cell = element("td"); cell.append(bar);
      row.append(element("td", entry.label, "label"), element("td", percent(entry.score), "number"), cell);
      scores.append(row);
    }
    result.append(scores);
    for (const entry of body.labels.slice(0, 2)) {
      const table = element("table");
      table.append(element("caption", "Features behind " + entry.label));
      const header = element("tr");
      header.append(element("th", "Feature"), element("th", "Push on the logit", "number"));
      table.append(header);
      for (const feature of entry.features) {
        const row = element("tr");
        row.append(element("td", feature.feature), element("td", signed(feature.contribution), "number"));
        table.append(row);
      }
      if (entry.features.length === 0) {
        const row = element("tr");
        row.append(element("td", "No known feature in this text."), element("td"));
        table.append(row);
      }
      result.append(table);
    }
  }
  async function classify() {
    errorLine.textContent = "";
    const text = textField.value;
    if (text.trim() === "") { errorLine.textContent = "Type a text first."; textField.focus(); return; }
    const headers = { "content-type": "application/json" };
    if (tokenField.value !== "") headers.authorization = "Bearer " + tokenField.value;
    button.disabled = true;
    try {
      const response = await fetch("/v1/explain", { method: "POST", headers, body: JSON.stringify({ text, top: labelCount, features: 8 }) });
      const body = await response.json();
      if (!response.ok) { errorLine.textContent = (body.error && body.error.message) || ("The server answered " + response.status); return; }
      render(body);
    } catch (error) {
      errorLine.textContent = "The request failed: " + error.message;
    } finally {
      button.disabled = false;
    }
  }
  form.addEventListener("submit", (event) => { event.preventDefault(); classify(); });
  textField.addEventListener("keydown", (event) => {
    if (event.key === "Enter" && (event.ctrlKey || event.metaKey)) { event.preventDefault(); classify(); }
  });
})();
</script>
</body>
</html>
`;
}
