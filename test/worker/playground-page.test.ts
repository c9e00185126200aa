// The playground page in headless Chromium against the Worker in workerd on loopback:
// type a text, submit (by button and by keyboard), read the label; no console errors (a CSP
// violation of the inline script or style would be one); labels, focus order and contrast
// checked against WCAG 2.2. A screenshot goes to test/output/ (gitignored).

import { existsSync, mkdirSync } from "node:fs";
import { chromium, type Browser, type Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Model } from "../../runtime/model/model.ts";
import { demoModel, startWorker, removeWorkerBundle, type RunningWorker } from "./helpers/worker-fixture.ts";

const CHROMIUM = "/usr/bin/chromium";
const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"];
const SPAM = "WIN a FREE prize!!! Click www.example.net/win to claim your reward now";
const QUESTION = "Hello, could you tell me when the Mossel desk lamp will be back in stock? Thanks, Ines";
const TOKEN = "playground-t0ken";

let model: Model;
let open: RunningWorker;
let guarded: RunningWorker;
let openUrl: string;
let guardedUrl: string;
let browser: Browser;

beforeAll(async () => {
  if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is missing: run scripts/setup.sh --browser (installs Debian's chromium)`);
  model = demoModel();
  const loopback = { host: "127.0.0.1", port: 0 };
  [open, guarded] = await Promise.all([startWorker({}, loopback), startWorker({ API_TOKEN: TOKEN }, loopback)]);
  openUrl = (await open.miniflare.ready).href;
  guardedUrl = (await guarded.miniflare.ready).href;
  browser = await chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS });
});

afterAll(async () => {
  await browser?.close();
  await Promise.all([open?.miniflare.dispose(), guarded?.miniflare.dispose()]);
  removeWorkerBundle();
});

/** A fresh page that records console errors, uncaught exceptions and CSP violations. */
async function openPage(url: string): Promise<{ page: Page; problems: string[] }> {
  const page = await browser.newPage({ viewport: { width: 900, height: 900 } });
  const problems: string[] = [];
  page.on("console", (message) => {
    if (message.type() === "error") problems.push(`console: ${message.text()}`);
  });
  page.on("pageerror", (error) => problems.push(`page error: ${error.message}`));
  await page.goto(url);
  return { page, problems };
}

async function topLabel(page: Page): Promise<string> {
  return (await page.locator("#scores tr.score-row td.label").first().textContent()) ?? "";
}

describe("the playground page", () => {
  it("shows the label of a typed text after submitting, without console errors", async () => {
    const { page, problems } = await openPage(openUrl);
    try {
      await page.getByLabel("Text to classify").fill(SPAM);
      await page.getByRole("button", { name: "Classify" }).click();
      await page.locator("#decision").waitFor();
      expect(await topLabel(page)).toBe(model.classify(SPAM, { top: 1 })[0].label);
      expect(await page.locator("#decision").textContent()).toContain(model.decide(SPAM).action);
      // The features table lists what pushed the top label.
      expect(await page.getByRole("table", { name: "Features behind spam" }).locator("tr").count()).toBeGreaterThan(1);
      mkdirSync(new URL("../output/", import.meta.url), { recursive: true });
      await page.screenshot({ path: new URL("../output/playground.png", import.meta.url).pathname, fullPage: true });
      expect(problems).toEqual([]);
    } finally {
      await page.close();
    }
  });

  it("can be used with the keyboard alone", async () => {
    const { page, problems } = await openPage(openUrl);
    try {
      // WCAG 2.2 SC 2.1.1 (Keyboard) and 2.4.3 (Focus Order): text, token, then the button.
      await page.getByLabel("Text to classify").focus();
      await page.keyboard.type(QUESTION);
      await page.keyboard.press("Tab");
      expect(await page.evaluate(() => document.activeElement?.id)).toBe("token");
      await page.keyboard.press("Tab");
      expect(await page.evaluate(() => document.activeElement?.id)).toBe("submit");
      await page.keyboard.press("Enter");
      await page.locator("#decision").waitFor();
      expect(await topLabel(page)).toBe("ok");
      // Ctrl+Enter in the text field submits as well.
      await page.getByLabel("Text to classify").fill(SPAM);
      await page.getByLabel("Text to classify").press("Control+Enter");
      await expect.poll(() => topLabel(page)).toBe("spam");
      expect(problems).toEqual([]);
    } finally {
      await page.close();
    }
  });

  it("has text with at least 4.5:1 contrast against its background", async () => {
    const { page } = await openPage(openUrl);
    try {
      await page.getByLabel("Text to classify").fill(QUESTION);
      await page.getByRole("button", { name: "Classify" }).click();
      await page.locator("#decision").waitFor();
      const ratios = await page.evaluate(() => {
        // WCAG 2.2 SC 1.4.3 and its definitions of relative luminance and contrast ratio.
        const channel = (value: number) => {
          const c = value / 255;
          return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
        };
        const rgb = (color: string) => (color.match(/[\d.]+/g) ?? []).map(Number);
        const luminance = ([r, g, b]: number[]) => 0.2126 * channel(r) + 0.7152 * channel(g) + 0.0722 * channel(b);
        const background = (element: Element | null): number[] => {
          for (let node = element; node; node = node.parentElement) {
            const parts = rgb(getComputedStyle(node).backgroundColor);
            if (parts.length === 3 || (parts.length === 4 && parts[3] > 0)) return parts.slice(0, 3);
          }
          return [255, 255, 255];
        };
        const selectors = ["h1", ".model", "label", ".hint", "textarea", "button", "caption", "th", "td", ".decision"];
        return selectors.map((selector) => {
          const element = document.querySelector(selector) as Element;
          const foreground = luminance(rgb(getComputedStyle(element).color).slice(0, 3));
          const back = luminance(background(element));
          return { selector, ratio: (Math.max(foreground, back) + 0.05) / (Math.min(foreground, back) + 0.05) };
        });
      });
      for (const { selector, ratio } of ratios) expect(ratio, selector).toBeGreaterThanOrEqual(4.5);
    } finally {
      await page.close();
    }
  });

  it("sends the token typed into the page and shows the server's error without one", async () => {
    const { page, problems } = await openPage(guardedUrl);
    try {
      await page.getByLabel("Text to classify").fill(QUESTION);
      await page.getByRole("button", { name: "Classify" }).click();
      await expect.poll(() => page.getByRole("alert").textContent()).toContain("Authorization");
      await page.getByLabel("API token").fill(TOKEN);
      await page.getByRole("button", { name: "Classify" }).click();
      await page.locator("#decision").waitFor();
      expect(await topLabel(page)).toBe("ok");
      expect(await page.getByRole("alert").textContent()).toBe("");
      // The failed call is the only console error the browser reports (its 401 resource error).
      expect(problems.filter((problem) => !problem.includes("401"))).toEqual([]);
    } finally {
      await page.close();
    }
  });
});
