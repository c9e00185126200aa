// The review queue in real workerd with a real D1 database: review decisions of /v1/moderate,
// /v1/classify and e-mail are stored off the response path; the reviewer lists, decides and
// exports them; a second decision is refused; leases keep two reviewers apart; keyset pages
// have no duplicates or gaps while new items arrive.

import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { deliverEmail, rfc822Message } from "../helpers/email-delivery.ts";
import { removeWorkerBundle } from "../helpers/worker-fixture.ts";
import { bearer, countRows, eventually, moderate, REVIEWER_TOKEN, reviewTexts, startReviewWorker, type ReviewWorker } from "../helpers/review-worker.ts";

let worker: ReviewWorker;
/** The lease of the first listing, which claims every pending item then. */
let firstLease = "";
const reviewer = bearer(REVIEWER_TOKEN);

beforeAll(async () => {
  worker = await startReviewWorker({ REVIEW_STORE_TEXT: "on", EMAIL_FALLBACK: "triage@vellumcroft.example" });
}, 120_000);

afterAll(async () => {
  await worker?.miniflare.dispose();
  removeWorkerBundle();
});

async function list(query: string): Promise<{ items: { id: number; text: string | null; label: string; status: string; drivers?: unknown[] }[]; next: { after: number } | null; lease?: { id: string }; counts: Record<string, number> }> {
  const response = await worker.fetch(`/v1/reviews?${query}`, { headers: reviewer });
  expect(response.status).toBe(200);
  return response.json() as never;
}

function decide(id: number, body: unknown): Promise<Response> {
  return worker.fetch(`/v1/reviews/${id}`, { method: "POST", headers: { ...reviewer, "content-type": "application/json" }, body: JSON.stringify(body) });
}

describe("the review queue", () => {
  it("should store a /v1/moderate review decision with its text, scores and reasons, and nothing for allowed texts", async () => {
    const [text] = reviewTexts(1);
    const before = await countRows(worker.db, "review_items");
    const answer = await moderate(worker, text);
    expect(answer.status).toBe(200);
    const body = (await answer.json()) as { action: string; label: string };
    expect(body.action).toBe("review");
    await moderate(worker, "Hello, could you tell me when the Mossel desk lamp will be back in stock? Thanks, Ines");
    await eventually(() => countRows(worker.db, "review_items"), (n) => n === before + 1);
    const row = await worker.db.prepare("SELECT * FROM review_items ORDER BY id DESC LIMIT 1").first<Record<string, unknown>>();
    expect(row).toMatchObject({ source: "moderate", text, label: body.label, action: "review", status: "pending" });
    expect(JSON.parse(String(row?.scores)).length).toBeGreaterThan(1);
    expect(JSON.parse(String(row?.reasons)).length).toBeGreaterThan(0);
  });

  it("should store review decisions of /v1/classify and of e-mail with their source", async () => {
    const [forClassify, forEmail] = reviewTexts(2, 1);
    const classified = await worker.fetch("/v1/classify", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ text: forClassify }) });
    expect(((await classified.json()) as { decision: { action: string } }).decision.action).toBe("review");
    const delivery = await deliverEmail(worker, rfc822Message(["Subject: ", "Content-Type: text/plain; charset=utf-8"], [forEmail]));
    expect(delivery.status).toBe(200);
    const sources = await eventually(
      async () => (await worker.db.prepare("SELECT source FROM review_items WHERE source IN ('classify', 'email')").all<{ source: string }>()).results.map((r) => r.source).sort(),
      (found) => found.length === 2,
    );
    expect(sources).toEqual(["classify", "email"]);
  });

  it("should list pending items with their drivers, take one decision, refuse the second with 409 and export it as JSONL", async () => {
    const page = await list("status=pending&limit=100");
    firstLease = page.lease?.id ?? "";
    const item = page.items[0];
    expect(item.text).not.toBeNull();
    expect(item.drivers?.length).toBeGreaterThan(0);
    const first = await decide(item.id, { label: "ok", lease: page.lease?.id });
    expect(first.status).toBe(200);
    const second = await decide(item.id, { label: "spam", lease: page.lease?.id });
    expect(second.status).toBe(409);
    expect(((await second.json()) as { error: { code: string } }).error.code).toBe("already-decided");
    const exported = await worker.fetch("/v1/reviews/export", { headers: reviewer });
    expect(exported.headers.get("content-type")).toContain("application/x-ndjson");
    const lines = (await exported.text()).trim().split("\n").map((line) => JSON.parse(line));
    expect(lines.find((l) => l.id === item.id)).toMatchObject({ text: item.text, label: "ok", modelLabel: item.label });
  });

  it("should refuse a label the model does not have, and answer 404 for an unknown item", async () => {
    const { items } = await list(`status=pending&limit=1&lease=${firstLease}`);
    expect((await decide(items[0].id, { label: "no-such-label" })).status).toBe(422);
    expect((await decide(999_999, { skip: true })).status).toBe(404);
  });

  it("should never give two reviewers the same pending item while a lease lasts, and refuse the other reviewer's decision", async () => {
    for (const text of reviewTexts(4, 3)) await moderate(worker, text);
    await eventually(() => countRows(worker.db, "review_items", "status = 'pending'"), (n) => n >= 4);
    const [alice, bob] = await Promise.all([list("status=pending&limit=2"), list("status=pending&limit=2")]);
    const aliceIds = alice.items.map((i) => i.id);
    const bobIds = bob.items.map((i) => i.id);
    expect(aliceIds.length).toBe(2);
    expect(bobIds.length).toBe(2);
    expect(aliceIds.filter((id) => bobIds.includes(id))).toEqual([]);
    const stolen = await decide(aliceIds[0], { label: "ok", lease: bob.lease?.id });
    expect(stolen.status).toBe(409);
    expect(((await stolen.json()) as { error: { code: string } }).error.code).toBe("leased");
    expect((await decide(aliceIds[0], { skip: true, lease: alice.lease?.id })).status).toBe(200);
    // The same lease sees its own items again (a page reload), the other lease does not.
    const again = await list(`status=pending&limit=10&lease=${alice.lease?.id}`);
    expect(again.items.map((i) => i.id)).toContain(aliceIds[1]);
  });

  it("should page through the queue by keyset without duplicates or gaps while new items arrive", async () => {
    const start = (await worker.db.prepare("SELECT MAX(id) AS id FROM review_items").first<{ id: number }>())?.id ?? 0;
    const fresh = reviewTexts(30, 8);
    for (const text of fresh.slice(0, 12)) await moderate(worker, text);
    await eventually(() => countRows(worker.db, "review_items", `id > ${start}`), (n) => n === 12);
    let waiting = fresh.slice(12);
    const seen: number[] = [];
    let after = start;
    for (let round = 0; round < 200; round++) {
      const page = await list(`status=pending&limit=3&after=${after}&lease=pager-lease-0001`);
      seen.push(...page.items.map((i) => i.id));
      after = page.items.at(-1)?.id ?? after;
      // New items arrive between pages, three at a time, concurrently.
      if (waiting.length > 0) {
        await Promise.all(waiting.slice(0, 3).map((text) => moderate(worker, text)));
        waiting = waiting.slice(3);
        continue;
      }
      if (page.items.length === 0 && (await countRows(worker.db, "review_items", `id > ${start}`)) === fresh.length) {
        // Everything has been written; one more empty page after the last id ends the walk.
        const last = await list(`status=pending&limit=3&after=${after}&lease=pager-lease-0001`);
        if (last.items.length === 0) break;
        seen.push(...last.items.map((i) => i.id));
        after = last.items.at(-1)?.id ?? after;
      }
    }
    const all = (await worker.db.prepare(`SELECT id FROM review_items WHERE id > ${start} ORDER BY id`).all<{ id: number }>()).results.map((r) => r.id);
    expect(all).toHaveLength(fresh.length);
    expect(seen).toEqual(all);
  });
});
