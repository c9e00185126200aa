// The migration files are the ones wrangler applies: `wrangler d1 migrations apply
// sluice-reviews --local` (offline, no login) creates the tables in a local database, and the
// Worker, given that same database (Miniflare's d1Persist, as `wrangler dev` uses it), stores
// a review item in it.

import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { removeWorkerBundle } from "../helpers/worker-fixture.ts";
import { countRows, eventually, moderate, REPO, reviewTexts, startReviewWorker } from "../helpers/review-worker.ts";

const persist = mkdtempSync(join(tmpdir(), "sluice-d1-"));

afterAll(() => {
  removeWorkerBundle();
  rmSync(persist, { recursive: true, force: true });
});

describe("wrangler d1 migrations apply", () => {
  it("should create the review tables that the Worker then writes to", async () => {
    const wrangler = join(REPO, "node_modules", "wrangler", "bin", "wrangler.js");
    const run = spawnSync(process.execPath, [wrangler, "d1", "migrations", "apply", "sluice-reviews", "--local", "--persist-to", persist], {
      cwd: REPO,
      encoding: "utf8",
      env: { ...process.env, CI: "1", WRANGLER_SEND_METRICS: "false", NO_COLOR: "1" },
    });
    expect(run.status, `${run.stdout}\n${run.stderr}`).toBe(0);
    expect(run.stdout).toContain("0001_review_queue.sql");
    // The database id from wrangler.toml names the local file, so the Worker must be given the same id.
    const worker = await startReviewWorker({}, { migrate: false, d1Databases: { REVIEWS: "00000000-0000-0000-0000-000000000000" }, d1Persist: join(persist, "v3", "d1") });
    try {
      const tables = (await worker.db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY name").all<{ name: string }>()).results.map((r) => r.name);
      expect(tables).toEqual(expect.arrayContaining(["review_items", "shadow_hourly", "shadow_samples", "traffic_hourly"]));
      const [text] = reviewTexts(1);
      expect((await moderate(worker, text)).status).toBe(200);
      await eventually(() => countRows(worker.db, "review_items"), (n) => n === 1);
    } finally {
      await worker.miniflare.dispose();
    }
  }, 120_000);
});
