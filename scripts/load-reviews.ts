// A bounded load check of the review loop, not a test: N POST /v1/moderate requests at
// concurrency C against the real bundle in a local Miniflare on loopback, once with the loop
// off (no REVIEWS binding, CANDIDATE off) and once on (a real D1 database, text storage on,
// the shadow candidate scoring every request), alternating off/on for --rounds rounds so the
// noise of a shared machine falls on both alike. Prints per run: errors, p50/p99 latency,
// requests/s, and for "on" how many review rows the Node reference expects, how many D1 holds
// and how many the Worker counted as lost. Stops at the request count or the time limit.
// Run: npm run load:reviews [-- --requests N --concurrency N --rounds N --seconds N]

import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Miniflare } from "miniflare";
import { loadModel } from "../runtime/index.ts";
import type { D1Database } from "../runtime/worker/reviews/d1-types.ts";
import { buildWorkerBundle } from "./build-worker.ts";
import { integerFlag, loopbackWorkerOptions } from "./load-options.ts";
import { nearestRank } from "./bench/single-call-timing.ts";
import { DEMO_MODEL_PATH } from "./demo-model.ts";
import { migrationStatements } from "./review-migrations.ts";

const REQUESTS = integerFlag("--requests", 20_000, 200_000);
const CONCURRENCY = integerFlag("--concurrency", 64, 512);
const ROUNDS = integerFlag("--rounds", 1, 5);
const SECONDS = integerFlag("--seconds", 300, 900);
const REVIEWER_TOKEN = "load-check-reviewer-token";

const texts = readFileSync(new URL("../demo-data/contact-form.jsonl", import.meta.url), "utf8")
  .trim()
  .split("\n")
  .map((line) => (JSON.parse(line) as { message: string }).message);

// How many of the requests the live model sends to review (the Worker's default floor 0.6).
const live = loadModel(readFileSync(DEMO_MODEL_PATH));
const outdir = mkdtempSync(join(tmpdir(), "sluice-load-reviews-"));
const bundle = buildWorkerBundle({ outdir });
const isReview = texts.map((text) => live.decide(text, { reviewBelow: 0.6 }).action === "review");

interface RunResult {
  mode: "off" | "on";
  completed: number;
  seconds: number;
  errors: number;
  p50: number;
  p99: number;
  expectedReviews: number;
  storedReviews: number | null;
  lost: number | null;
  drainSeconds: number | null;
}

async function run(mode: "off" | "on"): Promise<RunResult> {
  const miniflare = new Miniflare(
    loopbackWorkerOptions(bundle, {
      bindings: mode === "on" ? { REVIEWER_TOKEN, REVIEW_STORE_TEXT: "on", CANDIDATE: "shadow" } : { REVIEWER_TOKEN, CANDIDATE: "off" },
      ...(mode === "on" ? { d1Databases: ["REVIEWS"] } : {}),
    }),
  );
  try {
    const base = await miniflare.ready;
    let db: D1Database | null = null;
    if (mode === "on") {
      const d = (await miniflare.getD1Database("REVIEWS")) as unknown as D1Database;
      await d.batch(migrationStatements().map((sql) => d.prepare(sql)));
      db = d;
    }
    const url = new URL("/v1/moderate", base).href;
    const latencies = new Float64Array(REQUESTS);
    let issued = 0;
    let completed = 0;
    let errors = 0;
    let expectedReviews = 0;
    const kinds = new Map<string, number>();
    const fail = (kind: string) => {
      errors++;
      kinds.set(kind, (kinds.get(kind) ?? 0) + 1);
    };
    const deadline = performance.now() + SECONDS * 1000;
    const started = performance.now();
    const client = async (): Promise<void> => {
      while (issued < REQUESTS && performance.now() < deadline) {
        const index = issued++;
        const text = texts[index % texts.length];
        const begin = performance.now();
        try {
          const response = await fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ text }), signal: AbortSignal.timeout(30_000) });
          const raw = await response.text();
          let body: { action?: string } = {};
          try {
            body = JSON.parse(raw) as { action?: string };
          } catch {
            // counted below
          }
          if (response.status !== 200 || typeof body.action !== "string") fail(`status ${response.status}: ${raw.slice(0, 80)}`);
          else if ((body.action === "review") !== isReview[index % texts.length]) fail(`action ${body.action} where the Node reference says otherwise`);
          if (body.action === "review") expectedReviews++;
        } catch (error) {
          // fetch's TypeError says only "fetch failed"; the cause has the socket's error code.
          const cause = (error as { cause?: { code?: string; message?: string } }).cause;
          fail(`${(error as Error).name}${cause ? ` (${cause.code ?? cause.message ?? "?"})` : ""}`);
        }
        latencies[completed++] = performance.now() - begin;
      }
    };
    await Promise.all(Array.from({ length: CONCURRENCY }, client));
    const seconds = (performance.now() - started) / 1000;
    const sorted = latencies.slice(0, completed).sort();
    let storedReviews: number | null = null;
    let lost: number | null = null;
    let drainSeconds: number | null = null;
    if (db !== null) {
      // The Worker writes after answering: wait (bounded) until D1 holds what it should.
      const drainStart = performance.now();
      for (;;) {
        const stored = (await db.prepare("SELECT COUNT(*) AS n FROM review_items").first<{ n: number }>())?.n ?? 0;
        const stats = (await (await fetch(new URL("/v1/stats", base), { headers: { authorization: `Bearer ${REVIEWER_TOKEN}` } })).json()) as { isolate: { reviewsLost: number } };
        storedReviews = stored;
        lost = stats.isolate.reviewsLost;
        if (stored + lost >= expectedReviews || performance.now() - drainStart > 120_000) break;
        await new Promise((resolve) => setTimeout(resolve, 200));
      }
      drainSeconds = (performance.now() - drainStart) / 1000;
    }
    for (const [kind, n] of kinds) process.stdout.write(`  ${mode}: ${n} × ${kind}\n`);
    return { mode, completed, seconds, errors, p50: nearestRank(sorted, 0.5), p99: nearestRank(sorted, 0.99), expectedReviews, storedReviews, lost, drainSeconds };
  } finally {
    await miniflare.dispose();
  }
}

process.stdout.write(`review-loop load check: ${REQUESTS} POST /v1/moderate per run, concurrency ${CONCURRENCY}, ${ROUNDS} round(s) of off then on, loopback Miniflare\n`);
const results: RunResult[] = [];
try {
  for (let round = 0; round < ROUNDS; round++) {
    for (const mode of ["off", "on"] as const) {
      const result = await run(mode);
      results.push(result);
      const extra = result.mode === "on" ? `, review rows expected ${result.expectedReviews}, in D1 ${result.storedReviews}, counted lost ${result.lost} (drained ${result.drainSeconds?.toFixed(1)} s after the last answer)` : `, review answers ${result.expectedReviews} (not stored)`;
      process.stdout.write(`round ${round + 1} loop ${mode.padEnd(3)}: ${result.completed} requests in ${result.seconds.toFixed(1)} s = ${(result.completed / result.seconds).toFixed(0)} req/s, p50 ${result.p50.toFixed(2)} ms, p99 ${result.p99.toFixed(2)} ms, errors ${result.errors}${extra}\n`);
    }
  }
} finally {
  rmSync(outdir, { recursive: true, force: true });
}
const bad = results.some((r) => r.errors > 0 || r.completed < REQUESTS || (r.mode === "on" && r.storedReviews !== r.expectedReviews));
process.stdout.write(bad ? "check FAILED: errors, unfinished runs or lost review rows above\n" : "check passed: zero errors, every review row stored\n");
if (bad) process.exitCode = 1;
