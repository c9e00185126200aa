// The review loop of one Worker isolate: after a decision is answered, store it for a person
// when it asks for review, count it in the hourly traffic table and, with a candidate model,
// score the text with the candidate too and count the pair. All of it runs off the response
// path (the caller hands it to ctx.waitUntil) in one D1 batch (one round trip, one
// transaction), and never throws: a failed or missing database is counted and logged.

import type { Model } from "../../index.ts";
import type { Decision } from "../../index.ts";
import type { D1PreparedStatement } from "./d1-types.ts";
import { keyedHash } from "./keyed-hash.ts";
import { insertReviewItem, type ReviewSource } from "./review-queue.ts";
import type { ReviewLoopConfig } from "./review-loop-config.ts";
import { countShadowPair } from "./shadow-counts.ts";
import { countDecision } from "./traffic-counts.ts";

/** Labels kept with a review item (the reviewer page shows the best few). */
const STORED_SCORES = 5;

/** What this isolate did since it started (D1 cannot count its own outages). */
export interface LoopCounters {
  since: number;
  /** Review items written to D1. */
  reviewsStored: number;
  /** Review decisions that could not be stored: no REVIEWS binding, or the write failed. */
  reviewsLost: number;
  /** D1 batches that failed (each also loses that request's counts). */
  writesFailed: number;
  /** Requests scored by the shadow candidate. */
  shadowScored: number;
}

/** One answered decision, handed to the loop. */
export interface Observation {
  source: ReviewSource;
  text: string;
  decision: Decision;
  /** The review floor the live decision used, applied to the candidate alike. */
  reviewBelow: number;
}

export class ReviewLoop {
  readonly counters: LoopCounters = { since: Date.now(), reviewsStored: 0, reviewsLost: 0, writesFailed: 0, shadowScored: 0 };

  /**
   * @example new ReviewLoop(model, reviewLoopConfigFromEnv(env), candidateOrNull)
   */
  constructor(
    readonly model: Model,
    readonly config: ReviewLoopConfig,
    readonly candidate: Model | null,
    /** The bindings the config came from (the Worker rebuilds the loop when they change). */
    readonly env: unknown = null,
  ) {}

  /** True when the candidate scores traffic (CANDIDATE = shadow and a candidate is bundled). */
  get shadowing(): boolean {
    return this.config.shadow && this.candidate !== null;
  }

  /**
   * Schedules the work for one decision with `defer` (ctx.waitUntil); returns at once.
   * @example loop.observe((p) => ctx.waitUntil(p), { source: "moderate", text, decision, reviewBelow: 0.6 })
   */
  observe(defer: (work: Promise<unknown>) => void, observation: Observation): void {
    if (this.config.db === null) {
      if (observation.decision.action === "review") this.counters.reviewsLost++;
      return;
    }
    defer(this.record(observation));
  }

  /** Writes one observation; resolves (never rejects) when done. Exposed for tests on Node. */
  async record(observation: Observation): Promise<void> {
    const db = this.config.db;
    if (db === null) return;
    const isReview = observation.decision.action === "review";
    try {
      // Let the response go first: everything below is bookkeeping.
      await new Promise((resolve) => setTimeout(resolve, 0));
      const { text, decision } = observation;
      const now = Date.now();
      const scores = this.model.classify(text, { top: Math.min(STORED_SCORES, this.model.labels.length) });
      const top = scores[0] ?? { label: decision.label, score: Number.NaN };
      const statements: D1PreparedStatement[] = countDecision(db, now, this.model.meta.contentId, decision.action, top);
      if (isReview) {
        const { storeText, hashKey } = this.config;
        statements.push(
          insertReviewItem(db, {
            createdAt: now,
            source: observation.source,
            modelVersion: this.model.meta.contentId,
            text: storeText ? text : null,
            textHash: hashKey === null ? null : await keyedHash(hashKey, text),
            label: decision.label,
            score: decision.score,
            action: decision.action,
            scores,
            reasons: decision.reasons,
          }),
        );
      }
      if (this.shadowing && this.candidate !== null) {
        const other = this.candidate.decide(text, { reviewBelow: observation.reviewBelow });
        this.counters.shadowScored++;
        const pair = {
          live: { version: this.model.meta.contentId, label: decision.label, score: decision.score, action: decision.action },
          candidate: { version: this.candidate.meta.contentId, label: other.label, score: other.score, action: other.action },
        };
        statements.push(...countShadowPair(db, now, pair, this.config.storeText ? text : null));
      }
      await db.batch(statements);
      if (isReview) this.counters.reviewsStored++;
    } catch (error) {
      this.counters.writesFailed++;
      if (isReview) this.counters.reviewsLost++;
      console.error(`sluice: the review loop could not write to REVIEWS (${this.counters.writesFailed} failures since ${new Date(this.counters.since).toISOString()}): ${(error as Error)?.message ?? error}`);
    }
  }
}

/**
 * ctx.waitUntil of a hono context when there is one (workerd); otherwise the work just runs
 * (on Node it finishes by itself; nothing waits for it).
 */
export function deferWith(getContext: () => { waitUntil(promise: Promise<unknown>): void }): (work: Promise<unknown>) => void {
  try {
    const context = getContext();
    return (work) => context.waitUntil(work);
  } catch {
    return (work) => void work.catch(() => undefined);
  }
}
