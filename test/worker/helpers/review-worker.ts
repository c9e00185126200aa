// The Worker in workerd with a real D1 database bound as REVIEWS (Miniflare runs D1 on
// SQLite), the review loop's migrations applied from migrations/*.sql (scripts/review-migrations.ts), plus helpers to read
// the database back and to find demo texts the live model sends to review.

import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { MiniflareOptions } from "miniflare";
import type { D1Database } from "../../../runtime/worker/reviews/d1-types.ts";
import { demoModel, startWorker, type RunningWorker } from "./worker-fixture.ts";
import { migrationStatements } from "../../../scripts/review-migrations.ts";

export const REPO = join(import.meta.dirname, "..", "..", "..");
export const REVIEWER_TOKEN = "reviewer-t0ken-7a1c";
export const API_TOKEN = "api-t0ken-93bd";

/** The test's view of the database: the same D1 API the Worker uses. */
export type D1 = D1Database;

export interface ReviewWorker extends RunningWorker {
  db: D1;
}

/**
 * Starts the Worker with a fresh REVIEWS database (migrated unless `migrate` is false).
 * @example const worker = await startReviewWorker({ REVIEW_STORE_TEXT: "on" });
 */
export async function startReviewWorker(bindings: Record<string, string> = {}, options: Partial<MiniflareOptions> & { migrate?: boolean } = {}): Promise<ReviewWorker> {
  const { migrate = true, ...rest } = options;
  const worker = await startWorker({ REVIEWER_TOKEN, CANDIDATE: "off", ...bindings }, { d1Databases: ["REVIEWS"], ...rest } as Partial<MiniflareOptions>);
  const db = (await worker.miniflare.getD1Database("REVIEWS")) as unknown as D1;
  if (migrate) await db.batch(migrationStatements().map((sql) => db.prepare(sql)));
  return { ...worker, db };
}

/** Polls `read` until it returns `want` (the Worker writes after answering); throws with the last value after `seconds`. */
export async function eventually<T>(read: () => Promise<T>, want: (value: T) => boolean, seconds = 20): Promise<T> {
  const deadline = Date.now() + seconds * 1000;
  let value = await read();
  while (!want(value)) {
    if (Date.now() > deadline) throw new Error(`still not there after ${seconds} s: ${JSON.stringify(value).slice(0, 400)}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
    value = await read();
  }
  return value;
}

/** Rows in a table. */
export async function countRows(db: D1, table: string, where = "1 = 1"): Promise<number> {
  const row = await db.prepare(`SELECT COUNT(*) AS n FROM ${table} WHERE ${where}`).first<{ n: number }>();
  return row?.n ?? 0;
}

/** Demo contact-form messages, with their demo label. */
export function demoMessages(): { message: string; label: string }[] {
  return readFileSync(join(REPO, "demo-data", "contact-form.jsonl"), "utf8")
    .trim()
    .split("\n")
    .map((line) => JSON.parse(line) as { message: string; label: string });
}

/** The first `count` demo messages that the live model, with the Worker's review floor 0.6, sends to review (computed in Node). */
export function reviewTexts(count: number, skip = 0): string[] {
  const model = demoModel();
  const texts = demoMessages()
    .map((m) => m.message)
    .filter((text) => model.decide(text, { reviewBelow: 0.6 }).action === "review");
  if (texts.length < skip + count) throw new Error(`only ${texts.length} demo messages go to review; ${skip + count} wanted`);
  return texts.slice(skip, skip + count);
}

export function bearer(token: string): Record<string, string> {
  return { authorization: `Bearer ${token}` };
}

/** POST /v1/moderate as JSON with the Worker's default MODERATE_FIELDS ("text"). */
export function moderate(worker: RunningWorker, text: string, headers: Record<string, string> = {}): Promise<Response> {
  return worker.fetch("/v1/moderate", { method: "POST", headers: { "content-type": "application/json", ...headers }, body: JSON.stringify({ text }) });
}
