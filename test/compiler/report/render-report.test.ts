import { beforeAll, describe, expect, it } from "vitest";
import { evaluateModel } from "../../../compiler/evaluate/evaluate.ts";
import { renderReport } from "../../../compiler/report/render-report.ts";
import { RAMP_RULE } from "../../../compiler/report/colour-ramp.ts";
import { escapeHtml } from "../../../compiler/report/escape-html.ts";
import { REPORT_WORDS } from "../../../compiler/report/report-words.ts";
import type { Model } from "../../../runtime/model/model.ts";
import type { ReportExample } from "../../../compiler/report/report-data.ts";
import { AMPERSAND_LABEL, buildReportModel, SCRIPT_LABEL, TEXT_PAYLOAD, TRAINING_SHA256 } from "./report-test-model.ts";

let model: Model;
let examples: ReportExample[];
let html: string;

beforeAll(async () => {
  ({ model, examples } = await buildReportModel());
  html = renderReport(model, examples, undefined, { dataName: "<i>held-out</i>.jsonl", dataSha256: "cd".repeat(32) });
});

/** Every start tag in the page (text content is escaped, so it holds no "<"). */
function startTags(page: string): string[] {
  return page.match(/<[a-zA-Z][^<>]*>/g) ?? [];
}

/** The text of the element whose start tag carries `id`, up to the next tag. */
function textAfterId(page: string, id: string): string {
  const match = new RegExp(`id="${id}"[^>]*>([^<]*)<`).exec(page);
  return match ? match[1] : "";
}

describe("renderReport", () => {
  it("escapes labels that contain markup wherever they appear", () => {
    // WHATWG HTML, "escaping a string": & < > and quotes must be replaced by character
    // references for text to stay text in element content and attribute values.
    expect(html).not.toContain(SCRIPT_LABEL);
    expect(html).toContain("&lt;script&gt;alert(&quot;label&quot;)&lt;/script&gt;");
    expect(html).not.toContain(AMPERSAND_LABEL);
    expect(html).toContain("fees &amp; &quot;refunds&quot; &#39;now&#39;");
    expect(startTags(html).some((tag) => /^<script/i.test(tag))).toBe(false);
  });

  it("escapes texts from the data and the data file name", () => {
    // Same source. The mislabelled examples carry the payload, so it is among the confident mistakes.
    expect(html).not.toContain(TEXT_PAYLOAD);
    expect(html).toContain("&lt;img src=x onerror=&quot;alert(1)&quot;&gt;");
    expect(html).not.toContain("<i>held-out</i>");
    expect(html).toContain("&lt;i&gt;held-out&lt;/i&gt;.jsonl");
    expect(startTags(html).some((tag) => /^<img/i.test(tag))).toBe(false);
  });

  it("references nothing over the network", () => {
    // A self-contained page has no http(s) URL in any src or href, no external style sheet,
    // no CSS url() or @import, and no script (common practice, no source).
    const attributes = startTags(html).flatMap((tag) => [...tag.matchAll(/\s(src|href)\s*=\s*"([^"]*)"/gi)].map((m) => m[2]));
    expect(attributes.length).toBeGreaterThan(0);
    for (const value of attributes) expect(value).not.toMatch(/^\s*(https?:)?\/\//i);
    const style = /<style>([\s\S]*?)<\/style>/.exec(html)?.[1] ?? "";
    expect(style.length).toBeGreaterThan(100);
    expect(style).not.toMatch(/url\(|@import/i);
    expect(startTags(html).filter((tag) => /^<(script|iframe|object|embed|link\s[^>]*stylesheet)/i.test(tag))).toEqual([]);
  });

  it("gives every svg role img, a title and a description it is labelled by", () => {
    // W3C SVG Accessibility API Mappings 1.0, "Name and Description" (from memory): an <svg>
    // with role="img" takes its accessible name from the elements aria-labelledby names; the
    // <title> and <desc> children are the text alternative WCAG 2.1 SC 1.1.1 asks for.
    const charts = html.match(/<svg\b[^>]*>[\s\S]*?<\/svg>/g) ?? [];
    expect(charts.length).toBeGreaterThanOrEqual(6); // confusion, 3 PR panels, reliability, compile cost
    for (const chart of charts) {
      const open = /^<svg\b[^>]*>/.exec(chart)?.[0] ?? "";
      expect(open).toContain('role="img"');
      const [titleId, descriptionId] = (/aria-labelledby="([^"]+)"/.exec(open)?.[1] ?? "").split(" ");
      expect(chart).toMatch(new RegExp(`<title id="${titleId}">[^<]+</title>`));
      expect(chart).toMatch(new RegExp(`<desc id="${descriptionId}">[^<]+</desc>`));
      expect(textAfterId(chart, descriptionId).length).toBeGreaterThan(40);
    }
  });

  it("uses every id once and points aria-labelledby only at ids that exist", () => {
    // WHATWG HTML, "the id attribute": the value must be unique among all the IDs in the element's tree.
    const ids = [...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
    expect(new Set(ids).size).toBe(ids.length);
    const references = [...html.matchAll(/aria-labelledby="([^"]+)"/g)].flatMap((m) => m[1].split(" "));
    for (const reference of references) expect(ids).toContain(reference);
  });

  it("declares the page language and keeps heading levels in order", () => {
    // WCAG 2.1 SC 3.1.1 (language of page) and technique G141 (headings nest without skipping levels).
    expect(html).toMatch(/<html lang="en">/);
    const levels = [...html.matchAll(/<h([1-6])\b/g)].map((m) => Number(m[1]));
    expect(levels[0]).toBe(1);
    expect(levels.filter((level) => level === 1)).toHaveLength(1);
    for (let i = 1; i < levels.length; i++) expect(levels[i] - levels[i - 1]).toBeLessThanOrEqual(1);
  });

  it("prints the Wilson 95% interval of each label's precision", () => {
    // R package contingencytables (Fagerland, Lydersen & Laake 2017), tests/testthat/test-ch2.R:
    // Wilson_score_CI_1x2(X = 13, n = 16) → 95% CI 0.5699 to 0.9341. Here 13 of the 16 texts
    // predicted as the first label are right; the third label is never predicted.
    const evaluation = evaluateModel(model, examples);
    evaluation.confusion = [
      [13, 2, 0],
      [2, 20, 0],
      [1, 0, 0],
    ];
    const page = renderReport(model, examples, evaluation);
    const table = /<table class="label-table">[\s\S]*?<\/table>/.exec(page)?.[0] ?? "";
    const firstRow = /<tbody><tr>([\s\S]*?)<\/tr>/.exec(table)?.[1] ?? "";
    // 13 / 16 = 0.8125 exactly; ECMAScript Number.prototype.toFixed picks the larger n on a tie → "0.813".
    expect(firstRow).toContain("0.813");
    expect(firstRow).toContain("0.570–0.934");
    expect(table).toContain("no predictions");
  });

  it("marks the policy threshold with the precision and recall measured at score ≥ threshold", () => {
    // Precision = TP / predicted, recall = TP / positives, a text counting as the label when
    // its score ≥ the threshold (the convention of scikit-learn's precision_recall_curve and of
    // the policy's rule). Counted here directly from the runtime's scores.
    const rule = model.meta.policy?.rules[0];
    expect(rule?.label).toBe(SCRIPT_LABEL);
    const k = model.labels.indexOf(SCRIPT_LABEL);
    let predicted = 0;
    let right = 0;
    for (const example of examples) {
      if (model.score(example.text).scores[k] < (rule?.threshold ?? 1)) continue;
      predicted++;
      if (example.labels.includes(SCRIPT_LABEL)) right++;
    }
    expect(predicted).toBeGreaterThan(0);
    expect(html).toContain(`block at ≥ ${rule?.threshold.toFixed(3)}: precision ${(right / predicted).toFixed(3)}`);
    expect(html).toContain(`(${right} right of ${predicted} predicted)`);
    // The other labels have no rule: their argmax point is marked instead.
    expect(html.match(/top label \(argmax\): precision/g)?.length ?? 0).toBeGreaterThanOrEqual(2);
  });

  it("marks the start of a review band as its own point", async () => {
    // Same convention (score ≥ threshold); the review band is [reviewFrom, threshold) as runtime/model/policy.ts documents.
    const { model: banded, examples: data } = await buildReportModel();
    (banded.meta as { policy: unknown }).policy = { rules: [{ label: SCRIPT_LABEL, action: "block", threshold: 0.9, reviewFrom: 0.4 }] };
    const k = banded.labels.indexOf(SCRIPT_LABEL);
    let predicted = 0;
    let right = 0;
    for (const example of data) {
      if (banded.score(example.text).scores[k] < 0.4) continue;
      predicted++;
      if (example.labels.includes(SCRIPT_LABEL)) right++;
    }
    const page = renderReport(banded, data);
    expect(page).toContain(`review from ≥ 0.400: precision ${(right / predicted).toFixed(3)}`);
    expect(page).toContain(`(${right} right of ${predicted} predicted)`);
    expect(page).toContain("block at ≥ 0.900");
    expect(page).toMatch(/<polygon points="[^"]+" fill="#ffffff"/); // the review marker is an open diamond
  });

  it("draws 15 equal-width reliability bins and prints their expected calibration error", () => {
    // Guo, Pleiss, Sun & Weinberger, ICML 2017, §2 and their experiments: M = 15 bins,
    // bin m holds confidences in ((m−1)/M, m/M], ECE = Σ |B_m|/n · |acc(B_m) − conf(B_m)|.
    // Recomputed here from the runtime's top scores.
    const count = new Array(15).fill(0);
    const correct = new Array(15).fill(0);
    const confidence = new Array(15).fill(0);
    for (const example of examples) {
      const scores = model.score(example.text).scores;
      let best = 0;
      for (let j = 1; j < scores.length; j++) if (scores[j] > scores[best]) best = j;
      const bin = Math.min(14, Math.max(0, Math.ceil(scores[best] * 15) - 1));
      count[bin]++;
      confidence[bin] += scores[best];
      if (model.labels[best] === example.labels[0]) correct[bin]++;
    }
    let ece = 0;
    for (let b = 0; b < 15; b++) if (count[b] > 0) ece += (count[b] / examples.length) * Math.abs(correct[b] / count[b] - confidence[b] / count[b]);
    expect(html).toContain(`ECE ${ece.toFixed(3)} (15 bins)`);
    const bins = /reliability bins<\/caption>[\s\S]*?<tbody>([\s\S]*?)<\/tbody>/.exec(html)?.[1] ?? "";
    expect(bins.match(/<tr>/g)).toHaveLength(15);
  });

  it("shows the shipped size and the header's draft and compiled quality", () => {
    // The values come from the model file itself (runtime/format/FORMAT.md header metrics); the page
    // must print them unchanged (common practice, no source).
    const draft = model.meta.metrics.draft as { accuracy: number };
    const compiled = model.meta.metrics.compiled as { accuracy: number };
    const table = /size and quality of each compile step<\/caption>[\s\S]*?<\/table>/.exec(html)?.[0] ?? "";
    expect(table).toContain(draft.accuracy.toFixed(3));
    expect(table).toContain(compiled.accuracy.toFixed(3));
    expect(table).toContain(String(model.meta.bytes).replace(/\B(?=(\d{3})+(?!\d))/g, "\u202f"));
  });

  it("warns only when the data is the file the model was trained on", () => {
    // Scoring training data overstates accuracy (common practice, no source).
    expect(html).not.toContain("This is the file the model was built from");
    const same = renderReport(model, examples, undefined, { dataSha256: TRAINING_SHA256.toUpperCase() });
    expect(same).toContain("This is the file the model was built from");
  });

  it("carries the note on automatic blocking and the provenance", () => {
    expect(html).toContain("Automatic blocking can hurt legitimate users");
    expect(html).toContain("Keep a review band.");
    expect(html).toContain("Measure false positives on your own data.");
    expect(html).toContain("Follow your own policies and local law.");
    expect(html).toContain(TRAINING_SHA256);
    expect(html).toContain("2026-01-01T00:00:00.000Z");
  });

  it("shows provenance as sizes, counts and phrases, never raw serialized bytes or objects", () => {
    const provenance = html.slice(html.indexOf("<h3>Build</h3>"));
    expect(provenance).toMatch(/Bloom filter of [\d\u202f]+ training texts/);
    // Node's Buffer JSON ({"type":"Buffer","data":[…]}), a long run of numbers, or any JSON object.
    expect(provenance).not.toMatch(/&quot;data&quot;|"data":/);
    expect(provenance).not.toMatch(/\d+,\d+,\d+,\d+,\d+,\d+/);
    expect(provenance).not.toMatch(/\{&quot;|\{"/);
  });

  it("titles axes and legends in its own words, and states the colour ramp's rule", () => {
    for (const words of Object.values(REPORT_WORDS)) expect(html).toContain(escapeHtml(words));
    for (const borrowed of ["predicted label", "gold label", "perfect calibration", "viridis"]) expect(html.toLowerCase()).not.toContain(borrowed);
    expect(html).toContain(escapeHtml(RAMP_RULE));
  });

  it("is a pure function: the same inputs give the same page", () => {
    const again = renderReport(model, examples, undefined, { dataName: "<i>held-out</i>.jsonl", dataSha256: "cd".repeat(32) });
    expect(again).toBe(html);
  });
});
