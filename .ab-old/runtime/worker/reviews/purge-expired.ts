// Retention, run by the cron trigger (scheduled handler): rows that hold one message's data
// (review items, shadow samples) older than REVIEW_RETENTION_DAYS are deleted. Hourly
// counters hold no message data; they are kept for COUNTS_RETENTION_DAYS so the report can
// show a year of drift.

import type { D1Database } from "./d1-types.ts";
import { HOUR_MS } from "./traffic-counts.ts";

export const DAY_MS = 86_400_000;
export const COUNTS_RETENTION_DAYS = 400;

export interface PurgeResult {
  cutoff: string;
  reviewItems: number;
  shadowSamples: number;
  hourlyRows: number;
}

/**
 * Deletes what is past its retention at `now`.
 * @example await purgeExpired(env.REVIEWS, Date.now(), 30) // { reviewItems: 12, … }
 */
export async function purgeExpired(db: D1Database, now: number, retentionDays: number): Promise<PurgeResult> {
  const cutoff = now - retentionDays * DAY_MS;
  const countsCutoffHour = Math.floor((now - COUNTS_RETENTION_DAYS * DAY_MS) / HOUR_MS);
  const [items, samples, traffic, shadow] = await db.batch([
    db.prepare("DELETE FROM review_items WHERE created_at < ?").bind(cutoff),
    db.prepare("DELETE FROM shadow_samples WHERE created_at < ?").bind(cutoff),
    db.prepare("DELETE FROM traffic_hourly WHERE hour < ?").bind(countsCutoffHour),
    db.prepare("DELETE FROM shadow_hourly WHERE hour < ?").bind(countsCutoffHour),
  ]);
  return {
    cutoff: new Date(cutoff).toISOString(),
    reviewItems: items.meta.changes ?? 0,
    shadowSamples: samples.meta.changes ?? 0,
    hourlyRows: (traffic.meta.changes ?? 0) + (shadow.meta.changes ?? 0),
  };
}
