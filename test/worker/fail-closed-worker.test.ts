// Fail-closed edges of the Worker bundle in real workerd (Miniflare): 1 MiB single words in
// several scripts on every scoring route, the probe's spam-plus-127k-word body at the default
// limit, and a set-but-blank API_TOKEN, which must answer 500 bad-config, not run open.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { jsonPost, removeWorkerBundle, startWorker, type RunningWorker } from "./helpers/worker-fixture.ts";

const MEBIBYTE = 1024 * 1024;
const longWord = (unit: string, length: number) => unit.repeat(Math.ceil(length / unit.length)).slice(0, length);
const SPAM = "WIN A FREE PRIZE!!! Click www.example.net/win to claim your reward now";

let roomy: RunningWorker;
let standard: RunningWorker;
let blankToken: RunningWorker;

beforeAll(async () => {
  [roomy, standard, blankToken] = await Promise.all([
    startWorker({ MAX_BODY_BYTES: String(8 * MEBIBYTE) }),
    startWorker({}),
    startWorker({ API_TOKEN: "   " }),
  ]);
});

afterAll(async () => {
  await Promise.all([roomy, standard, blankToken].map((worker) => worker?.miniflare.dispose()));
  removeWorkerBundle();
});

describe("the Worker with 1 MiB single words", () => {
  // Latin, Cyrillic and CJK letters (Unicode charts), the last as 3-byte UTF-8. Moderation
  // decides and, for anything it does not allow, explains: both featurizer paths.
  it.each([["Latin", "a"], ["Cyrillic", "я"], ["CJK", "字"]])("should moderate a %s word", async (_script, unit) => {
    const moderated = await roomy.fetch("/v1/moderate", jsonPost({ text: `${SPAM} ${longWord(unit, MEBIBYTE)}` }));
    expect(moderated.status).toBe(200);
    const decision = (await moderated.json()) as { action: string; fault?: unknown };
    expect(decision.fault).toBeUndefined();
    expect(decision.action).not.toBe("allow");
  });

  it.each([["Latin", "a"], ["Cyrillic", "я"], ["CJK", "字"]])("should classify and explain a %s word", async (_script, unit) => {
    const text = `${SPAM} ${longWord(unit, MEBIBYTE)}`;
    const classified = await roomy.fetch("/v1/classify", jsonPost({ text }));
    expect(classified.status).toBe(200);
    for (const { score } of ((await classified.json()) as { labels: { score: number }[] }).labels) expect(Number.isFinite(score)).toBe(true);
    const explained = await roomy.fetch("/v1/explain", jsonPost({ text }));
    expect(explained.status).toBe(200);
    expect(((await explained.json()) as { labels: unknown[] }).labels.length).toBeGreaterThan(0);
  });

  it("should not let one 127k-character word turn a block into a 500 at the default body limit", async () => {
    const response = await standard.fetch("/v1/moderate", jsonPost({ text: `${SPAM} ${longWord("x", 127 * 1024)}` }));
    expect(response.status).toBe(200);
    expect(((await response.json()) as { action: string }).action).not.toBe("allow");
  });
});

describe("the Worker with a blank API_TOKEN", () => {
  it.each([
    ["GET", "/v1/model"],
    ["POST", "/v1/classify"],
    ["POST", "/v1/moderate"],
    ["POST", "/v1/explain"],
  ])("should answer %s %s with 500 bad-config instead of running open", async (method, path) => {
    const response = await blankToken.fetch(path, method === "GET" ? undefined : jsonPost({ text: "hello" }));
    expect(response.status).toBe(500);
    expect(((await response.json()) as { error: { code: string } }).error.code).toBe("bad-config");
  });
});
