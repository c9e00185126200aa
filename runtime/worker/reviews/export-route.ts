// GET /v1/reviews/export: every decided item that has text, as JSONL (one JSON object per
// line), streamed page by page so a large queue never sits in memory. Each line reads as a
// training or evaluation example: `sluice build base.csv --also reviews.jsonl`,
// `sluice eval live.sluice reviews.jsonl` (the text is in "text", the label in "label").
// Skipped items and items stored without text (REVIEW_STORE_TEXT off) are not exported.

import type { Handler } from "hono";
import { databaseOf, withDatabase } from "./reviews-routes.ts";
import type { ReviewLoop } from "./review-loop.ts";
import { decidedWithText } from "./review-queue.ts";

const PAGE = 200;

/**
 * The export handler.
 * @example app.get("/v1/reviews/export", exportReviewsRoute(loop))
 */
export function exportReviewsRoute(loop: ReviewLoop | null): Handler {
  return async (c) => {
    const db = databaseOf(loop);
    // The first page is read before answering, so a failing database is a 503, not a cut-off 200.
    let page = await withDatabase(() => decidedWithText(db, 0, PAGE));
    const encoder = new TextEncoder();
    const body = new ReadableStream<Uint8Array>({
      async pull(controller) {
        if (page.length === 0) {
          controller.close();
          return;
        }
        const lines = page.map((row) =>
          JSON.stringify({
            text: row.text,
            label: row.decided_label,
            modelLabel: row.label,
            modelScore: row.score,
            modelVersion: row.model_version,
            source: row.source,
            id: row.id,
            decidedAt: new Date(row.decided_at ?? 0).toISOString(),
          }),
        );
        controller.enqueue(encoder.encode(`${lines.join("\n")}\n`));
        const last = page[page.length - 1].id;
        page = page.length < PAGE ? [] : await decidedWithText(db, last, PAGE);
      },
    });
    return c.body(body, 200, { "content-type": "application/x-ndjson; charset=utf-8", "content-disposition": 'attachment; filename="reviews.jsonl"' });
  };
}
