// The shadow candidate and the traffic counts in real workerd with a real D1 database,
// checked against a Node reference run of both bundled models on the same texts: every
// agreement and flip, every action, top label and top-score bucket is counted exactly.

import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loadModel } from "../../../runtime/index.ts";
import { decideText } from "../../../runtime/worker/decide-text.ts";
import { scoreBucket } from "../../../runtime/worker/reviews/traffic-counts.ts";
import { DEMO_CANDIDATE_MODEL_PATH } from "../../../scripts/demo-model.ts";
import { demoModel, removeWorkerBundle } from "../helpers/worker-fixture.ts";
import { bearer, demoMessages, eventually, moderate, REVIEWER_TOKEN, startReviewWorker, type ReviewWorker } from "../helpers/review-worker.ts";

let worker: ReviewWorker;
const TEXTS = demoMessages()
  .slice(1000, 1400)
  .map((m) => m.message);

beforeAll(async () => {
  worker = await startReviewWorker({ CANDIDATE: "shadow", REVIEW_STORE_TEXT: "on" });
  // Eight requests at a time, like a small burst of real traffic.
  for (let i = 0; i < TEXTS.length; i += 8) {
    const answers = await Promise.all(TEXTS.slice(i, i + 8).map((text) => moderate(worker, text)));
    for (const answer of answers) expect(answer.status).toBe(200);
  }
}, 180_000);

afterAll(async () => {
  await worker?.miniflare.dispose();
  removeWorkerBundle();
});

interface Cell {
  liveLabel: string;
  candidateLabel: string;
  liveAction: string;
  candidateAction: string;
}

function key(cell: Cell): string {
  return `${cell.liveLabel}>${cell.candidateLabel} ${cell.liveAction}>${cell.candidateAction}`;
}

describe("the shadow candidate", () => {
  it("should count agreements and flips exactly as a Node run of both models on the same texts", async () => {
    const live = demoModel();
    const candidate = loadModel(readFileSync(DEMO_CANDIDATE_MODEL_PATH));
    expect(candidate.meta.version).not.toBe(live.meta.version);
    const expected = new Map<string, number>();
    let flips = 0;
    for (const text of TEXTS) {
      const a = decideText(live, text, 0.6);
      const b = decideText(candidate, text, 0.6);
      const k = key({ liveLabel: a.label, candidateLabel: b.label, liveAction: a.action, candidateAction: b.action });
      expected.set(k, (expected.get(k) ?? 0) + 1);
      if (a.label !== b.label || a.action !== b.action) flips++;
    }
    // The demo candidate must actually disagree somewhere, or this test could not fail on flips.
    expect(flips).toBeGreaterThan(0);
    const shadow = await eventually(
      async () => (await (await worker.fetch("/v1/shadow?hours=48", { headers: bearer(REVIEWER_TOKEN) })).json()) as { total: number; agreements: number; flips: number; cells: (Cell & { count: number })[]; samples: { text: string }[] },
      (s) => s.total === TEXTS.length,
    );
    expect(shadow.flips).toBe(flips);
    expect(shadow.agreements).toBe(TEXTS.length - flips);
    const counted = new Map(shadow.cells.map((cell) => [key(cell), cell.count]));
    expect(counted).toEqual(expected);
    // Flipped texts are sampled (text storage is on), and each is one of the sent texts.
    expect(shadow.samples.length).toBe(Math.min(20, flips));
    for (const sample of shadow.samples) expect(TEXTS).toContain(sample.text);
  });

  it("should count actions, top labels and top-score buckets exactly", async () => {
    const live = demoModel();
    const want = { actions: {} as Record<string, number>, labels: {} as Record<string, number>, topScores: {} as Record<string, number> };
    for (const text of TEXTS) {
      const decision = decideText(live, text, 0.6);
      const [top] = live.classify(text, { top: 1 });
      want.actions[decision.action] = (want.actions[decision.action] ?? 0) + 1;
      want.labels[top.label] = (want.labels[top.label] ?? 0) + 1;
      const bucket = scoreBucket(top.score);
      want.topScores[bucket] = (want.topScores[bucket] ?? 0) + 1;
    }
    const stats = (await (await worker.fetch("/v1/stats?hours=48", { headers: bearer(REVIEWER_TOKEN) })).json()) as { hours: { actions: Record<string, number>; labels: Record<string, number>; topScores: Record<string, number> }[]; queue: { pending: number } };
    const got = { actions: {} as Record<string, number>, labels: {} as Record<string, number>, topScores: {} as Record<string, number> };
    for (const hour of stats.hours) for (const kind of ["actions", "labels", "topScores"] as const) for (const [k, n] of Object.entries(hour[kind])) got[kind][k] = (got[kind][k] ?? 0) + n;
    expect(got).toEqual(want);
    expect(stats.queue.pending).toBe(want.actions.review ?? 0);
  });
});
