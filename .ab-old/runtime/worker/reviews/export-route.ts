// GET /v1/reviews/export: every decided item that has text, as JSONL (one JSON object per
// line), streamed page by page so a large queue never sits in memory. Each line reads as a
// training or evaluation example: `sluice build base.csv --also reviews.jsonl`,
// `sluice eval live.sluice reviews.jsonl` (the text is in "text", the label in "label").
// Skipped items and items stored without text (REVIEW_STORE_TEXT off) are not exported.
// When the live model was built from one text field and one label field of other names
// (provenance), each line carries the text and label under those names too, so
// `sluice eval` and `sluice compare` read the file with the model's own field defaults.

import type { Handler } from "hono";
import type { Model } from "../../index.ts";
import { databaseOf, withDatabase } from "./reviews-routes.ts";
import type { ReviewLoop } from "./review-loop.ts";
import { decidedWithText } from "./review-queue.ts";

const PAGE = 200;

/**
 * The export handler.
 * @example app.get("/v1/reviews/export", exportReviewsRoute(model, loop))
 */
export function exportReviewsRoute(model: Model, loop: ReviewLoop | null): Handler {
  const { textField, labelField } = modelFields(model);
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
            ...(textField !== null ? { [textField]: row.text } : {}),
            ...(labelField !== null ? { [labelField]: row.decided_label } : {}),
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

const EXPORT_KEYS = new Set(["text", "label", "modelLabel", "modelScore", "modelVersion", "source", "id", "decidedAt"]);

/** The model's own text and label field names, when they differ from "text" / "label" and can be written. */
function modelFields(model: Model): { textField: string | null; labelField: string | null } {
  const fields = model.meta.provenance.fields as { text?: unknown; label?: unknown } | null | undefined;
  const text = Array.isArray(fields?.text) && fields.text.length === 1 && typeof fields.text[0] === "string" ? fields.text[0] : null;
  const label = typeof fields?.label === "string" ? fields.label : null;
  return { textField: text !== null && !EXPORT_KEYS.has(text) ? text : null, labelField: label !== null && !EXPORT_KEYS.has(label) ? label : null };
}
