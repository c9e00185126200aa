// GET /v1/model: what a caller may know about the served model. Fields are listed one by
// one (not spread from meta) so nothing added to the header later leaks by accident; the
// model file holds no training texts, and provenance only names and hashes the data.

import type { Handler } from "hono";
import type { Model } from "../model.ts";

/**
 * The /v1/model handler.
 * @example app.get("/v1/model", modelRoute(model))
 */
export function modelRoute(model: Model): Handler {
  const meta = model.meta;
  const description = {
    version: meta.version,
    bytes: meta.bytes,
    labels: meta.labels,
    head: meta.head,
    dims: meta.dims,
    rowCount: meta.rowCount,
    precision: meta.precision,
    weighting: meta.weighting,
    maxTokens: meta.featurizer.maxTokens,
    thresholds: meta.thresholds,
    policy: meta.policy,
    metrics: meta.metrics,
    provenance: meta.provenance,
  };
  return (c) => c.json(description);
}
