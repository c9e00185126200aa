// Privacy and retention in real workerd with a real D1 database: with REVIEW_STORE_TEXT off
// no submitted text reaches any table, only the keyed hash and the scores; the cron handler
// deletes exactly the rows older than REVIEW_RETENTION_DAYS; a missing or failing database
// never fails a request, and the loss is counted.

import { createHmac } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { keyedHash } from "../../../runtime/worker/reviews/keyed-hash.ts";
import { removeWorkerBundle, startWorker, type RunningWorker } from "../helpers/worker-fixture.ts";
import { bearer, countRows, eventually, moderate, REVIEWER_TOKEN, reviewTexts, startReviewWorker, type D1, type ReviewWorker } from "../helpers/review-worker.ts";

const HASH_KEY = "hash-key-for-tests";
let textOff: ReviewWorker;

beforeAll(async () => {
  textOff = await startReviewWorker({ REVIEW_HASH_KEY: HASH_KEY, REVIEW_RETENTION_DAYS: "30" });
}, 120_000);

afterAll(async () => {
  await textOff?.miniflare.dispose();
  removeWorkerBundle();
});

/** Every text value in every table of the database. */
async function everyStoredString(db: D1): Promise<string[]> {
  const tables = (await db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name NOT LIKE '_cf_%'").all<{ name: string }>()).results.map((r) => r.name);
  const values: string[] = [];
  for (const table of tables) {
    for (const row of (await db.prepare(`SELECT * FROM ${table}`).all<Record<string, unknown>>()).results) {
      for (const value of Object.values(row)) if (typeof value === "string") values.push(value);
    }
  }
  return values;
}

describe("the keyed hash", () => {
  it("should match RFC 4231 test case 2 and Node's HMAC-SHA256", async () => {
    // RFC 4231 §4.3 (test case 2): key "Jefe", data "what do ya want for nothing?".
    expect(await keyedHash("Jefe", "what do ya want for nothing?")).toBe("5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843");
    const text = "Grüße aus Vellumcroft — order #A12345";
    expect(await keyedHash(HASH_KEY, text)).toBe(createHmac("sha256", HASH_KEY).update(text, "utf8").digest("hex"));
  });
});

describe("with text storage off", () => {
  it("should keep no submitted text in any table, only the keyed hash and the scores", async () => {
    const texts = reviewTexts(3);
    for (const text of texts) expect(((await (await moderate(textOff, text)).json()) as { action: string }).action).toBe("review");
    await eventually(() => countRows(textOff.db, "review_items"), (n) => n === 3);
    const rows = (await textOff.db.prepare("SELECT text, text_hash, scores FROM review_items ORDER BY id").all<{ text: string | null; text_hash: string; scores: string }>()).results;
    expect(rows.map((r) => r.text)).toEqual([null, null, null]);
    expect(rows.map((r) => r.text_hash)).toEqual(texts.map((t) => createHmac("sha256", HASH_KEY).update(t, "utf8").digest("hex")));
    expect(JSON.parse(rows[0].scores).length).toBeGreaterThan(0);
    const stored = await everyStoredString(textOff.db);
    for (const text of texts) {
      // Not the text, nor any 20-character piece of it.
      for (let i = 0; i + 20 <= text.length; i += 10) expect(stored.some((value) => value.includes(text.slice(i, i + 20)))).toBe(false);
    }
    const exported = await textOff.fetch("/v1/reviews/export", { headers: bearer(REVIEWER_TOKEN) });
    expect(await exported.text()).toBe("");
  });
});

describe("retention", () => {
  it("should delete exactly the review items and samples older than REVIEW_RETENTION_DAYS when the cron handler runs", async () => {
    const now = Date.UTC(2026, 11, 3, 3, 17);
    const day = 86_400_000;
    const ages = { expired: now - 30 * day - 1, atCutoff: now - 30 * day, recent: now - 29 * day, older: now - 400 * day };
    await textOff.db.prepare("DELETE FROM review_items").run();
    for (const [name, createdAt] of Object.entries(ages)) {
      await textOff.db.prepare("INSERT INTO review_items (created_at, source, model_version, label, score, action, scores, reasons) VALUES (?, 'moderate', ?, 'ok', 0.5, 'review', '[]', '[]')").bind(createdAt, name).run();
      await textOff.db
        .prepare("INSERT INTO shadow_samples (created_at, hour, live_version, candidate_version, text, live_label, live_score, live_action, candidate_label, candidate_score, candidate_action) VALUES (?, 0, ?, 'c', 't', 'ok', 0.5, 'allow', 'spam', 0.9, 'block')")
        .bind(createdAt, name)
        .run();
    }
    // Miniflare's Fetcher of the Worker also carries scheduled() (miniflare 4 docs, "getWorker").
    const scheduled = (await textOff.miniflare.getWorker()) as unknown as { scheduled(options: { scheduledTime: Date; cron: string }): Promise<unknown> };
    await scheduled.scheduled({ scheduledTime: new Date(now), cron: "17 3 * * *" });
    const kept = (await textOff.db.prepare("SELECT model_version FROM review_items ORDER BY created_at").all<{ model_version: string }>()).results.map((r) => r.model_version);
    expect(kept).toEqual(["atCutoff", "recent"]);
    const keptSamples = (await textOff.db.prepare("SELECT live_version FROM shadow_samples ORDER BY created_at").all<{ live_version: string }>()).results.map((r) => r.live_version);
    expect(keptSamples).toEqual(["atCutoff", "recent"]);
  });
});

describe("when the database is missing or failing", () => {
  let missing: RunningWorker;
  let failing: ReviewWorker;

  beforeAll(async () => {
    // No REVIEWS binding at all; and a binding whose tables were never created (every write fails).
    [missing, failing] = await Promise.all([startWorker({ REVIEWER_TOKEN, CANDIDATE: "off" }), startReviewWorker({}, { migrate: false })]);
  }, 120_000);

  afterAll(async () => {
    await Promise.all([missing?.miniflare.dispose(), failing?.miniflare.dispose()]);
  });

  async function stats(worker: RunningWorker): Promise<{ database: string; isolate: { reviewsLost: number; writesFailed: number; reviewsStored: number } }> {
    const response = await worker.fetch("/v1/stats", { headers: bearer(REVIEWER_TOKEN) });
    expect(response.status).toBe(200);
    return response.json() as never;
  }

  it("should still answer every request and count the review items it could not store", async () => {
    const texts = reviewTexts(3);
    for (const worker of [missing, failing]) {
      for (const text of texts) {
        const response = await moderate(worker, text);
        expect(response.status).toBe(200);
        expect(((await response.json()) as { action: string }).action).toBe("review");
      }
      expect((await moderate(worker, "Hello, when will the Mossel desk lamp be back in stock?")).status).toBe(200);
    }
    const withoutBinding = await stats(missing);
    expect(withoutBinding.database).toBe("missing");
    expect(withoutBinding.isolate.reviewsLost).toBe(3);
    const broken = await eventually(() => stats(failing), (s) => s.isolate.writesFailed === 4);
    expect(broken.database).toBe("failing");
    expect(broken.isolate.reviewsLost).toBe(3);
    expect(broken.isolate.reviewsStored).toBe(0);
    // The reviewer API says the database failed instead of pretending the queue is empty.
    expect((await failing.fetch("/v1/reviews", { headers: bearer(REVIEWER_TOKEN) })).status).toBe(503);
  });
});
