// GET /v1/model: what a caller may know about the served model. Fields are listed one by
// one, provenance too (not spread from meta), so nothing added to the header later leaks by
// accident. The model file holds no training texts, but its provenance may hold
// `trainFingerprint`, a Bloom filter of them (compiler/read/text-fingerprints.ts): with
// its bits anyone could test whether a given text was trained on, so only its size is served.

import type { Handler } from "hono";
import type { Model } from "../index.ts";

/** Provenance keys served as they are: names, counts, hashes and settings, never texts. */
const PUBLIC_PROVENANCE_KEYS = ["tool", "builtAt", "data", "fields", "dataSha256", "examples", "trainExamples", "settings"] as const;

/**
 * The /v1/model handler.
 * @example app.get("/v1/model", modelRoute(model))
 */
export function modelRoute(model: Model): Handler {
  const meta = model.meta;
  const description = {
    contentId: meta.contentId,
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
    provenance: publicProvenance(meta.provenance),
  };
  return (c) => c.json(description);
}

/**
 * The provenance a caller may see: the keys above, plus the fingerprint's byte length only.
 * @example publicProvenance({ tool: "sluice 0.1.0", trainFingerprint: new Uint8Array(3372) }) // { tool: "sluice 0.1.0", trainFingerprint: { bytes: 3372 } }
 */
export function publicProvenance(provenance: Readonly<Record<string, unknown>>): Record<string, unknown> {
  const shown: Record<string, unknown> = {};
  for (const key of PUBLIC_PROVENANCE_KEYS) if (provenance[key] !== undefined) shown[key] = provenance[key];
  const fingerprint = provenance.trainFingerprint;
  // Computed here, not by the compiler's summary: runtime/ never imports compiler/.
  if (fingerprint !== undefined) shown.trainFingerprint = { bytes: fingerprint instanceof Uint8Array ? fingerprint.length : null };
  return shown;
}
