// The report opened in a real browser (Debian's chromium, driven by playwright-core): the page
// must load with no console error and no request beyond its own file, its charts must be
// there with their text alternatives, and markup in labels must stay text. A screenshot of the
// demo report goes to test/output/report.png for people to look at.

import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { chromium, type Browser, type Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { build } from "../../../compiler/build/build.ts";
import { defaultBuildSettings } from "../../../compiler/build/build-settings.ts";
import { readExamples, type Example } from "../../../compiler/read/index.ts";
import { renderReport } from "../../../compiler/report/render-report.ts";
import { loadModel } from "../../../runtime/format/load-model.ts";
import { buildReportModel, SCRIPT_LABEL } from "./report-test-model.ts";

const REPO = resolve(dirname(fileURLToPath(import.meta.url)), "../../..");
const OUTPUT = join(REPO, "test/output");
const CHROMIUM = "/usr/bin/chromium";
const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"];

let browser: Browser;
let demoPath: string;
let hostilePath: string;

/** Everything the page did that a self-contained report must not do. */
interface PageTrouble {
  consoleErrors: string[];
  pageErrors: string[];
  failedRequests: string[];
  requests: string[];
}

async function openReport(path: string): Promise<{ page: Page; trouble: PageTrouble }> {
  const page = await browser.newPage({ viewport: { width: 1200, height: 900 } });
  const trouble: PageTrouble = { consoleErrors: [], pageErrors: [], failedRequests: [], requests: [] };
  page.on("console", (message) => {
    if (message.type() === "error" || message.type() === "warning") trouble.consoleErrors.push(message.text());
  });
  page.on("pageerror", (error) => trouble.pageErrors.push(error.message));
  page.on("requestfailed", (request) => trouble.failedRequests.push(request.url()));
  page.on("request", (request) => trouble.requests.push(request.url()));
  await page.goto(pathToFileURL(path).href, { waitUntil: "load" });
  return { page, trouble };
}

beforeAll(async () => {
  if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is missing: install Debian's chromium (scripts/setup.sh --browser) to run the page tests`);
  mkdirSync(OUTPUT, { recursive: true });

  // The demo model, built as the README builds it: a block rule for spam, a review rule for abusive.
  const dataFile = join(REPO, "demo-data/contact-form.jsonl");
  const examples: Example[] = [];
  for await (const example of readExamples(dataFile, { textFields: ["message"], labelField: "label" })) examples.push(example);
  const settings = { ...defaultBuildSettings(), targetPrecision: { spam: 0.95 }, targetRecall: { abusive: 0.9 }, reviewBelow: 0.6, maxBytes: 128 * 1024, searchTime: 0 };
  const dataSha256 = createHash("sha256").update(readFileSync(dataFile)).digest("hex");
  const { bytes } = await build({ examples, settings, buildTime: "2026-01-01T00:00:00.000Z", dataSha256, dataName: "contact-form.jsonl", fields: { text: ["message"], label: "label" } });
  demoPath = join(OUTPUT, "report.html");
  writeFileSync(demoPath, renderReport(loadModel(bytes), examples, undefined, { dataName: "contact-form.jsonl", dataSha256 }));

  const hostile = await buildReportModel();
  hostilePath = join(OUTPUT, "report-hostile-labels.html");
  writeFileSync(hostilePath, renderReport(hostile.model, hostile.examples));

  browser = await chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS });
});

afterAll(async () => {
  await browser?.close();
});

describe("the report in a browser", () => {
  it("loads with no console error, no failed request and no request but its own file", async () => {
    // A self-contained page fetches nothing (common practice, no source); the page's CSP would
    // log a console error for any blocked fetch, so an empty console also shows none was tried.
    const { page, trouble } = await openReport(demoPath);
    expect(trouble.consoleErrors).toEqual([]);
    expect(trouble.pageErrors).toEqual([]);
    expect(trouble.failedRequests).toEqual([]);
    expect(trouble.requests).toEqual([pathToFileURL(demoPath).href]);
    await page.close();
  });

  it("shows at least four charts, each an img with a title and a description", async () => {
    // W3C SVG Accessibility API Mappings 1.0, "Name and Description" (from memory): role="img"
    // plus aria-labelledby pointing at <title> and <desc> names and describes the chart.
    const { page } = await openReport(demoPath);
    const charts = page.locator("svg[role=img]");
    expect(await charts.count()).toBeGreaterThanOrEqual(4);
    const labelled = await page.evaluate(() =>
      [...document.querySelectorAll("svg[role=img]")].map((svg) => {
        const ids = (svg.getAttribute("aria-labelledby") ?? "").split(" ");
        const title = svg.querySelector(":scope > title")?.textContent ?? "";
        const description = svg.querySelector(":scope > desc")?.textContent ?? "";
        return { title, description, resolved: ids.every((id) => document.getElementById(id) !== null), box: svg.getBoundingClientRect().width };
      }),
    );
    for (const chart of labelled) {
      expect(chart.title.length).toBeGreaterThan(0);
      expect(chart.description.length).toBeGreaterThan(40);
      expect(chart.resolved).toBe(true);
      expect(chart.box).toBeGreaterThan(200);
    }
    // Each chart's data table is one click away: a <details> inside its figure.
    expect(await page.locator("figure details table").count()).toBeGreaterThanOrEqual(4);
    await page.screenshot({ path: join(OUTPUT, "report.png"), fullPage: true });
    await page.close();
  });

  it("keeps markup in labels and texts as text: no script or img element appears", async () => {
    // The browser's own HTML parser is the reference: escaped markup parses to text nodes.
    const { page, trouble } = await openReport(hostilePath);
    const found = await page.evaluate(() => ({
      scripts: document.querySelectorAll("script").length,
      images: document.querySelectorAll("img").length,
      headings: [...document.querySelectorAll("h3")].map((h) => h.textContent),
    }));
    expect(found.scripts).toBe(0);
    expect(found.images).toBe(0);
    expect(found.headings).toContain(SCRIPT_LABEL);
    expect(trouble.consoleErrors).toEqual([]);
    expect(trouble.pageErrors).toEqual([]);
    await page.close();
  });
});
