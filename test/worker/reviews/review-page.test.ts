// The reviewer page in Debian's chromium (playwright-core, no downloaded browser) against the
// Worker in workerd with a real D1 queue: token form, one item at a time with text, scores
// and driving n-grams, keyboard shortcuts for a label and for skip, the progress count, and
// no console errors (a CSP violation of the inline script or style would be one).

import { existsSync, mkdirSync } from "node:fs";
import { chromium, type Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoModel, removeWorkerBundle } from "../helpers/worker-fixture.ts";
import { countRows, eventually, moderate, REVIEWER_TOKEN, reviewTexts, startReviewWorker, type ReviewWorker } from "../helpers/review-worker.ts";

const CHROMIUM = "/usr/bin/chromium";
const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"];

let worker: ReviewWorker;
let url: string;
let browser: Browser;
const texts = reviewTexts(3);

beforeAll(async () => {
  if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is missing: run scripts/setup.sh --browser (installs Debian's chromium)`);
  worker = await startReviewWorker({ REVIEW_STORE_TEXT: "on" }, { host: "127.0.0.1", port: 0 });
  url = (await worker.miniflare.ready).href;
  for (const text of texts) await moderate(worker, text);
  await eventually(() => countRows(worker.db, "review_items"), (n) => n === texts.length);
  browser = await chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS });
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await worker?.miniflare.dispose();
  removeWorkerBundle();
});

describe("the reviewer page", () => {
  it("should show one item at a time and take a label by key 1 and a skip by key S, counting progress", async () => {
    const page = await browser.newPage({ viewport: { width: 900, height: 900 } });
    const problems: string[] = [];
    page.on("console", (message) => {
      if (message.type() === "error") problems.push(`console: ${message.text()}`);
    });
    page.on("pageerror", (error) => problems.push(`page error: ${error.message}`));
    try {
      await page.goto(new URL("/review", url).href);
      const csp = (await page.context().request.get(new URL("/review", url).href)).headers()["content-security-policy"];
      expect(csp).toContain("default-src 'none'");
      expect(csp).not.toContain("unsafe-inline");
      await page.fill("#token", REVIEWER_TOKEN);
      await page.press("#token", "Enter");
      await page.waitForSelector("#item:not([hidden])");
      expect(await page.textContent("#progress")).toBe("0 decided, 3 left");
      expect(await page.textContent("#text")).toBe(texts[0]);
      // The top labels with scores, and n-grams for the first.
      expect(await page.locator("#scores tbody tr").count()).toBe(3);
      expect((await page.locator("#scores tbody tr td").nth(2).textContent())?.length).toBeGreaterThan(1);
      // One button per label with its key, and skip.
      const labels = demoModel().labels;
      expect(await page.locator("#choices button").count()).toBe(labels.length + 1);

      await page.keyboard.press("1");
      await page.waitForFunction((text) => document.getElementById("text")?.textContent !== text, texts[0]);
      expect(await page.textContent("#text")).toBe(texts[1]);
      expect(await page.textContent("#progress")).toBe("1 decided, 2 left");
      await page.keyboard.press("s");
      await page.waitForFunction((text) => document.getElementById("text")?.textContent !== text, texts[1]);
      expect(await page.textContent("#progress")).toBe("2 decided, 1 left");

      const rows = (await worker.db.prepare("SELECT status, decided_label FROM review_items ORDER BY id").all<{ status: string; decided_label: string | null }>()).results;
      expect(rows.slice(0, 2)).toEqual([
        { status: "decided", decided_label: labels[0] },
        { status: "skipped", decided_label: null },
      ]);
      mkdirSync("test/output", { recursive: true });
      await page.screenshot({ path: "test/output/review-page.png", fullPage: true });
      expect(problems).toEqual([]);
    } finally {
      await page.close();
    }
  });
});
