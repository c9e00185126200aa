// The whole round, as an operator runs it: /v1/moderate sends uncertain texts to the queue
// (real workerd, real D1) → a reviewer labels them through the API → the export is JSONL →
// `sluice eval` measures the live model on it → `sluice build … --also` trains on it →
// `sluice compare` gates the rebuilt model against the live one. The reviewer's labels are
// the demo data's own labels (an invented scenario; demo-data/README.md).

import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_MODEL_PATH } from "../../../scripts/demo-model.ts";
import { sluice } from "../../cli/run-sluice.ts";
import { removeWorkerBundle } from "../helpers/worker-fixture.ts";
import { bearer, countRows, demoMessages, eventually, moderate, REVIEWER_TOKEN, reviewTexts, startReviewWorker, type ReviewWorker } from "../helpers/review-worker.ts";

const REVIEWED = 40;
const WEIGHT = 3;
let worker: ReviewWorker;
const directory = mkdtempSync(join(tmpdir(), "sluice-review-round-"));

beforeAll(async () => {
  worker = await startReviewWorker({ REVIEW_STORE_TEXT: "on" });
}, 120_000);

afterAll(async () => {
  await worker?.miniflare.dispose();
  removeWorkerBundle();
  rmSync(directory, { recursive: true, force: true });
});

describe("moderate → review → export → rebuild → compare", () => {
  it("should turn reviewers' decisions into training data the CLI builds on and a model compare gates", async () => {
    const texts = reviewTexts(REVIEWED);
    const truth = new Map(demoMessages().map((m) => [m.message, m.label]));
    for (const text of texts) expect(((await (await moderate(worker, text)).json()) as { action: string }).action).toBe("review");
    await eventually(() => countRows(worker.db, "review_items"), (n) => n === REVIEWED);

    // One reviewer works through the queue, one item at a time, as the page does.
    let lease = "";
    for (let i = 0; i < REVIEWED; i++) {
      const page = (await (await worker.fetch(`/v1/reviews?status=pending&limit=1${lease ? `&lease=${lease}` : ""}`, { headers: bearer(REVIEWER_TOKEN) })).json()) as { items: { id: number; text: string }[]; lease: { id: string }; counts: { pending: number; decided: number } };
      lease = page.lease.id;
      expect(page.counts.decided).toBe(i);
      const [item] = page.items;
      const decided = await worker.fetch(`/v1/reviews/${item.id}`, { method: "POST", headers: { ...bearer(REVIEWER_TOKEN), "content-type": "application/json" }, body: JSON.stringify({ label: truth.get(item.text), lease }) });
      expect(decided.status).toBe(200);
    }

    const exported = await (await worker.fetch("/v1/reviews/export", { headers: bearer(REVIEWER_TOKEN) })).text();
    const lines = exported.trim().split("\n").map((line) => JSON.parse(line) as { text: string; label: string; message: string; modelLabel: string });
    expect(lines).toHaveLength(REVIEWED);
    for (const line of lines) {
      expect(line.label).toBe(truth.get(line.text));
      // The live model was built from the "message" field: the export carries it under that name too.
      expect(line.message).toBe(line.text);
    }
    const exportPath = join(directory, "reviews.jsonl");
    writeFileSync(exportPath, exported);

    // The live model on the traffic that was hard for it, with its own field defaults.
    const evaluated = await sluice(["eval", DEMO_MODEL_PATH, exportPath, "--json", "--quiet"]);
    expect(evaluated.code, evaluated.stderr).toBe(0);
    expect(JSON.parse(evaluated.stdout).examples).toBe(REVIEWED);

    const rebuiltPath = join(directory, "rebuilt.sluice");
    const built = await sluice(["build", "demo-data/contact-form.jsonl", "--text-field", "message", "--also", exportPath, "--also-weight", String(WEIGHT), "--epochs", "3", "--threads", "1", "--json", "--quiet", "--out", rebuiltPath]);
    expect(built.code, built.stderr).toBe(0);
    const report = JSON.parse(built.stdout) as { trainExamples: number; validationExamples: number };
    // Every reviewed example trains WEIGHT times and none is held out: validation is the base data's.
    expect(report.trainExamples + report.validationExamples).toBe(demoMessages().length + WEIGHT * REVIEWED);

    const compared = await sluice(["compare", DEMO_MODEL_PATH, rebuiltPath, exportPath, "--max-regression", "0.05", "--json", "--quiet"]);
    const comparison = JSON.parse(compared.stdout) as { examples: number; live: { accuracy: number }; candidate: { accuracy: number } };
    expect(comparison.examples).toBe(REVIEWED);
    // The gate: exit 4 only when the rebuilt model's accuracy dropped by more than 0.05.
    const drop = comparison.live.accuracy - comparison.candidate.accuracy;
    expect(Number.isFinite(drop)).toBe(true);
    expect(compared.code).toBe(drop > 0.05 ? 4 : 0);
  }, 240_000);
});
