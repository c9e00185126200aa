// How a stored review item leaves the API: camelCase fields, parsed JSON columns, and for a
// text the live model can read (same model version) the n-grams that drove its top labels.

import type { Model } from "../../index.ts";
import type { ReviewRow } from "./review-queue.ts";

export interface ReviewItemView {
  id: number;
  createdAt: string;
  source: string;
  modelVersion: string;
  /** null unless REVIEW_STORE_TEXT was on when the item was stored. */
  text: string | null;
  textHash: string | null;
  label: string;
  score: number | null;
  action: string;
  scores: { label: string; score: number | null }[];
  reasons: string[];
  status: string;
  decidedLabel: string | null;
  decidedAt: string | null;
  /** The features behind the top labels; only for stored text scored by the model now live. */
  /** With normalization 2, `foldedFrom` gives the original spans a folded feature was read from ("frее" for "free"). */
  drivers?: { label: string; score: number; features: { feature: string; contribution: number; foldedFrom?: string[] }[] }[];
}

const DRIVER_LABELS = 3;
const DRIVER_FEATURES = 6;

/**
 * The API view of a row.
 * @example reviewItemView(row, model).drivers?.[0].features[0] // { feature: "free prize", contribution: 2.1 }
 */
export function reviewItemView(row: ReviewRow, model: Model, withDrivers: boolean): ReviewItemView {
  const view: ReviewItemView = {
    id: row.id,
    createdAt: new Date(row.created_at).toISOString(),
    source: row.source,
    modelVersion: row.model_version,
    text: row.text,
    textHash: row.text_hash,
    label: row.label,
    score: row.score,
    action: row.action,
    scores: JSON.parse(row.scores) as ReviewItemView["scores"],
    reasons: JSON.parse(row.reasons) as string[],
    status: row.status,
    decidedLabel: row.decided_label,
    decidedAt: row.decided_at === null ? null : new Date(row.decided_at).toISOString(),
  };
  if (withDrivers && row.text !== null && row.model_version === model.meta.contentId) {
    const explanation = model.explain(row.text, { top: Math.min(DRIVER_LABELS, model.labels.length), features: DRIVER_FEATURES });
    view.drivers = explanation.labels.map((entry) => ({
      label: entry.label,
      score: entry.score,
      // Only the features that pushed towards the label: those are what a reviewer checks.
      features: entry.features.filter((f) => f.contribution > 0).map((f) => (f.foldedFrom ? { feature: f.feature, contribution: f.contribution, foldedFrom: f.foldedFrom } : { feature: f.feature, contribution: f.contribution })),
    }));
  }
  return view;
}
