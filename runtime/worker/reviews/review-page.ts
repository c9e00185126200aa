// GET /review: the reviewer's page. One pending item at a time: its text, the model's top
// labels and the n-grams that drove them, a button per label and one to skip, each with a
// key (1…9 for the labels in order, S to skip), and how many items are left. No framework,
// no external assets; inline style and script carry the response's CSP nonce. Everything
// from the server is written with textContent, never as HTML. The reviewer token is asked
// for on the page and kept in sessionStorage (this tab only).

import type { Model } from "../../index.ts";
import { escapeHtml } from "../escape-html.ts";
import { pageHead } from "../page-head.ts";

/**
 * The page's HTML for one response.
 * @example c.html(reviewPage(model, c.get("secureHeadersNonce")))
 */
export function reviewPage(model: Model, nonce: string): string {
  const n = escapeHtml(nonce);
  const labels = JSON.stringify(model.labels).replace(/</g, "\\u003c");
  return `${pageHead("Sluice review", nonce)}  .note, .hint { color: #4a4a4a; font-size: .9rem; }
  input { box-sizing: border-box; width: 100%; font: inherit; border: 2px solid #5c5c5c; border-radius: 4px; padding: .5rem; }
  button { margin: .5rem .5rem 0 0; font: inherit; font-weight: 600; color: #ffffff; background: #0b4f8a; border: 2px solid #0b4f8a; border-radius: 4px; padding: .4rem 1rem; cursor: pointer; }
  button.skip { color: #1a1a1a; background: #ffffff; border-color: #5c5c5c; }
  button:disabled { background: #5c5c5c; border-color: #5c5c5c; color: #ffffff; cursor: progress; }
  kbd { font: .85rem ui-monospace, monospace; border: 1px solid #8a8a8a; border-radius: 3px; padding: 0 .3rem; margin-left: .35rem; }
  :focus-visible { outline: 3px solid #b35c00; outline-offset: 2px; }
  #text { white-space: pre-wrap; border-left: 4px solid #0b4f8a; padding: .5rem .75rem; background: #f3f6f9; margin: .75rem 0; }
  table { border-collapse: collapse; width: 100%; margin-top: .5rem; }
  th, td { text-align: left; padding: .25rem .5rem; border-bottom: 1px solid #c8c8c8; vertical-align: top; }
  td.number { font-variant-numeric: tabular-nums; text-align: right; white-space: nowrap; }
  .error { color: #a50e0e; font-weight: 600; }
</style>
</head>
<body>
<main>
<h1>Sluice review</h1>
<p class="note">The model could not decide these on its own. Choose the right label, or skip when unsure. Your decision trains the next model; follow your organisation's moderation policy.</p>
<form id="token-form">
  <label for="token">Reviewer token <span class="hint">(kept in this tab only)</span></label>
  <input id="token" name="token" type="password" autocomplete="off" required>
  <button id="start" type="submit">Start reviewing</button>
</form>
<p id="progress" aria-live="polite"></p>
<p id="error" class="error" role="alert"></p>
<section id="item" hidden aria-label="Item to review">
  <p class="hint" id="item-meta"></p>
  <div id="text"></div>
  <table id="scores"><caption class="hint">What the model saw</caption><thead><tr><th scope="col">label</th><th scope="col" class="number">score</th><th scope="col">n-grams that pushed towards it</th></tr></thead><tbody></tbody></table>
  <div id="choices" role="group" aria-label="Decision"></div>
</section>
</main>
<script nonce="${n}">
(() => {
  "use strict";
  const LABELS = ${labels};
  const tokenForm = document.getElementById("token-form");
  const tokenField = document.getElementById("token");
  const progress = document.getElementById("progress");
  const error = document.getElementById("error");
  const section = document.getElementById("item");
  const text = document.getElementById("text");
  const meta = document.getElementById("item-meta");
  const scoreRows = document.querySelector("#scores tbody");
  const choices = document.getElementById("choices");
  let token = sessionStorage.getItem("sluice-reviewer-token") || "";
  let lease = sessionStorage.getItem("sluice-review-lease") || "";
  let current = null;
  let busy = false;

  const keyOf = (i) => (i < 9 ? String(i + 1) : "");
  const buttons = [];
  LABELS.forEach((label, i) => {
    const button = document.createElement("button");
    button.type = "button";
    button.dataset.label = label;
    button.textContent = label;
    if (keyOf(i)) { const kbd = document.createElement("kbd"); kbd.textContent = keyOf(i); button.append(kbd); button.setAttribute("aria-keyshortcuts", keyOf(i)); }
    button.addEventListener("click", () => decide({ label }));
    choices.append(button);
    buttons.push(button);
  });
  const skip = document.createElement("button");
  skip.type = "button";
  skip.className = "skip";
  skip.id = "skip";
  skip.textContent = "Skip";
  const skipKey = document.createElement("kbd"); skipKey.textContent = "S"; skip.append(skipKey); skip.setAttribute("aria-keyshortcuts", "S");
  skip.addEventListener("click", () => decide({ skip: true }));
  choices.append(skip);
  buttons.push(skip);

  async function api(path, init) {
    const response = await fetch(path, { ...init, headers: { ...(init && init.headers), authorization: "Bearer " + token } });
    const body = await response.json().catch(() => ({}));
    if (!response.ok) throw new Error((body.error && body.error.message) || "the server answered " + response.status);
    return body;
  }

  function showCounts(counts) {
    const done = counts.decided + counts.skipped;
    progress.textContent = done + " decided, " + counts.pending + " left";
  }

  // A folded feature shows what was written: free (from "frее") — why a lookalike counted.
  function driverText(f) {
    return f.foldedFrom && f.foldedFrom.length > 0 ? f.feature + " (from " + f.foldedFrom.map((s) => JSON.stringify(s)).join(", ") + ")" : f.feature;
  }

  function show(item) {
    current = item;
    section.hidden = item === null;
    if (item === null) { progress.textContent += " — nothing to review right now."; return; }
    meta.textContent = "Item " + item.id + " from " + item.source + ", " + item.createdAt + ", model " + item.modelVersion;
    text.textContent = item.text === null ? "(the text was not stored: REVIEW_STORE_TEXT is off; only its scores are kept)" : item.text;
    scoreRows.replaceChildren();
    const drivers = new Map((item.drivers || []).map((d) => [d.label, d.features]));
    for (const entry of item.scores.slice(0, 3)) {
      const row = document.createElement("tr");
      const label = document.createElement("td"); label.textContent = entry.label;
      const score = document.createElement("td"); score.className = "number"; score.textContent = entry.score === null ? "n/a" : entry.score.toFixed(3);
      const features = document.createElement("td"); features.textContent = (drivers.get(entry.label) || []).map(driverText).join(", ") || "—";
      row.append(label, score, features);
      scoreRows.append(row);
    }
    (buttons.find((b) => b.dataset.label === item.label) || buttons[0]).focus();
  }

  async function next() {
    error.textContent = "";
    const body = await api("/v1/reviews?status=pending&limit=1" + (lease ? "&lease=" + encodeURIComponent(lease) : ""));
    lease = body.lease.id;
    sessionStorage.setItem("sluice-review-lease", lease);
    showCounts(body.counts);
    show(body.items[0] || null);
  }

  async function decide(choice) {
    if (current === null || busy) return;
    busy = true;
    buttons.forEach((b) => (b.disabled = true));
    try {
      await api("/v1/reviews/" + current.id, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ ...choice, lease }) });
      await next();
    } catch (e) {
      error.textContent = e.message;
      await next().catch(() => undefined);
    } finally {
      busy = false;
      buttons.forEach((b) => (b.disabled = false));
      if (current) (buttons.find((b) => b.dataset.label === current.label) || buttons[0]).focus();
    }
  }

  document.addEventListener("keydown", (event) => {
    if (current === null || event.ctrlKey || event.metaKey || event.altKey || event.target === tokenField) return;
    const key = event.key.toLowerCase();
    if (key === "s") { event.preventDefault(); decide({ skip: true }); return; }
    const index = Number(key) - 1;
    if (Number.isInteger(index) && index >= 0 && index < Math.min(9, LABELS.length)) { event.preventDefault(); decide({ label: LABELS[index] }); }
  });

  tokenForm.addEventListener("submit", (event) => {
    event.preventDefault();
    token = tokenField.value.trim();
    sessionStorage.setItem("sluice-reviewer-token", token);
    next().then(() => { tokenForm.hidden = true; }, (e) => { error.textContent = e.message; });
  });
  if (token) next().then(() => { tokenForm.hidden = true; }, (e) => { error.textContent = e.message; });
})();
</script>
</body>
</html>
`;
}
