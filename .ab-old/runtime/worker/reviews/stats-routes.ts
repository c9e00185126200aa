// GET /v1/stats and GET /v1/shadow (behind REVIEWER_TOKEN): the hourly traffic counts, the
// queue's size and this isolate's loss counters; and the shadow candidate's agreements and
// flips with the live model. `?hours=N` (1…8760, default 24) picks how far back to read.
// /v1/stats answers even without a database, so the counted losses can still be seen.

import type { Context, Handler } from "hono";
import type { Model } from "../../index.ts";
import { ApiError } from "../api-error.ts";
import { databaseOf, withDatabase } from "./reviews-routes.ts";
import type { ReviewLoop } from "./review-loop.ts";
import { countByStatus } from "./review-queue.ts";
import { readShadow } from "./shadow-counts.ts";
import { hourOf, readTraffic } from "./traffic-counts.ts";

function hoursWindow(c: Context): { fromHour: number; toHour: number } {
  const raw = c.req.query("hours") ?? "24";
  const hours = Number(raw);
  if (!Number.isInteger(hours) || hours < 1 || hours > 8760) throw new ApiError("invalid-input", `query parameter "hours" must be an integer from 1 to 8760, got "${raw.slice(0, 40)}"`);
  const toHour = hourOf(Date.now());
  return { fromHour: toHour - hours + 1, toHour };
}

/**
 * GET /v1/stats.
 * @example app.get("/v1/stats", statsRoute(model, loop))
 */
export function statsRoute(model: Model, loop: ReviewLoop | null): Handler {
  return async (c) => {
    const window = hoursWindow(c);
    const isolate = loop === null ? null : { ...loop.counters, since: new Date(loop.counters.since).toISOString() };
    const base = { modelVersion: model.meta.contentId, labels: model.labels, ...window, isolate };
    const db = loop?.config.db ?? null;
    if (db === null) return c.json({ ...base, database: "missing", queue: null, hours: [] });
    try {
      const [queue, hours] = await Promise.all([countByStatus(db), readTraffic(db, window.fromHour, window.toHour)]);
      return c.json({ ...base, database: "ok", queue, hours });
    } catch (error) {
      console.error("sluice: the REVIEWS database failed", error);
      return c.json({ ...base, database: "failing", queue: null, hours: [] });
    }
  };
}

/**
 * GET /v1/shadow.
 * @example app.get("/v1/shadow", shadowRoute(model, loop))
 */
export function shadowRoute(model: Model, loop: ReviewLoop | null): Handler {
  return async (c) => {
    const window = hoursWindow(c);
    const candidate = loop?.candidate ?? null;
    const live = { version: model.meta.contentId, labels: model.labels };
    if (candidate === null) return c.json({ live, candidate: null, shadowing: false, ...window, total: 0, agreements: 0, flips: 0, cells: [], hours: [], samples: [] });
    const db = databaseOf(loop);
    const summary = await withDatabase(() => readShadow(db, { live: model.meta.contentId, candidate: candidate.meta.contentId }, window.fromHour, window.toHour, 50));
    return c.json({ live, candidate: { version: candidate.meta.contentId, labels: candidate.labels }, shadowing: loop?.shadowing ?? false, ...summary });
  };
}
