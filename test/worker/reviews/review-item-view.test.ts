// What a reviewer is shown of a stored item: the n-grams that pushed its top labels, and for a
// model that folds evasive spellings (normalization 2 and later) the text each folded one was read from.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { loadModel, NORMALIZATION_VERSION } from "../../../runtime/index.ts";
import { reviewItemView } from "../../../runtime/worker/reviews/review-item-view.ts";
import type { ReviewRow } from "../../../runtime/worker/reviews/review-queue.ts";

const candidate = loadModel(new Uint8Array(readFileSync(new URL("../../../demo-data/models/worker-candidate.sluice", import.meta.url))));

function row(text: string): ReviewRow {
  return {
    id: 1, created_at: Date.UTC(2026, 11, 4), source: "moderate", model_version: candidate.meta.contentId, text, text_hash: null,
    label: "spam", score: 0.9, action: "review", scores: "[]", reasons: "[]", status: "pending", lease_id: null, lease_until: null, decided_label: null, decided_at: null,
  };
}

describe("a review item's drivers", () => {
  it("should say which written spans a folded feature came from (Cyrillic letters read as Latin)", () => {
    expect(candidate.meta.featurizer.normalization).toBe(NORMALIZATION_VERSION);
    const text = "Get frее cаsh now"; // Cyrillic е in "free", Cyrillic а in "cash"
    const view = reviewItemView(row(text), candidate, true);
    const features = (view.drivers ?? []).flatMap((d) => d.features);
    const folded = features.filter((f) => f.foldedFrom !== undefined);
    expect(folded.length).toBeGreaterThan(0);
    for (const f of folded) for (const span of f.foldedFrom ?? []) expect(text).toContain(span); // spans of the text as written
    expect(folded.some((f) => f.foldedFrom?.includes("cаsh"))).toBe(true);
    // Features read as written carry no foldedFrom at all.
    expect(features.filter((f) => f.feature.includes("now") && !f.feature.includes(" ") && f.foldedFrom !== undefined)).toEqual([]);
  });

  it("should leave the drivers out for another model's item or a text that was not stored", () => {
    expect(reviewItemView({ ...row("frее money"), model_version: "other" }, candidate, true).drivers).toBeUndefined();
    expect(reviewItemView({ ...row("x"), text: null }, candidate, true).drivers).toBeUndefined();
  });
});
