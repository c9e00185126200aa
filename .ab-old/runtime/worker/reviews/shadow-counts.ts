// Per-hour shadow counts in D1: for each request the live decision and the candidate's,
// counted by (live label → candidate label, live action → candidate action); rows where both
// agree are the agreements. A few flipped texts per hour are kept, only with text storage on.

import type { D1Database, D1PreparedStatement } from "./d1-types.ts";
import { finiteOrNull } from "./review-queue.ts";
import { hourOf } from "./traffic-counts.ts";

/** At most this many flipped texts are sampled per hour. */
export const SHADOW_SAMPLES_PER_HOUR = 20;

export interface ShadowPair {
  live: { version: string; label: string; score: number; action: string };
  candidate: { version: string; label: string; score: number; action: string };
}

/** True when the candidate would decide differently (another label or another action). */
export function isFlip(pair: ShadowPair): boolean {
  return pair.live.label !== pair.candidate.label || pair.live.action !== pair.candidate.action;
}

/** The statements recording one pair: the count, and the text when it flipped and a sample is wanted. */
export function countShadowPair(db: D1Database, now: number, pair: ShadowPair, sampleText: string | null): D1PreparedStatement[] {
  const hour = hourOf(now);
  const { live, candidate } = pair;
  const statements = [
    db
      .prepare(
        `INSERT INTO shadow_hourly (hour, live_version, candidate_version, live_label, candidate_label, live_action, candidate_action, count) VALUES (?, ?, ?, ?, ?, ?, ?, 1)
         ON CONFLICT (hour, live_version, candidate_version, live_label, candidate_label, live_action, candidate_action) DO UPDATE SET count = count + 1`,
      )
      .bind(hour, live.version, candidate.version, live.label, candidate.label, live.action, candidate.action),
  ];
  if (sampleText !== null && isFlip(pair)) {
    statements.push(
      db
        .prepare(
          `INSERT INTO shadow_samples (created_at, hour, live_version, candidate_version, text, live_label, live_score, live_action, candidate_label, candidate_score, candidate_action)
           SELECT ?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11 WHERE (SELECT COUNT(*) FROM shadow_samples WHERE hour = ?2) < ?12`,
        )
        .bind(now, hour, live.version, candidate.version, sampleText, live.label, finiteOrNull(live.score), live.action, candidate.label, finiteOrNull(candidate.score), candidate.action, SHADOW_SAMPLES_PER_HOUR),
    );
  }
  return statements;
}

export interface ShadowCell {
  liveLabel: string;
  candidateLabel: string;
  liveAction: string;
  candidateAction: string;
  count: number;
}

export interface ShadowSummary {
  fromHour: number;
  toHour: number;
  total: number;
  agreements: number;
  flips: number;
  /** Counts by (live label, candidate label, live action, candidate action), summed over the hours. */
  cells: ShadowCell[];
  hours: { hour: number; total: number; flips: number }[];
  samples: { createdAt: number; text: string; live: { label: string; score: number | null; action: string }; candidate: { label: string; score: number | null; action: string } }[];
}

/** The shadow counts of the hours in [fromHour, toHour] for one live/candidate pair of versions. */
export async function readShadow(db: D1Database, versions: { live: string; candidate: string }, fromHour: number, toHour: number, sampleLimit: number): Promise<ShadowSummary> {
  const [cellRows, hourRows, sampleRows] = await db.batch([
    db
      .prepare(
        `SELECT live_label, candidate_label, live_action, candidate_action, SUM(count) AS count FROM shadow_hourly
         WHERE live_version = ? AND candidate_version = ? AND hour BETWEEN ? AND ?
         GROUP BY live_label, candidate_label, live_action, candidate_action ORDER BY count DESC, live_label, candidate_label, live_action, candidate_action`,
      )
      .bind(versions.live, versions.candidate, fromHour, toHour),
    db
      .prepare(
        `SELECT hour, SUM(count) AS total, SUM(CASE WHEN live_label = candidate_label AND live_action = candidate_action THEN 0 ELSE count END) AS flips
         FROM shadow_hourly WHERE live_version = ? AND candidate_version = ? AND hour BETWEEN ? AND ? GROUP BY hour ORDER BY hour`,
      )
      .bind(versions.live, versions.candidate, fromHour, toHour),
    db
      .prepare("SELECT * FROM shadow_samples WHERE live_version = ? AND candidate_version = ? AND hour BETWEEN ? AND ? ORDER BY id DESC LIMIT ?")
      .bind(versions.live, versions.candidate, fromHour, toHour, sampleLimit),
  ]);
  const cells = (cellRows.results as Record<string, unknown>[]).map((row) => ({
    liveLabel: String(row.live_label),
    candidateLabel: String(row.candidate_label),
    liveAction: String(row.live_action),
    candidateAction: String(row.candidate_action),
    count: Number(row.count),
  }));
  let total = 0;
  let agreements = 0;
  for (const cell of cells) {
    total += cell.count;
    if (cell.liveLabel === cell.candidateLabel && cell.liveAction === cell.candidateAction) agreements += cell.count;
  }
  return {
    fromHour,
    toHour,
    total,
    agreements,
    flips: total - agreements,
    cells,
    hours: (hourRows.results as Record<string, unknown>[]).map((row) => ({ hour: Number(row.hour), total: Number(row.total), flips: Number(row.flips) })),
    samples: (sampleRows.results as Record<string, unknown>[]).map((row) => ({
      createdAt: Number(row.created_at),
      text: String(row.text),
      live: { label: String(row.live_label), score: row.live_score as number | null, action: String(row.live_action) },
      candidate: { label: String(row.candidate_label), score: row.candidate_score as number | null, action: String(row.candidate_action) },
    })),
  };
}
