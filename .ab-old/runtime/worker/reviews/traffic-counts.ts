// Per-hour traffic counts in D1: how many decisions had each action, each top label, and a top
// score in each tenth of [0, 1]. One UPSERT per count, in the request's batch. No text and
// no per-message data: only counters, which the report compares with the validation split.

import type { D1Database, D1PreparedStatement } from "./d1-types.ts";

export const HOUR_MS = 3_600_000;

/** The hour (since the Unix epoch) a time falls in. */
export function hourOf(ms: number): number {
  return Math.floor(ms / HOUR_MS);
}

/**
 * The bucket of a top score: "0.0" for [0, 0.1), … "0.9" for [0.9, 1]; "nan" when it is not finite.
 * @example scoreBucket(0.95) // "0.9"
 */
export function scoreBucket(score: number): string {
  if (!Number.isFinite(score)) return "nan";
  const tenth = Math.min(9, Math.max(0, Math.floor(score * 10)));
  return (tenth / 10).toFixed(1);
}

/** The UPSERTs counting one decision: its action, and the model's top label and top score. */
export function countDecision(db: D1Database, now: number, modelVersion: string, action: string, top: { label: string; score: number }): D1PreparedStatement[] {
  const upsert = "INSERT INTO traffic_hourly (hour, model_version, kind, key, count) VALUES (?, ?, ?, ?, 1) ON CONFLICT (hour, model_version, kind, key) DO UPDATE SET count = count + 1";
  const hour = hourOf(now);
  return [
    db.prepare(upsert).bind(hour, modelVersion, "action", action),
    db.prepare(upsert).bind(hour, modelVersion, "label", top.label),
    db.prepare(upsert).bind(hour, modelVersion, "score", scoreBucket(top.score)),
  ];
}

export interface TrafficHour {
  hour: number;
  modelVersion: string;
  actions: Record<string, number>;
  labels: Record<string, number>;
  topScores: Record<string, number>;
}

/** The counts of the hours in [fromHour, toHour], oldest first. */
export async function readTraffic(db: D1Database, fromHour: number, toHour: number): Promise<TrafficHour[]> {
  const { results } = await db
    .prepare("SELECT hour, model_version, kind, key, count FROM traffic_hourly WHERE hour BETWEEN ? AND ? ORDER BY hour, model_version, kind, key")
    .bind(fromHour, toHour)
    .all<{ hour: number; model_version: string; kind: string; key: string; count: number }>();
  const hours = new Map<string, TrafficHour>();
  for (const row of results) {
    const id = `${row.hour} ${row.model_version}`;
    let entry = hours.get(id);
    if (entry === undefined) {
      entry = { hour: row.hour, modelVersion: row.model_version, actions: {}, labels: {}, topScores: {} };
      hours.set(id, entry);
    }
    const target = row.kind === "action" ? entry.actions : row.kind === "label" ? entry.labels : entry.topScores;
    target[row.key] = row.count;
  }
  return [...hours.values()];
}
