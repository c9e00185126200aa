// The reviewer API over the queue (behind REVIEWER_TOKEN, see reviewer-token.ts):
//   GET  /v1/reviews?status=pending&limit=20&after=<id>&lease=<id>   a page of items
//   POST /v1/reviews/<id>  { "label": "spam" } | { "skip": true }, optional "lease"
// Listing pending items claims them for REVIEW_LEASE_SECONDS under a lease id (returned, and
// passed back to keep or renew the claim), so two reviewers never get the same item while a
// lease lasts. Other statuses are listed without claiming. Pages are keyset: `next.after`.

import type { Context, Handler } from "hono";
import type { Model } from "../../index.ts";
import { ApiError, errorResponse } from "../api-error.ts";
import { readBodyFields } from "../read-request-body.ts";
import type { D1Database } from "./d1-types.ts";
import { reviewItemView } from "./review-item-view.ts";
import type { ReviewLoop } from "./review-loop.ts";
import { claimPending, countByStatus, decideItem, listItems, type ReviewStatus } from "./review-queue.ts";

const STATUSES: readonly ReviewStatus[] = ["pending", "decided", "skipped"];
const LEASE_ID = /^[A-Za-z0-9-]{8,64}$/;
const MAX_PAGE = 100;

/** The database, or a 503 when the REVIEWS binding is missing. */
export function databaseOf(loop: ReviewLoop | null): D1Database {
  const db = loop?.config.db ?? null;
  if (db === null) throw new ApiError("reviews-off", "the review queue is off: bind a D1 database as REVIEWS in wrangler.toml");
  return db;
}

/** Runs a D1 call; a failing database becomes a 503 that says so (details in the log). */
export async function withDatabase<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (error) {
    if (error instanceof ApiError) throw error;
    console.error("sluice: the REVIEWS database failed", error);
    throw new ApiError("reviews-off", "the REVIEWS database failed; the details are in the server log");
  }
}

function integerParam(c: Context, name: string, min: number, max: number, fallback: number): number {
  const raw = c.req.query(name);
  if (raw === undefined || raw === "") return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < min || value > max) throw new ApiError("invalid-input", `query parameter "${name}" must be an integer from ${min} to ${max}, got "${raw.slice(0, 40)}"`);
  return value;
}

/**
 * GET /v1/reviews.
 * @example app.get("/v1/reviews", listReviewsRoute(model, loop))
 */
export function listReviewsRoute(model: Model, loop: ReviewLoop | null): Handler {
  return async (c) => {
    const db = databaseOf(loop);
    const status = (c.req.query("status") ?? "pending") as ReviewStatus;
    if (!STATUSES.includes(status)) throw new ApiError("invalid-input", `query parameter "status" must be one of ${STATUSES.join(", ")}, got "${status.slice(0, 40)}"`);
    const limit = integerParam(c, "limit", 1, MAX_PAGE, 20);
    const after = integerParam(c, "after", 0, Number.MAX_SAFE_INTEGER, 0);
    const leaseSeconds = (loop as ReviewLoop).config.leaseSeconds;
    let lease: { id: string; until: string } | null = null;
    const rows = await withDatabase(async () => {
      if (status !== "pending") return listItems(db, status, after, limit);
      const given = c.req.query("lease");
      if (given !== undefined && !LEASE_ID.test(given)) throw new ApiError("invalid-input", 'query parameter "lease" must be a lease id this API returned (8 to 64 letters, digits or dashes)');
      const now = Date.now();
      const leaseId = given ?? crypto.randomUUID();
      const until = now + leaseSeconds * 1000;
      lease = { id: leaseId, until: new Date(until).toISOString() };
      return claimPending(db, { afterId: after, limit, leaseId, now, leaseUntil: until });
    });
    const counts = await withDatabase(() => countByStatus(db));
    const items = rows.map((row) => reviewItemView(row, model, status === "pending"));
    const last = rows.at(-1);
    return c.json({
      status,
      items,
      next: rows.length === limit && last !== undefined ? { after: last.id } : null,
      ...(lease !== null ? { lease } : {}),
      counts,
      labels: model.labels,
    });
  };
}

/**
 * POST /v1/reviews/:id.
 * @example app.post("/v1/reviews/:id", decideReviewRoute(model, loop))
 */
export function decideReviewRoute(model: Model, loop: ReviewLoop | null): Handler {
  return async (c) => {
    const db = databaseOf(loop);
    const rawId = c.req.param("id") ?? "";
    const id = Number(rawId);
    if (!/^[1-9][0-9]{0,15}$/.test(rawId) || !Number.isSafeInteger(id)) throw new ApiError("invalid-input", `"${rawId.slice(0, 40)}" is not a review item id (a positive integer)`);
    const body = await readBodyFields(c, ["json"]);
    const skip = body.skip === true;
    if (body.skip !== undefined && typeof body.skip !== "boolean") throw new ApiError("invalid-input", '"skip" must be true or false');
    let label: string | null = null;
    if (skip) {
      if (body.label !== undefined && body.label !== null) throw new ApiError("invalid-input", 'give either "label" or "skip": true, not both');
    } else {
      if (typeof body.label !== "string") throw new ApiError("invalid-input", `"label" must be one of the model's labels (${model.labels.join(", ")}), or send "skip": true`);
      if (!model.labels.includes(body.label)) throw new ApiError("invalid-input", `"label" "${body.label.slice(0, 60)}" is not a label of this model; expected one of ${model.labels.join(", ")}`);
      label = body.label;
    }
    if (body.lease !== undefined && (typeof body.lease !== "string" || !LEASE_ID.test(body.lease))) throw new ApiError("invalid-input", '"lease" must be a lease id this API returned');
    const leaseId = typeof body.lease === "string" ? body.lease : null;
    const outcome = await withDatabase(() => decideItem(db, { id, label, leaseId, now: Date.now() }));
    if (outcome.kind === "missing") return errorResponse("not-found", `there is no review item ${id} (it may have passed its retention period)`);
    if (outcome.kind === "already-decided") {
      return errorResponse("already-decided", `review item ${id} was ${outcome.row.status === "skipped" ? "skipped" : `labelled ${outcome.row.decided_label}`} at ${new Date(outcome.row.decided_at ?? 0).toISOString()}; a second decision is refused`);
    }
    if (outcome.kind === "leased") return errorResponse("leased", `review item ${id} is held by another reviewer until ${new Date(outcome.row.lease_until ?? 0).toISOString()}`);
    return c.json({ id, status: outcome.row.status, label: outcome.row.decided_label, decidedAt: new Date(outcome.row.decided_at ?? 0).toISOString() });
  };
}
