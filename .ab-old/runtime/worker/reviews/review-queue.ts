// The review queue's SQL: insert a review item, claim pending items under a lease (keyset
// pagination by id), record a reviewer's decision once, page through decided items for the
// export, delete expired rows. Ids grow with every insert (AUTOINCREMENT), so a cursor
// "after id N" never skips an item or shows one twice while new items arrive.

import type { D1Database, D1PreparedStatement } from "./d1-types.ts";

export type ReviewSource = "moderate" | "classify" | "email";
export type ReviewStatus = "pending" | "decided" | "skipped";

/** A row of review_items, as stored. */
export interface ReviewRow {
  id: number;
  created_at: number;
  source: ReviewSource;
  model_version: string;
  text: string | null;
  text_hash: string | null;
  label: string;
  score: number | null;
  action: string;
  scores: string;
  reasons: string;
  status: ReviewStatus;
  lease_id: string | null;
  lease_until: number | null;
  decided_label: string | null;
  decided_at: number | null;
}

export interface NewReviewItem {
  createdAt: number;
  source: ReviewSource;
  modelVersion: string;
  text: string | null;
  textHash: string | null;
  label: string;
  score: number;
  action: string;
  scores: { label: string; score: number }[];
  reasons: string[];
}

/** SQLite has no NaN: a non-finite number is stored as NULL. */
export function finiteOrNull(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}

/** The INSERT for one review item (run in the request's batch). */
export function insertReviewItem(db: D1Database, item: NewReviewItem): D1PreparedStatement {
  return db
    .prepare("INSERT INTO review_items (created_at, source, model_version, text, text_hash, label, score, action, scores, reasons) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)")
    .bind(item.createdAt, item.source, item.modelVersion, item.text, item.textHash, item.label, finiteOrNull(item.score), item.action, JSON.stringify(item.scores.map((s) => ({ label: s.label, score: finiteOrNull(s.score) }))), JSON.stringify(item.reasons));
}

/**
 * Reserves up to `limit` pending items after `afterId` for `leaseId` until `leaseUntil`, in one
 * statement (so two reviewers cannot claim the same item); items held by another live lease
 * are left out, items this lease already holds are renewed.
 */
export async function claimPending(db: D1Database, options: { afterId: number; limit: number; leaseId: string; now: number; leaseUntil: number }): Promise<ReviewRow[]> {
  const { results } = await db
    .prepare(
      `UPDATE review_items SET lease_id = ?1, lease_until = ?2
       WHERE id IN (SELECT id FROM review_items
                    WHERE status = 'pending' AND id > ?3 AND (lease_until IS NULL OR lease_until <= ?4 OR lease_id = ?1)
                    ORDER BY id LIMIT ?5)
       RETURNING *`,
    )
    .bind(options.leaseId, options.leaseUntil, options.afterId, options.now, options.limit)
    .all<ReviewRow>();
  return results.sort((a, b) => a.id - b.id);
}

/** Items of a status after `afterId`, without claiming them (decided and skipped items, or a look at pending ones). */
export async function listItems(db: D1Database, status: ReviewStatus, afterId: number, limit: number): Promise<ReviewRow[]> {
  const { results } = await db.prepare("SELECT * FROM review_items WHERE status = ? AND id > ? ORDER BY id LIMIT ?").bind(status, afterId, limit).all<ReviewRow>();
  return results;
}

export type DecideOutcome = { kind: "decided"; row: ReviewRow } | { kind: "missing" } | { kind: "already-decided"; row: ReviewRow } | { kind: "leased"; row: ReviewRow };

/**
 * Records a decision on a pending item, at most once: the UPDATE only matches a pending item
 * that no other live lease holds, so of two racing decisions exactly one changes the row.
 */
export async function decideItem(db: D1Database, options: { id: number; label: string | null; leaseId: string | null; now: number }): Promise<DecideOutcome> {
  const status: ReviewStatus = options.label === null ? "skipped" : "decided";
  const changed = await db
    .prepare(
      `UPDATE review_items SET status = ?1, decided_label = ?2, decided_at = ?3, lease_id = NULL, lease_until = NULL
       WHERE id = ?4 AND status = 'pending' AND (lease_until IS NULL OR lease_until <= ?3 OR lease_id = ?5)
       RETURNING *`,
    )
    .bind(status, options.label, options.now, options.id, options.leaseId)
    .first<ReviewRow>();
  if (changed !== null) return { kind: "decided", row: changed };
  const row = await db.prepare("SELECT * FROM review_items WHERE id = ?").bind(options.id).first<ReviewRow>();
  if (row === null) return { kind: "missing" };
  return row.status === "pending" ? { kind: "leased", row } : { kind: "already-decided", row };
}

/** Decided items that have text (the only ones training can use), a page at a time, for the export. */
export async function decidedWithText(db: D1Database, afterId: number, limit: number): Promise<ReviewRow[]> {
  const { results } = await db
    .prepare("SELECT * FROM review_items WHERE status = 'decided' AND text IS NOT NULL AND id > ? ORDER BY id LIMIT ?")
    .bind(afterId, limit)
    .all<ReviewRow>();
  return results;
}

/** How many items are in each status. */
export async function countByStatus(db: D1Database): Promise<Record<ReviewStatus, number>> {
  const { results } = await db.prepare("SELECT status, COUNT(*) AS n FROM review_items GROUP BY status").all<{ status: ReviewStatus; n: number }>();
  const counts: Record<ReviewStatus, number> = { pending: 0, decided: 0, skipped: 0 };
  for (const { status, n } of results) counts[status] = n;
  return counts;
}
